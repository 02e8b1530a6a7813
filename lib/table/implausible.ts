/**
 * Pay that no plausible pay table holds, and the rows it stands on.
 *
 * A data-quality warning says "worth a look"; these values stop a fit, a
 * gap check and a review, because one of them decides the result: a single
 * pay of 1e308 (a finite number, so finiteness alone misses it) makes a
 * mean gap of 100% and an error of infinity. A value is implausible when
 * it is
 *
 * - not finite (an annualised or FTE-divided value can overflow), or
 * - beyond {@linkcode PAY_CEILING} in size: no year's pay in any currency
 *   reaches it (a judgement, not a statute), and below it squares and sums
 *   of pay over millions of rows stay finite in double precision, or
 * - more than {@linkcode PLAUSIBLE_FACTOR} times from the median of the
 *   column's finite values, either way (zero and negative pay are infinitely
 *   far below a positive median). Pay spreads over a factor of about 10 to
 *   100 in one organisation (part-time hourly to executive); 10^4 leaves
 *   room for units mixed by mistake to show as a data-quality warning
 *   instead (see quality.ts), while catching typing slips of many digits.
 *
 * The library reports the finding as data ({@linkcode ImplausiblePay});
 * the terminal layer words it.
 *
 * @module
 */

import { DataError } from "../errors.ts";
import { subsetRows } from "./filter_rows.ts";
import { quantile } from "./quality.ts";
import type { Table } from "./types.ts";

/**
 * How many times from the column's median a pay value may lie, either way.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "./load_table.ts";
 * import { findImplausiblePay, PLAUSIBLE_FACTOR } from "./implausible.ts";
 * // Median 50,000: up to 10^4 times it is pay; a little beyond is not.
 * const table = (pay: number) => loadTable(`pay\n40000\n50000\n60000\n${pay}\n50000\n`);
 * assert.equal(findImplausiblePay(table(50000 * PLAUSIBLE_FACTOR), "pay"), null);
 * assert.deepEqual(findImplausiblePay(table(50000 * PLAUSIBLE_FACTOR * 1.01), "pay")!.lines, [5]);
 * // Either way: ten-thousand times below the median too.
 * assert.deepEqual(findImplausiblePay(table(4), "pay")!.lines, [5]);
 * ```
 */
export const PLAUSIBLE_FACTOR = 1e4;
/**
 * The largest size of a plausible pay value.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "./load_table.ts";
 * import { findImplausiblePay, PAY_CEILING } from "./implausible.ts";
 * // Close to the median, but beyond any year's pay in any currency.
 * const table = loadTable(`pay\n${PAY_CEILING / 2}\n${PAY_CEILING}\n${2 * PAY_CEILING}\n`);
 * const found = findImplausiblePay(table, "pay")!;
 * assert.deepEqual([found.count, found.lines], [1, [4]]);
 * ```
 */
export const PAY_CEILING = 1e15;

const SHOWN = 5;

/** Implausible pay values of one column. */
export interface ImplausiblePay {
  /** Discriminant. */
  kind: "implausible-pay";
  /** The pay column. */
  column: string;
  /** Whether the distance from the median was part of the rule (not for variable pay). */
  ratio: boolean;
  /** Median of the column's finite values (NaN when there is none). */
  median: number;
  /** How many rows hold an implausible value. */
  count: number;
  /** Every such row (indices into the table's rows). */
  rows: number[];
  /** Source lines of the first few. */
  lines: number[];
  /** Their values, in the same order. */
  values: number[];
}

/**
 * Finds the implausible values of a numeric column, or null when there are
 * none (or the column is not numeric).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "./load_table.ts";
 * import { findImplausiblePay } from "./implausible.ts";
 * const table = loadTable("pay\n50000\n1e308\n61000\n58000\n", { target: "pay" });
 * const found = findImplausiblePay(table, "pay")!;
 * assert(found.count === 1 && found.lines[0] === 3 && found.median === 59500);
 * assert(findImplausiblePay(loadTable("pay\n50000\n61000\n"), "pay") === null);
 * ```
 */
export function findImplausiblePay(
  table: Table,
  column: string,
  ratio = true,
): ImplausiblePay | null {
  const found = table.columns.find((c) => c.name === column);
  if (found === undefined || found.type !== "numeric") return null;
  const values = found.values;
  const finite: number[] = [];
  for (let r = 0; r < values.length; r++) if (Number.isFinite(values[r])) finite.push(values[r]);
  const median = finite.length > 0 ? quantile(Float64Array.from(finite).sort(), 0.5) : NaN;
  const rows: number[] = [];
  for (let r = 0; r < values.length; r++) {
    const v = values[r];
    if (Number.isNaN(v)) continue; // missing
    const implausible = !Number.isFinite(v) || Math.abs(v) > PAY_CEILING ||
      (ratio && median > 0 && (v > median * PLAUSIBLE_FACTOR || v < median / PLAUSIBLE_FACTOR));
    if (implausible) rows.push(r);
  }
  if (rows.length === 0) return null;
  const shown = rows.slice(0, SHOWN);
  return {
    kind: "implausible-pay",
    column,
    ratio,
    median,
    count: rows.length,
    rows,
    lines: shown.map((r) => table.lines[r]),
    values: shown.map((r) => values[r]),
  };
}

/**
 * A pay column holds implausible values (see {@linkcode findImplausiblePay}).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { DataError } from "../errors.ts";
 * import { loadTable } from "./load_table.ts";
 * import { findImplausiblePay, ImplausiblePayError } from "./implausible.ts";
 * // Line 3 (the header is line 1) holds 1e308, beyond the 10^15 ceiling.
 * const table = loadTable("pay\n50000\n1e308\n61000\n", { target: "pay" });
 * const error = new ImplausiblePayError(findImplausiblePay(table, "pay")!, "t.csv");
 * assert(error instanceof DataError);
 * assert.equal(error.finding.count, 1);
 * assert(error.message.startsWith('t.csv: "pay": line 3 has 1e+308; no plausible pay table'));
 * ```
 */
export class ImplausiblePayError extends DataError {
  /** What was found. */
  readonly finding: ImplausiblePay;

  /**
   * @param finding What was found.
   * @param file The file's name, for the message.
   */
  constructor(finding: ImplausiblePay, file: string) {
    const many = finding.count > 1;
    const lines = listOf(finding.lines.map(String), finding.count);
    const values = finding.values.map(String).join(", ").replace(/, ([^,]*)$/, " and $1");
    super(
      `${file}: "${finding.column}": line${many ? "s" : ""} ${lines} ` +
        `${many ? "have" : "has"} ${values}; no plausible pay table holds such ` +
        `${many ? "values" : "a value"} (${implausibleRule(finding)})`,
      { file, line: finding.lines[0], column: finding.column },
    );
    this.finding = finding;
  }
}

/**
 * The rule in words, with the median: "more than 10,000 times from the
 * median 61,500 either way, beyond 10^15, or not finite" (without the
 * median where it was not part of the rule: "beyond 10^15, or not finite").
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { implausibleRule } from "./implausible.ts";
 * assert.equal(implausibleRule({ ratio: false, median: 0 }), "beyond 10^15, or not finite");
 * ```
 */
export function implausibleRule(finding: Pick<ImplausiblePay, "ratio" | "median">): string {
  const median = finding.median;
  if (!finding.ratio) return "beyond 10^15, or not finite";
  const m = Number.isFinite(median)
    ? ` ${Number(median.toPrecision(6)).toLocaleString("en-US")}`
    : "";
  return `more than ${PLAUSIBLE_FACTOR.toLocaleString("en-US")} times from the median${m} ` +
    `either way, beyond 10^15, or not finite`;
}

/** Options of {@linkcode screenPay}. */
export interface ScreenPayOptions {
  /**
   * Leave the rows with implausible pay out instead of refusing the table.
   * @default {false}
   */
  leaveOut?: boolean;
  /**
   * Screen only a money column (a currency or period, or a name such as
   * pay or salary); other numeric targets (a rating, a score) can hold
   * zeros and wide ranges for good reason.
   * @default {false}
   */
  moneyOnly?: boolean;
  /**
   * Apply the distance from the median. Off for variable pay, where zero
   * (no bonus) is common and a few large bonuses are ordinary: then only
   * values beyond 10^15 or not finite are implausible.
   * @default {true}
   */
  ratio?: boolean;
}

/** The table to use, and what was left out of it. */
export interface ScreenedTable {
  /** The table, without the rows of implausible pay when they were left out. */
  table: Table;
  /** What was left out, or null. */
  leftOut: ImplausiblePay | null;
}

/**
 * Checks a pay column before anything is computed from it: refuses a table
 * with implausible pay, or leaves those rows out when asked. Rows left out
 * are counted with the table's excluded rows, so that "rows read" stays
 * the number of rows in the file.
 *
 * @throws {ImplausiblePayError} when implausible pay is found and not left out.
 * @throws {DataError} when every row's pay is implausible.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "./load_table.ts";
 * import { ImplausiblePayError, screenPay } from "./implausible.ts";
 * const table = loadTable("pay\n50000\n1e308\n61000\n", { target: "pay" });
 * assert.throws(() => screenPay(table, "pay"), ImplausiblePayError);
 * const { table: kept, leftOut } = screenPay(table, "pay", { leaveOut: true });
 * assert(kept.rows === 2 && kept.excluded.count === 1 && leftOut!.lines[0] === 3);
 * ```
 */
export function screenPay(
  table: Table,
  column: string,
  options: ScreenPayOptions = {},
): ScreenedTable {
  const pay = table.columns.find((c) => c.name === column);
  if (pay === undefined || pay.type !== "numeric") return { table, leftOut: null };
  if (options.moneyOnly && pay.money === undefined) return { table, leftOut: null };
  const found = findImplausiblePay(table, column, options.ratio ?? true);
  if (found === null) return { table, leftOut: null };
  const file = table.source.file ?? "input";
  if (!options.leaveOut) throw new ImplausiblePayError(found, file);
  if (found.count === table.rows) {
    throw new DataError(
      `${file}: every row's "${column}" is implausible (${implausibleRule(found)}); ` +
        `there is no pay left to work with`,
      { file, column },
    );
  }
  const out = new Set(found.rows);
  const keep: number[] = [];
  for (let r = 0; r < table.rows; r++) if (!out.has(r)) keep.push(r);
  const kept = subsetRows(table, keep, `left out ${found.count} rows of implausible pay`);
  kept.excluded = { ...table.excluded, count: table.excluded.count + found.count };
  return { table: kept, leftOut: found };
}

function listOf(items: string[], total: number): string {
  if (total > items.length) return `${items.join(", ")} and ${total - items.length} more`;
  return items.length === 1 ? items[0] : `${items.slice(0, -1).join(", ")} and ${items.at(-1)}`;
}
