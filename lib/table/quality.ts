/**
 * Data-quality findings: duplicate identifiers and rows, pay that looks like
 * a unit slip, pay that is zero or negative, far-out values. They are
 * warnings with line numbers, never reasons to refuse a table.
 *
 * @module
 */

import { lineList } from "./money.ts";
import type { Column, NumericColumn, QualityWarning, Table } from "./types.ts";

const SHOWN_LINES = 5;
// A pay value is a likely unit slip when the column's median is about
// 1,000 times it (thousands typed as units: 85 among 85,000s) or about
// 12 times it (a monthly figure among annual ones). The windows are wide
// enough for rounding and narrow enough to stay clear of ordinary spread.
const THOUSANDS_SLIP: [number, number] = [500, 2000];
const MONTHLY_SLIP: [number, number] = [9, 16];
// Tukey's far-out fence (common practice): beyond 3 interquartile ranges.
const FAR_OUT = 3;

/**
 * Finds the data-quality warnings of a loaded table.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "./load_table.ts";
 * const rows = Array.from({ length: 20 }, (_, i) => `${60000 + i * 1000}`);
 * rows.push("85");
 * const table = loadTable("salary\n" + rows.join("\n"));
 * assert(table.warnings.some((w) => w.kind === "unit-slip"));
 * ```
 */
export function findQualityWarnings(table: Table): QualityWarning[] {
  const warnings: QualityWarning[] = [];
  // One scratch array for every column's present values, and one for the
  // positive ones (logFences): a new pair per column of a million rows held
  // about 100 MB more at the peak.
  const scratch = { present: new Float64Array(table.rows), positive: new Float64Array(0) };
  for (const column of table.columns) {
    if (column.type === "identifier") {
      warnings.push(...duplicateIds(column.name, column.values, table));
    }
    if (column.type === "numeric") {
      const values = present(column.values, scratch);
      if (column.money) warnings.push(...payChecks(column, values, table));
      const outliers = farOut(column, values, table);
      if (outliers) warnings.push(outliers);
    }
  }
  const duplicates = duplicateRows(table);
  if (duplicates) warnings.push(duplicates);
  return warnings;
}

function duplicateIds(name: string, values: readonly string[], table: Table): QualityWarning[] {
  const first = new Map<string, number>();
  const lines: number[] = [];
  let count = 0;
  for (let r = 0; r < values.length; r++) {
    if (values[r] === "") continue;
    const earlier = first.get(values[r]);
    if (earlier === undefined) {
      first.set(values[r], r);
    } else {
      count++;
      if (lines.length < SHOWN_LINES) lines.push(table.lines[r]);
    }
  }
  if (count === 0) return [];
  return [{
    kind: "duplicate-identifier",
    column: name,
    count,
    lines,
    message: `"${name}": ${count} identifier${count === 1 ? " repeats" : "s repeat"} an earlier ` +
      `row (${lineList(lines, count)})`,
  }];
}

function payChecks(column: NumericColumn, present: Present, table: Table): QualityWarning[] {
  const warnings: QualityWarning[] = [];
  if (present.values.length === 0) return warnings;
  const median = selectQuantile(present.values, 0.5);
  const [lowLog] = logFencesOf(present);
  const nonPositive: number[] = [];
  const slips: number[] = [];
  let slipCount = 0;
  let nonPositiveCount = 0;
  for (let r = 0; r < column.values.length; r++) {
    const v = column.values[r];
    if (Number.isNaN(v)) continue;
    if (v <= 0) {
      nonPositiveCount++;
      if (nonPositive.length < SHOWN_LINES) nonPositive.push(table.lines[r]);
      continue;
    }
    // A slip is both at the right distance from the median and far out on the
    // log scale, so wide but ordinary spread (part-time weekly pay) is not flagged.
    const ratio = median / v;
    const slip = (ratio >= THOUSANDS_SLIP[0] && ratio <= THOUSANDS_SLIP[1]) ||
      (ratio >= MONTHLY_SLIP[0] && ratio <= MONTHLY_SLIP[1]);
    if (median > 0 && slip && Math.log(v) < lowLog) {
      slipCount++;
      if (slips.length < SHOWN_LINES) slips.push(table.lines[r]);
    }
  }
  if (nonPositiveCount > 0) {
    warnings.push({
      kind: "non-positive-pay",
      column: column.name,
      count: nonPositiveCount,
      lines: nonPositive,
      message: `"${column.name}": ${nonPositiveCount} value${
        nonPositiveCount === 1 ? " is" : "s are"
      } zero or negative (${lineList(nonPositive, nonPositiveCount)})`,
    });
  }
  if (slipCount > 0) {
    warnings.push({
      kind: "unit-slip",
      column: column.name,
      count: slipCount,
      lines: slips,
      message: `"${column.name}": ${slipCount} value${slipCount === 1 ? " is" : "s are"} about ` +
        `1,000x or 12x below the median ${formatPlain(median)}: thousands typed as units, or ` +
        `monthly pay among annual? (${lineList(slips, slipCount)}); they are kept as they are`,
    });
  }
  return warnings;
}

// Far-out fences of the logs of the positive values; pay is right-skewed, so
// its fences are set on the log scale. The logs' quantiles are those of the
// positive values with each order statistic taken to its log (the log keeps
// the order), as quantile() of the sorted logs gives them.
// A pay column's fences serve both its slip check and its far-out check:
// found once.
function logFencesOf(present: Present): [number, number] {
  present.logFences ??= logFences(present.values, present.scratch);
  return present.logFences;
}

function logFences(values: Float64Array, scratch: Scratch): [number, number] {
  if (scratch.positive.length < values.length) scratch.positive = new Float64Array(values.length);
  const positive = scratch.positive;
  let n = 0;
  for (let r = 0; r < values.length; r++) if (values[r] > 0) positive[n++] = values[r];
  if (n === 0) return [-Infinity, Infinity];
  const q1 = selectQuantile(positive.subarray(0, n), 0.25, Math.log);
  const q3 = selectQuantile(positive.subarray(0, n), 0.75, Math.log);
  return [q1 - FAR_OUT * (q3 - q1), q3 + FAR_OUT * (q3 - q1)];
}

function farOut(
  column: NumericColumn,
  present: Present,
  table: Table,
): QualityWarning | undefined {
  const values = present.values;
  if (values.length < 20) return undefined;
  let low: number;
  let high: number;
  const logScale = column.money !== undefined && present.min > 0;
  if (logScale) {
    [low, high] = logFencesOf(present).map(Math.exp);
  } else {
    const q1 = selectQuantile(values, 0.25);
    const q3 = selectQuantile(values, 0.75);
    low = q1 - FAR_OUT * (q3 - q1);
    high = q3 + FAR_OUT * (q3 - q1);
  }
  if (!(high > low)) return undefined;
  const lines: number[] = [];
  let count = 0;
  for (let r = 0; r < column.values.length; r++) {
    const v = column.values[r];
    if (v < low || v > high) {
      count++;
      if (lines.length < SHOWN_LINES) lines.push(table.lines[r]);
    }
  }
  if (count === 0) return undefined;
  // A fence below zero for a column with no negative value (years, counts)
  // is no bound anyone can fall under: only the upper one is said.
  const bounds = low < 0 && present.min >= 0
    ? `above ${formatPlain(high)}`
    : `below ${formatPlain(low)} or above ${formatPlain(high)}`;
  return {
    kind: "outlier",
    column: column.name,
    count,
    lines,
    message: `"${column.name}": ${count} value${count === 1 ? " is" : "s are"} far from the ` +
      `rest, ${bounds} (${lineList(lines, count)}); ` +
      `worth a check, they are kept (bounds: 3 interquartile ranges beyond the quartiles` +
      `${logScale ? " of log pay" : ""})`,
  };
}

function duplicateRows(table: Table): QualityWarning | undefined {
  if (table.columns.length === 0) return undefined;
  // Rows are bucketed by a hash of their cells and compared cell by cell
  // only with the earlier distinct rows of the same hash, so no per-row key
  // strings are built. The buckets are chains through two typed arrays
  // (first row of each slot, next row of each row), not a Map of arrays: a
  // million rows would make a million small arrays.
  const hashes = rowHashes(table);
  let size = 1;
  while (size < 2 * table.rows) size *= 2;
  const mask = size - 1;
  const firsts = new Int32Array(size).fill(-1);
  const nexts = new Int32Array(table.rows);
  const lines: number[] = [];
  let count = 0;
  for (let r = 0; r < table.rows; r++) {
    const hash = hashes[r];
    const slot = hash & mask;
    let earlier = firsts[slot];
    while (earlier >= 0 && !(hashes[earlier] === hash && sameRow(table.columns, earlier, r))) {
      earlier = nexts[earlier];
    }
    if (earlier >= 0) {
      count++;
      if (lines.length < SHOWN_LINES) lines.push(table.lines[r]);
    } else {
      nexts[r] = firsts[slot];
      firsts[slot] = r;
    }
  }
  if (count === 0) return undefined;
  return {
    kind: "duplicate-row",
    count,
    lines,
    message: `${count} row${count === 1 ? " repeats" : "s repeat"} an earlier row in every ` +
      `column (${lineList(lines, count)})` +
      (table.columns.some((c) => c.type === "identifier")
        ? ""
        : "; with no identifier column, different people with the same record look alike"),
  };
}

// FNV-1a-style 32-bit hash of each row's cells (numbers by their bits,
// level codes, identifier text).
function rowHashes(table: Table): Uint32Array {
  const hashes = new Uint32Array(table.rows).fill(0x811c9dc5);
  const mix = (r: number, word: number) => {
    hashes[r] = Math.imul(hashes[r] ^ word, 0x01000193);
  };
  const bits = new Float64Array(1);
  const words = new Uint32Array(bits.buffer);
  for (const column of table.columns) {
    for (let r = 0; r < table.rows; r++) {
      switch (column.type) {
        case "numeric":
          bits[0] = column.values[r];
          mix(r, words[0]);
          mix(r, words[1]);
          break;
        case "categorical":
        case "ordinal":
          mix(r, column.codes[r]);
          break;
        case "identifier": {
          const text = column.values[r];
          for (let i = 0; i < text.length; i++) mix(r, text.charCodeAt(i));
          break;
        }
        case "constant":
          break;
      }
    }
  }
  return hashes;
}

function sameRow(columns: readonly Column[], a: number, b: number): boolean {
  for (const column of columns) {
    switch (column.type) {
      case "numeric": {
        const x = column.values[a];
        const y = column.values[b];
        if (x !== y && !(Number.isNaN(x) && Number.isNaN(y))) return false;
        break;
      }
      case "categorical":
      case "ordinal":
        if (column.codes[a] !== column.codes[b]) return false;
        break;
      case "identifier":
        if (column.values[a] !== column.values[b]) return false;
        break;
      case "constant":
        break;
    }
  }
  return true;
}

// A column's present values (in no set order) and the least of them.
interface Present {
  values: Float64Array;
  min: number;
  scratch: Scratch;
  logFences?: [number, number];
}

interface Scratch {
  present: Float64Array;
  positive: Float64Array;
}

function present(values: Float64Array, scratch: Scratch): Present {
  // A plain loop: filter() with a callback costs more than the sort on a
  // million values.
  const out = scratch.present.length >= values.length
    ? scratch.present
    : new Float64Array(values.length);
  let n = 0;
  let min = Infinity;
  for (let r = 0; r < values.length; r++) {
    const v = values[r];
    if (v === v) {
      out[n++] = v;
      if (v < min) min = v;
    }
  }
  // (The least is only compared with 0, so -0 and 0 need not be told apart.)
  return { values: out.subarray(0, n), min, scratch };
}

/**
 * The q-quantile of unsorted values, the same number as
 * {@linkcode quantile} of them sorted (R's type 7), found by selection in
 * linear time instead of a sort: the values are reordered in place. With
 * `map`, each of the two order statistics is mapped before the
 * interpolation (Math.log, for the quantile of the logs of positive values).
 * The values hold no NaN. Why: sorting each numeric column of a million rows was a tenth of loading it.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { quantile, selectQuantile } from "./quality.ts";
 * const values = Float64Array.of(4, 1, 3, 2, 3);
 * assert.equal(selectQuantile(values, 0.25), quantile([1, 2, 3, 3, 4], 0.25)); // 2
 * assert.equal(selectQuantile(Float64Array.of(3, 1, 4, 2), 0.5), 2.5);
 * assert.equal(selectQuantile(Float64Array.of(1, Math.E), 1, Math.log), 1);
 * ```
 */
export function selectQuantile(
  values: Float64Array,
  q: number,
  map?: (value: number) => number,
): number {
  const n = values.length;
  if (n === 0) throw new RangeError("quantile of no values");
  const h = (n - 1) * q;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, n - 1);
  // Zeros of both signs need no care: the sort puts -0 first, selection
  // may not, but the interpolation below gives +0 either way.
  let a = select(values, lo);
  // Everything after lo is at least values[lo]: the next order statistic is their least.
  let b = a;
  if (hi > lo) {
    b = values[hi];
    for (let i = hi + 1; i < n; i++) if (values[i] < b) b = values[i];
  }
  if (map !== undefined) {
    a = map(a);
    b = map(b);
  }
  return a + (h - lo) * (b - a);
}

// Reorders values so that values[k] is the k-th least (0-based), the ones
// before it no greater and the ones after no less, and returns it: Hoare
// partitions around the median of three (equal values stop both scans, so
// many repeats stay linear); a range still wide after many rounds (an
// adversarial order) is sorted instead.
function select(values: Float64Array, k: number): number {
  let left = 0;
  let right = values.length - 1;
  let rounds = 0;
  while (right > left) {
    if (++rounds > 64) {
      values.subarray(left, right + 1).sort();
      break;
    }
    const mid = (left + right) >>> 1;
    // Median of three at mid, with values[left] <= values[mid] <= values[right].
    if (values[mid] < values[left]) swap(values, mid, left);
    if (values[right] < values[left]) swap(values, right, left);
    if (values[right] < values[mid]) swap(values, right, mid);
    const pivot = values[mid];
    let i = left;
    let j = right;
    while (i <= j) {
      while (values[i] < pivot) i++;
      while (values[j] > pivot) j--;
      if (i <= j) {
        swap(values, i, j);
        i++;
        j--;
      }
    }
    // Now values[left..j] <= pivot <= values[i..right], and j < i.
    if (k <= j) right = j;
    else if (k >= i) left = i;
    else break; // between j and i: all equal to the pivot
  }
  return values[k];
}

function swap(values: Float64Array, i: number, j: number): void {
  const t = values[i];
  values[i] = values[j];
  values[j] = t;
}

/**
 * The q-quantile of sorted values by linear interpolation between order
 * statistics (the default of R's `quantile`, type 7).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { quantile } from "./quality.ts";
 * // Type 7 on 1, 2, 3, 4: h = 3q, so q = 0.25 gives 1.75 and q = 0.5 gives 2.5
 * // (R: quantile(1:4, c(0.25, 0.5)) is 1.75 2.50).
 * assert.equal(quantile([1, 2, 3, 4], 0.25), 1.75);
 * assert.equal(quantile([1, 2, 3, 4], 0.5), 2.5);
 * assert.equal(quantile([1, 2, 3, 4], 1), 4);
 * ```
 */
export function quantile(sorted: ArrayLike<number>, q: number): number {
  if (sorted.length === 0) throw new RangeError("quantile of no values");
  const h = (sorted.length - 1) * q;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, sorted.length - 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

function formatPlain(value: number): string {
  return Number(value.toPrecision(4)).toLocaleString("en-US");
}
