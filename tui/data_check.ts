/**
 * What the library found in a table, in words: columns that look like
 * identifiers, columns with more levels than the split search takes, and
 * why a column was left out of a model. The library returns these as data;
 * this module is where they become sentences, the same in every command.
 *
 * @module
 */

import { errorWords, optionWords } from "./option_words.ts";
import wrapAnsi from "wrap-ansi";
import {
  DataError,
  type DroppedColumn,
  type ImplausiblePay,
  ImplausiblePayError,
  implausibleRule,
  type QualityWarning,
  type SchemaSummary,
  type ScreenedTable,
  screenPay,
  type Table,
} from "../mod.ts";
import type { Style } from "./render/style.ts";

function count(n: number): string {
  return n.toLocaleString("en-US");
}

/**
 * The note on a column that looks like it names rows.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { identifierLikeNote } from "./data_check.ts";
 * assert.equal(
 *   identifierLikeNote("comment", { levels: 250, rows: 300 }),
 *   "looks like an identifier (250 levels in 300 rows); left out of models unless declared " +
 *     "with --type comment=categorical",
 * );
 * ```
 */
export function identifierLikeNote(
  name: string,
  detail: { levels: number; rows: number },
): string {
  return `looks like an identifier (${count(detail.levels)} levels in ${count(detail.rows)} ` +
    `rows); left out of models unless declared with --type ${name}=categorical`;
}

/**
 * A schema summary with the identifier-like note added to such columns'
 * notes, for the text view (the JSON keeps the figures as data).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { describeSchema, loadTable } from "../mod.ts";
 * import { identifierLikeNote, withWordedNotes } from "./data_check.ts";
 * const rows = Array.from({ length: 100 }, (_, i) => `note ${i % 60} x,${50000 + i}`);
 * const table = loadTable(`comment,pay\n${rows.join("\n")}\n`, { target: "pay" });
 * const comment = withWordedNotes(describeSchema(table)).columns[0];
 * assert.equal(comment.notes.at(-1), identifierLikeNote("comment", { levels: 60, rows: 100 }));
 * ```
 */
export function withWordedNotes(summary: SchemaSummary): SchemaSummary {
  return {
    ...summary,
    columns: summary.columns.map((c) =>
      c.identifierLike
        ? { ...c, notes: [...c.notes, identifierLikeNote(c.name, c.identifierLike)] }
        : c
    ),
  };
}

/**
 * Why a column was left out of a model, in a few words.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { droppedReason } from "./data_check.ts";
 * assert.equal(
 *   droppedReason({
 *     name: "team",
 *     reason: "too many levels",
 *     detail: { kind: "too-many-levels", levels: 2000, limit: 1000 },
 *   }),
 *   "2,000 levels; at most 1,000 are split on",
 * );
 * assert.equal(droppedReason({ name: "id", reason: "identifier" }), "identifier");
 * ```
 */
export function droppedReason(dropped: DroppedColumn): string {
  const detail = dropped.detail;
  if (detail?.kind === "too-many-levels") {
    return `${count(detail.levels)} levels; at most ${count(detail.limit)} are split on`;
  }
  if (detail?.kind === "pay") {
    return "pay: pay never explains pay, and a model would show it in its split points";
  }
  if (detail?.kind === "identifier-like") {
    return `looks like an identifier: ${count(detail.levels)} levels in ${count(detail.rows)} rows`;
  }
  return dropped.reason;
}

/** How many data-quality warnings the brief block quotes in full. */
const QUOTED_WARNINGS = 2;

/**
 * The data-quality warnings of a table in brief, for every command that
 * reads one: how many, the first two in full, and `paygrove schema` for
 * the rest. No lines when there are none.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { dataWarningLines } from "./data_check.ts";
 * import { makeStyle } from "./render/style.ts";
 * const lines = dataWarningLines(
 *   [{ kind: "duplicate-row", count: 1, lines: [4], message: "1 row repeats an earlier row (line 4)" }],
 *   "t.csv",
 *   { style: makeStyle(false), width: 80 },
 * );
 * assert.equal(
 *   lines.join(" "),
 *   "! 1 data-quality warning: 1 row repeats an earlier row (line 4). paygrove schema t.csv lists " +
 *     "them with line numbers.",
 * );
 * ```
 */
export function dataWarningLines(
  warnings: readonly QualityWarning[],
  file: string,
  view: { style: Style; width: number },
): string[] {
  if (warnings.length === 0) return [];
  const n = warnings.length;
  const quoted = warnings.slice(0, QUOTED_WARNINGS).map((w) => optionWords(w.message)).join("; ");
  const more = n > QUOTED_WARNINGS ? `; and ${n - QUOTED_WARNINGS} more` : "";
  const text = `! ${n} data-quality warning${n === 1 ? "" : "s"}: ${quoted}${more}. ` +
    `paygrove schema ${file} lists them with line numbers.`;
  return wrapAnsi(text, view.width, { hard: true }).split("\n").map(view.style.warn);
}

/** A pay column to screen, and how (see {@linkcode screenPay}). */
export interface PayCheck {
  /** The column. */
  column: string;
  /** Screen it only when it is money. */
  moneyOnly?: boolean;
  /** Apply the distance from the median (not for variable pay). */
  ratio?: boolean;
}

/**
 * Checks pay columns as fit, gap and review do: implausible pay stops the
 * command with its lines, unless `--drop-implausible` leaves those rows out.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { DataError, loadTable } from "../mod.ts";
 * import { screenPayFlags } from "./data_check.ts";
 * const table = loadTable("pay\n50000\n9e12\n61000\n58000\n", { target: "pay" });
 * const { table: kept, leftOut } = screenPayFlags(table, [{ column: "pay" }], true);
 * assert.equal(kept.rows, 3);
 * assert.deepEqual([leftOut[0].count, leftOut[0].lines], [1, [3]]);
 * assert.throws(() => screenPayFlags(table, [{ column: "pay" }], false), (e: unknown) =>
 *   e instanceof DataError && /pass --drop-implausible to leave such rows out/.test(e.message));
 * ```
 */
export function screenPayFlags(
  table: Table,
  checks: readonly PayCheck[],
  dropImplausible: boolean,
): { table: Table; leftOut: ImplausiblePay[] } {
  const leftOut: ImplausiblePay[] = [];
  let current = table;
  for (const check of checks) {
    let screened: ScreenedTable;
    try {
      screened = screenPay(current, check.column, { ...check, leaveOut: dropImplausible });
    } catch (error) {
      if (!(error instanceof ImplausiblePayError)) throw error;
      throw new DataError(
        `${
          errorWords(error)
        }; correct the table, or pass --drop-implausible to leave such rows out`,
        error.location,
      );
    }
    current = screened.table;
    if (screened.leftOut !== null) leftOut.push(screened.leftOut);
  }
  return { table: current, leftOut };
}

/**
 * The sentence on rows left out by `--drop-implausible`, for every output;
 * `how` says how they came to be left out (the flow asks instead).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { leftOutSentence } from "./data_check.ts";
 * assert.equal(
 *   leftOutSentence({
 *     kind: "implausible-pay", column: "pay", ratio: true, median: 61500, count: 1, rows: [1],
 *     lines: [3], values: [1e308],
 *   }),
 *   '1 row left out (--drop-implausible): its "pay" is more than 10,000 times from the median ' +
 *     "61,500 either way, beyond 10^15, or not finite (line 3).",
 * );
 * ```
 */
export function leftOutSentence(
  leftOut: ImplausiblePay,
  how = " (--drop-implausible)",
): string {
  const many = leftOut.count > 1;
  const shown = leftOut.lines.map(String);
  const lines = leftOut.count > shown.length
    ? `${shown.join(", ")} and ${leftOut.count - shown.length} more`
    : shown.length === 1
    ? shown[0]
    : `${shown.slice(0, -1).join(", ")} and ${shown.at(-1)}`;
  return `${leftOut.count} row${many ? "s" : ""} left out${how}: ` +
    `${many ? "their" : "its"} "${leftOut.column}" is ${implausibleRule(leftOut)} ` +
    `(line${many ? "s" : ""} ${lines}).`;
}

/**
 * The rows left out, for --json: per column, the count and the first lines (no values).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { leftOutJson } from "./data_check.ts";
 * const leftOut = {
 *   kind: "implausible-pay" as const, column: "pay", ratio: true, median: 58000, count: 1,
 *   rows: [1], lines: [3], values: [9e12],
 * };
 * assert.deepEqual(leftOutJson([leftOut]), [{ column: "pay", count: 1, lines: [3] }]);
 * ```
 */
export function leftOutJson(
  leftOut: readonly ImplausiblePay[],
): { column: string; count: number; lines: number[] }[] {
  return leftOut.map((l) => ({ column: l.column, count: l.count, lines: l.lines }));
}

/**
 * The brief block every table-reading command prints before its result:
 * rows left out by --drop-implausible, then the data-quality warnings.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "../mod.ts";
 * import { dataCheckLines, screenPayFlags } from "./data_check.ts";
 * import { makeStyle } from "./render/style.ts";
 * const read = loadTable("pay\n50000\n9e12\n61000\n58000\n", { target: "pay" });
 * const { table, leftOut } = screenPayFlags(read, [{ column: "pay" }], true);
 * const lines = dataCheckLines(table, leftOut, "t.csv", { style: makeStyle(false), width: 200 });
 * assert.match(lines[0], /^1 row left out \(--drop-implausible\): its "pay" is more than 10,000/);
 * assert.equal(lines.at(-1), "");
 * assert.deepEqual(dataCheckLines(table, [], "t.csv", { style: makeStyle(false), width: 80 }), []);
 * ```
 */
export function dataCheckLines(
  table: Table,
  leftOut: readonly ImplausiblePay[],
  file: string,
  view: { style: Style; width: number },
): string[] {
  const lines: string[] = [];
  for (const each of leftOut) {
    lines.push(
      ...wrapAnsi(leftOutSentence(each), view.width, { hard: true }).split("\n").map(
        view.style.warn,
      ),
    );
  }
  lines.push(...dataWarningLines(table.warnings, file, view));
  return lines.length > 0 ? [...lines, ""] : [];
}

// Figures that are NaN by design, anywhere below these keys: permutation
// importance where it is not measured (class targets), and precision or
// recall of a class never predicted or never present. JSON shows them as
// null, the text as "-".
const UNDEFINED_BY_DESIGN = new Set(["permutation", "permutationSd", "precision", "recall"]);

/**
 * Throws a DataError when a figure about to be shown or written is
 * infinite, or NaN where a number is due: the last guard after the pay
 * screen, for values too large (or too alike) to compute with that no
 * earlier check caught. Walks the document with an explicit stack.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { assertFiniteFigures } from "./data_check.ts";
 * assertFiniteFigures({ a: [1, null, { permutation: NaN }], recall: [0.5, NaN] }, "pay");
 * assert.throws(
 *   () => assertFiniteFigures({ quality: { rmse: Infinity } }, "pay"),
 *   /a figure came out infinite or undefined \(quality\.rmse\)/,
 * );
 * ```
 */
export function assertFiniteFigures(doc: unknown, column: string): void {
  // Each entry: the value, its path, and whether NaN is allowed there.
  const stack: [unknown, string, boolean][] = [[doc, "", false]];
  while (stack.length > 0) {
    const [value, path, nanAllowed] = stack.pop()!;
    if (typeof value === "number") {
      if (Number.isFinite(value) || (Number.isNaN(value) && nanAllowed)) continue;
      throw new DataError(
        `a figure came out infinite or undefined (${path}): the values of "${column}" are too ` +
          `large, or too alike, to compute with; check the column (paygrove schema shows its range)`,
        { column },
      );
    }
    if (value === null || typeof value !== "object" || ArrayBuffer.isView(value)) continue;
    for (const [k, v] of Object.entries(value)) {
      stack.push([v, path === "" ? k : `${path}.${k}`, nanAllowed || UNDEFINED_BY_DESIGN.has(k)]);
    }
  }
}
