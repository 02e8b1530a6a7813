/**
 * Keeping only the rows of a table that match `--where COLUMN=VALUE`
 * conditions: a row is kept when, for every column named, its value is one
 * of the values given for that column.
 *
 * @module
 */

import { OptionError } from "../errors.ts";
import { columnNamed, matchLevel, unknownLevel } from "./column_named.ts";
import type { Column, Table } from "./types.ts";

/**
 * The rows of `table` matching every condition (values of one column are
 * alternatives). Level columns compare by level name, numeric columns by
 * number.
 *
 * @throws {OptionError} for an unknown column, a level the column does not
 * have, or when no row matches.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { filterRows, loadTable } from "../../mod.ts";
 * const table = loadTable("site,pay\nNorth,50\nSouth,60\nNorth,55\n", { target: "pay" });
 * assert(filterRows(table, { site: ["North"] }).rows === 2);
 * ```
 */
export function filterRows(
  table: Table,
  where: Readonly<Record<string, readonly string[]>>,
): Table {
  const names = Object.keys(where);
  if (names.length === 0) return table;
  const tests = names.map((name) => rowTest(table, name, where[name]));
  const keep: number[] = [];
  for (let r = 0; r < table.rows; r++) if (tests.every((t) => t(r))) keep.push(r);
  if (keep.length === 0) {
    throw new OptionError(
      `{where}: no row has ${names.map((n) => `${n}=${where[n].join(" or ")}`).join(" and ")}`,
    );
  }
  return subsetRows(
    table,
    keep,
    `kept ${keep.length} of ${table.rows} rows where ${describe(where)}`,
  );
}

/**
 * The given rows of a table, in the order given, with a note saying why.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable, subsetRows } from "../../mod.ts";
 * const table = loadTable("site,pay\nNorth,50\nSouth,60\nNorth,55\n", { target: "pay" });
 * assert(subsetRows(table, [2], "last row only").lines[0] === 4);
 * ```
 */
export function subsetRows(table: Table, keep: readonly number[], note: string): Table {
  return {
    ...table,
    rows: keep.length,
    columns: table.columns.map((c) => subsetColumn(c, keep)),
    lines: Int32Array.from(keep, (r) => table.lines[r]),
    notes: [...table.notes, note],
  };
}

function describe(where: Readonly<Record<string, readonly string[]>>): string {
  return Object.entries(where).map(([n, v]) => `${n}=${v.join("|")}`).join(", ");
}

function rowTest(table: Table, name: string, values: readonly string[]): (r: number) => boolean {
  const column = columnNamed(table, name, "where");
  if (column.type === "numeric") {
    const wanted = values.map((v) => {
      const x = Number(v);
      if (!Number.isFinite(x)) {
        throw new OptionError(`{where}: "${name}" is numeric, and "${v}" is not a number`);
      }
      return x;
    });
    return (r) => wanted.includes(column.values[r]);
  }
  if (column.type === "categorical" || column.type === "ordinal") {
    const codes = values.map((v) => {
      const match = matchLevel(v, column.levels);
      if (match.kind === "unknown") throw unknownLevel("where", column.name, v, column.levels);
      return column.levels.indexOf(match.name);
    });
    return (r) => codes.includes(column.codes[r]);
  }
  if (column.type === "identifier") {
    const ids = column.values;
    return (r) => values.includes(ids[r]);
  }
  // A constant column: every row or none.
  const only = (column as { value?: string }).value ?? "";
  const all = values.includes(only);
  return () => all;
}

function subsetColumn(column: Column, keep: readonly number[]): Column {
  switch (column.type) {
    case "numeric":
      return { ...column, values: Float64Array.from(keep, (r) => column.values[r]) };
    case "categorical":
    case "ordinal":
      return { ...column, codes: Int32Array.from(keep, (r) => column.codes[r]) };
    case "identifier":
      return { ...column, values: keep.map((r) => column.values[r]) };
    default:
      return column;
  }
}
