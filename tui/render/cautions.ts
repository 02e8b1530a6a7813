/**
 * The cautions every pay answer carries, and the provenance line.
 *
 * @module
 */

import wrapAnsi from "wrap-ansi";
import { GAP_CAUTIONS, type Provenance, type TableProvenance } from "../../mod.ts";
import { forTerminal, jsonText } from "./safe_text.ts";
import type { Style } from "./style.ts";

/**
 * The usual cautions, wrapped to the width.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { cautionLines } from "./cautions.ts";
 * import { makeStyle } from "./style.ts";
 * const lines = cautionLines(makeStyle(false), 60);
 * assert(lines[0].startsWith("These figures describe what your current pay structure does"));
 * assert(lines.every((l) => l.length <= 60));
 * assert.match(lines.join(" "), /Defer to local law, counsel and licensed practice/);
 * ```
 */
export function cautionLines(style: Style, width: number): string[] {
  return wrapAnsi(style.dim(ANSWER_CAUTIONS), width).split("\n");
}

/**
 * The usual cautions of every pay answer, in one paragraph (the terminal
 * wraps it; a report shows it as it is).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { ANSWER_CAUTIONS } from "./cautions.ts";
 * assert.match(ANSWER_CAUTIONS, /not what anyone should be paid/);
 * ```
 */
export const ANSWER_CAUTIONS =
  "These figures describe what your current pay structure does, not what anyone " +
  "should be paid. Protected attributes are kept out of estimates unless you allowed them. " +
  "Defer to local law, counsel and licensed practice before acting on any figure.";

/**
 * One line naming where a result came from.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { provenanceLine } from "./cautions.ts";
 * const line = provenanceLine({
 *   paygrove: "0.1.0", format: 1, created: "2026-12-02T10:00:00Z",
 *   table: { file: "pay.csv", sha256: "ab".repeat(32), rows: 10 }, seed: 1,
 * });
 * assert(line === "paygrove 0.1.0, model format 1, fitted 2026-12-02T10:00:00Z on pay.csv (sha256 abababababab...), seed 1");
 * ```
 */
export function provenanceLine(p: Provenance): string {
  return `paygrove ${p.paygrove}, model format ${p.format}, fitted ${p.created} on ` +
    `${p.table.file} (sha256 ${p.table.sha256.slice(0, 12)}...), seed ${p.seed}`;
}

/**
 * An answer's screen as printed by the model commands: its lines, then the
 * cautions and the provenance line, wrapped to the terminal.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { cautionLines, withCautions } from "./cautions.ts";
 * import { makeStyle } from "./style.ts";
 * const provenance = {
 *   paygrove: "0.1.0", format: 2, created: "2026-12-02T10:00:00Z",
 *   table: { file: "pay.csv", sha256: "ab".repeat(32), rows: 10 }, seed: 1,
 * };
 * const text = withCautions(["Estimate: €61,000"], provenance, makeStyle(false), 200);
 * assert.deepEqual(text.split("\n"), [
 *   "Estimate: €61,000",
 *   "",
 *   ...cautionLines(makeStyle(false), 200),
 *   "paygrove 0.1.0, model format 2, fitted 2026-12-02T10:00:00Z on pay.csv " +
 *   "(sha256 abababababab...), seed 1",
 * ]);
 * ```
 */
export function withCautions(
  lines: string[],
  provenance: Provenance,
  style: Style,
  width: number,
): string {
  return [
    ...lines,
    "",
    ...cautionLines(style, width),
    ...wrapAnsi(style.dim(provenanceLine(provenance)), width).split("\n"),
  ].join("\n");
}

/**
 * How the model commands print an answer: one JSON document with `--json`,
 * else the rendered lines with the cautions and the provenance.
 *
 * @param json The `--json` document (written with {@linkcode jsonText}).
 * @param render The text lines, drawn only when text is asked for, from
 * documents passed through {@linkcode forTerminal}.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { recordingTerminal } from "../terminal.ts";
 * import { printAnswer } from "./cautions.ts";
 * const provenance = {
 *   paygrove: "0.1.0", format: 2, created: "2026-12-02T10:00:00Z",
 *   table: { file: "pay.csv", sha256: "ab".repeat(32), rows: 10 }, seed: 1,
 * };
 * const json = recordingTerminal();
 * printAnswer(json, true, provenance, { estimate: 61000 }, () => ["not drawn"]);
 * assert.deepEqual(JSON.parse(json.stdout.join("")), { estimate: 61000 });
 * const text = recordingTerminal();
 * printAnswer(text, false, provenance, { estimate: 61000 }, () => ["Estimate: €61,000"]);
 * assert.match(text.stdout.join(""), /^Estimate: €61,000\n\nThese figures describe/);
 * ```
 */
export function printAnswer(
  terminal: { out(text: string): void; style: Style; width: number },
  asJson: boolean,
  provenance: Provenance,
  json: unknown,
  render: () => string[],
): void {
  if (asJson) {
    terminal.out(jsonText(json));
    return;
  }
  terminal.out(withCautions(render(), forTerminal(provenance), terminal.style, terminal.width));
}

/**
 * One line naming the table a gap or review answer was computed from.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { tableProvenanceLine } from "./cautions.ts";
 * const line = tableProvenanceLine({
 *   paygrove: "0.1.0", table: { file: "pay.csv", sha256: "ab".repeat(32), rows: 10 }, seed: 1,
 * });
 * assert(line === "paygrove 0.1.0; pay.csv (sha256 abababababab...); seed 1");
 * ```
 */
export function tableProvenanceLine(p: TableProvenance): string {
  return `paygrove ${p.paygrove}; ${p.table.file} (sha256 ${p.table.sha256.slice(0, 12)}...); ` +
    `seed ${p.seed}`;
}

/**
 * How `gap` and `review` print: one JSON document with the pay-gap
 * cautions in it, or the rendered lines, the cautions, the provenance line
 * and any lines `after` (e.g. where a report went).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { GAP_CAUTIONS } from "../../mod.ts";
 * import { recordingTerminal } from "../terminal.ts";
 * import { printTableAnswer } from "./cautions.ts";
 * const table = { file: "pay.csv", sha256: "ab".repeat(32), rows: 10 };
 * const doc = { provenance: { paygrove: "0.1.0", table, seed: 1 } };
 * const json = recordingTerminal();
 * printTableAnswer(json, true, doc, () => []);
 * assert.equal(JSON.parse(json.stdout.join("")).cautions, GAP_CAUTIONS);
 * const text = recordingTerminal(1000);
 * printTableAnswer(text, false, doc, () => ["Pay gap by gender"], ["Report written to r.md."]);
 * assert.deepEqual(text.stdout.join("").trimEnd().split("\n"), [
 *   "Pay gap by gender",
 *   GAP_CAUTIONS,
 *   "paygrove 0.1.0; pay.csv (sha256 abababababab...); seed 1",
 *   "Report written to r.md.",
 * ]);
 * ```
 */
export function printTableAnswer(
  terminal: { out(text: string): void; style: Style; width: number },
  asJson: boolean,
  doc: { provenance: TableProvenance },
  render: () => string[],
  after: string[] = [],
): void {
  if (asJson) {
    terminal.out(jsonText({ ...doc, cautions: GAP_CAUTIONS }));
    return;
  }
  const { style, width } = terminal;
  terminal.out(
    [
      ...render(),
      ...wrapAnsi(style.dim(GAP_CAUTIONS), width).split("\n"),
      ...wrapAnsi(style.dim(tableProvenanceLine(forTerminal(doc.provenance))), width).split("\n"),
      ...after,
    ].join("\n"),
  );
}

// Kept here too for the modules that import it from here.
export { jsonNumbers } from "./safe_text.ts";

/**
 * The caution printed whenever protected attributes are allowed.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv } from "../../mod.ts";
 * import { recordingTerminal } from "../terminal.ts";
 * import { fitCommand } from "../commands/fit.ts";
 * import { PROTECTED_CAUTION } from "./cautions.ts";
 * const dir = Deno.makeTempDirSync();
 * Deno.writeTextFileSync(`${dir}/pay.csv`, demoCompanyCsv({ rows: 120, seed: 1 }));
 * const terminal = recordingTerminal();
 * await fitCommand(terminal).parseAsync([
 *   `${dir}/pay.csv`, "--target", "base_pay_eur", "--allow-protected", "--trees", "3",
 *   "--folds", "3", "--workers", "1", "--out", `${dir}/m.json`, "--json",
 * ], { from: "user" });
 * assert(terminal.stderr.includes(`${PROTECTED_CAUTION}\n`));
 * Deno.removeSync(dir, { recursive: true });
 * ```
 */
export const PROTECTED_CAUTION = "Caution: --allow-protected lets sex, race, age and other " +
  "protected attributes shape pay estimates. Setting pay on them risks unlawful discrimination; " +
  "use such a model only to study gaps, with counsel.";
