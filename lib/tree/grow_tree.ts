/**
 * Growing one classification or regression tree (Breiman et al. 1984,
 * ch. 2-4) on binned features, depth first with an explicit stack.
 *
 * The split search ranks a node's candidate splits with the same cheap
 * proxies as scikit-learn's criteria (sklearn/tree/_criterion.pyx), so that
 * equal data gives equal trees: for squared error `sL^2/wL + sR^2/wR`
 * (s = weighted sum of y, w = weight), for Gini `-wL*giniL - wR*giniR`.
 * Each feature's rows are gathered into per-bin sums (a histogram, or a sort
 * of the node's bin ids when the node has far fewer rows than the feature
 * has bins) and scanned in bin order.
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
 * split; when the node has none, to the heavier child. Levels a categorical
 * split never saw follow the same direction.
 *
 * Ties between equally good splits go to the lowest feature index, then the
 * lowest threshold (the first found in the scan).
 *
 * @module
 */

import type { Dataset } from "../dataset/types.ts";
import { type FeatureBins, rowMajorBins } from "./bins.ts";
import type { FlatTree } from "./flat_tree.ts";

/** Stopping rules. */
export interface GrowOptions {
  /**
   * Minimum distinct rows (with nonzero weight) in a leaf.
   * @default {5}
   */
  minLeaf?: number;
  /**
   * Minimum distinct rows in a node for a split to be tried.
   * @default twice minLeaf
   */
  minSplit?: number;
  /**
   * Maximum depth (the root has depth 0).
   * @default {Infinity}
   */
  maxDepth?: number;
  /**
   * A split must decrease the weighted impurity by at least this much.
   * @default {0}
   */
  minImpurityDecrease?: number;
}

/** The data a tree is grown on. */
export interface GrowInput {
  /** Encoded rows. */
  dataset: Dataset;
  /** Bins of the dataset's features, from `binFeatures`. */
  bins: FeatureBins[];
  /** Weight per row (e.g. bootstrap counts); rows of weight 0 are left out. Default 1. */
  weights?: Float64Array;
  /** The dataset's `canonicalRowOrder`, when already computed (saves a sort per tree). */
  order?: Int32Array;
}

/**
 * An order of the rows that does not depend on where they stand in the
 * table: by target, then by each feature's value (missing last), then by
 * position only among rows equal in all of these. Sums are accumulated in
 * this order, so that shuffling the table's rows gives a bit-identical tree.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { canonicalRowOrder } from "./grow_tree.ts";
 * const order = canonicalRowOrder({
 *   rows: 3,
 *   features: [],
 *   target: { kind: "regression", name: "y", values: new Float64Array([3, 1, 2]) },
 * });
 * assert(order.join() === "1,2,0");
 * ```
 */
export function canonicalRowOrder(dataset: Dataset): Int32Array {
  const y = dataset.target.values;
  const features = dataset.features.map((f) => f.values);
  const order = Array.from({ length: dataset.rows }, (_, i) => i);
  const compare = (a: number, b: number) => {
    if (y[a] !== y[b]) return y[a] - y[b];
    for (const values of features) {
      const x = values[a];
      const z = values[b];
      if (x === z || (x !== x && z !== z)) continue;
      if (x !== x) return 1;
      if (z !== z) return -1;
      return x - z;
    }
    return a - b;
  };
  order.sort(compare);
  return Int32Array.from(order);
}

// A node whose impurity is at most this is pure (scikit-learn's EPSILON,
// the double-precision machine epsilon).
const EPSILON = 2.220446049250313e-16;
const EXHAUSTIVE_LEVELS = 12;
// Sort a node's bin ids rather than fill a histogram when the feature has
// more than this many bins per row of the node.
const SPARSE_RATIO = 8;

/**
 * Grows a tree to the stopping rules.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures } from "./bins.ts";
 * import { growTree } from "./grow_tree.ts";
 * const dataset = {
 *   rows: 4,
 *   features: [{ name: "x", kind: "numeric" as const, values: new Float64Array([1, 2, 3, 4]) }],
 *   target: { kind: "regression" as const, name: "y", values: new Float64Array([10, 10, 20, 20]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
 * assert(tree.threshold[0] === 2.5 && tree.nodeCount === 3);
 * ```
 */
export function growTree(input: GrowInput, options: GrowOptions = {}): FlatTree {
  const minLeaf = options.minLeaf ?? 5;
  const minSplit = options.minSplit ?? 2 * minLeaf;
  const maxDepth = options.maxDepth ?? Infinity;
  const minDecrease = options.minImpurityDecrease ?? 0;
  if (!Number.isInteger(minLeaf) || minLeaf < 1 || !Number.isInteger(minSplit) || minSplit < 2) {
    throw new RangeError(
      `minLeaf must be a whole number >= 1 and minSplit >= 2, got ${minLeaf} and ${minSplit}`,
    );
  }
  if (!(maxDepth >= 0) || (maxDepth !== Infinity && !Number.isInteger(maxDepth))) {
    throw new RangeError(`maxDepth must be a whole number >= 0 or Infinity, got ${maxDepth}`);
  }
  if (!(minDecrease >= 0)) {
    throw new RangeError(`minImpurityDecrease must be >= 0, got ${minDecrease}`);
  }
  const grower = new Grower(input, { minLeaf, minSplit, maxDepth, minDecrease });
  return grower.grow();
}

interface Settings {
  minLeaf: number;
  minSplit: number;
  maxDepth: number;
  minDecrease: number;
}

interface Best {
  proxy: number;
  feature: number;
  threshold: number;
  /** Bin ids going left and right (categorical splits; levels absent from the node in neither). */
  leftBins: number[];
  rightBins: number[];
  lastLeftBin: number;
  missingLeft: number; // 1 left, 0 right, -1 decide by weight
  leftW: number;
  rightW: number;
  leftImpurity: number;
  rightImpurity: number;
}

// A regression node's sums, in this order (see nodeSums).
const SUM_WEIGHT = 0;
const SUM_TARGET = 1;
const SUM_SQUARES = 2;
const SUM_LOW = 3;
const SUM_HIGH = 4;
const SUM_SHIFT = 5;
const NODE_SUMS = 6;

// The weight of a node's rows, their weighted target and squares about the
// first row's target (the shift), and the lowest and highest target, adding
// rows in index order.
function nodeSums(
  y: Float64Array,
  w: Float64Array,
  index: Int32Array,
  start: number,
  end: number,
): Float64Array {
  const shift = y[index[start]];
  let weight = 0;
  let sum = 0;
  let sq = 0;
  let low = Infinity;
  let high = -Infinity;
  for (let i = start; i < end; i++) {
    const r = index[i];
    const v = y[r];
    const d = v - shift;
    const wd = w[r] * d;
    weight += w[r];
    sum += wd;
    sq += wd * d;
    if (v < low) low = v;
    if (v > high) high = v;
  }
  return Float64Array.of(weight, sum, sq, low, high, shift);
}

class Grower {
  private readonly data: GrowInput;
  private readonly s: Settings;
  private readonly regression: boolean;
  private readonly k: number; // values per node
  private readonly y: Float64Array;
  private readonly cls: Int32Array;
  private readonly w: Float64Array;
  private readonly index: Int32Array;
  private readonly scratch: Int32Array;
  private readonly totalWeight: number;
  // Histograms: one flat buffer per node for all features, `stride` numbers
  // per bin, interleaved so that one update touches one cache line:
  // regression [rows, w, sum w*y, sum w*y^2], classification
  // [rows, w, w of class 0, ..., w of class K-1]. A feature's bins start at
  // offsets[f] (its missing bin is the last).
  private readonly stride: number;
  private readonly offsets: Int32Array;
  private readonly histLength: number;
  private readonly pool: Float64Array[] = [];
  private readonly globalBins: Uint32Array;
  private readonly rowData: Float64Array;
  // Compact list of the non-empty bins of the feature being scanned.
  private cBin: Int32Array;
  private sortKeys: Uint32Array;
  private cN: Int32Array;
  private cW: Float64Array;
  private cS: Float64Array; // regression: 1 per bin; classification: K per bin
  private cQ: Float64Array;
  private binOrder: Int32Array;
  private readonly leftS: Float64Array;
  private readonly missS: Float64Array;
  private readonly totS: Float64Array;
  // Growing node arrays.
  private readonly nodes = {
    feature: [] as number[],
    threshold: [] as number[],
    maskOffset: [] as number[],
    masks: [] as number[],
    left: [] as number[],
    right: [] as number[],
    missingLeft: [] as number[],
    value: [] as number[],
    rows: [] as number[],
    weight: [] as number[],
    impurity: [] as number[],
  };
  private readonly maskWords: Int32Array;

  constructor(data: GrowInput, settings: Settings) {
    this.data = data;
    this.s = settings;
    const { dataset } = data;
    const n = dataset.rows;
    this.regression = dataset.target.kind === "regression";
    this.k = dataset.target.kind === "regression" ? 1 : dataset.target.classes.length;
    this.y = dataset.target.kind === "regression" ? dataset.target.values : new Float64Array(0);
    this.cls = dataset.target.kind === "classification" ? dataset.target.values : new Int32Array(0);
    this.w = data.weights ?? new Float64Array(n).fill(1);
    if (this.w.length !== n) {
      throw new RangeError(`weights has ${this.w.length} entries for ${n} rows`);
    }
    let kept = 0;
    let total = 0;
    for (let r = 0; r < n; r++) {
      const wr = this.w[r];
      if (!(wr >= 0) || wr === Infinity) throw new RangeError(`weight of row ${r} is ${wr}`);
      if (wr > 0) kept++;
      const target = dataset.target.values[r];
      if (!Number.isFinite(target)) throw new RangeError(`target of row ${r} is ${target}`);
    }
    const order = data.order ?? canonicalRowOrder(dataset);
    if (order.length !== n) throw new RangeError(`order has ${order.length} entries for ${n} rows`);
    this.index = new Int32Array(kept);
    for (let j = 0, i = 0; j < n; j++) {
      const r = order[j];
      if (this.w[r] > 0) {
        this.index[i++] = r;
        total += this.w[r];
      }
    }
    this.totalWeight = total;
    this.scratch = new Int32Array(kept);
    const k = this.k;
    const offsets = new Int32Array(data.bins.length + 1);
    for (let f = 0; f < data.bins.length; f++) offsets[f + 1] = offsets[f] + data.bins[f].count + 1;
    this.offsets = offsets;
    this.stride = this.regression ? 4 : 2 + k;
    this.histLength = offsets[data.bins.length] * this.stride;
    this.globalBins = rowMajorBins(data.bins, n, offsets);
    // Each row's weight, weight * y and weight * y^2 side by side.
    this.rowData = new Float64Array(this.regression ? 3 * n : 0);
    if (this.regression) {
      for (let r = 0; r < n; r++) {
        const wy = this.w[r] * this.y[r];
        this.rowData[3 * r] = this.w[r];
        this.rowData[3 * r + 1] = wy;
        this.rowData[3 * r + 2] = wy * this.y[r];
      }
    }
    const widest = Math.max(1, ...data.bins.map((b) => b.count + 1));
    const compact = Math.min(widest, kept + 1);
    this.sortKeys = new Uint32Array(kept);
    this.cBin = new Int32Array(compact);
    this.cN = new Int32Array(compact);
    this.cW = new Float64Array(compact);
    this.cS = new Float64Array(compact * k);
    this.cQ = new Float64Array(compact);
    this.binOrder = new Int32Array(compact);
    this.leftS = new Float64Array(k);
    this.missS = new Float64Array(k);
    this.totS = new Float64Array(k);
    this.maskWords = Int32Array.from(
      dataset.features,
      (f) => (f.kind === "categorical" ? Math.ceil(f.levels!.length / 32) : 0),
    );
  }

  grow(): FlatTree {
    if (this.index.length === 0) {
      throw new RangeError("no rows with positive weight to grow a tree on");
    }
    // Stack entries: start, end, depth, parent, isLeft (1) / right (0) / root
    // (-1); beside it, each pending node's histogram (null: fill when needed).
    const stack: number[] = [0, this.index.length, 0, -1, -1];
    const histograms: (Float64Array | null)[] = [null];
    // Each pending node's sums, when its parent's partition took them.
    const sums: (Float64Array | null)[] = [null];
    while (stack.length > 0) {
      let hist = histograms.pop()!;
      const taken = sums.pop()!;
      const side = stack.pop()!;
      const parent = stack.pop()!;
      const depth = stack.pop()!;
      const end = stack.pop()!;
      const start = stack.pop()!;
      const id = this.addNode(start, end, taken);
      if (parent >= 0) {
        if (side === 1) this.nodes.left[parent] = id;
        else this.nodes.right[parent] = id;
      }
      const impurity = this.nodes.impurity[id];
      const rows = end - start;
      if (
        depth >= this.s.maxDepth || rows < this.s.minSplit || rows < 2 * this.s.minLeaf ||
        impurity <= EPSILON
      ) {
        this.release(hist);
        continue;
      }
      if (hist === null && this.anyDense(rows)) {
        hist = this.acquire(rows);
        this.fill(hist, start, end, rows);
      }
      const best = this.findSplit(start, end, hist);
      const weight = this.nodes.weight[id];
      const improvement = best === undefined ? -Infinity : (weight / this.totalWeight) *
        (impurity - (best.rightW / weight) * best.rightImpurity -
          (best.leftW / weight) * best.leftImpurity);
      if (best === undefined || improvement + EPSILON < this.s.minDecrease) {
        this.release(hist);
        continue;
      }
      const missingLeft = best.missingLeft >= 0
        ? best.missingLeft
        : best.leftW >= best.rightW
        ? 1
        : 0;
      const leftSums = this.regression ? new Float64Array(NODE_SUMS) : null;
      const rightSums = this.regression ? new Float64Array(NODE_SUMS) : null;
      const mid = this.partition(start, end, best, missingLeft, leftSums, rightSums);
      this.setSplit(id, best, missingLeft);
      // The smaller child's histogram is filled from its rows; the larger
      // child's is the parent's minus the smaller's.
      const [leftHist, rightHist] = this.childHistograms(hist, start, mid, end);
      stack.push(mid, end, depth + 1, id, 0);
      histograms.push(rightHist);
      sums.push(rightSums);
      stack.push(start, mid, depth + 1, id, 1);
      histograms.push(leftHist);
      sums.push(leftSums);
    }
    return this.finish();
  }

  private childHistograms(
    parent: Float64Array | null,
    start: number,
    mid: number,
    end: number,
  ): [Float64Array | null, Float64Array | null] {
    const leftRows = mid - start;
    const rightRows = end - mid;
    const largerRows = Math.max(leftRows, rightRows);
    if (parent === null || !this.anyDense(largerRows)) {
      this.release(parent);
      return [null, null];
    }
    const leftSmaller = leftRows <= rightRows;
    const small = this.acquire(largerRows);
    if (leftSmaller) this.fill(small, start, mid, largerRows);
    else this.fill(small, mid, end, largerRows);
    this.subtract(parent, small, largerRows);
    return leftSmaller ? [small, parent] : [parent, small];
  }

  // Whether a feature uses the histogram in a node of this many rows (else
  // the node's bin ids are sorted).
  private isDense(f: number, rows: number): boolean {
    return this.data.bins[f].count <= SPARSE_RATIO * rows;
  }

  private anyDense(rows: number): boolean {
    for (let f = 0; f < this.data.bins.length; f++) if (this.isDense(f, rows)) return true;
    return false;
  }

  /** A histogram buffer with the ranges of features dense at `rows` zeroed. */
  private acquire(rows: number): Float64Array {
    const hist = this.pool.pop() ?? new Float64Array(this.histLength);
    for (let f = 0; f < this.data.bins.length; f++) {
      if (!this.isDense(f, rows)) continue;
      hist.fill(0, this.offsets[f] * this.stride, this.offsets[f + 1] * this.stride);
    }
    return hist;
  }

  private release(hist: Float64Array | null): void {
    if (hist !== null) this.pool.push(hist);
  }

  // One pass over the rows adds every dense feature's sums: each row's
  // global bin ids and its weight data are read once.
  private fill(hist: Float64Array, start: number, end: number, denseRows: number): void {
    const features = this.data.bins.length;
    const dense: number[] = [];
    for (let f = 0; f < features; f++) if (this.isDense(f, denseRows)) dense.push(f);
    const { index, globalBins, stride } = this;
    const nd = dense.length;
    if (this.regression) {
      const data = this.rowData;
      for (let i = start; i < end; i++) {
        const r = index[i];
        const wr = data[3 * r];
        const wy = data[3 * r + 1];
        const wyy = data[3 * r + 2];
        const base = r * features;
        for (let j = 0; j < nd; j++) {
          const b = globalBins[base + dense[j]] * 4;
          hist[b]++;
          hist[b + 1] += wr;
          hist[b + 2] += wy;
          hist[b + 3] += wyy;
        }
      }
    } else {
      const { w, cls } = this;
      for (let i = start; i < end; i++) {
        const r = index[i];
        const wr = w[r];
        const c = 2 + cls[r];
        const base = r * features;
        for (let j = 0; j < nd; j++) {
          const b = globalBins[base + dense[j]] * stride;
          hist[b]++;
          hist[b + 1] += wr;
          hist[b + c] += wr;
        }
      }
    }
  }

  private subtract(target: Float64Array, other: Float64Array, denseRows: number): void {
    for (let f = 0; f < this.data.bins.length; f++) {
      if (!this.isDense(f, denseRows)) continue;
      const to = this.offsets[f + 1] * this.stride;
      for (let i = this.offsets[f] * this.stride; i < to; i++) target[i] -= other[i];
    }
  }

  private addNode(start: number, end: number, taken: Float64Array | null): number {
    const { index, w, k } = this;
    const values = new Float64Array(k);
    let weight = 0;
    let impurity: number;
    if (this.regression) {
      // Sums taken about the first row's target so that they do not cancel
      // (as raw sums of y^2 would, by ~1e-13 on log pay); a node whose
      // targets are all equal gets impurity exactly 0. A child's sums come
      // from its parent's partition (the same rows in the same order).
      const sums = taken ?? nodeSums(this.y, w, index, start, end);
      weight = sums[SUM_WEIGHT];
      const sum = sums[SUM_TARGET];
      const sq = sums[SUM_SQUARES];
      const low = sums[SUM_LOW];
      const high = sums[SUM_HIGH];
      const shift = sums[SUM_SHIFT];
      const offset = sum / weight;
      values[0] = shift + offset;
      impurity = low === high ? 0 : Math.max(0, sq / weight - offset * offset);
    } else {
      for (let i = start; i < end; i++) {
        const r = index[i];
        values[this.cls[r]] += w[r];
        weight += w[r];
      }
      let sq = 0;
      for (let c = 0; c < k; c++) sq += values[c] * values[c];
      impurity = 1 - sq / (weight * weight);
      for (let c = 0; c < k; c++) values[c] /= weight;
    }
    const nodes = this.nodes;
    const id = nodes.feature.length;
    nodes.feature.push(-1);
    nodes.threshold.push(NaN);
    nodes.maskOffset.push(-1);
    nodes.left.push(-1);
    nodes.right.push(-1);
    nodes.missingLeft.push(0);
    for (let c = 0; c < k; c++) nodes.value.push(values[c]);
    nodes.rows.push(end - start);
    nodes.weight.push(weight);
    nodes.impurity.push(impurity);
    return id;
  }

  private setSplit(id: number, best: Best, missingLeft: number): void {
    const nodes = this.nodes;
    nodes.feature[id] = best.feature;
    nodes.missingLeft[id] = missingLeft;
    const words = this.maskWords[best.feature];
    if (words > 0) {
      // Two bit sets: the levels sent left, then those sent right. A level in
      // neither was absent from the node and follows the missing direction.
      nodes.maskOffset[id] = nodes.masks.length;
      const mask = new Array<number>(2 * words).fill(0);
      for (const bin of best.leftBins) mask[bin >>> 5] |= 1 << (bin & 31);
      for (const bin of best.rightBins) mask[words + (bin >>> 5)] |= 1 << (bin & 31);
      for (const word of mask) nodes.masks.push(word >>> 0);
    } else {
      nodes.threshold[id] = best.threshold;
    }
  }

  /** Gathers the node's rows of one feature into the compact bin list; returns its length. */
  private collect(f: number, start: number, end: number, hist: Float64Array | null): number {
    const bins = this.data.bins[f];
    const ids = bins.ids;
    const { index, w, k } = this;
    const missingBin = bins.count;
    const rows = end - start;
    this.missS.fill(0);
    let m = 0;
    if (hist !== null && this.isDense(f, rows)) {
      const stride = this.stride;
      const first = this.offsets[f] * stride;
      for (let b = 0; b < missingBin; b++) {
        const at = first + b * stride;
        // Counts are exact integers, also after subtraction.
        if (hist[at] === 0) continue;
        this.cBin[m] = b;
        this.cN[m] = hist[at];
        this.cW[m] = hist[at + 1];
        if (this.regression) {
          this.cS[m] = hist[at + 2];
          this.cQ[m] = hist[at + 3];
        } else {
          for (let c = 0; c < k; c++) this.cS[m * k + c] = hist[at + 2 + c];
          this.cQ[m] = 0;
        }
        m++;
      }
      const at = first + missingBin * stride;
      this.missN = hist[at];
      this.missW = hist[at + 1];
      if (this.regression) {
        this.missS[0] = hist[at + 2];
        this.missQ = hist[at + 3];
      } else {
        for (let c = 0; c < k; c++) this.missS[c] = hist[at + 2 + c];
        this.missQ = 0;
      }
      return m;
    }
    // Few rows, many bins: sort the node's (bin, position) keys instead.
    // Keys fit 32 bits for all but huge nodes of many-valued features, and a
    // reused Uint32Array sorts faster than a fresh Float64Array.
    const keys = (missingBin + 1) * rows <= 0xffffffff
      ? this.sortKeys.subarray(0, rows)
      : new Float64Array(rows);
    for (let i = 0; i < rows; i++) keys[i] = ids[index[start + i]] * rows + i;
    keys.sort();
    let i = 0;
    let missN = 0;
    let missW = 0;
    let missQ = 0;
    while (i < rows) {
      const b = Math.floor(keys[i] / rows);
      const first = b * rows;
      const limit = first + rows;
      let n = 0;
      let wsum = 0;
      let q = 0;
      const at = m;
      if (b !== missingBin) {
        this.cBin[at] = b;
        for (let c = 0; c < k; c++) this.cS[at * k + c] = 0;
      }
      while (i < rows && keys[i] < limit) {
        const r = index[start + (keys[i] - first)];
        const wr = w[r];
        n++;
        wsum += wr;
        if (this.regression) {
          const wy = wr * this.y[r];
          if (b === missingBin) this.missS[0] += wy;
          else this.cS[at] += wy;
          q += wy * this.y[r];
        } else if (b === missingBin) {
          this.missS[this.cls[r]] += wr;
        } else {
          this.cS[at * k + this.cls[r]] += wr;
        }
        i++;
      }
      if (b === missingBin) {
        missN = n;
        missW = wsum;
        missQ = q;
      } else {
        this.cN[at] = n;
        this.cW[at] = wsum;
        this.cQ[at] = q;
        m++;
      }
    }
    this.missN = missN;
    this.missW = missW;
    this.missQ = missQ;
    return m;
  }

  private missN = 0;
  private missW = 0;
  private missQ = 0;

  private findSplit(start: number, end: number, hist: Float64Array | null): Best | undefined {
    let best: Best | undefined;
    const features = this.data.dataset.features;
    for (let f = 0; f < features.length; f++) {
      const m = this.collect(f, start, end, hist);
      if (m < 2 && !(m === 1 && this.missN > 0)) continue;
      const kind = features[f].kind;
      if (kind === "categorical" && !this.regression && this.k > 2 && m <= EXHAUSTIVE_LEVELS) {
        best = this.exhaustive(f, m, best);
      } else {
        if (kind === "categorical") this.orderLevels(m);
        else for (let i = 0; i < m; i++) this.binOrder[i] = i;
        best = this.scan(f, m, kind === "categorical", best);
      }
      best = this.knownVersusMissing(f, m, kind === "categorical", best);
    }
    return best;
  }

  // Orders the compact bins for a categorical scan: by mean response, by
  // the second class's share (two classes), or by the share of the node's
  // most frequent class; ties by level code.
  private orderLevels(m: number): void {
    const k = this.k;
    const key = new Float64Array(m);
    let cls = 1;
    if (!this.regression && k > 2) {
      const totals = new Float64Array(k);
      for (let i = 0; i < m; i++) for (let c = 0; c < k; c++) totals[c] += this.cS[i * k + c];
      cls = 0;
      for (let c = 1; c < k; c++) if (totals[c] > totals[cls]) cls = c;
    }
    for (let i = 0; i < m; i++) {
      key[i] = this.regression ? this.cS[i] / this.cW[i] : this.cS[i * k + cls] / this.cW[i];
      this.binOrder[i] = i;
    }
    const order = Array.from(this.binOrder.subarray(0, m));
    order.sort((a, b) => key[a] - key[b] || this.cBin[a] - this.cBin[b]);
    this.binOrder.set(order);
  }

  private scan(
    f: number,
    m: number,
    categorical: boolean,
    best: Best | undefined,
  ): Best | undefined {
    const { k, cN, cW, cS, cQ, leftS } = this;
    const order = this.binOrder;
    this.totals(m);
    let leftN = 0;
    let leftW = 0;
    let leftQ = 0;
    leftS.fill(0);
    // Where this scan's best split falls; a categorical split's level lists
    // are built once, after the scan (building them at each better split
    // made the scan quadratic in the levels).
    let bestAt = -1;
    for (let i = 0; i < m - 1; i++) {
      const e = order[i];
      leftN += cN[e];
      leftW += cW[e];
      leftQ += cQ[e];
      for (let c = 0; c < k; c++) leftS[c] += cS[e * k + c];
      const found = this.evaluate(leftN, leftW, leftQ, best);
      if (found !== undefined) {
        best = found;
        best.feature = f;
        const lastLeft = this.cBin[order[i]];
        best.lastLeftBin = lastLeft;
        if (categorical) {
          bestAt = i;
        } else {
          // As scikit-learn: the midpoint, computed as a/2 + b/2.
          const bins = this.data.bins[f];
          const a = bins.upper[lastLeft];
          const b = bins.lower[this.cBin[order[i + 1]]];
          let threshold = a / 2 + b / 2;
          if (threshold === b || !Number.isFinite(threshold)) threshold = a;
          best.threshold = threshold;
        }
      }
    }
    if (bestAt >= 0) {
      best!.leftBins = Array.from(order.subarray(0, bestAt + 1), (j) => this.cBin[j]);
      best!.rightBins = Array.from(order.subarray(bestAt + 1, m), (j) => this.cBin[j]);
    }
    return best;
  }

  // Every known value on the left, the missing ones on the right: a split on
  // whether the value is known at all.
  private knownVersusMissing(
    f: number,
    m: number,
    categorical: boolean,
    best: Best | undefined,
  ): Best | undefined {
    if (this.missN === 0) return best;
    this.totals(m);
    const found = this.evaluate(this.totN, this.totW, this.totQ, best, true);
    if (found === undefined) return best;
    found.feature = f;
    if (categorical) {
      found.leftBins = Array.from(this.cBin.subarray(0, m));
      found.rightBins = [];
    } else {
      found.lastLeftBin = this.cBin[m - 1];
      found.threshold = Infinity;
    }
    return found;
  }

  private totN = 0;
  private totW = 0;
  private totQ = 0;

  // Sums over the compact bins (missing values not included).
  private totals(m: number): void {
    const { k, cN, cW, cS, cQ, totS } = this;
    let n = 0;
    let w = 0;
    let q = 0;
    totS.fill(0);
    for (let i = 0; i < m; i++) {
      n += cN[i];
      w += cW[i];
      q += cQ[i];
      for (let c = 0; c < k; c++) totS[c] += cS[i * k + c];
    }
    this.totN = n;
    this.totW = w;
    this.totQ = q;
  }

  /**
   * Scores the split whose left side holds the current left sums, with the
   * node's missing values sent left, then right (left wins ties); returns a
   * new best (without feature and threshold filled in) when one beats `best`.
   */
  private evaluate(
    leftN: number,
    leftW: number,
    leftQ: number,
    best: Best | undefined,
    knownLeft = false,
  ): Best | undefined {
    const { k, leftS, missS, totS } = this;
    if (knownLeft) leftS.set(totS);
    const minLeaf = this.s.minLeaf;
    const missN = this.missN;
    let found: Best | undefined;
    const sides = knownLeft ? [0] : missN > 0 ? [1, 0] : [-1];
    for (const side of sides) {
      const withLeft = side === 1;
      const nl = leftN + (withLeft ? missN : 0);
      const nr = this.totN + missN - nl;
      if (nl < minLeaf || nr < minLeaf) continue;
      const wl = leftW + (withLeft ? this.missW : 0);
      const wr = this.totW + this.missW - wl;
      let proxy: number;
      let leftImpurity: number;
      let rightImpurity: number;
      if (this.regression) {
        const sl = leftS[0] + (withLeft ? missS[0] : 0);
        const sr = totS[0] + missS[0] - sl;
        proxy = (sl * sl) / wl + (sr * sr) / wr;
        if (!(best === undefined || proxy > best.proxy)) continue;
        const ql = leftQ + (withLeft ? this.missQ : 0);
        const qr = this.totQ + this.missQ - ql;
        leftImpurity = ql / wl - (sl / wl) * (sl / wl);
        rightImpurity = qr / wr - (sr / wr) * (sr / wr);
      } else {
        let sqL = 0;
        let sqR = 0;
        for (let c = 0; c < k; c++) {
          const l = leftS[c] + (withLeft ? missS[c] : 0);
          const r = totS[c] + missS[c] - l;
          sqL += l * l;
          sqR += r * r;
        }
        leftImpurity = 1 - sqL / (wl * wl);
        rightImpurity = 1 - sqR / (wr * wr);
        proxy = -wr * rightImpurity - wl * leftImpurity;
        if (!(best === undefined || proxy > best.proxy)) continue;
      }
      found = best = {
        proxy,
        feature: -1,
        threshold: NaN,
        leftBins: [],
        rightBins: [],
        lastLeftBin: -1,
        missingLeft: side,
        leftW: wl,
        rightW: wr,
        leftImpurity,
        rightImpurity,
      };
    }
    return found;
  }

  private exhaustive(f: number, m: number, best: Best | undefined): Best | undefined {
    const { k, cN, cW, cS, leftS } = this;
    this.totals(m);
    // Subsets of the first m-1 levels; the last level stays right, so each
    // partition is tried once.
    for (let mask = 1; mask < 1 << (m - 1); mask++) {
      let leftN = 0;
      let leftW = 0;
      leftS.fill(0);
      for (let i = 0; i < m - 1; i++) {
        if (!((mask >>> i) & 1)) continue;
        leftN += cN[i];
        leftW += cW[i];
        for (let c = 0; c < k; c++) leftS[c] += cS[i * k + c];
      }
      const found = this.evaluate(leftN, leftW, 0, best);
      if (found !== undefined) {
        best = found;
        best.feature = f;
        for (let i = 0; i < m; i++) {
          if (i < m - 1 && (mask >>> i) & 1) best.leftBins.push(this.cBin[i]);
          else best.rightBins.push(this.cBin[i]);
        }
      }
    }
    return best;
  }

  /**
   * Stable in-place partition of [start, end): left rows first; returns the
   * first right position. For regression, each child's sums are taken on
   * the way ({@linkcode nodeSums}'s figures, added in the same order).
   */
  private partition(
    start: number,
    end: number,
    best: Best,
    missingLeft: number,
    leftSums: Float64Array | null,
    rightSums: Float64Array | null,
  ): number {
    const { index, scratch } = this;
    const bins = this.data.bins[best.feature];
    const ids = bins.ids;
    const missingBin = bins.count;
    const categorical = this.maskWords[best.feature] > 0;
    const inLeft = categorical ? new Uint8Array(bins.count) : undefined;
    if (inLeft) { for (const b of best.leftBins) inLeft[b] = 1; }
    let l = start;
    let r = 0;
    if (leftSums === null || rightSums === null) {
      for (let i = start; i < end; i++) {
        const row = index[i];
        const b = ids[row];
        const left = b === missingBin
          ? missingLeft === 1
          : inLeft
          ? inLeft[b] === 1
          : b <= best.lastLeftBin;
        if (left) index[l++] = row;
        else scratch[r++] = row;
      }
      index.set(scratch.subarray(0, r), l);
      return l;
    }
    // The two sides' sums are kept in locals, written out twice rather than
    // through a helper over an array: this loop runs for every row of every
    // split of every tree.
    const { y, w } = this;
    let lShift = 0, lWeight = 0, lSum = 0, lSq = 0, lLow = Infinity, lHigh = -Infinity;
    let rShift = 0, rWeight = 0, rSum = 0, rSq = 0, rLow = Infinity, rHigh = -Infinity;
    for (let i = start; i < end; i++) {
      const row = index[i];
      const b = ids[row];
      const left = b === missingBin
        ? missingLeft === 1
        : inLeft
        ? inLeft[b] === 1
        : b <= best.lastLeftBin;
      const v = y[row];
      const wr = w[row];
      if (left) {
        if (l === start) lShift = v;
        index[l++] = row;
        const d = v - lShift;
        const wd = wr * d;
        lWeight += wr;
        lSum += wd;
        lSq += wd * d;
        if (v < lLow) lLow = v;
        if (v > lHigh) lHigh = v;
      } else {
        if (r === 0) rShift = v;
        scratch[r++] = row;
        const d = v - rShift;
        const wd = wr * d;
        rWeight += wr;
        rSum += wd;
        rSq += wd * d;
        if (v < rLow) rLow = v;
        if (v > rHigh) rHigh = v;
      }
    }
    index.set(scratch.subarray(0, r), l);
    leftSums.set([lWeight, lSum, lSq, lLow, lHigh, lShift]);
    rightSums.set([rWeight, rSum, rSq, rLow, rHigh, rShift]);
    return l;
  }

  private finish(): FlatTree {
    const n = this.nodes;
    return {
      task: this.regression ? "regression" : "classification",
      width: this.k,
      nodeCount: n.feature.length,
      feature: Int32Array.from(n.feature),
      threshold: Float64Array.from(n.threshold),
      maskOffset: Int32Array.from(n.maskOffset),
      masks: Uint32Array.from(n.masks),
      maskWords: this.maskWords,
      left: Int32Array.from(n.left),
      right: Int32Array.from(n.right),
      missingLeft: Uint8Array.from(n.missingLeft),
      value: Float64Array.from(n.value),
      rows: Int32Array.from(n.rows),
      weight: Float64Array.from(n.weight),
      impurity: Float64Array.from(n.impurity),
    };
  }
}
