/**
 * CSV bytes or text -> a typed {@linkcode Table}: the one entry point of the
 * data layer. Either the whole table loads or an error says why; nothing is
 * half-loaded.
 *
 * @module
 */

import { createHash } from "node:crypto";
import { DataError, OptionError } from "../errors.ts";
import { matchName, unknownColumn } from "./column_named.ts";
import { type DecimalMark, parseAmount } from "./amount.ts";
import { type DeclaredType, inferColumn, inferPlainColumn } from "./infer_column.ts";
import { type DecimalMarkReading, judgeDecimalMark } from "./decimal_mark.ts";
import { DEFAULT_MISSING_TOKENS, missingTest, missingTestAt } from "./missing.ts";
import { applyFte, isPayName } from "./money.ts";
import { isProtectedName } from "./protected_names.ts";
import { findQualityWarnings } from "./quality.ts";
import { ChunkDecoder, CsvColumnsReader, describeDelimiter, type ReadColumns } from "./read_csv.ts";
import type { Column, PayPeriod, QualityWarning, Table } from "./types.ts";

/** What the target column must be. */
export type TargetKind = "numeric" | "class";

/** Options of {@linkcode loadTable}; every field is optional. */
export interface LoadTableOptions {
  /** File name used in messages. */
  file?: string;
  /** Field delimiter; detected among comma, semicolon and tab when not given. */
  delimiter?: string;
  /**
   * Decimal mark of numbers in the file.
   * @default {"."}
   */
  decimal?: DecimalMark;
  /**
   * Text encoding (WHATWG label) of byte input.
   * @default {"utf-8"}
   */
  encoding?: string;
  /**
   * Cell texts meaning "missing", besides the empty cell.
   * @default DEFAULT_MISSING_TOKENS
   */
  missing?: readonly string[];
  /** Declared column types, by column name. */
  types?: Readonly<Record<string, DeclaredType>>;
  /** Declared level orders (lowest first), by column name; makes the column ordinal. */
  orders?: Readonly<Record<string, readonly string[]>>;
  /** Further columns to treat as protected attributes. */
  protected?: readonly string[];
  /** The column to be predicted; rows where it is missing are left out. */
  target?: string;
  /** What the target must be: numeric (pay) or a class (e.g. level). */
  targetKind?: TargetKind;
  /** ISO 4217 code of the pay columns, e.g. `"EUR"`. */
  currency?: string;
  /** Hours in a working year, to annualise hourly pay. */
  hoursPerYear?: number;
  /** Column of full-time-equivalent fractions; pay columns are divided by it. */
  fte?: string;
  /** Pay period of money columns whose cells do not say it, by column name. */
  periods?: Readonly<Record<string, PayPeriod>>;
}

/**
 * Loads a pay table from CSV bytes (decoded with `options.encoding`) or text.
 *
 * @throws {DataError} when the data cannot be used (the message names file,
 * line and column).
 * @throws {OptionError} when an option does not fit the data (e.g. an
 * unknown column name; the message lists the columns there are).
 *
 * @example Loading a small table
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "./load_table.ts";
 * const table = loadTable("id,level,pay\na1,L2,\"$85,000\"\na2,L1,\"$61,500\"\n", {
 *   types: { id: "identifier" },
 * });
 * const pay = table.columns[2];
 * assert(pay.type === "numeric" && pay.values[0] === 85000);
 * assert(pay.type === "numeric" && pay.money?.currency === "USD");
 * ```
 */
export function loadTable(input: Uint8Array | string, options: LoadTableOptions = {}): Table {
  const file = options.file ?? "input";
  const reader = tableReader(options);
  const raw8 = typeof input === "string" ? new TextEncoder().encode(input) : input;
  // The fingerprint that ties a saved model and every output to this input.
  const sha256 = createHash("sha256").update(raw8).digest("hex");
  if (typeof input === "string") reader.push(input);
  else reader.push(new ChunkDecoder(options.encoding ?? "utf-8", file).decode(input, true));
  return buildTable(reader.end(), options, { bytes: raw8.length, sha256 });
}

/**
 * Loads a pay table from bytes arriving in chunks (a file read piece by
 * piece): the same table as {@linkcode loadTable} on the whole input, built
 * without holding the text or the rows, so a million-row file fits in
 * memory several times smaller than its cells as strings.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable, loadTableChunks } from "./load_table.ts";
 * const bytes = new TextEncoder().encode("level,pay\nL1,50\nL2,61\nL2,60\n");
 * const chunks = [bytes.subarray(0, 7), bytes.subarray(7, 20), bytes.subarray(20)];
 * async function* each() { yield* chunks; }
 * const table = await loadTableChunks(each(), { target: "pay" });
 * assert.deepEqual(table, loadTable(bytes, { target: "pay" }));
 * ```
 */
export async function loadTableChunks(
  chunks: AsyncIterable<Uint8Array>,
  options: LoadTableOptions = {},
): Promise<Table> {
  const file = options.file ?? "input";
  const reader = tableReader(options);
  const decoder = new ChunkDecoder(options.encoding ?? "utf-8", file);
  const hash = createHash("sha256");
  let bytes = 0;
  for await (const chunk of chunks) {
    hash.update(chunk);
    bytes += chunk.length;
    reader.push(decoder.decode(chunk));
  }
  reader.push(decoder.decode(new Uint8Array(0), true));
  return buildTable(reader.end(), options, { bytes, sha256: hash.digest("hex") });
}

function tableReader(options: LoadTableOptions): CsvColumnsReader {
  return new CsvColumnsReader({
    file: options.file ?? "input",
    delimiter: options.delimiter,
    isMissing: missingTest(options.missing ?? DEFAULT_MISSING_TOKENS),
    isMissingAt: missingTestAt(options.missing ?? DEFAULT_MISSING_TOKENS),
  });
}

// The read columns -> the typed table: target rows, inference, checks, warnings.
function buildTable(
  raw: ReadColumns,
  options: LoadTableOptions,
  source: { bytes: number; sha256: string },
): Table {
  const file = options.file ?? "input";
  const nameMatches: { option: string; asked: string; name: string }[] = [];
  options = resolveOptionColumns(raw.header, options, nameMatches);
  if (options.hoursPerYear !== undefined && !(options.hoursPerYear > 0)) {
    throw new OptionError(`{hoursPerYear} must be a positive number of hours`);
  }
  const isMissing = missingTest(options.missing ?? DEFAULT_MISSING_TOKENS);
  // The mark given, else the one the cells settle (semicolon files only).
  const decimal: DecimalMarkReading = options.decimal !== undefined
    ? { mark: options.decimal, how: "given" }
    : judgeDecimalMark(numberLikeCells(raw), raw.delimiter);

  let lines = raw.lines;
  const excludedLines: number[] = [];
  if (options.target !== undefined) {
    const target = raw.columns[raw.header.indexOf(options.target)];
    const plain = target.plain;
    const texts = plain === null ? target.texts() : null;
    const keep: number[] = [];
    for (let r = 0; r < lines.length; r++) {
      if (plain !== null ? Number.isNaN(plain[r]) : isMissing(texts![r])) {
        excludedLines.push(lines[r]);
      } else keep.push(r);
    }
    if (excludedLines.length > 0) {
      for (const column of raw.columns) column.keep(keep);
      lines = keep.map((r) => lines[r]);
    }
    if (lines.length === 0) {
      throw new DataError(`${file}: the target "${options.target}" is missing on every row`, {
        file,
        column: options.target,
      });
    }
  }

  // A target named as pay must be numeric, so stray text is quoted back
  // rather than turning the column into levels.
  const targetKind = options.targetKind ??
    (options.target !== undefined && isPayName(options.target) ? "numeric" : undefined);
  const userProtected = new Set(options.protected ?? []);
  const columns = raw.header.map((name, c) => {
    const infer = {
      file,
      decimal: decimal.mark,
      isMissing,
      missingTokens: options.missing ?? DEFAULT_MISSING_TOKENS,
      // A pay target is declared numeric so that stray text is quoted back.
      type: options.types?.[name] ??
        (name === options.target && targetKind === "numeric" ? "numeric" as const : undefined),
      order: options.orders?.[name],
      protected: userProtected.has(name) || isProtectedName(name),
      currency: options.currency,
      period: options.periods?.[name],
      hoursPerYear: options.hoursPerYear,
    };
    const cells = raw.columns[c];
    const plain = cells.plain;
    const typed = plain === null
      ? undefined
      : inferPlainColumn(name, plain.slice(), lines, infer, () => cells.texts());
    return typed ??
      inferColumn(name, cells.texts(), lines, infer, (limit) => cells.distinct(limit));
  });

  const notes = [`delimiter: ${describeDelimiter(raw.delimiter)}`];
  if (decimal.how === "detected" && decimal.mark === ",") {
    notes.push(`decimal mark: comma, read from cells such as "${decimal.example}"`);
  } else if (decimal.how === "ambiguous") {
    notes.push(
      `decimal mark: point, though the file does not settle it (cells such as ` +
        `"${decimal.example}" read differently with a comma)`,
    );
  }
  if (options.fte !== undefined) applyFteToPay(columns, options.fte, lines, file);
  if (options.target !== undefined) {
    checkTarget(columns[raw.header.indexOf(options.target)], targetKind, file);
  }
  const lineArray = Int32Array.from(lines);
  const table: Table = {
    rows: lines.length,
    columns,
    lines: lineArray,
    excluded: { count: excludedLines.length, lines: excludedLines.slice(0, 10) },
    warnings: [],
    notes,
    source: { file: options.file, delimiter: raw.delimiter, ...source, decimal },
  };
  if (options.target !== undefined) table.target = options.target;
  if (nameMatches.length > 0) table.nameMatches = nameMatches;
  if (excludedLines.length > 0) {
    notes.push(
      `${excludedLines.length} row${excludedLines.length === 1 ? "" : "s"} left out: ` +
        `the target "${options.target}" is missing (first on line ${excludedLines[0]})`,
    );
  }
  table.warnings = findQualityWarnings(table);
  const misread = decimalMarkWarning(columns, decimal.mark);
  if (misread) table.warnings.unshift(misread);
  return table;
}

// Each column's distinct number-like texts, one after another.
function* numberLikeCells(raw: ReadColumns): Iterable<string> {
  for (const column of raw.columns) yield* column.numberLikeTexts();
}

// The columns the options name, each matched exactly or else without case
// (the match recorded); an unknown one is an UnknownNameError with the nearest.
function resolveOptionColumns(
  header: readonly string[],
  options: LoadTableOptions,
  matches: { option: string; asked: string; name: string }[],
): LoadTableOptions {
  const resolve = (option: string, asked: string): string => {
    const match = matchName(asked, header);
    if (match.kind === "unknown") throw unknownColumn(option, asked, header);
    if (match.kind === "case") matches.push({ option, asked, name: match.name });
    return match.name;
  };
  const keys = <V>(record: Readonly<Record<string, V>> | undefined, option: string) =>
    record === undefined
      ? undefined
      : Object.fromEntries(Object.entries(record).map(([name, v]) => [resolve(option, name), v]));
  const resolved: LoadTableOptions = { ...options };
  if (options.target !== undefined) resolved.target = resolve("target", options.target);
  if (options.fte !== undefined) resolved.fte = resolve("fte", options.fte);
  if (options.types !== undefined) resolved.types = keys(options.types, "type");
  if (options.orders !== undefined) resolved.orders = keys(options.orders, "order");
  if (options.periods !== undefined) resolved.periods = keys(options.periods, "period");
  if (options.protected !== undefined) {
    resolved.protected = options.protected.map((name) => resolve("protected", name));
  }
  return resolved;
}

function applyFteToPay(columns: Column[], fteName: string, lines: number[], file: string) {
  const fte = columns.find((c) => c.name === fteName)!;
  if (fte.type !== "numeric") {
    throw new OptionError(`{fte} ${fteName}: the column is ${fte.type}, not numeric fractions`);
  }
  const pay = columns.filter((c) => c.type === "numeric" && c.money && c !== fte);
  if (pay.length === 0) {
    throw new OptionError(
      `{fte} ${fteName}: no pay column found to adjust (name one with pay, salary or wage in ` +
        `its name, or write amounts with a currency)`,
    );
  }
  for (const column of pay) {
    if (column.type !== "numeric") continue;
    const result = applyFte(column.values, fte.values, lines, {
      pay: column.name,
      fte: fteName,
      file,
    });
    column.missing += result.madeMissing;
    column.notes.push(
      `made full-time-equivalent: divided by "${fteName}"${result.percent ? " / 100" : ""}` +
        (result.madeMissing > 0 ? ` (${result.madeMissing} left missing: no fraction)` : ""),
    );
  }
}

function checkTarget(column: Column, kind: TargetKind | undefined, file: string): void {
  const where = { file, column: column.name };
  let distinct = 2;
  if (column.type === "numeric") {
    // Fewer than two distinct values? (Stops at the second.)
    const values = column.values;
    let first = NaN;
    distinct = 0;
    for (let r = 0; r < values.length && distinct < 2; r++) {
      const v = values[r];
      if (Number.isNaN(v)) continue;
      if (distinct === 0) {
        first = v;
        distinct = 1;
      } else if (v !== first) distinct = 2;
    }
  }
  if (column.type === "constant" || distinct < 2) {
    throw new DataError(
      `${file}: the target "${column.name}" has fewer than 2 distinct values; there is nothing ` +
        `to predict`,
      where,
    );
  }
  if (column.type === "identifier") {
    throw new DataError(
      `${file}: the target "${column.name}" is an identifier (a different value on every row)`,
      where,
    );
  }
  if (kind === "numeric" && column.type !== "numeric") {
    throw new DataError(
      `${file}: the target "${column.name}" must be numeric pay, but it is ${column.type} ` +
        `(levels such as "${column.levels.slice(0, 3).join('", "')}")`,
      where,
    );
  }
}

// Columns read as text that would be numbers under the other decimal mark
// (more than half of their levels, and more than under the current mark; a
// stray "TBD" must not hide a pay column): the usual sign of a decimal-comma
// file read without --decimal ",".
// The mark is read from the cells only where they settle it, in semicolon
// files (decimal_mark.ts): "85,000" reads under both marks, and a wrong
// guess would silently divide pay by a thousand.
function decimalMarkWarning(columns: Column[], decimal: DecimalMark): QualityWarning | undefined {
  const other: DecimalMark = decimal === "." ? "," : ".";
  const names = columns
    .filter((c) => {
      if (c.type !== "categorical") return false;
      const underOther = c.levels.filter((level) => parseAmount(level, other) !== undefined).length;
      const underThis = c.levels.filter((level) =>
        parseAmount(level, decimal) !== undefined
      ).length;
      return 2 * underOther > c.levels.length && underOther > underThis;
    })
    .map((c) => c.name);
  if (names.length === 0) return undefined;
  return {
    kind: "decimal-mark",
    count: names.length,
    lines: [],
    message: `${names.map((n) => `"${n}"`).join(", ")} ${
      names.length === 1 ? "reads" : "read"
    } as numbers only with {decimal} "${other}"; without it ${
      names.length === 1 ? "it is" : "they are"
    } treated as text`,
  };
}
