/**
 * The guided flow's gap step: after the model summary, when the table has
 * a protected attribute (kept out of the model), the flow offers the pay-gap
 * check by it: one group against the reference (or all at once), within
 * categories the user picks from the model's attributes. The figures are
 * those of `paygrove gap` on the same table, whose command line is shown.
 *
 * @module
 */

import { errorWords } from "../option_words.ts";
import wrapAnsi from "wrap-ansi";
import {
  chooseReference,
  DataError,
  GAP_CAUTIONS,
  gapCheck,
  type GapReport,
  type Model,
  OptionError,
  type Table,
} from "../../mod.ts";
import { progressBar } from "../progress.ts";
import { renderGap } from "../render/gap_view.ts";
import { formatNumber, type NumberStyle } from "../render/numbers.ts";
import type { FlowIO } from "./flow_io.ts";
import { forTerminal, terminalGuard, terminalText } from "../render/safe_text.ts";

/** The flow's table as the model was fitted on it, and its path for the command line. */
export interface TableSource {
  /** The table, read with the model's target. */
  table: Table;
  /** Its path (for the equivalent command line). */
  path: string;
}

/** A protected column the gap check can compare, with its groups and their sizes. */
export interface GapCandidate {
  /** Column name. */
  name: string;
  /** Group names and how many people with pay each has. */
  groups: { name: string; people: number }[];
}

/**
 * The protected columns of a table the gap check can compare: columns of
 * at least two named groups that the model does not use.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { gapCandidates } from "./gap_step.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }), { target: "base_pay_eur" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * const [gender, ...others] = gapCandidates(model, table);
 * assert.deepEqual(others, []);
 * assert.equal(gender.name, "gender");
 * assert.equal(gender.groups.reduce((n, g) => n + g.people, 0), 120);
 * ```
 */
export function gapCandidates(model: Model, table: Table): GapCandidate[] {
  if (model.target.kind !== "regression") return [];
  const used = new Set(model.features.map((f) => f.name));
  return table.columns.flatMap((c) => {
    if (!c.protected || used.has(c.name) || (c.type !== "categorical" && c.type !== "ordinal")) {
      return [];
    }
    const people = new Array<number>(c.levels.length).fill(0);
    for (const code of c.codes) if (code >= 0) people[code]++;
    const groups = c.levels.map((name, i) => ({ name, people: people[i] }))
      .filter((g) => g.people > 0);
    return groups.length >= 2 ? [{ name: c.name, groups }] : [];
  });
}

/**
 * Offers the gap check; returns its report when one was shown (for the
 * session report), else null. A problem is said, and the flow goes on.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { makeStyle } from "../render/style.ts";
 * import type { Choice, FlowIO } from "./flow_io.ts";
 * import { offerGapCheck } from "./gap_step.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }), { target: "base_pay_eur" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * // A flow I/O that takes each question's default: here "No" (the check itself,
 * // 200 trees twice, is shown by paygrove gap's example with fewer trees).
 * const offered: Choice<unknown>[][] = [];
 * const io: FlowIO = {
 *   say: () => {}, style: makeStyle(false), width: 80, ascii: false,
 *   choose: (_m, choices, d) => (offered.push(choices), Promise.resolve(d ?? choices[0].value)),
 *   tick: () => Promise.resolve([]),
 *   ask: () => Promise.resolve(""),
 * };
 * const report = await offerGapCheck(io, model, { table, path: "pay.csv" }, { currency: "EUR" });
 * assert.equal(report, null);
 * assert.deepEqual(offered[0].map((c) => c.name), ["Yes, by gender", "No, go on to a profile"]);
 * ```
 */
export async function offerGapCheck(
  io: FlowIO,
  model: Model,
  source: TableSource,
  numbers: NumberStyle,
): Promise<GapReport | null> {
  const table = source.table;
  const candidates = gapCandidates(model, table);
  if (candidates.length === 0) return null;
  const group = await io.choose(
    "Check for pay gaps between groups first?",
    [
      ...candidates.map((c) => ({
        name: `Yes, by ${c.name}`,
        value: c.name,
        description: `${c.groups.map((g) => g.name).join(", ")}: raw and unexplained gaps per ` +
          `category of workers (${c.name} stays out of the model)`,
      })),
      { name: "No, go on to a profile", value: "" },
    ],
    "",
  );
  if (group === "") return null;
  const groups = candidates.find((c) => c.name === group)!.groups;
  const counts = new Map(groups.map((g) => [g.name, g.people]));
  const { reference } = chooseReference(group, counts);
  const others = groups.filter((g) => g.name !== reference)
    .sort((a, b) => b.people - a.people);
  let compare: string[] | undefined;
  if (others.length > 1) {
    // One group at a time by default: a small group would hide every
    // category where it has fewer people than the privacy minimum.
    const chosen = await io.choose(
      `Compare which group with ${reference} (the reference)?`,
      [
        // A group below the privacy minimum is never compared, and its size
        // is not told (lib/gap/gap_check.ts).
        ...others.map((g) =>
          g.people >= model.settings.privacyMin
            ? { name: `${g.name} (${formatNumber(g.people, numbers, 0)} people)`, value: g.name }
            : {
              name: `${g.name} (too few to report)`,
              value: g.name,
              disabled: `fewer than ${model.settings.privacyMin} people`,
            }
        ),
        {
          name: "All of them at once",
          value: "",
          description: `a category is hidden where any group has fewer than ` +
            `${model.settings.privacyMin} people`,
        },
      ],
      others[0].name,
    );
    compare = chosen === "" ? undefined : [chosen];
  }
  const levelled = model.features.filter((f) => f.kind !== "numeric" && !f.protected);
  const within = await io.choose(
    "Compare within which categories of workers?",
    [
      ...levelled.map((f) => ({ name: f.name, value: f.name })),
      { name: "Everyone together (no categories)", value: "" },
    ],
    levelled[0]?.name ?? "",
  );
  const bar = progressBar({ progress: io.progress, width: io.width });
  let report: GapReport;
  try {
    report = await gapCheck(table, {
      target: model.target.name,
      group,
      compare,
      within: within === "" ? [] : [within],
      features: model.features.filter((f) => !f.protected).map((f) => f.name),
      privacyMin: model.settings.privacyMin,
      seed: model.settings.seed,
      onProgress: (stage, done, total) => bar.update(stage, done, total),
    });
  } catch (error) {
    if (!(error instanceof OptionError || error instanceof DataError)) throw error;
    io.say(
      io.style.warn(`! The gap check could not run: ${terminalGuard(errorWords(error), false)}`),
    );
    return null;
  } finally {
    bar.finish();
  }
  // Relative to here when it can be, so the line is short enough to copy.
  const here = `${Deno.cwd()}/`;
  const path = source.path.startsWith(here) ? source.path.slice(here.length) : source.path;
  const command = `paygrove gap ${path} --target ${model.target.name} --group ${group}` +
    (compare ? ` --groups ${compare.join(",")}` : "") + (within ? ` --within ${within}` : "");
  io.say(
    [
      "",
      ...wrapAnsi(io.style.dim(GAP_CAUTIONS), io.width).split("\n"),
      "",
      ...renderGap(forTerminal(report), { style: io.style, width: io.width, numbers, brief: true }),
      ...wrapAnsi(
        io.style.dim(
          "Saving a report at the end includes this check. Quartiles, the linear version and " +
            "sources, on the command line (add --report FILE for Markdown):",
        ),
        io.width,
      ).split("\n"),
      // Broken with shell line continuations, so it can be copied whole.
      ...shellLines(terminalText(command), io.width),
    ].join("\n"),
  );
  return report;
}

/**
 * A command line cut at spaces into lines that fit the width, each but the
 * last ending in a backslash, so a shell reads them as one line.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { shellLines } from "./gap_step.ts";
 * assert.deepEqual(shellLines("paygrove gap t.csv --target pay", 24), [
 *   "  paygrove gap t.csv \\",
 *   "    --target pay",
 * ]);
 * ```
 */
export function shellLines(command: string, width: number): string[] {
  const lines: string[] = [];
  let line = "  ";
  for (const word of command.split(" ")) {
    const indent = lines.length === 0 ? "  " : "    ";
    if (line.trim() !== "" && line.length + 1 + word.length + 2 > width) {
      lines.push(`${line} \\`);
      line = "    " + word;
    } else line = line.trim() === "" ? indent + word : `${line} ${word}`;
  }
  lines.push(line);
  return lines;
}
