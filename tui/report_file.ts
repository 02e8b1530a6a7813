/**
 * `--report FILE` of the commands that write an HTML report: the options,
 * the checks before any work (the name asks for HTML, the path can be
 * written and is none of the files read), and the write itself (whole or
 * not at all, never over a file without `--force`).
 *
 * @module
 */

import type { Command } from "@commander-js/extra-typings";
import { assertCanWrite, OptionError, type Provenance, sameFile, writeFileAtomic } from "../mod.ts";
import { ANSWER_CAUTIONS, provenanceLine } from "./render/cautions.ts";
import { htmlPage, type HtmlSection, isHtmlPath } from "./render/html/page.ts";

/**
 * Adds `--report FILE.html` and `--force` to a command.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { Command } from "@commander-js/extra-typings";
 * import { withHtmlReport } from "./report_file.ts";
 * const command = withHtmlReport(new Command("estimate"));
 * command.parse(["--report", "a.html", "--force"], { from: "user" });
 * assert.deepEqual(command.opts(), { report: "a.html", force: true });
 * ```
 */
export function withHtmlReport<A extends unknown[], O extends Record<string, unknown>>(
  command: Command<A, O>,
): Command<A, O & { report?: string; force?: true }> {
  return command
    .option(
      "--report <file>",
      "also write a report to open in any browser (HTML; name it .html)",
    )
    .option("--force", "replace an existing report") as unknown as Command<
      A,
      O & { report?: string; force?: true }
    >;
}

/**
 * Checks a `--report` path before any work: an HTML name, writable, not a
 * file the command reads.
 *
 * @throws {OptionError} for a name that is not .html or .htm, an existing
 *   file without `force`, or one of the files read.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { checkHtmlReport } from "./report_file.ts";
 * const dir = Deno.makeTempDirSync();
 * await checkHtmlReport(`${dir}/r.html`, false, []);
 * await assert.rejects(() => checkHtmlReport(`${dir}/r.md`, false, []), /\.html/);
 * ```
 */
export async function checkHtmlReport(
  path: string,
  force: boolean,
  reading: readonly string[],
): Promise<void> {
  if (!isHtmlPath(path)) {
    throw new OptionError(
      `--report: this command writes its report as HTML: name the file .html (got ${path})`,
    );
  }
  await assertCanWrite(path, force, "--report", [...reading]);
}

/**
 * Writes an answer's HTML report: its title and question, the usual
 * cautions, its sections, the model's provenance.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { writeHtmlReport } from "./report_file.ts";
 * const path = `${Deno.makeTempDirSync()}/r.html`;
 * const provenance = {
 *   paygrove: "0.1.0", format: 2, created: "2026-12-03T10:00:00Z",
 *   table: { file: "pay.csv", sha256: "ab".repeat(32), rows: 10 }, seed: 1,
 * };
 * await writeHtmlReport(path, false, provenance, {
 *   title: "Estimated pay", question: "What would we pay?", sections: [],
 * });
 * assert.match(Deno.readTextFileSync(path), /<title>Estimated pay<\/title>/);
 * ```
 */
export async function writeHtmlReport(
  path: string,
  force: boolean,
  provenance: Provenance,
  page: { title: string; question: string; sections: HtmlSection[]; cautions?: string[] },
): Promise<void> {
  const html = htmlPage({
    title: page.title,
    question: page.question,
    created: new Date().toISOString(),
    provenance: [provenanceLine(provenance)],
    cautions: [...(page.cautions ?? []), ANSWER_CAUTIONS],
    sections: page.sections,
  });
  await writeFileAtomic(path, html, { force, option: "--report" });
}

/**
 * Refuses two outputs that are one file under any spelling (the second
 * would replace the first, or a shared file take a private one's place);
 * outputs not given are skipped.
 *
 * @throws {OptionError} naming the later option and the earlier one.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { assertApart } from "./report_file.ts";
 * const dir = Deno.makeTempDirSync();
 * await assertApart([["--out", `${dir}/a.csv`], ["--report", undefined], ["--people", `${dir}/b.csv`]]);
 * await assert.rejects(
 *   () => assertApart([["--out", `${dir}/a.csv`], ["--report", `${dir}/./a.csv`]]),
 *   /--report: .* is the --out file/,
 * );
 * ```
 */
export async function assertApart(
  outputs: readonly (readonly [string, string | undefined])[],
): Promise<void> {
  const given = outputs.filter((o): o is readonly [string, string] => o[1] !== undefined);
  for (let i = 0; i < given.length; i++) {
    for (let j = i + 1; j < given.length; j++) {
      if (await sameFile(given[i][1], given[j][1])) {
        throw new OptionError(`${given[j][0]}: ${given[j][1]} is the ${given[i][0]} file`);
      }
    }
  }
}
