/**
 * Categories of workers as the user defines them (`--within job_family,level`):
 * every combination of the named level columns' values that occurs, in the
 * columns' level order (missing last), named "Field Service / G3". Shared
 * by the gap check and the pay review, with the small figures both report.
 *
 * @module
 */

import { OptionError } from "../errors.ts";
import { columnNamed } from "../table/column_named.ts";
import type { LevelColumn, Table } from "../table/types.ts";
import { VERSION } from "../version.ts";

/**
 * The level columns named by `--within`, checked: they exist and hold
 * named levels (categories are never cut from numbers).
 *
 * @param exclude Columns that cannot define categories (the pay, the group).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "../../mod.ts";
 * import { withinColumns } from "./categories.ts";
 * const table = loadTable("family,years,pay\nA,1,50\nB,2,60\n", { target: "pay" });
 * assert(withinColumns(table, ["family"], ["pay"])[0].name === "family");
 * assert.throws(() => withinColumns(table, ["years"], ["pay"]), /never cut from numbers/);
 * ```
 */
export function withinColumns(
  table: Table,
  names: readonly string[],
  exclude: readonly string[],
): LevelColumn[] {
  return names.map((name) => {
    const column = columnNamed(table, name, "within");
    if (exclude.includes(name)) {
      throw new OptionError(`{within}: "${name}" cannot define categories of itself`);
    }
    if (column.type !== "categorical" && column.type !== "ordinal") {
      throw new OptionError(
        `{within}: "${name}" is ${column.type}; categories come from columns of named levels ` +
          `(job family, level), never cut from numbers by paygrove`,
      );
    }
    return column;
  });
}

/** Categories and their members. */
export interface Categories {
  /** Category names, e.g. "Field Service / G3". */
  names: string[];
  /** Per category, the positions (into `tableRows`) of its members, ascending. */
  members: number[][];
}

/**
 * Groups items into the categories of the given columns.
 *
 * @param columns The `--within` columns (of the table the rows index).
 * @param tableRows For each item, its row in that table.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { categoriesOf } from "./categories.ts";
 * const family = { name: "family", type: "categorical" as const, levels: ["A", "B"],
 *   codes: Int32Array.from([1, 0, -1, 1]), missing: 1, protected: false, notes: [] };
 * const c = categoriesOf([family], [0, 1, 2, 3]);
 * assert.deepEqual(c.names, ["A", "B", "(missing)"]);
 * assert.deepEqual(c.members, [[1], [0, 3], [2]]);
 * ```
 */
export function categoriesOf(
  columns: readonly LevelColumn[],
  tableRows: ArrayLike<number>,
): Categories {
  if (columns.length === 0) return { names: [], members: [] };
  const keyOf = (i: number) => columns.map((c) => c.codes[tableRows[i]]);
  const seen = new Map<string, number[]>();
  for (let i = 0; i < tableRows.length; i++) {
    const key = keyOf(i);
    if (!seen.has(key.join(","))) seen.set(key.join(","), key);
  }
  // Level order, missing (-1) last.
  const rank = (x: number) => (x < 0 ? Infinity : x);
  const keys = [...seen.values()].sort((a, b) => {
    for (let j = 0; j < a.length; j++) if (a[j] !== b[j]) return rank(a[j]) - rank(b[j]);
    return 0;
  });
  const index = new Map(keys.map((k, i) => [k.join(","), i]));
  const members = keys.map(() => [] as number[]);
  for (let i = 0; i < tableRows.length; i++) members[index.get(keyOf(i).join(","))!].push(i);
  return {
    names: keys.map((k) =>
      k.map((code, j) => (code < 0 ? "(missing)" : columns[j].levels[code])).join(" / ")
    ),
    members,
  };
}

/**
 * Out-of-bag R-squared over the rows that have an out-of-bag estimate.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { oobRSquared } from "./categories.ts";
 * assert(oobRSquared([1, 2, 3], [1, 2, NaN]) === 1);
 * ```
 */
export function oobRSquared(y: ArrayLike<number>, oob: ArrayLike<number>): number {
  let mean = 0;
  let count = 0;
  for (let r = 0; r < y.length; r++) {
    if (!Number.isNaN(oob[r])) {
      mean += y[r];
      count++;
    }
  }
  mean /= count;
  let sse = 0;
  let sst = 0;
  for (let r = 0; r < y.length; r++) {
    if (Number.isNaN(oob[r])) continue;
    sse += (y[r] - oob[r]) ** 2;
    sst += (y[r] - mean) ** 2;
  }
  return 1 - sse / sst;
}

/** Where a gap or review figure came from. */
export interface TableProvenance {
  /** paygrove's version. */
  paygrove: string;
  /**
   * The table read: its file name, SHA-256 and rows (the row count left out
   * where it would tell the size of a group too small to report).
   */
  table: { file: string; sha256: string; rows?: number };
  /** The seed of the resamples. */
  seed: number;
}

/**
 * The provenance of figures computed straight from a table.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "../table/load_table.ts";
 * import { VERSION } from "../version.ts";
 * import { tableProvenance } from "./categories.ts";
 * const text = "pay,x\n50000,1\n,2\n60000,3\n";
 * const table = loadTable(text, { target: "pay", file: "pay.csv" });
 * // Three rows read, one left out for its missing pay: rows counts all three.
 * // The SHA-256 is `printf 'pay,x\n50000,1\n,2\n60000,3\n' | sha256sum`.
 * assert.deepEqual(tableProvenance(table, 17), {
 *   paygrove: VERSION,
 *   table: {
 *     file: "pay.csv",
 *     sha256: "0eb9f6b9c1c9bffb6c54efb72ca7c9bc5e336090042215c49c019782beb083be",
 *     rows: 3,
 *   },
 *   seed: 17,
 * });
 * ```
 */
export function tableProvenance(table: Table, seed: number): TableProvenance {
  return {
    paygrove: VERSION,
    table: {
      file: table.source.file ?? "input",
      sha256: table.source.sha256,
      rows: table.rows + table.excluded.count,
    },
    seed,
  };
}
