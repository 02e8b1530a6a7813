/**
 * Table -> Dataset: choosing the target and the features, and encoding them.
 *
 * @module
 */

import { DataError, OptionError } from "../errors.ts";
import { columnNamed } from "../table/column_named.ts";
import type { Column, Table } from "../table/types.ts";
import { isPayName } from "../table/money.ts";
import type { Dataset, Feature } from "./types.ts";

/** Options of {@linkcode makeDataset}. */
export interface MakeDatasetOptions {
  /** The column to predict. */
  target: string;
  /** The feature columns; by default every usable column but the target. */
  features?: readonly string[];
  /** Columns to leave out of the default features. */
  drop?: readonly string[];
  /**
   * Allow protected attributes as features.
   * @default {false}
   */
  allowProtected?: boolean;
  /**
   * Treat unordered categorical features as numbers (each level's position
   * in the sorted level list), so splits are thresholds on the code. Only
   * for comparisons with learners that take integer-coded categories, such
   * as a scikit-learn benchmark; subset splits fit pay better.
   * @default {false}
   */
  categoricalAsCodes?: boolean;
}

/**
 * The most levels a categorical (unordered) feature is split on. The split
 * search orders a node's levels and scans them (O(m log m) for m levels in
 * the node), and each split keeps two bit sets of the levels, one word per
 * 32 levels: at this bound 64 words (256 bytes) per split, whatever the
 * table holds. A column with more levels is left out of the default
 * features and refused when named (grouping its levels is the user's
 * call: which ones belong together is not in the data). Ordinal and numeric
 * features split by threshold and need no bound.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "../table/load_table.ts";
 * import { makeDataset, MAX_SPLIT_LEVELS } from "./make_dataset.ts";
 * // A team column of one level more than the bound (each team twice, so not identifier-like).
 * const teams = MAX_SPLIT_LEVELS + 1;
 * const rows = Array.from({ length: 2 * teams }, (_, i) => `team ${i % teams} x,${50000 + i}`);
 * const table = loadTable(`team,pay\n${rows.join("\n")}\n`, { target: "pay" });
 * const { dropped } = makeDataset(table, { target: "pay" });
 * assert.deepEqual(dropped[0], {
 *   name: "team", reason: "too many levels",
 *   detail: { kind: "too-many-levels", levels: 1001, limit: 1000 },
 * });
 * ```
 */
export const MAX_SPLIT_LEVELS = 1000;

/**
 * The most classes a class target may have. Every node of every tree keeps
 * a share for each class, and the split search a count per class and bin:
 * with 2,000 classes a default fit of 10,000 rows ran 100 s into 8 GB. A
 * hundred covers levels, grades, job families and departments.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { OptionError } from "../errors.ts";
 * import { loadTable } from "../table/load_table.ts";
 * import { makeDataset, MAX_CLASSES } from "./make_dataset.ts";
 * const table = (classes: number) => {
 *   const rows = Array.from({ length: 3 * classes }, (_, i) => `${i % 7},grade ${i % classes} x`);
 *   return loadTable(`years,grade\n${rows.join("\n")}\n`);
 * };
 * const { dataset } = makeDataset(table(MAX_CLASSES), { target: "grade" });
 * assert.equal(dataset.target.kind, "classification");
 * assert.throws(
 *   () => makeDataset(table(MAX_CLASSES + 1), { target: "grade" }),
 *   (e: unknown) =>
 *     e instanceof OptionError && /101 classes; a class target has at most 100/.test(e.message),
 * );
 * ```
 */
export const MAX_CLASSES = 100;

/**
 * The largest size of a number an attribute may hold: beyond it sums of
 * squares overflow (a value of 1.7e308 made every straight-line prediction
 * undefined), and no count, rating, year or score of people comes near it.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { DataError } from "../errors.ts";
 * import { loadTable } from "../table/load_table.ts";
 * import { ATTRIBUTE_CEILING, makeDataset } from "./make_dataset.ts";
 * const table = (score: number) =>
 *   loadTable(`score,pay\n1,50000\n${score},61000\n2,52000\n`, { target: "pay" });
 * const { dataset } = makeDataset(table(ATTRIBUTE_CEILING), { target: "pay" });
 * assert.equal(dataset.features.length, 1);
 * assert.throws(
 *   () => makeDataset(table(2 * ATTRIBUTE_CEILING), { target: "pay" }),
 *   (e: unknown) =>
 *     e instanceof DataError && /"score" has 2000000000000000 on line 3: .*10\^15/.test(e.message),
 * );
 * ```
 */
export const ATTRIBUTE_CEILING = 1e15;

/**
 * The smallest size of a number other than 0 an attribute may hold:
 * below it a number loses its precision (a subnormal such as 5e-324), and
 * dividing by a spread made of such numbers is undefined.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "../table/load_table.ts";
 * import { ATTRIBUTE_FLOOR, makeDataset } from "./make_dataset.ts";
 * const table = (score: number) =>
 *   loadTable(`score,pay\n1,50000\n${score},61000\n2,52000\n`, { target: "pay" });
 * // 0 and the floor itself are numbers; below the floor (a subnormal) is not.
 * assert.equal(makeDataset(table(0), { target: "pay" }).dataset.features.length, 1);
 * assert.equal(makeDataset(table(ATTRIBUTE_FLOOR), { target: "pay" }).dataset.features.length, 1);
 * assert.throws(() => makeDataset(table(5e-324), { target: "pay" }), /this close to 0 but not 0/);
 * ```
 */
export const ATTRIBUTE_FLOOR = 1e-300;

// A numeric attribute with a number no table of people holds stops the
// fit with the line, as implausible pay does.
function checkUsableNumbers(c: Column, table: Table): void {
  if (c.type !== "numeric") return;
  for (let r = 0; r < c.values.length; r++) {
    const x = c.values[r];
    if (Number.isNaN(x)) continue;
    const size = Math.abs(x);
    if (size > ATTRIBUTE_CEILING || (size !== 0 && size < ATTRIBUTE_FLOOR)) {
      throw new DataError(
        `"${c.name}" has ${x} on line ${table.lines[r]}: no attribute of people holds a number ` +
          `${size > ATTRIBUTE_CEILING ? "beyond 10^15" : "this close to 0 but not 0"}; ` +
          `correct it, or leave the column out`,
        { line: table.lines[r], column: c.name },
      );
    }
  }
}

/** Why a column was left out, as data. */
export type DroppedDetail =
  | { kind: "identifier-like"; levels: number; rows: number }
  | { kind: "too-many-levels"; levels: number; limit: number }
  | { kind: "pay" };

/**
 * Whether a column other than the target is pay (money by its values or
 * options, or named like pay: a bonus, an allowance, a second salary).
 * Such a column is never an attribute: a tree splits on its values
 * halfway between two people's pay, so a model file would show them (its
 * thresholds and per-level ranges), and pay explained by pay says nothing
 * about the pay structure.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "../table/load_table.ts";
 * import { isPayColumn } from "./make_dataset.ts";
 * const table = loadTable("level,bonus_eur,years\nL1,500,3\nL2,800,5\n");
 * assert.deepEqual(table.columns.map(isPayColumn), [false, true, false]);
 * ```
 */
export function isPayColumn(column: Column): boolean {
  return column.type === "numeric" && (column.money !== undefined || isPayName(column.name));
}

/**
 * A numeric column correlated with a numeric target at least this much is pay under another name.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "../table/load_table.ts";
 * import { COPY_CORRELATION, copiesTarget } from "./make_dataset.ts";
 * const pearson = (x: ArrayLike<number>, y: ArrayLike<number>) => {
 *   const n = x.length;
 *   const mx = Array.from(x).reduce((s, v) => s + v, 0) / n;
 *   const my = Array.from(y).reduce((s, v) => s + v, 0) / n;
 *   let sxy = 0, sxx = 0, syy = 0;
 *   for (let i = 0; i < n; i++) {
 *     sxy += (x[i] - mx) * (y[i] - my);
 *     sxx += (x[i] - mx) ** 2;
 *     syy += (y[i] - my) ** 2;
 *   }
 *   return sxy / Math.sqrt(sxx * syy);
 * };
 * const csv = "near,loose,pay\n40100,41000,40000\n52300,50000,52000\n60800,64000,61000\n" +
 *   "45200,43000,45000\n";
 * const [near, loose, pay] = loadTable(csv).columns;
 * const values = (c: typeof pay) => (c as { values: Float64Array }).values;
 * assert(pearson(values(near), values(pay)) >= COPY_CORRELATION);
 * assert.equal(copiesTarget(near, pay), true);
 * assert(pearson(values(loose), values(pay)) < COPY_CORRELATION);
 * assert.equal(copiesTarget(loose, pay), false);
 * ```
 */
export const COPY_CORRELATION = 0.99;
/**
 * ...and whose typical value is within this factor of pay's (either way).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "../table/load_table.ts";
 * import { COPY_RATIO, copiesTarget } from "./make_dataset.ts";
 * // Pay a month (1/12 of pay) and pay in units of 40 (1/40): both perfectly correlated.
 * const pay = [40000, 52000, 61000, 45000];
 * const rows = pay.map((p) => `${p / 12},${p / 40},${p}`);
 * const [month, fortieth, target] = loadTable(`m,q,pay\n${rows.join("\n")}\n`).columns;
 * assert(1 / 12 >= COPY_RATIO && 1 / 40 < COPY_RATIO);
 * assert.equal(copiesTarget(month, target), true);
 * assert.equal(copiesTarget(fortieth, target), false);
 * ```
 */
export const COPY_RATIO = 1 / 20;

/**
 * Whether a numeric column is pay under a name no list knows ("stipend",
 * "payroll_amount", "eur"): Pearson's correlation with a numeric target of
 * at least {@linkcode COPY_CORRELATION} over the rows where both are known,
 * and a median ratio to it between 1/20 and 20 (so that years on a rigid
 * pay scale, perfectly correlated but not pay, stay attributes).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "../../mod.ts";
 * import { copiesTarget } from "./make_dataset.ts";
 * const csv = "years,stipend,pay\n9,40100,40000\n1,52000,52000\n5,61050,61000\n2,45000,45000\n";
 * const [years, stipend, pay] = loadTable(csv).columns;
 * assert(copiesTarget(stipend, pay) && !copiesTarget(years, pay));
 * const scale = loadTable("years,pay\n1,40900\n2,41800\n3,42700\n").columns;
 * assert(!copiesTarget(scale[0], scale[1])); // pay by years exactly: years stay
 * ```
 */
export function copiesTarget(column: Column, target: Column): boolean {
  if (column.type !== "numeric" || target.type !== "numeric" || column === target) return false;
  const x = column.values;
  const y = target.values;
  let n = 0;
  let sx = 0;
  let sy = 0;
  for (let r = 0; r < x.length; r++) {
    if (x[r] === x[r] && y[r] === y[r]) {
      n++;
      sx += x[r];
      sy += y[r];
    }
  }
  if (n < 3) return false;
  const mx = sx / n;
  const my = sy / n;
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let r = 0; r < x.length; r++) {
    if (x[r] === x[r] && y[r] === y[r]) {
      sxy += (x[r] - mx) * (y[r] - my);
      sxx += (x[r] - mx) ** 2;
      syy += (y[r] - my) ** 2;
    }
  }
  if (!(sxx > 0 && syy > 0 && sxy / Math.sqrt(sxx * syy) >= COPY_CORRELATION)) return false;
  // On pay's own scale too (a monthly copy is 1/12 of yearly pay): a rigid
  // pay scale by years of service correlates as well, and years are an
  // attribute, not pay.
  const ratios: number[] = [];
  for (let r = 0; r < x.length; r++) {
    if (x[r] === x[r] && y[r] === y[r] && y[r] !== 0) ratios.push(x[r] / y[r]);
  }
  ratios.sort((a, b) => a - b);
  const median = ratios[ratios.length >> 1];
  return median >= COPY_RATIO && median <= 1 / COPY_RATIO;
}

/** Why a column is not a feature. */
export interface DroppedColumn {
  /** Column name. */
  name: string;
  /** One phrase for the user. */
  reason: string;
  /** The figures behind the reason, where there are some. */
  detail?: DroppedDetail;
}

/** A dataset and what was left out of it. */
export interface DatasetResult {
  /** The encoded data. */
  dataset: Dataset;
  /** Columns that are not features, with the reason. */
  dropped: DroppedColumn[];
  /** Rows of the table used (all rows whose target is present). */
  rowIndex: Int32Array;
}

/**
 * Encodes a table for the learner. By default every column except the
 * target becomes a feature, but for identifiers, constants and protected
 * attributes (kept out unless `allowProtected`). Rows whose target is
 * missing are left out.
 *
 * @throws {OptionError} for an unknown column, an identifier or constant
 * target, or a protected feature named without `allowProtected`.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "../table/load_table.ts";
 * import { makeDataset } from "./make_dataset.ts";
 * const table = loadTable("gender,level,pay\nF,L1,50\nM,L2,60\nF,L2,61\n");
 * const { dataset, dropped } = makeDataset(table, { target: "pay" });
 * assert(dataset.features.map((f) => f.name).join() === "level");
 * assert(dropped[0].name === "gender");
 * ```
 */
export function makeDataset(table: Table, options: MakeDatasetOptions): DatasetResult {
  const column = (name: string, option: string): Column => columnNamed(table, name, option);
  const targetColumn = column(options.target, "target");
  for (const name of options.drop ?? []) column(name, "drop");

  const dropped: DroppedColumn[] = [];
  let chosen: Column[];
  if (options.features !== undefined) {
    if (options.features.length === 0) {
      throw new OptionError("the list of features is empty: name at least one column");
    }
    chosen = options.features.map((name) => column(name, "features"));
    for (const c of chosen) {
      if (c === targetColumn) throw new OptionError(`{features}: "${c.name}" is the target`);
      if (c.type === "identifier" || c.type === "constant") {
        throw new OptionError(
          `{features}: "${c.name}" is ${
            c.type === "identifier" ? "an identifier" : "constant"
          } and cannot be a feature`,
        );
      }
      if (c.protected && !options.allowProtected) {
        throw new OptionError(
          `{features}: "${c.name}" is a protected attribute; it is kept out of pay estimates ` +
            `unless you pass {allowProtected}`,
        );
      }
      if (isPayColumn(c) || copiesTarget(c, targetColumn)) {
        throw new OptionError(
          `{features}: "${c.name}" is pay; pay is never an attribute (a model's split points ` +
            `would show people's pay, and pay explained by pay explains nothing)`,
        );
      }
      if (c.type === "categorical" && c.levels.length > MAX_SPLIT_LEVELS) {
        throw new OptionError(
          `"${c.name}" has ${count(c.levels.length)} levels; a categorical attribute is split on ` +
            `at most ${count(MAX_SPLIT_LEVELS)} (the search and each split's level sets grow ` +
            `with the levels): leave it out, or group its levels into fewer`,
        );
      }
    }
    for (const c of table.columns) {
      if (c !== targetColumn && !chosen.includes(c)) {
        dropped.push({ name: c.name, reason: "not chosen" });
      }
    }
  } else {
    const drop = new Set(options.drop ?? []);
    chosen = [];
    for (const c of table.columns) {
      if (c === targetColumn) continue;
      const reason = drop.has(c.name)
        ? "dropped on request"
        : c.type === "identifier"
        ? "identifier"
        : c.type === "constant"
        ? "constant"
        : c.protected && !options.allowProtected
        ? "protected attribute"
        : undefined;
      if (reason === undefined && (isPayColumn(c) || copiesTarget(c, targetColumn))) {
        dropped.push({ name: c.name, reason: "pay", detail: { kind: "pay" } });
        continue;
      }
      const detail = reason === undefined ? manyLevels(c) : undefined;
      if (reason) dropped.push({ name: c.name, reason });
      else if (detail) {
        dropped.push({
          name: c.name,
          reason: detail.kind === "identifier-like" ? "identifier-like" : "too many levels",
          detail,
        });
      } else chosen.push(c);
    }
  }

  for (const c of chosen) checkUsableNumbers(c, table);
  const keep: number[] = [];
  for (let r = 0; r < table.rows; r++) if (!targetMissing(targetColumn, r)) keep.push(r);
  const rowIndex = Int32Array.from(keep);
  const features = chosen.map((c) => encodeFeature(c, rowIndex, options.categoricalAsCodes));
  let target: Dataset["target"];
  if (targetColumn.type === "numeric") {
    target = {
      kind: "regression",
      name: targetColumn.name,
      values: Float64Array.from(rowIndex, (r) => targetColumn.values[r]),
    };
  } else if (targetColumn.type === "categorical" || targetColumn.type === "ordinal") {
    if (targetColumn.levels.length > MAX_CLASSES) {
      throw new OptionError(
        `"${targetColumn.name}" has ${count(targetColumn.levels.length)} classes; a class target ` +
          `has at most ${MAX_CLASSES} (every node of every tree keeps a share for each class): ` +
          `choose a target of fewer levels, or group them`,
      );
    }
    target = {
      kind: "classification",
      name: targetColumn.name,
      classes: [...targetColumn.levels],
      values: Int32Array.from(rowIndex, (r) => targetColumn.codes[r]),
    };
  } else {
    throw new OptionError(
      `{target}: "${targetColumn.name}" is ${
        targetColumn.type === "identifier" ? "an identifier" : "constant"
      }; there is nothing to predict`,
    );
  }
  return { dataset: { rows: rowIndex.length, features, target }, dropped, rowIndex };
}

// Why a level column is left out of the default features, if it is.
function manyLevels(column: Column): DroppedDetail | undefined {
  if (column.type !== "categorical" && column.type !== "ordinal") return undefined;
  if (column.identifierLike) return { kind: "identifier-like", ...column.identifierLike };
  if (column.type === "categorical" && column.levels.length > MAX_SPLIT_LEVELS) {
    return { kind: "too-many-levels", levels: column.levels.length, limit: MAX_SPLIT_LEVELS };
  }
  return undefined;
}

function count(n: number): string {
  return n.toLocaleString("en-US");
}

function targetMissing(column: Column, r: number): boolean {
  if (column.type === "numeric") return Number.isNaN(column.values[r]);
  if (column.type === "categorical" || column.type === "ordinal") return column.codes[r] < 0;
  return false;
}

function encodeFeature(column: Column, rows: Int32Array, asCodes = false): Feature {
  if (column.type === "numeric") {
    return {
      name: column.name,
      kind: "numeric",
      values: Float64Array.from(rows, (r) => column.values[r]),
    };
  }
  if (column.type === "categorical" && asCodes) {
    return {
      name: column.name,
      kind: "numeric",
      values: Float64Array.from(rows, (r) => (column.codes[r] < 0 ? NaN : column.codes[r])),
    };
  }
  if (column.type === "categorical" || column.type === "ordinal") {
    return {
      name: column.name,
      kind: column.type,
      levels: [...column.levels],
      values: Float64Array.from(rows, (r) => (column.codes[r] < 0 ? NaN : column.codes[r])),
    };
  }
  throw new TypeError(`column "${column.name}" (${column.type}) cannot be a feature`);
}
