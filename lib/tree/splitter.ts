/**
 * The search for a node's best split, feature by feature, on per-bin
 * summaries (lib/tree/histogram.ts, or a sort of the node's bin ids when
 * the feature has far more bins than the node has rows), scanned in bin
 * order and scored by the criterion (lib/tree/criterion.ts).
 *
 * Categorical features split by a subset of levels. For a numeric target
 * the best subset is found exactly by ordering the levels by mean response
 * and scanning that order (Fisher 1958; Breiman et al. 1984, Thm 4.5); for
 * two classes likewise by the share of the second class. For three or more
 * classes every subset is tried when the node holds at most 12 levels;
 * beyond that, levels are ordered by the share of the node's most frequent
 * class (a heuristic, not guaranteed optimal).
 *
 * Missing values: each split sends them to the side that gives the better
 * split (left first, left wins ties); when the node has none, the builder
 * sends them to the heavier child. A split of known against missing values
 * is tried too.
 *
 * A feature constrained to increase (regression): a split of its known
 * values by order is allowed only when the lower side's mean is at most the
 * higher side's (missing values counted on their side); the builder passes
 * bounds down so that no descendant crosses the split (lib/tree/grow_tree.ts).
 *
 * Ties between equally good splits go to the lowest feature index, then the
 * lowest threshold (the first found in the scan).
 *
 * @module
 */

import type { FeatureKind } from "../dataset/types.ts";
import type { FeatureBins } from "./bins.ts";
import type { Criterion } from "./criterion.ts";
import type { GrowRows } from "./grow_rows.ts";
import type { Histograms } from "./histogram.ts";
import { BinOrders, KEPT_FEATURES } from "./bin_orders.ts";

/** Where a split sends missing values: a side, or the heavier child (the node had none). */
export type MissingGoes = "left" | "right" | "heavier";

/** The best split found so far (one record, rewritten as better ones are found). */
export interface SplitChoice {
  /** The criterion's proxy (larger is better). */
  proxy: number;
  /** The feature split on. */
  feature: number;
  /** Numeric split: values up to it go left (Infinity: known left, missing right). */
  threshold: number;
  /** Numeric split: the last bin sent left. */
  lastLeftBin: number;
  /** Categorical split: bins sent left and right (a level absent from the node is in neither). */
  leftBins: number[];
  rightBins: number[];
  /** Where missing values go. */
  missing: MissingGoes;
  leftWeight: number;
  rightWeight: number;
  leftImpurity: number;
  rightImpurity: number;
}

const EXHAUSTIVE_LEVELS = 12;
// Levels ordered by insertion sort up to this many (no closure, no array).
const INSERTION_LEVELS = 32;
const SIDES: readonly MissingGoes[] = ["right", "left"];
const NO_BINS: number[] = [];

/**
 * Finds nodes' best splits for one tree.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures } from "./bins.ts";
 * import { SquaredError } from "./criterion.ts";
 * import { gatherRows } from "./grow_rows.ts";
 * import { Histograms } from "./histogram.ts";
 * import { Splitter } from "./splitter.ts";
 * const dataset = {
 *   rows: 4,
 *   features: [{ name: "x", kind: "numeric" as const, values: Float64Array.of(1, 2, 3, 4) }],
 *   target: { kind: "regression" as const, name: "y", values: Float64Array.of(10, 10, 20, 20) },
 * };
 * const bins = binFeatures(dataset);
 * const rows = gatherRows(dataset, bins, new Float64Array(4).fill(1), Int32Array.of(0, 1, 2, 3));
 * const histograms = new Histograms(rows, bins, 4);
 * const splitter = new Splitter(rows, bins, ["numeric"], histograms, new SquaredError(), 1);
 * assert(splitter.find(Int32Array.of(0, 1, 2, 3), 0, 4, null));
 * assert.equal(splitter.choice.threshold, 2.5);
 * assert.equal(splitter.choice.leftImpurity, 0);
 * ```
 */
export class Splitter {
  /** The best split of the last `find` that returned true. */
  readonly choice: SplitChoice = {
    proxy: -Infinity,
    feature: -1,
    threshold: NaN,
    lastLeftBin: -1,
    leftBins: NO_BINS,
    rightBins: NO_BINS,
    missing: "heavier",
    leftWeight: 0,
    rightWeight: 0,
    leftImpurity: 0,
    rightImpurity: 0,
  };
  private found = false;
  private readonly rows: GrowRows;
  private readonly bins: FeatureBins[];
  private readonly kinds: readonly FeatureKind[];
  private readonly histograms: Histograms;
  private readonly criterion: Criterion;
  private readonly minLeaf: number;
  private readonly stride: number;
  // Two-class Gini has the same stride as squared error, so the task says.
  private readonly squaredError: boolean;
  // Per feature, 1 when the estimate must not fall as it grows (null: no
  // feature is constrained); `monotone`, whether the feature being searched is.
  private readonly increasing: Uint8Array | null;
  private monotone = false;
  // The node's non-empty bins of the feature being searched: summary `i`
  // starts at `at[i]` in `data` (the histogram itself, or `compact` when
  // the bins were sorted) and is bin `binOf[i]`; the missing values'
  // summary starts at `missAt` in `missData`.
  private data: Float64Array;
  private missData: Float64Array;
  private missAt = 0;
  private readonly at: Int32Array;
  private readonly binOf: Int32Array;
  private readonly compact: Float64Array;
  private readonly missing: Float64Array;
  private readonly sortKeys: Uint32Array;
  private keys: Uint32Array;
  /** Per feature, the node's rows in bin order, for the builder to hand down. */
  readonly orders: BinOrders;
  /** The features whose order of the last `find`'s rows `orders` holds (a mask). */
  ordered = 0;
  private readonly levelKey: Float64Array;
  // The summary of the known values, of the left side being scanned, and
  // the two sides of the split being scored.
  private readonly total: Float64Array;
  private readonly left: Float64Array;
  private readonly sides: Float64Array;

  constructor(
    rows: GrowRows,
    bins: FeatureBins[],
    kinds: readonly FeatureKind[],
    histograms: Histograms,
    criterion: Criterion,
    minLeaf: number,
    increasing: Uint8Array | null = null,
  ) {
    this.rows = rows;
    this.bins = bins;
    this.kinds = kinds;
    this.histograms = histograms;
    this.criterion = criterion;
    this.minLeaf = minLeaf;
    this.increasing = increasing;
    const stride = criterion.stride;
    this.stride = stride;
    this.squaredError = criterion.task === "regression";
    const widest = Math.max(1, ...bins.map((b) => b.count + 1));
    const compact = Math.min(widest, rows.count + 1);
    this.at = new Int32Array(compact);
    this.binOf = new Int32Array(compact);
    this.compact = new Float64Array(compact * stride);
    this.levelKey = new Float64Array(compact);
    this.sortKeys = new Uint32Array(rows.count);
    this.orders = new BinOrders(rows.count, bins.length);
    this.keys = this.sortKeys;
    this.missing = new Float64Array(stride);
    this.data = this.compact;
    this.missData = this.missing;
    this.total = new Float64Array(stride);
    this.left = new Float64Array(stride);
    this.sides = new Float64Array(2 * stride);
  }

  /**
   * Searches every feature for the best split of the rows
   * `index[start..end)` (`hist`: their histogram, or null when no feature
   * is dense at their size); false when no split leaves `minLeaf` rows on
   * both sides. `ordered`: the features whose bin order of these rows is
   * already in `orders` (a mask); `ordered` afterwards adds those sorted.
   */
  find(
    index: Int32Array,
    start: number,
    end: number,
    hist: Float64Array | null,
    ordered = 0,
  ): boolean {
    this.found = false;
    this.ordered = ordered;
    for (let f = 0; f < this.kinds.length; f++) {
      this.monotone = this.increasing !== null && this.increasing[f] === 1;
      this.search(f, this.collect(f, index, start, end, hist));
    }
    return this.found;
  }

  /**
   * Searches feature `f` alone from summaries already made: `m` known bins
   * `binIds` (ascending, each non-empty) whose summaries lie one after the
   * other in `summaries`, and the missing values' summary (zeros: none).
   * The same search as `find` over a node with these bins; a builder that
   * keeps bins rather than rows calls it (lib/tree/grow_one_feature.ts).
   */
  findInSummaries(
    f: number,
    binIds: Int32Array,
    summaries: Float64Array,
    m: number,
    missing: Float64Array,
  ): boolean {
    this.found = false;
    this.monotone = this.increasing !== null && this.increasing[f] === 1;
    const { at, binOf, total, stride } = this;
    total.fill(0);
    for (let i = 0; i < m; i++) {
      at[i] = i * stride;
      binOf[i] = binIds[i];
      for (let c = 0; c < stride; c++) total[c] += summaries[i * stride + c];
    }
    this.pointAt(summaries, missing, 0);
    this.search(f, m);
    return this.found;
  }

  // The search of feature f over the m bins `collect` (or findInSummaries)
  // pointed at.
  private search(f: number, m: number): void {
    const missN = this.missData[this.missAt];
    if (m < 2 && !(m === 1 && missN > 0)) return;
    const classes = this.criterion.task === "classification" ? this.criterion.width : 0;
    const categorical = this.kinds[f] === "categorical";
    if (categorical && classes > 2 && m <= EXHAUSTIVE_LEVELS) {
      this.exhaustive(f, m);
    } else {
      if (categorical) this.orderLevels(m, classes);
      this.scan(f, m, categorical);
    }
    if (missN > 0) this.knownVersusMissing(f, m, categorical);
  }

  /**
   * Points at the node's non-empty bins of feature `f` (in bin order) and
   * their missing values, and sums the known values; returns the bins' count.
   */
  private collect(
    f: number,
    index: Int32Array,
    start: number,
    end: number,
    hist: Float64Array | null,
  ): number {
    const { stride, at, binOf, total } = this;
    const missingBin = this.bins[f].count;
    const rows = end - start;
    let m = 0;
    if (hist !== null && this.histograms.isDense(f, rows)) {
      const first = this.histograms.at(f, 0);
      if (stride === 4) {
        // Squared error, the common case, with its sums in locals: most of
        // a large table's bins are empty in a small node, and this loop
        // steps over them.
        let rows = 0, weight = 0, sum = 0, squares = 0;
        for (let b = 0, a = first; b < missingBin; b++, a += 4) {
          const count = hist[a];
          if (count === 0) continue;
          at[m] = a;
          binOf[m++] = b;
          rows += count;
          weight += hist[a + 1];
          sum += hist[a + 2];
          squares += hist[a + 3];
        }
        this.squaredErrorTotal(rows, weight, sum, squares);
        this.pointAt(hist, hist, first + missingBin * stride);
        return m;
      }
      total.fill(0);
      for (let b = 0; b < missingBin; b++) {
        const a = first + b * stride;
        // Counts are exact integers, also after subtraction.
        if (hist[a] === 0) continue;
        at[m] = a;
        binOf[m] = b;
        for (let c = 0; c < stride; c++) total[c] += hist[a + c];
        m++;
      }
      this.pointAt(hist, hist, first + missingBin * stride);
      return m;
    }
    return this.collectByRows(f, index, start, end);
  }

  // Few rows, many bins: goes through the node's rows in bin order instead
  // (bin_orders.ts), handed down by the split above or sorted here by (bin,
  // position) keys. Keys fit 32 bits for all but huge nodes of many-valued
  // features, and a reused Uint32Array sorts faster than a fresh
  // Float64Array. A method of its own, so that `collect`, which most nodes
  // of most tables end in, stays small for the compiler.
  private collectByRows(f: number, index: Int32Array, start: number, end: number): number {
    const { stride, at, binOf, total } = this;
    const missingBin = this.bins[f].count;
    const rows = end - start;
    let m = 0;
    const { bins: rowBins, features, offsets, moments, weight, classOf } = this.rows;
    const offset = offsets[f];
    const order = this.orders.order(f);
    if (f >= KEPT_FEATURES || ((this.ordered >>> f) & 1) === 0) {
      const keys = (missingBin + 1) * rows <= 0xffffffff
        ? this.keysOf(rows)
        : new Float64Array(rows);
      for (let i = 0; i < rows; i++) {
        keys[i] = (rowBins[index[start + i] * features + f] - offset) * rows + i;
      }
      keys.sort();
      for (let i = 0; i < rows; i++) order[start + i] = index[start + (keys[i] % rows)];
      if (f < KEPT_FEATURES) this.ordered |= 1 << f;
    }
    const compact = this.compact;
    const missing = this.missing;
    missing.fill(0);
    const regression = moments.length > 0;
    if (!regression) total.fill(0);
    let i = start;
    // Each bin's summary is added up in locals and written once (a fill per
    // bin cost a fifth of this function); the known values' total is added
    // bin by bin in the same order.
    let tRows = 0, tWeight = 0, tSum = 0, tSquares = 0;
    while (i < end) {
      const b = rowBins[order[i] * features + f] - offset;
      const a = b === missingBin ? 0 : m * stride;
      const into = b === missingBin ? missing : compact;
      if (regression) {
        let n = 0, w = 0, sum = 0, squares = 0;
        while (i < end) {
          const r = order[i];
          if (rowBins[r * features + f] - offset !== b) break;
          n++;
          w += moments[3 * r];
          sum += moments[3 * r + 1];
          squares += moments[3 * r + 2];
          i++;
        }
        into[a] = n;
        into[a + 1] = w;
        into[a + 2] = sum;
        into[a + 3] = squares;
        if (b !== missingBin) {
          tRows += n;
          tWeight += w;
          tSum += sum;
          tSquares += squares;
        }
      } else {
        for (let c = 0; c < stride; c++) into[a + c] = 0;
        while (i < end) {
          const r = order[i];
          if (rowBins[r * features + f] - offset !== b) break;
          into[a]++;
          into[a + 1] += weight[r];
          into[a + 2 + classOf[r]] += weight[r];
          i++;
        }
        if (b !== missingBin) { for (let c = 0; c < stride; c++) total[c] += into[a + c]; }
      }
      if (b !== missingBin) {
        at[m] = a;
        binOf[m] = b;
        m++;
      }
    }
    if (regression) this.squaredErrorTotal(tRows, tWeight, tSum, tSquares);
    this.pointAt(compact, missing, 0);
    return m;
  }

  // The first `rows` sort keys, one view per node size: every feature of a
  // node sorts as many keys, and a view per feature cost a twentieth of
  // the search.
  private keysOf(rows: number): Uint32Array {
    if (this.keys.length !== rows) this.keys = this.sortKeys.subarray(0, rows);
    return this.keys;
  }

  // Where the bins' summaries and the missing values' summary are read.
  private pointAt(data: Float64Array, missData: Float64Array, missAt: number): void {
    this.data = data;
    this.missData = missData;
    this.missAt = missAt;
  }

  // The known values' total, when squared error summed it in locals.
  private squaredErrorTotal(rows: number, weight: number, sum: number, squares: number): void {
    const total = this.total;
    total[0] = rows;
    total[1] = weight;
    total[2] = sum;
    total[3] = squares;
  }

  // Orders a categorical feature's bins for the scan: by mean response, by
  // the second class's share (two classes), or by the share of the node's
  // most frequent class; ties by level code.
  private orderLevels(m: number, classes: number): void {
    const { data, at, binOf, levelKey: key, total } = this;
    let share = 2; // regression: sum w*y over w
    if (classes === 2) share = 3;
    if (classes > 2) {
      let top = 0;
      for (let c = 1; c < classes; c++) if (total[2 + c] > total[2 + top]) top = c;
      share = 2 + top;
    }
    for (let i = 0; i < m; i++) key[i] = data[at[i] + share] / data[at[i] + 1];
    if (m <= INSERTION_LEVELS) {
      for (let i = 1; i < m; i++) {
        const k = key[i];
        const a = at[i];
        const b = binOf[i];
        let j = i - 1;
        while (j >= 0 && (key[j] > k || (key[j] === k && binOf[j] > b))) {
          key[j + 1] = key[j];
          at[j + 1] = at[j];
          binOf[j + 1] = binOf[j];
          j--;
        }
        key[j + 1] = k;
        at[j + 1] = a;
        binOf[j + 1] = b;
      }
      return;
    }
    const order = Array.from({ length: m }, (_, i) => i);
    order.sort((x, y) => key[x] - key[y] || binOf[x] - binOf[y]);
    const oldAt = at.slice(0, m);
    const oldBin = binOf.slice(0, m);
    for (let i = 0; i < m; i++) {
      at[i] = oldAt[order[i]];
      binOf[i] = oldBin[order[i]];
    }
  }

  // Tries every split between consecutive bins in their order.
  private scan(f: number, m: number, categorical: boolean): void {
    if (this.squaredError && this.missData[this.missAt] === 0) {
      this.scanSquaredError(f, m, categorical);
      return;
    }
    const { data, at, left, stride } = this;
    left.fill(0);
    // Where this scan's best categorical split falls (see levelLists).
    let bestAt = -1;
    for (let i = 0; i < m - 1; i++) {
      const a = at[i];
      for (let c = 0; c < stride; c++) left[c] += data[a + c];
      if (!this.evaluate(left)) continue;
      if (this.record(f, i, categorical)) bestAt = i;
    }
    this.levelLists(bestAt, m);
  }

  // The split after bin i that evaluate just took: its feature and last
  // left bin, and a numeric split's threshold; true for a categorical one,
  // whose level lists wait for the scan's end (levelLists).
  private record(f: number, i: number, categorical: boolean): boolean {
    const { choice, binOf } = this;
    choice.feature = f;
    choice.lastLeftBin = binOf[i];
    if (categorical) return true;
    choice.threshold = this.midpoint(f, binOf[i], binOf[i + 1]);
    return false;
  }

  // A categorical scan's best split, its bins up to `bestAt` sent left:
  // built once, after the scan (building them at each better split made
  // the scan quadratic in the levels).
  private levelLists(bestAt: number, m: number): void {
    if (bestAt < 0) return;
    // Copied by hand: Array.from over a typed array's view went through the
    // iterator, and took a thirtieth of a small table's whole fit.
    const binOf = this.binOf;
    const left: number[] = new Array(bestAt + 1);
    for (let i = 0; i <= bestAt; i++) left[i] = binOf[i];
    const right: number[] = new Array(m - bestAt - 1);
    for (let i = bestAt + 1; i < m; i++) right[i - bestAt - 1] = binOf[i];
    this.choice.leftBins = left;
    this.choice.rightBins = right;
  }

  // scan's loop for squared error at a node without missing values, the
  // common case: the left side's sums in locals and each split's proxy
  // worked out inline, so that `evaluate` (the same arithmetic in the
  // same order, which records the split) runs only for a split that beats
  // the best so far. Scoring every split through `evaluate` took a fifth
  // of a 100,000-row tree's growth.
  private scanSquaredError(f: number, m: number, categorical: boolean): void {
    const { data, at, left, total, missData, missAt, minLeaf, choice, monotone } = this;
    // The missing values' summary is added to the right side as in
    // `evaluate`: a histogram's by subtraction may hold rounding left over.
    const rightRows = total[0] + missData[missAt];
    const rightWeight = total[1] + missData[missAt + 1];
    const rightSum = total[2] + missData[missAt + 2];
    let lRows = 0, lWeight = 0, lSum = 0, lSquares = 0;
    let bestAt = -1;
    for (let i = 0; i < m - 1; i++) {
      const a = at[i];
      lRows += data[a];
      lWeight += data[a + 1];
      lSum += data[a + 2];
      lSquares += data[a + 3];
      if (lRows < minLeaf || rightRows - lRows < minLeaf) continue;
      const rSum = rightSum - lSum;
      // A constrained feature: the lower values' mean may not exceed the higher's.
      if (monotone && lSum / lWeight > rSum / (rightWeight - lWeight)) continue;
      const proxy = (lSum * lSum) / lWeight + (rSum * rSum) / (rightWeight - lWeight);
      if (this.found && !(proxy > choice.proxy)) continue;
      left[0] = lRows;
      left[1] = lWeight;
      left[2] = lSum;
      left[3] = lSquares;
      if (!this.evaluate(left)) continue;
      if (this.record(f, i, categorical)) bestAt = i;
    }
    this.levelLists(bestAt, m);
  }

  // The threshold between two bins: as scikit-learn, the midpoint, computed
  // as a/2 + b/2.
  private midpoint(f: number, lowBin: number, highBin: number): number {
    const bins = this.bins[f];
    const low = bins.upper[lowBin];
    const high = bins.lower[highBin];
    const threshold = low / 2 + high / 2;
    return threshold === high || !Number.isFinite(threshold) ? low : threshold;
  }

  // Every known value on the left, the missing ones on the right: a split on
  // whether the value is known at all.
  private knownVersusMissing(f: number, m: number, categorical: boolean): void {
    if (!this.evaluate(this.total, true)) return;
    const choice = this.choice;
    choice.feature = f;
    if (categorical) {
      choice.leftBins = Array.from(this.binOf.subarray(0, m));
      choice.rightBins = [];
    } else {
      choice.lastLeftBin = this.binOf[m - 1];
      choice.threshold = Infinity;
    }
  }

  // Every subset of the first m-1 levels goes left; the last level stays
  // right, so each partition is tried once.
  private exhaustive(f: number, m: number): void {
    const { data, at, binOf, left, stride } = this;
    for (let mask = 1; mask < 1 << (m - 1); mask++) {
      left.fill(0);
      for (let i = 0; i < m - 1; i++) {
        if (!((mask >>> i) & 1)) continue;
        const a = at[i];
        for (let c = 0; c < stride; c++) left[c] += data[a + c];
      }
      if (!this.evaluate(left)) continue;
      const choice = this.choice;
      choice.feature = f;
      choice.leftBins = [];
      choice.rightBins = [];
      for (let i = 0; i < m; i++) {
        if (i < m - 1 && (mask >>> i) & 1) choice.leftBins.push(binOf[i]);
        else choice.rightBins.push(binOf[i]);
      }
    }
  }

  /**
   * Scores the split whose left side holds `left` (the known values), with
   * the node's missing values sent left, then right (left wins ties), or
   * only right (`knownLeft`); true when it beats the best so far, which it
   * then becomes (feature and threshold for the caller to fill in).
   */
  private evaluate(left: Float64Array, knownLeft = false): boolean {
    const { stride, sides, total, missData, missAt, criterion } = this;
    const missN = missData[missAt];
    // Sides tried: 1 (missing left) then 0 (right) when there are missing
    // values; -1 (none: the builder picks the heavier child) otherwise.
    const first = knownLeft ? 0 : missN > 0 ? 1 : -1;
    const last = missN > 0 ? 0 : -1;
    let improved = false;
    for (let side = first; side >= last; side--) {
      const withLeft = side === 1;
      for (let c = 0; c < stride; c++) {
        const l = left[c] + (withLeft ? missData[missAt + c] : 0);
        sides[c] = l;
        sides[stride + c] = total[c] + missData[missAt + c] - l;
      }
      if (sides[0] < this.minLeaf || sides[stride] < this.minLeaf) continue;
      // Known values split by their order on a constrained feature: the
      // left side's mean may not exceed the right side's.
      if (
        this.monotone && !knownLeft && sides[2] / sides[1] > sides[stride + 2] / sides[stride + 1]
      ) continue;
      const proxy = criterion.proxy(sides, 0, stride);
      if (this.found && !(proxy > this.choice.proxy)) continue;
      this.found = true;
      improved = true;
      const choice = this.choice;
      choice.proxy = proxy;
      choice.missing = side < 0 ? "heavier" : SIDES[side];
      choice.leftWeight = sides[1];
      choice.rightWeight = sides[stride + 1];
      choice.leftImpurity = criterion.impurity(sides, 0);
      choice.rightImpurity = criterion.impurity(sides, stride);
      choice.threshold = NaN;
      choice.lastLeftBin = -1;
      choice.leftBins = NO_BINS;
      choice.rightBins = NO_BINS;
    }
    return improved;
  }
}
