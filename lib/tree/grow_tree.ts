/**
 * Growing one classification or regression tree (Breiman et al. 1984,
 * ch. 2-4) on binned features, depth first. The learner is in four parts:
 *
 * - lib/tree/grow_rows.ts: the rows of one tree, gathered once and
 *   renumbered in canonical order;
 * - lib/tree/criterion.ts: squared error or Gini, behind one interface;
 * - lib/tree/histogram.ts: per-bin summaries of a node's rows;
 * - lib/tree/splitter.ts: the best split of a node (search, categorical
 *   ordering, missing values);
 *
 * and this module, the builder: an explicit stack of pending nodes, each
 * node's figures, the partition of its rows, and the finished flat tree.
 *
 * @module
 */

import type { Dataset } from "../dataset/types.ts";
import { KeptArray } from "../kept_array.ts";
import type { FeatureBins } from "./bins.ts";
import { type Criterion, criterionFor } from "./criterion.ts";
import type { FlatTree } from "./flat_tree.ts";
import { gatherRows, type GrowRows, RowBuffers } from "./grow_rows.ts";
import { Histograms } from "./histogram.ts";
import { type SplitChoice, Splitter } from "./splitter.ts";
import { maskWordsOf, type PendingNode, TreeNodes } from "./tree_nodes.ts";

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
  /**
   * Features (by index; numeric or ordinal, regression only) along which
   * the prediction must never fall: with the others held fixed, a higher
   * known value never gets a lower prediction. A split of such a feature's
   * values is allowed only when the lower side's mean is at most the
   * higher's; the midpoint of the two sides' values bounds every node below
   * (the lower side's from above, the higher side's from below), and every
   * node's value is its mean clipped to its bounds, its impurity the mean
   * squared error about that value (so pruning, which reads weight x
   * impurity, keeps the property). Missing values go where the split sends
   * them; the order holds among known values.
   */
  increasing?: readonly number[];
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

/**
 * Whether a node stays a leaf without a search: too deep, too few rows to
 * split or to leave `minLeaf` on both sides, or pure. Both builders stop
 * by it (lib/tree/grow_one_feature.ts).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { growLimits, isLeaf } from "./grow_tree.ts";
 * const limits = growLimits({ minLeaf: 3 });
 * assert.equal(isLeaf(limits, 0, 5, 0.4), true); // fewer than 2 x 3 rows
 * assert.equal(isLeaf(limits, 0, 6, 0.4), false);
 * assert.equal(isLeaf(limits, 0, 6, 0), true); // pure
 * ```
 */
export function isLeaf(limits: GrowLimits, depth: number, rows: number, impurity: number): boolean {
  return depth >= limits.maxDepth || rows < limits.minSplit || rows < 2 * limits.minLeaf ||
    impurity <= PURE_IMPURITY;
}

/**
 * Whether a found split decreases the weighted impurity by at least the
 * minimum: its share of the tree's weight times the node's impurity less
 * the children's, weighted (up to PURE_IMPURITY).
 *
 * @param weight The node's weight; `totalWeight` the tree's.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { decreasesEnough } from "./grow_tree.ts";
 * const split = { leftWeight: 2, rightWeight: 2, leftImpurity: 0, rightImpurity: 0 };
 * assert.equal(decreasesEnough(split, 4, 0.5, 8, { minDecrease: 0.25 }), true); // 4/8 x 0.5
 * assert.equal(decreasesEnough(split, 4, 0.5, 8, { minDecrease: 0.3 }), false);
 * ```
 */
export function decreasesEnough(
  split: Pick<SplitChoice, "leftWeight" | "rightWeight" | "leftImpurity" | "rightImpurity">,
  weight: number,
  impurity: number,
  totalWeight: number,
  limits: Pick<GrowLimits, "minDecrease">,
): boolean {
  const improvement = (weight / totalWeight) *
    (impurity - (split.rightWeight / weight) * split.rightImpurity -
      (split.leftWeight / weight) * split.leftImpurity);
  return !(improvement + PURE_IMPURITY < limits.minDecrease);
}

/**
 * Whether a split sends missing values left: its own choice, or, when the
 * node had none, the heavier child (the left one on a tie).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { missingGoesLeft } from "./grow_tree.ts";
 * assert.equal(missingGoesLeft({ missing: "heavier", leftWeight: 3, rightWeight: 3 }), true);
 * assert.equal(missingGoesLeft({ missing: "right", leftWeight: 9, rightWeight: 3 }), false);
 * ```
 */
export function missingGoesLeft(
  split: Pick<SplitChoice, "missing" | "leftWeight" | "rightWeight">,
): boolean {
  return split.missing === "left" ||
    (split.missing === "heavier" && split.leftWeight >= split.rightWeight);
}

/**
 * A node whose impurity is at most this is pure, and a split must improve
 * on the minimum decrease by more than it (scikit-learn's EPSILON, the
 * double-precision machine epsilon).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { PURE_IMPURITY } from "./grow_tree.ts";
 * assert.equal(PURE_IMPURITY, Number.EPSILON);
 * ```
 */
export const PURE_IMPURITY = 2.220446049250313e-16;

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
  const limits = growLimits(options);
  const increasing = increasingFlags(input.dataset, options.increasing ?? []);
  return new Builder(input, { ...limits, increasing }).grow();
}

/** A grown tree and the leaf each row it was grown on ended in. */
export interface GrownLeaves {
  /** The tree, as {@linkcode growTree} grows it. */
  tree: FlatTree;
  /**
   * Per row of the dataset, the leaf the partition put it in; -1 for a row
   * of weight 0, which the tree never saw. The leaf a walk of the row's
   * values reaches: a split's threshold and level masks send each side's
   * bins where the partition sent them.
   */
  leafOf: Int32Array;
}

/**
 * Grows a tree as {@linkcode growTree} does and keeps the leaf of each row
 * it was grown on: a bagged tree's drawn rows then need no walk down it.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures } from "./bins.ts";
 * import { applyRow } from "./flat_tree.ts";
 * import { growTreeLeaves } from "./grow_tree.ts";
 * const dataset = {
 *   rows: 5,
 *   features: [{ name: "x", kind: "numeric" as const, values: Float64Array.of(1, 2, 3, 4, 5) }],
 *   target: { kind: "regression" as const, name: "y", values: Float64Array.of(10, 10, 20, 20, 30) },
 * };
 * const weights = Float64Array.of(1, 2, 0, 1, 1);
 * const { tree, leafOf } = growTreeLeaves({ dataset, bins: binFeatures(dataset), weights }, { minLeaf: 1 });
 * assert.equal(leafOf[2], -1); // not drawn
 * for (const r of [0, 1, 3, 4]) assert.equal(leafOf[r], applyRow(tree, dataset.features, r));
 * ```
 */
export function growTreeLeaves(input: GrowInput, options: GrowOptions = {}): GrownLeaves {
  const limits = growLimits(options);
  const increasing = increasingFlags(input.dataset, options.increasing ?? []);
  const builder = new Builder(input, { ...limits, increasing }, true);
  const tree = builder.grow();
  return { tree, leafOf: builder.leafOfRows() };
}

/** The stopping rules of {@linkcode GrowOptions} with their defaults, checked. */
export interface GrowLimits {
  minLeaf: number;
  minSplit: number;
  maxDepth: number;
  minDecrease: number;
}

/**
 * Stopping rules with their defaults, after checking them.
 *
 * @throws {RangeError} for a rule out of its range.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { growLimits } from "./grow_tree.ts";
 * assert.deepEqual(growLimits({ minLeaf: 3 }), { minLeaf: 3, minSplit: 6, maxDepth: Infinity, minDecrease: 0 });
 * assert.throws(() => growLimits({ minLeaf: 0 }), RangeError);
 * ```
 */
export function growLimits(options: GrowOptions): GrowLimits {
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
  return { minLeaf, minSplit, maxDepth, minDecrease };
}

interface Settings extends GrowLimits {
  /** 1 per feature constrained to increase; null when none is. */
  increasing: Uint8Array | null;
}

// The constrained features as flags, after checking them.
function increasingFlags(dataset: Dataset, features: readonly number[]): Uint8Array | null {
  if (features.length === 0) return null;
  if (dataset.target.kind !== "regression") {
    throw new RangeError("increasing constrains a regression tree, not a class tree");
  }
  const flags = new Uint8Array(dataset.features.length);
  for (const f of features) {
    const feature = dataset.features[f];
    if (!Number.isInteger(f) || feature === undefined) {
      throw new RangeError(`increasing: no feature ${f}`);
    }
    if (feature.kind === "categorical") {
      throw new RangeError(
        `increasing: "${feature.name}" is categorical, with no order to increase along`,
      );
    }
    flags[f] = 1;
  }
  return flags;
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
// rows in index order, written into `into` (a node of at least one row).
function nodeSums(
  y: Float64Array,
  w: Float64Array,
  index: Int32Array,
  start: number,
  end: number,
  into: Float64Array = new Float64Array(NODE_SUMS),
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
  writeSums(into, weight, sum, sq, low, high, shift);
  return into;
}

// Writes a node's sums in nodeSums' order.
function writeSums(
  sums: Float64Array,
  weight: number,
  sum: number,
  squares: number,
  low: number,
  high: number,
  shift: number,
): void {
  sums[SUM_WEIGHT] = weight;
  sums[SUM_TARGET] = sum;
  sums[SUM_SQUARES] = squares;
  sums[SUM_LOW] = low;
  sums[SUM_HIGH] = high;
  sums[SUM_SHIFT] = shift;
}

// The mean target of a node's sums.
function sumsMean(sums: Float64Array): number {
  return sums[SUM_SHIFT] + sums[SUM_TARGET] / sums[SUM_WEIGHT];
}

/** A node waiting on the stack, with what its parent handed down. */
interface PendingRows extends PendingNode {
  /** Its histogram, when the parent's split handed one down (null: fill when needed). */
  histogram: Float64Array | null;
  /** Its regression sums, when the parent's partition took them. */
  sums: Float64Array | null;
  /** The features whose bin order of its rows the parent's split handed down (a mask). */
  ordered: number;
  /** Bounds of its value from constrained splits above (-Infinity, Infinity: none). */
  floor: number;
  ceiling: number;
}

// The rows of the tree being grown, in arrays this thread keeps from tree to
// tree (a builder grows one tree and is done before the next starts).
const threadRows = new RowBuffers();
// Likewise its index (the rows in node order) and the partition's scratch.
const threadIndex = new KeptArray((n) => new Int32Array(n));
const threadScratch = new KeptArray((n) => new Int32Array(n));

class Builder {
  private readonly s: Settings;
  private readonly regression: boolean;
  private readonly criterion: Criterion;
  private readonly rows: GrowRows;
  private readonly bins: FeatureBins[];
  private readonly histograms: Histograms;
  private readonly splitter: Splitter;
  // The node's rows, as local row numbers; the partition moves right rows
  // through the scratch array to keep both sides in order.
  private readonly index: Int32Array;
  private readonly scratch: Int32Array;
  private readonly nodes: TreeNodes;
  private readonly maskWords: Int32Array;
  private readonly inLeft: Uint8Array;
  // Sums arrays already read, for later splits (see takeSums).
  private readonly spareSums: Float64Array[] = [];
  // A class node's weight per class, filled afresh at each node, and a
  // node's values (its mean, or its share of each class).
  private readonly classWeights: Float64Array;
  private readonly nodeValues: Float64Array;
  // The rows as gathered (their canonical order, their weights), and the
  // leaf of the row at each place of the index, set as leaves are finished
  // (a finished node's rows keep their places).
  private readonly order: Int32Array;
  private readonly weights: Float64Array;
  private readonly leafAt: Int32Array | null;

  /** @param keepLeaves Whether to note each row's leaf (see leafOfRows). */
  constructor(data: GrowInput, settings: Settings, keepLeaves = false) {
    this.s = settings;
    const { dataset } = data;
    const n = dataset.rows;
    this.criterion = criterionFor(dataset);
    this.regression = this.criterion.task === "regression";
    this.order = data.order ?? canonicalRowOrder(dataset);
    this.weights = data.weights ?? new Float64Array(n).fill(1);
    this.rows = gatherRows(dataset, data.bins, this.weights, this.order, threadRows);
    this.bins = data.bins;
    const kept = this.rows.count;
    this.leafAt = keepLeaves ? new Int32Array(kept) : null;
    this.index = threadIndex.view(kept);
    for (let i = 0; i < kept; i++) this.index[i] = i;
    this.scratch = threadScratch.view(kept);
    this.histograms = new Histograms(this.rows, data.bins, this.criterion.stride);
    this.splitter = new Splitter(
      this.rows,
      data.bins,
      dataset.features.map((f) => f.kind),
      this.histograms,
      this.criterion,
      settings.minLeaf,
      settings.increasing,
    );
    this.maskWords = maskWordsOf(dataset.features);
    this.nodes = new TreeNodes(this.criterion.task, this.criterion.width, this.maskWords);
    // One flag per bin and one for the missing bin.
    this.inLeft = new Uint8Array(Math.max(1, ...data.bins.map((b) => b.count)) + 1);
    this.classWeights = new Float64Array(this.criterion.width);
    this.nodeValues = new Float64Array(this.criterion.width);
  }

  grow(): FlatTree {
    if (this.index.length === 0) {
      throw new RangeError("no rows with positive weight to grow a tree on");
    }
    const stack: PendingRows[] = [{
      start: 0,
      end: this.index.length,
      depth: 0,
      parent: -1,
      side: "root",
      histogram: null,
      sums: null,
      ordered: 0,
      floor: -Infinity,
      ceiling: Infinity,
    }];
    const { histograms, splitter } = this;
    while (stack.length > 0) {
      const node = stack.pop()!;
      const { start, end, depth } = node;
      let hist = node.histogram;
      const id = this.addNode(start, end, node.sums, node.floor, node.ceiling);
      // The sums are read; the array serves a later split.
      if (node.sums !== null) this.spareSums.push(node.sums);
      if (node.side !== "root") this.nodes.attach(node.parent, node.side, id);
      const impurity = this.nodes.impurityOf(id);
      const rows = end - start;
      if (isLeaf(this.s, depth, rows, impurity)) {
        histograms.release(hist);
        this.leafAt?.fill(id, start, end);
        continue;
      }
      if (hist === null && histograms.anyDense(rows)) {
        hist = histograms.acquire(rows);
        histograms.fill(hist, this.index, start, end, rows);
      }
      const found = splitter.find(this.index, start, end, hist, node.ordered);
      const best = splitter.choice;
      const weight = this.nodes.weightOf(id);
      if (!found || !decreasesEnough(best, weight, impurity, this.rows.totalWeight, this.s)) {
        histograms.release(hist);
        this.leafAt?.fill(id, start, end);
        continue;
      }
      const missingLeft = missingGoesLeft(best);
      const leftSums = this.regression ? this.takeSums() : null;
      const rightSums = this.regression ? this.takeSums() : null;
      const mid = this.partition(start, end, best, missingLeft, leftSums, rightSums);
      this.nodes.split(id, best, missingLeft);
      // The rows' bin orders the search made or was given go down with them.
      const ordered = splitter.ordered;
      if (ordered !== 0) {
        splitter.orders.split(ordered, this.index, this.scratch, start, mid, end);
      }
      const [leftHist, rightHist] = histograms.children(hist, this.index, start, mid, end);
      // A constrained feature's known values split by order: the midpoint of
      // the two sides' values bounds the lower side from above and the
      // higher from below, for every node beneath.
      let { floor, ceiling } = node;
      let split = NaN;
      if (
        this.s.increasing !== null && this.s.increasing[best.feature] === 1 &&
        best.threshold !== Infinity
      ) {
        const clip = (v: number) => Math.min(ceiling, Math.max(floor, v));
        split = (clip(sumsMean(leftSums!)) + clip(sumsMean(rightSums!))) / 2;
      }
      stack.push({
        start: mid,
        end,
        depth: depth + 1,
        parent: id,
        side: "right",
        histogram: rightHist,
        sums: rightSums,
        ordered,
        floor: Number.isNaN(split) ? floor : split,
        ceiling,
      });
      if (!Number.isNaN(split)) ceiling = split;
      stack.push({
        start,
        end: mid,
        depth: depth + 1,
        parent: id,
        side: "left",
        histogram: leftHist,
        sums: leftSums,
        ordered,
        floor,
        ceiling,
      });
    }
    return this.nodes.finish();
  }

  /** After `grow`, each dataset row's leaf; -1 for a row of weight 0. */
  leafOfRows(): Int32Array {
    const { order, weights, index } = this;
    const leafAt = this.leafAt!;
    const n = order.length;
    // Local row i is the i-th row of positive weight in canonical order.
    const original = new Int32Array(index.length);
    for (let j = 0, i = 0; j < n; j++) if (weights[order[j]] > 0) original[i++] = order[j];
    const leafOf = new Int32Array(n).fill(-1);
    for (let p = 0; p < index.length; p++) leafOf[original[index[p]]] = leafAt[p];
    return leafOf;
  }

  private addNode(
    start: number,
    end: number,
    taken: Float64Array | null,
    floor: number,
    ceiling: number,
  ): number {
    const { index } = this;
    const { weight: w, classOf } = this.rows;
    const k = this.criterion.width;
    const nodeValues = this.nodeValues;
    let weight = 0;
    let impurity: number;
    if (this.regression) {
      // Sums taken about the first row's target so that they do not cancel
      // (as raw sums of y^2 would, by ~1e-13 on log pay); a node whose
      // targets are all equal gets impurity exactly 0. A child's sums come
      // from its parent's partition (the same rows in the same order).
      const sums = taken ?? nodeSums(this.rows.target, w, index, start, end);
      weight = sums[SUM_WEIGHT];
      const sum = sums[SUM_TARGET];
      const sq = sums[SUM_SQUARES];
      const low = sums[SUM_LOW];
      const high = sums[SUM_HIGH];
      const shift = sums[SUM_SHIFT];
      const offset = sum / weight;
      const mean = shift + offset;
      impurity = low === high ? 0 : Math.max(0, sq / weight - offset * offset);
      // Bounds from constrained splits above: the value is the mean clipped
      // to them, the impurity the mean squared error about that value.
      const value = Math.min(ceiling, Math.max(floor, mean));
      if (value !== mean) impurity += (mean - value) * (mean - value);
      nodeValues[0] = value;
    } else {
      const values = this.classWeights;
      values.fill(0);
      for (let i = start; i < end; i++) {
        const r = index[i];
        values[classOf[r]] += w[r];
        weight += w[r];
      }
      let sq = 0;
      for (let c = 0; c < k; c++) sq += values[c] * values[c];
      impurity = 1 - sq / (weight * weight);
      for (let c = 0; c < k; c++) nodeValues[c] = values[c] / weight;
    }
    return this.nodes.add(nodeValues, end - start, weight, impurity);
  }

  /**
   * Stable in-place partition of [start, end): left rows first; returns the
   * first right position. For regression, each child's sums are taken on
   * the way ({@linkcode nodeSums}'s figures, added in the same order).
   */
  private partition(
    start: number,
    end: number,
    best: SplitChoice,
    missingLeft: boolean,
    leftSums: Float64Array | null,
    rightSums: Float64Array | null,
  ): number {
    const { index, scratch } = this;
    const f = best.feature;
    const { bins, features, offsets } = this.rows;
    const offset = offsets[f];
    const missingBin = this.bins[f].count;
    const categorical = this.maskWords[f] > 0;
    // A bin goes left when its flag is 1 (categorical) or it is at most the
    // last left bin (numeric); the missing bin by the split's direction.
    const inLeft = this.inLeft;
    const lastLeft = categorical ? -1 : best.lastLeftBin;
    if (categorical) {
      inLeft.fill(0, 0, missingBin);
      for (const b of best.leftBins) inLeft[b] = 1;
    }
    // Without a branch per row (its side is a coin toss to the processor):
    // each row is written to both sides and only its own side's count moves.
    // Left is 1 or 0: a bin at most the last left one (numeric; the missing
    // bin lies past every other), the flag of its level (categorical), and
    // the missing bin by the split's direction.
    const missingInt = missingLeft ? 1 : 0;
    if (categorical) inLeft[missingBin] = missingInt;
    let l = start;
    let r = 0;
    for (let i = start; i < end; i++) {
      const row = index[i];
      const b = bins[row * features + f] - offset;
      const left = categorical
        ? inLeft[b]
        : (((lastLeft - b) >> 31) + 1) | ((((b ^ missingBin) - 1) >>> 31) & missingInt);
      index[l] = row;
      scratch[r] = row;
      l += left;
      r += 1 - left;
    }
    index.set(scratch.subarray(0, r), l);
    if (leftSums === null || rightSums === null) return l;
    // Each side's sums over its rows in the order they were sent there: the
    // same additions, in the same order, as adding them during the pass.
    // (Both sides hold rows: a split leaves neither empty.)
    const { target: y, weight: w } = this.rows;
    nodeSums(y, w, index, start, l, leftSums);
    nodeSums(y, w, index, l, end, rightSums);
    return l;
  }

  // A node's sums array: one read before, or a new one. Two small typed
  // arrays allocated per split took 12% of a CPS1988 tree's growth.
  private takeSums(): Float64Array {
    return this.spareSums.pop() ?? new Float64Array(NODE_SUMS);
  }
}
