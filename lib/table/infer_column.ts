/**
 * One column of cell text -> one typed column.
 *
 * Inference order: a declared type wins; otherwise a column whose every
 * value reads as a number (or pay amount) is numeric, a text column of level
 * names like `L1..L9` is ordinal, a column unique per row (or named as an id
 * and nearly unique) is an identifier, one distinct value is constant, and
 * the rest is categorical.
 *
 * @module
 */

import { DataError, OptionError } from "../errors.ts";
import { type Amount, type DecimalMark, parseAmount } from "./amount.ts";
import { isPayName, periodFromName, settleMoney } from "./money.ts";
import { DEFAULT_MISSING_TOKENS } from "./missing.ts";
import { ladderOrder } from "./ordinal.ts";
import { nameWords } from "./protected_names.ts";
import type { Column, ColumnType, LevelColumn, NumericColumn, PayPeriod } from "./types.ts";

/** The types a user may declare for a column. */
export type DeclaredType = Exclude<ColumnType, "constant">;

/** What {@linkcode inferColumn} needs besides the cells. */
export interface InferColumnOptions {
  /** File name, for messages. */
  file: string;
  /** The file's decimal mark. */
  decimal: DecimalMark;
  /** Test for missing cells. */
  isMissing: (text: string) => boolean;
  /** The texts that mean missing (for messages). */
  missingTokens?: readonly string[];
  /** A type the user declared. */
  type?: DeclaredType;
  /** A level order the user declared (makes the column ordinal). */
  order?: readonly string[];
  /** Whether the column is a protected attribute. */
  protected: boolean;
  /** The currency the user says pay is in. */
  currency?: string;
  /** The pay period the user says the column is in. */
  period?: PayPeriod;
  /** Hours in a working year, to annualise hourly pay. */
  hoursPerYear?: number;
}

// A column is "numeric but for a few values" (and refused, rather than
// silently made categorical) when at most this share of its values fail.
const FEW_FAILURES = 0.05;
// The amount of every present plain number in inferPlainColumn (settleMoney
// reads no value from it).
const PLAIN_AMOUNT: Amount = Object.freeze({ value: NaN });

// Distinct texts counted once each for a column's inference; past this many
// (identifiers, numbers) each cell is asked as it comes.
const DISTINCT_MAX = 65536;
const QUOTED_FAILURES = 5;
const ID_WORDS = new Set(["id", "ids", "identifier", "uuid", "guid", "key", "no", "nr", "number"]);
const NEARLY_UNIQUE = 0.95;
const UNIQUE_MIN_ROWS = 20;
// A level column names rows rather than grouping them when it has more than
// this many levels and more levels than half its rows with a value: then
// most levels hold one or two people, too few for a leaf, and the column
// is free text (names, comments, addresses) rather than a grouping.
const IDENTIFIER_LIKE_LEVELS = 50;

const collator = new Intl.Collator("en", { numeric: true, sensitivity: "variant" });

/**
 * Types one column.
 *
 * @param name Header name.
 * @param cells Trimmed cell text per row.
 * @param lines Source line of each row, for messages.
 * @param counted Each distinct text with its count, in order of first
 *   appearance, where the caller has them (null past `limit` of them).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { inferColumn } from "./infer_column.ts";
 * import { missingTest } from "./missing.ts";
 * const col = inferColumn("level", ["L2", "L10", "L1"], [2, 3, 4], {
 *   file: "t.csv", decimal: ".", isMissing: missingTest(), protected: false,
 * });
 * assert(col.type === "ordinal");
 * ```
 */
export function inferColumn(
  name: string,
  cells: readonly string[],
  lines: ArrayLike<number>,
  options: InferColumnOptions,
  counted?: (limit: number) => Map<string, number> | null,
): Column {
  const { isMissing } = options;
  // Each distinct text once, where there are few (levels): the missing test,
  // the reading as a number and the level codes are then asked of each
  // distinct text, not of each of a million cells. A reader that counted
  // them as the cells came in (CellColumn.distinct) saves counting again.
  const distinct = counted?.(DISTINCT_MAX) ?? distinctTexts(cells);
  let missing = 0;
  if (distinct === undefined) {
    for (const cell of cells) if (isMissing(cell)) missing++;
  } else {
    for (const [text, count] of distinct) if (isMissing(text)) missing += count;
  }
  const base = { name, missing, protected: options.protected, notes: [] as string[] };

  if (options.type === "identifier") return identifier(cells, base, isMissing);
  if (options.order !== undefined || options.type === "ordinal") {
    return levels(name, cells, lines, base, options, "ordinal", distinct);
  }
  if (options.type === "categorical") {
    return levels(name, cells, lines, base, options, undefined, distinct);
  }
  // Text that is no number, tallied over the distinct texts: where the
  // column is levels below, whatever the rows, no per-row reading is needed.
  if (distinct !== undefined && options.type === undefined) {
    let failures = 0;
    const numbers = new Set<number>();
    for (const [text, count] of distinct) {
      if (isMissing(text)) continue;
      const amount = parseAmount(text, options.decimal);
      if (amount === undefined) failures += count;
      else numbers.add(amount.value);
    }
    const present = cells.length - missing;
    const failureShare = failures / Math.max(present, 1);
    const payLike = isPayName(name) && failureShare < 0.5;
    const numbersAfterAll = payLike ||
      (present > 0 && failureShare <= FEW_FAILURES && numbers.size >= 5);
    if (failures > 0 && !numbersAfterAll) {
      return levels(name, cells, lines, base, options, undefined, distinct);
    }
  }

  const parsed = readNumbers(cells, options);
  const present = cells.length - missing;
  // Declared numeric and nothing but numbers or missing cells (possibly
  // every cell missing, as for new hires' ratings in a file of candidates).
  if (parsed.failures.length === 0 && options.type === "numeric") {
    return numeric(name, parsed, lines, base, options);
  }
  if (parsed.failures.length === 0 && present > 0) {
    if (options.type !== "numeric" && looksLikeNumericId(name, parsed.values, present)) {
      return identifier(cells, base, isMissing);
    }
    return numeric(name, parsed, lines, base, options);
  }
  const failureShare = parsed.failures.length / Math.max(present, 1);
  const distinctNumbers = new Set(parsed.values.filter((v) => !Number.isNaN(v))).size;
  // A column named as pay that is mostly numbers must be numbers: its stray
  // text is quoted back rather than the pay becoming levels or identifiers.
  const payLike = options.type === undefined && isPayName(name) && failureShare < 0.5;
  if (
    options.type === "numeric" || payLike ||
    (present > 0 && failureShare <= FEW_FAILURES && distinctNumbers >= 5)
  ) {
    throw notNumbers(name, parsed.failures, lines, options, cells);
  }
  return levels(name, cells, lines, base, options);
}

/**
 * The same as {@linkcode inferColumn} for a column whose every cell was a
 * plain number or missing (as {@linkcode CellColumn} keeps them), without
 * the text of each cell: numeric, or a numeric identifier, or constant.
 * Returns undefined where the full inference is needed (a declared
 * non-numeric type, a decimal comma, or no number at all); the caller then
 * passes the texts to `inferColumn`.
 *
 * @param values The numbers, NaN where missing.
 * @param texts The cells' texts, asked for only when the column is an identifier.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { inferPlainColumn } from "./infer_column.ts";
 * import { missingTest } from "./missing.ts";
 * const options = { file: "t.csv", decimal: "." as const, isMissing: missingTest(), protected: false };
 * const values = Float64Array.of(30, NaN, 41, 52);
 * const col = inferPlainColumn("age", values, [2, 3, 4, 5], options, () => []);
 * // Three numbers and one missing cell: numeric, the values kept as given.
 * assert(col?.type === "numeric");
 * assert.equal(col.missing, 1);
 * assert.deepEqual([...col.values], [30, NaN, 41, 52]);
 * // A decimal comma, or no number at all, needs the full inference.
 * assert.equal(inferPlainColumn("age", values, [2, 3, 4, 5], { ...options, decimal: "," }, () => []), undefined);
 * assert.equal(inferPlainColumn("age", Float64Array.of(NaN), [2], options, () => []), undefined);
 * ```
 */
export function inferPlainColumn(
  name: string,
  values: Float64Array,
  lines: ArrayLike<number>,
  options: InferColumnOptions,
  texts: () => readonly string[],
): Column | undefined {
  if (options.decimal !== "." || options.order !== undefined) return undefined;
  if (options.type !== undefined && options.type !== "numeric") return undefined;
  let missing = 0;
  for (let r = 0; r < values.length; r++) if (Number.isNaN(values[r])) missing++;
  const present = values.length - missing;
  if (present === 0) return undefined;
  const base = { name, missing, protected: options.protected, notes: [] as string[] };
  if (options.type !== "numeric" && looksLikeNumericId(name, values, present)) {
    return identifier(texts(), base, options.isMissing);
  }
  // Plain numbers carry no currency or period: amounts only for settleMoney's
  // count, which asks of each row only whether it has an amount and its
  // currency and period. One shared amount with none of them stands for
  // every present row: an object per row was a million objects for pay.
  const amounts: (Amount | undefined)[] = [];
  if (isPayName(name) || options.period !== undefined) {
    for (let r = 0; r < values.length; r++) {
      amounts.push(Number.isNaN(values[r]) ? undefined : PLAIN_AMOUNT);
    }
  }
  return numeric(name, { values, amounts, failures: [], money: false }, lines, base, options);
}

interface ParsedNumbers {
  values: Float64Array;
  amounts: (Amount | undefined)[];
  failures: number[];
  money: boolean;
}

function readNumbers(cells: readonly string[], options: InferColumnOptions): ParsedNumbers {
  const values = new Float64Array(cells.length);
  const amounts: (Amount | undefined)[] = new Array(cells.length);
  const failures: number[] = [];
  let money = false;
  // Each distinct text is parsed once (a column of levels repeats a few).
  const seen = new Map<string, Amount | undefined>();
  for (let r = 0; r < cells.length; r++) {
    if (options.isMissing(cells[r])) {
      values[r] = NaN;
      continue;
    }
    let amount: Amount | undefined;
    if (seen.has(cells[r])) amount = seen.get(cells[r]);
    else {
      amount = parseAmount(cells[r], options.decimal);
      if (seen.size < 65536) seen.set(cells[r], amount);
    }
    if (amount === undefined) {
      values[r] = NaN;
      failures.push(r);
      continue;
    }
    amounts[r] = amount;
    values[r] = amount.value;
    if (amount.currency !== undefined || amount.period !== undefined) money = true;
  }
  return { values, amounts, failures, money };
}

function notNumbers(
  name: string,
  failures: readonly number[],
  lines: ArrayLike<number>,
  options: InferColumnOptions,
  cells: readonly string[],
): DataError {
  const shown = failures.slice(0, QUOTED_FAILURES)
    .map((r) => `line ${lines[r]} has "${printable(cells[r])}"`)
    .join(", ");
  const more = failures.length > QUOTED_FAILURES
    ? `, and ${failures.length - QUOTED_FAILURES} more`
    : "";
  const otherDecimal: DecimalMark = options.decimal === "." ? "," : ".";
  const commaHint = failures.every((r) => parseAmount(cells[r], otherDecimal) !== undefined)
    ? `; the values read as numbers with {decimal} "${otherDecimal}"`
    : "";
  // A letter O or l among digits is a common typing slip ("85,0OO").
  const slip = failures.some((r) => /\d[oOlI]|[oOlI]\d/.test(cells[r]))
    ? "; a letter O or l typed for a digit?"
    : "";
  const hint = options.type === "numeric" || isPayName(name)
    ? ""
    : `; if the column is not numeric, declare it with {type} ${name}=categorical`;
  const tokens = ["empty", ...(options.missingTokens ?? DEFAULT_MISSING_TOKENS)];
  const said = tokens.length > 1
    ? `${tokens.slice(0, -1).join(", ")} or ${tokens[tokens.length - 1]}`
    : tokens[0];
  return new DataError(
    `${options.file}: ${name}: ${shown}${more}, not a number` +
      `${commaHint}${slip}${hint} (missing values may be written as ${said})`,
    { file: options.file, line: lines[failures[0]], column: name },
  );
}

// Control characters and very long cells are shortened in messages so that
// one line of output stays one line.
function printable(text: string): string {
  // deno-lint-ignore no-control-regex
  const clean = text.replace(/[\u0000-\u001f\u007f]/g, "?");
  return clean.length > 40 ? `${clean.slice(0, 37)}...` : clean;
}

function looksLikeNumericId(name: string, values: Float64Array, present: number): boolean {
  if (!nameWords(name).some((w) => ID_WORDS.has(w))) return false;
  const distinct = new Set<number>();
  for (const v of values) {
    if (Number.isNaN(v)) continue;
    if (!Number.isInteger(v)) return false;
    distinct.add(v);
  }
  return distinct.size >= NEARLY_UNIQUE * present;
}

type Base = { name: string; missing: number; protected: boolean; notes: string[] };

function numeric(
  name: string,
  parsed: ParsedNumbers,
  lines: ArrayLike<number>,
  base: Base,
  options: InferColumnOptions,
): Column {
  // One distinct value or none? (Two found ends the search.)
  let first = NaN;
  let several = false;
  for (const v of parsed.values) {
    if (Number.isNaN(v)) continue;
    if (Number.isNaN(first)) first = v;
    else if (v !== first) {
      several = true;
      break;
    }
  }
  // A column declared numeric stays numeric even with one value (a file of
  // one profile, or offers that are all the same).
  if (!several && options.type !== "numeric") {
    return constant(base, Number.isNaN(first) ? undefined : String(first));
  }
  const column: NumericColumn = { ...base, type: "numeric", values: parsed.values };
  if (parsed.money || isPayName(name) || options.period !== undefined) {
    const settled = settleMoney(parsed.values, parsed.amounts, lines, {
      column: name,
      file: options.file,
      currency: options.currency,
      defaultPeriod: options.period ?? periodFromName(name),
      hoursPerYear: options.hoursPerYear,
    });
    column.money = settled.unit;
    column.notes.push(...settled.notes);
  }
  return column;
}

function constant(base: Base, value: string | undefined): Column {
  const note = value === undefined
    ? "every value is missing; left out of models"
    : `every value is "${value}"; left out of models`;
  const column: Column = { ...base, type: "constant", notes: [...base.notes, note] };
  if (value !== undefined) column.value = value;
  return column;
}

function identifier(cells: readonly string[], base: Base, isMissing: (t: string) => boolean) {
  const values = cells.map((c) => (isMissing(c) ? "" : c));
  return {
    ...base,
    type: "identifier" as const,
    values,
    notes: [...base.notes, "names rows; never used as a feature"],
  };
}

// Each distinct text of the cells with its count, in order of first
// appearance; undefined past DISTINCT_MAX of them (identifiers, numbers).
function distinctTexts(cells: readonly string[]): Map<string, number> | undefined {
  const counts = new Map<string, number>();
  for (const cell of cells) {
    const count = counts.get(cell);
    if (count !== undefined) counts.set(cell, count + 1);
    else if (counts.size === DISTINCT_MAX) return undefined;
    else counts.set(cell, 1);
  }
  return counts;
}

function levels(
  name: string,
  cells: readonly string[],
  lines: ArrayLike<number>,
  base: Base,
  options: InferColumnOptions,
  forced?: "ordinal",
  distinct?: Map<string, number>,
): Column {
  // The present levels with their counts, in order of first appearance.
  let counts = new Map<string, number>();
  if (distinct === undefined) {
    for (const cell of cells) {
      if (!options.isMissing(cell)) counts.set(cell, (counts.get(cell) ?? 0) + 1);
    }
  } else {
    counts = new Map([...distinct].filter(([text]) => !options.isMissing(text)));
  }
  const present = cells.length - base.missing;
  if (forced === undefined && options.type === undefined) {
    if (counts.size <= 1) return constant(base, [...counts.keys()][0]);
    const idName = nameWords(name).some((w) => ID_WORDS.has(w));
    const unique = counts.size >= NEARLY_UNIQUE * present;
    if (unique && (idName || present >= UNIQUE_MIN_ROWS)) {
      return identifier(cells, base, options.isMissing);
    }
  }
  let order: string[];
  let type: LevelColumn["type"] = "categorical";
  if (options.order !== undefined) {
    order = checkOrder(name, options.order, counts, cells, lines, options);
    type = "ordinal";
  } else {
    const ladder = ladderOrder([...counts.keys()]);
    if (ladder !== undefined && options.type !== "categorical") {
      order = ladder;
      type = "ordinal";
      base.notes.push(`ordered by the number in each level: ${ladder.join(" < ")}`);
    } else {
      order = [...counts.keys()].sort((a, b) => collator.compare(a, b) || (a < b ? -1 : 1));
      if (forced === "ordinal") {
        throw new OptionError(
          `{type} ${name}=ordinal needs an order: give {order} ${name}=${order.join(",")} ` +
            `with the levels lowest first`,
        );
      }
    }
  }
  const index = new Map(order.map((level, i) => [level, i]));
  const codes = new Int32Array(cells.length);
  if (distinct === undefined) {
    for (let r = 0; r < cells.length; r++) {
      codes[r] = options.isMissing(cells[r]) ? -1 : index.get(cells[r])!;
    }
  } else {
    // Every distinct text's code (missing -1), then one look-up per cell.
    for (const text of distinct.keys()) if (options.isMissing(text)) index.set(text, -1);
    for (let r = 0; r < cells.length; r++) codes[r] = index.get(cells[r])!;
  }
  const column: LevelColumn = { ...base, type, codes, levels: order };
  const inferred = forced === undefined && options.type === undefined &&
    options.order === undefined;
  if (inferred && counts.size > IDENTIFIER_LIKE_LEVELS && 2 * counts.size > present) {
    column.identifierLike = { levels: counts.size, rows: present };
  }
  return column;
}

function checkOrder(
  name: string,
  order: readonly string[],
  counts: Map<string, number>,
  cells: readonly string[],
  lines: ArrayLike<number>,
  options: InferColumnOptions,
): string[] {
  const declared = new Set(order);
  if (declared.size !== order.length) {
    throw new OptionError(`{order} ${name}: a level is listed twice`);
  }
  const unknown = [...counts.keys()].filter((level) => !declared.has(level));
  if (unknown.length > 0) {
    const where = unknown.slice(0, 5).map((level) => {
      const r = cells.findIndex((c) => c === level && !options.isMissing(c));
      return `"${level}" (line ${lines[r]})`;
    });
    throw new OptionError(
      `{order} ${name}: the data has level${unknown.length === 1 ? "" : "s"} not in the order: ` +
        `${where.join(", ")}${unknown.length > 5 ? ` and ${unknown.length - 5} more` : ""}`,
    );
  }
  return [...order];
}
