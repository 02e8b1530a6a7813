/**
 * Reading a table for a saved model: read as the training table was read
 * (declared types and level orders, decimal mark, currency), checked against
 * the model's schema (columns, types, levels) with every difference listed,
 * and encoded into the model's feature codes.
 *
 * @module
 */

import { DataError } from "../errors.ts";
import { loadTable, type LoadTableOptions } from "../table/load_table.ts";
import { decodeText, readCsv } from "../table/read_csv.ts";
import { readTableText } from "../table/load_table_file.ts";
import type { Table } from "../table/types.ts";
import type { Model, ReadSettings } from "./types.ts";

/** A table encoded for a model. */
export interface ModelRows {
  /** The table as read. */
  table: Table;
  /** Rows. */
  rows: number;
  /** Per model feature, one value per row (level codes in the model's order). */
  features: Float64Array[];
  /** The identifier of each row ("" without an identifier column). */
  ids: string[];
  /**
   * The column the identifiers come from: the model's identifier column, or
   * else the table's first identifier column; undefined when there is none.
   */
  idColumn?: string;
  /** The target in money per row, when the table has it (NaN where missing). */
  target: Float64Array | null;
  /** The file's header and cell texts as read (`cells[c][r]`), to echo input back. */
  raw: { header: string[]; cells: string[][] };
  /**
   * Rows that cannot be scored (a level the model never saw), in row order;
   * their attribute values are NaN. Only a {@linkcode RowsRefusedError}
   * carries rows with any.
   */
  refused?: RefusedRow[];
}

/** A row a model cannot score, and why. */
export interface RefusedRow {
  /** The row's index (0-based, in table order). */
  row: number;
  /** Its line in the file (1-based, the header is line 1). */
  line: number;
  /** Why, one sentence each. */
  reasons: string[];
}

/**
 * The table matches the model except for levels it never saw in some rows:
 * the whole table is refused (a DataError like any other), and `rows`
 * holds every row read, those that cannot be scored listed in
 * `rows.refused`, for a caller that can score the others (`batch`).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { DataError, RowsRefusedError } from "../../mod.ts";
 * const rows = { rows: 2, refused: [{ row: 1, line: 3, reasons: ["level G9 unknown"] }] };
 * const error = new RowsRefusedError("t.csv does not match", rows as never);
 * assert(error instanceof DataError && error.rows.refused![0].line === 3);
 * ```
 */
export class RowsRefusedError extends DataError {
  /** Every row read, with the refused ones listed. */
  readonly rows: ModelRows;

  /**
   * @param message The whole table's refusal, as a DataError says it.
   * @param rows Every row read.
   * @param file The file's name, for messages.
   */
  constructor(message: string, rows: ModelRows, file?: string) {
    super(message, file === undefined ? {} : { file });
    this.name = "DataError";
    this.rows = rows;
  }
}

/**
 * How to read a table for a model where it differs from how the model's own
 * table was read (the model's settings are the defaults): a file exported
 * another way, say with commas and decimal points in UTF-8.
 */
export type ReadOverrides = Pick<
  LoadTableOptions,
  "delimiter" | "decimal" | "encoding" | "missing" | "currency" | "hoursPerYear" | "fte" | "periods"
>;

/**
 * The model's reading settings with `overrides` put over them.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { readSettingsWith } from "./model_table.ts";
 * import type { ReadSettings } from "./types.ts";
 * const read: ReadSettings = { decimal: ",", encoding: "windows-1252", delimiter: ";", types: {}, orders: {} };
 * const mixed = readSettingsWith(read, { decimal: ".", encoding: "utf-8" });
 * assert.equal(mixed.decimal, ".");
 * assert.equal(mixed.encoding, "utf-8");
 * assert.equal(mixed.delimiter, ";");
 * ```
 */
export function readSettingsWith(read: ReadSettings, overrides: ReadOverrides = {}): ReadSettings {
  const out: ReadSettings = { ...read };
  for (const [key, value] of Object.entries(overrides)) {
    if (value !== undefined) (out as unknown as Record<string, unknown>)[key] = value;
  }
  return out;
}

/**
 * Reads CSV bytes (or text) for a model and encodes them.
 *
 * @param file The file's name, for messages.
 * @param requireTarget Whether the target column must be there.
 * @param amounts Further columns to read as numbers (e.g. offers), when present.
 * @param overrides Reading options that differ from the model's own table's.
 * @throws {DataError} listing the schema differences.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { readForModel, RowsRefusedError } from "./model_table.ts";
 * const model = {
 *   target: { name: "pay" },
 *   read: { decimal: ".", encoding: "utf-8", types: {}, orders: {}, identifier: "id" },
 *   features: [
 *     { name: "site", kind: "categorical", levels: ["North", "South"] },
 *     { name: "years", kind: "numeric" },
 *   ],
 * } as unknown as import("./types.ts").Model;
 * // Columns in another order, a level in other case, a missing number.
 * const rows = readForModel(model, "id,years,site\nA1,3,South\nA2,,North\nA3,7,south\n", "c.csv");
 * assert.equal(rows.rows, 3);
 * assert.deepEqual([...rows.features[0]], [1, 0, 1]); // the model's codes: North 0, South 1
 * assert.deepEqual([...rows.features[1]], [3, NaN, 7]);
 * assert.deepEqual(rows.ids, ["A1", "A2", "A3"]);
 * assert.equal(rows.target, null); // no pay column
 * // A level the model never saw refuses its row (line 3), not the others.
 * try {
 *   readForModel(model, "id,years,site\nA1,3,South\nA2,4,West\n", "c.csv");
 *   assert.fail("West is no level of the model");
 * } catch (e) {
 *   assert(e instanceof RowsRefusedError);
 *   assert.deepEqual(e.rows.refused!.map((x) => [x.row, x.line]), [[1, 3]]);
 * }
 * assert.throws(() => readForModel(model, "id,site\nA1,North\n", "c.csv"), /lacks the column "years"/);
 * ```
 */
export function readForModel(
  model: Model,
  input: Uint8Array | string,
  file: string,
  requireTarget = false,
  amounts: readonly string[] = [],
  overrides: ReadOverrides = {},
): ModelRows {
  const read = readSettingsWith(model.read, overrides);
  const text = typeof input === "string" ? input : decodeText(input, read.encoding, file);
  const raw = readCsv(text, { file, delimiter: read.delimiter });
  const header = raw.header;
  const present = new Set(header);
  const needed = model.features.map((f) => f.name);
  const missingColumns = needed.filter((n) => !present.has(n));
  if (requireTarget && !present.has(model.target.name)) missingColumns.push(model.target.name);
  if (missingColumns.length > 0) {
    throw new DataError(
      `${file} does not match the model: it lacks the column${
        missingColumns.length > 1 ? "s" : ""
      } ` +
        `${missingColumns.map((n) => `"${n}"`).join(", ")} (the model's attributes are ` +
        `${needed.join(", ")})`,
      { file },
    );
  }
  const only = <V>(record: Record<string, V> | undefined) =>
    Object.fromEntries(Object.entries(record ?? {}).filter(([name]) => present.has(name)));
  // Ordinal columns are read as plain levels and matched to the model's by
  // name below, so that an unknown level is listed with the other
  // differences instead of stopping the read.
  const types = Object.fromEntries(
    Object.entries(only(read.types)).map(([n, t]) => [n, t === "ordinal" ? "categorical" : t]),
  );
  const options: LoadTableOptions = {
    file,
    decimal: read.decimal,
    encoding: read.encoding,
    types: {
      ...types,
      ...Object.fromEntries(
        amounts.filter((n) => present.has(n)).map((n) => [n, "numeric" as const]),
      ),
    },
  };
  if (read.delimiter !== undefined) options.delimiter = read.delimiter;
  if (read.missing !== undefined) options.missing = read.missing;
  if (read.currency !== undefined) options.currency = read.currency;
  if (read.hoursPerYear !== undefined) options.hoursPerYear = read.hoursPerYear;
  if (read.fte !== undefined && present.has(read.fte)) options.fte = read.fte;
  if (read.periods !== undefined) options.periods = only(read.periods);
  if (read.protected !== undefined) {
    options.protected = read.protected.filter((n) => present.has(n));
  }
  const table = loadTable(text, options);

  const differences: string[] = [];
  // Unknown levels refuse the rows that hold them; any other difference
  // refuses the whole table.
  let otherDifferences = 0;
  const refusedReasons = new Map<number, string[]>();
  const refuseRow = (r: number, reason: string) => {
    const list = refusedReasons.get(r);
    if (list === undefined) refusedReasons.set(r, [reason]);
    else list.push(reason);
  };
  const features = model.features.map((f) => {
    const column = table.columns.find((c) => c.name === f.name)!;
    if (f.kind === "numeric") {
      if (column.type !== "numeric") {
        otherDifferences++;
        differences.push(`"${f.name}" is ${column.type} here, numeric in the model`);
        return new Float64Array(table.rows);
      }
      return Float64Array.from(column.values);
    }
    if (column.type !== "categorical" && column.type !== "ordinal") {
      // A column of one level reads as constant; its level may still be known.
      if (column.type === "constant") {
        const code = column.value === undefined ? NaN : f.levels!.indexOf(column.value);
        if (code < 0) {
          differences.push(`"${f.name}" has the level "${column.value}", unknown to the model`);
          for (let r = 0; r < table.rows; r++) {
            refuseRow(r, `${f.name} "${column.value}" is a level the model never saw`);
          }
          return new Float64Array(table.rows).fill(NaN);
        }
        return new Float64Array(table.rows).fill(code);
      }
      otherDifferences++;
      differences.push(`"${f.name}" is ${column.type} here, ${f.kind} in the model`);
      return new Float64Array(table.rows);
    }
    // By name; a level differing only in case is the same level (as --set treats it).
    const lower = f.levels!.map((l) => l.toLowerCase());
    const map = column.levels.map((level) => {
      const exact = f.levels!.indexOf(level);
      return exact >= 0 ? exact : lower.indexOf(level.toLowerCase());
    });
    const unseen = column.levels.filter((_, i) => map[i] < 0);
    if (unseen.length > 0) {
      differences.push(
        `"${f.name}" has level${unseen.length > 1 ? "s" : ""} ${
          unseen.map((l) => `"${l}"`).join(", ")
        } ` +
          `the model never saw (it knows ${f.levels!.join(", ")})`,
      );
      column.codes.forEach((code, r) => {
        if (code >= 0 && map[code] < 0) {
          refuseRow(r, `${f.name} "${column.levels[code]}" is a level the model never saw`);
        }
      });
    }
    return Float64Array.from(column.codes, (code) => (code < 0 || map[code] < 0 ? NaN : map[code]));
  });
  const message = `${file} does not match the model's schema:\n  - ${differences.join("\n  - ")}`;
  if (otherDifferences > 0) throw new DataError(message, { file });
  const idColumn = table.columns.find((c) => c.name === read.identifier) ??
    table.columns.find((c) => c.type === "identifier");
  const ids = idColumn?.type === "identifier"
    ? idColumn.values
    : idColumn?.type === "categorical" || idColumn?.type === "ordinal"
    ? Array.from(idColumn.codes, (c) => (c < 0 ? "" : idColumn.levels[c]))
    : new Array<string>(table.rows).fill("");
  const targetColumn = table.columns.find((c) => c.name === model.target.name);
  const target = targetColumn?.type === "numeric" ? Float64Array.from(targetColumn.values) : null;
  const rows: ModelRows = {
    table,
    rows: table.rows,
    features,
    ids,
    ...(idColumn ? { idColumn: idColumn.name } : {}),
    target,
    raw: { header: raw.header, cells: raw.cells },
  };
  if (differences.length > 0) {
    // A refused row is not scored as a row with missing values.
    for (const r of refusedReasons.keys()) for (const values of features) values[r] = NaN;
    rows.refused = [...refusedReasons].sort((a, b) => a[0] - b[0]).map(([row, reasons]) => ({
      row,
      line: raw.lines[row] ?? row + 2,
      reasons,
    }));
    throw new RowsRefusedError(message, rows, file);
  }
  return rows;
}

/**
 * Reads a table file for a model: piece by piece in the model's encoding,
 * at most 256 MiB (`TEXT_TABLE_MAX_BYTES`; an endless or binary input stops
 * at once with a DataError), then as {@linkcode readForModel}.
 *
 * @param amounts Further columns to read as numbers (e.g. offers), when present.
 * @param overrides Reading options that differ from the model's own table's.
 * @throws {DataError} when the file cannot be read or does not match the model.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { readTableFileForModel, rowProfile } from "./model_table.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }));
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * const path = `${Deno.makeTempDirSync()}/candidates.csv`;
 * const text = demoCompanyCsv({ rows: 3, seed: 9 });
 * Deno.writeTextFileSync(path, text);
 * const rows = await readTableFileForModel(model, path);
 * assert.equal(rows.rows, 3);
 * // Encoded to the model's own codes: the second person's level as the file has it.
 * const level = model.features.findIndex((f) => f.name === "level");
 * const cell = text.split("\n")[2].split(",")[2];
 * assert.equal(model.features[level].levels![rowProfile(rows, 1)[level]], cell);
 * Deno.removeSync(path);
 * ```
 */
export async function readTableFileForModel(
  model: Model,
  path: string,
  amounts: readonly string[] = [],
  requireTarget = false,
  overrides: ReadOverrides = {},
): Promise<ModelRows> {
  const text = await readTableText(path, overrides.encoding ?? model.read.encoding);
  return readForModel(model, text, path, requireTarget, amounts, overrides);
}

/**
 * The profile of row `r`.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { rowProfile } from "./model_table.ts";
 * const rows = { features: [Float64Array.of(1, 0, 1), Float64Array.of(3, NaN, 7)] } as unknown as import("./model_table.ts").ModelRows;
 * assert.deepEqual([...rowProfile(rows, 2)], [1, 7]);
 * assert.deepEqual([...rowProfile(rows, 1)], [0, NaN]);
 * ```
 */
export function rowProfile(rows: ModelRows, r: number): Float64Array {
  return Float64Array.from(rows.features, (values) => values[r]);
}

/**
 * The index of the row whose identifier is `id`.
 *
 * @throws {DataError} when the table has no identifier column or no such row.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { findRow } from "./model_table.ts";
 * const model = { target: { name: "pay" }, features: [{ name: "years" }] } as unknown as import("./types.ts").Model;
 * const withIds = { idColumn: "id", ids: ["A1", "A2", "A3"] } as unknown as import("./model_table.ts").ModelRows;
 * assert.equal(findRow(model, withIds, "A3", "c.csv"), 2);
 * assert.throws(() => findRow(model, withIds, "A9", "c.csv"), /has no row with id "A9"/);
 * // Without an identifier column: the one row naming it in a column that is no attribute.
 * const named = {
 *   ids: ["", ""],
 *   raw: { header: ["candidate", "years"], cells: [["Ann", "Bo"], ["3", "5"]] },
 * } as unknown as import("./model_table.ts").ModelRows;
 * assert.equal(findRow(model, named, "Bo", "c.csv"), 1);
 * assert.throws(() => findRow(model, named, "5", "c.csv"), /no row of c.csv is named "5"/);
 * ```
 */
export function findRow(model: Model, rows: ModelRows, id: string, file: string): number {
  if (rows.idColumn !== undefined) {
    const r = rows.ids.indexOf(id);
    if (r < 0) {
      throw new DataError(`{row}: ${file} has no row with ${rows.idColumn} "${id}"`, { file });
    }
    return r;
  }
  // No column reads as identifiers (a short table of candidates, say): the
  // row whose cell in some column that is not an attribute equals the id.
  const attributes = new Set([...model.features.map((f) => f.name), model.target.name]);
  const hits: number[] = [];
  rows.raw.header.forEach((name, c) => {
    if (attributes.has(name)) return;
    rows.raw.cells[c].forEach((cell, r) => {
      if (cell === id) hits.push(r);
    });
  });
  if (hits.length === 1) return hits[0];
  throw new DataError(
    hits.length === 0
      ? `{row}: no row of ${file} is named "${id}" (in any column besides the attributes)`
      : `{row}: "${id}" names ${hits.length} rows of ${file}; use {set} instead`,
    { file },
  );
}

/**
 * Whether `rows` were read from the very table the model was fitted on
 * (the same SHA-256 of its bytes): then its people are the model's own, and
 * their estimates include their own pay unless the analyst's file says
 * which trees never saw them.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { isTrainingTable } from "./model_table.ts";
 * const model = { provenance: { table: { sha256: "ab12" } } } as import("./types.ts").Model;
 * const rows = { table: { source: { sha256: "ab12" } } } as import("./model_table.ts").ModelRows;
 * assert.equal(isTrainingTable(model, rows), true);
 * ```
 */
export function isTrainingTable(model: Model, rows: ModelRows): boolean {
  return rows.table.source.sha256 === model.provenance.table.sha256;
}
