/**
 * A class tree on one feature, grown from that feature's bins instead of
 * its rows: the same tree as {@linkcode growTree} gives on the one-feature
 * dataset, node for node, in time that grows with the feature's distinct
 * values rather than with the table.
 *
 * Why it is the same tree: on one feature a node is a set of bins, and the
 * splitter reads nothing of a node but each bin's summary (rows, weight,
 * weight of each class), which the rows' summaries add up to. With whole
 * weights (bootstrap counts) every such sum is an exact integer, so adding
 * by bin instead of by row in canonical order changes no bit. The tests
 * hold it to `growTree`'s trees on random tables.
 *
 * Why it exists: the proxy check grows one 50-tree ensemble per feature
 * and protected attribute; a feature has a few hundred distinct values at
 * most in a pay table, and the row-by-row grower spent most of the check
 * re-reading rows that a bin summarises.
 *
 * @module
 */

import type { Feature } from "../dataset/types.ts";
import type { FeatureBins } from "./bins.ts";
import { Gini } from "./criterion.ts";
import type { FlatTree } from "./flat_tree.ts";
import type { GrowRows } from "./grow_rows.ts";
import {
  decreasesEnough,
  growLimits,
  type GrowOptions,
  isLeaf,
  missingGoesLeft,
} from "./grow_tree.ts";
import { Histograms } from "./histogram.ts";
import { Splitter } from "./splitter.ts";
import { maskWordsOf, type PendingNode, TreeNodes } from "./tree_nodes.ts";

/** The data of {@linkcode growOneFeatureTree}. */
export interface OneFeatureInput {
  /** The feature. */
  feature: Feature;
  /** Its bins, from `binFeatures`. */
  bins: FeatureBins;
  /** Number of classes. */
  classes: number;
  /** Each row's class code. */
  classOf: ArrayLike<number>;
  /** Each row's whole-number weight (e.g. bootstrap counts); rows of weight 0 are left out. */
  weights: Float64Array;
}

/**
 * Grows a Gini class tree on one feature to the stopping rules: the tree
 * `growTree` grows on the dataset of that one feature and class target.
 *
 * @throws {RangeError} for a weight that is not a whole number >= 0, a
 * class code out of range, no row of positive weight, or bad rules (and
 * `increasing`, which constrains regression trees only).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures } from "./bins.ts";
 * import { growOneFeatureTree } from "./grow_one_feature.ts";
 * import { growTree } from "./grow_tree.ts";
 * const feature = { name: "x", kind: "numeric" as const, values: Float64Array.from({ length: 40 }, (_, i) => i % 8) };
 * const classOf = Int32Array.from({ length: 40 }, (_, i) => (i % 8 < 3 ? 0 : 1));
 * const weights = Float64Array.from({ length: 40 }, (_, i) => i % 3);
 * const dataset = { rows: 40, features: [feature], target: { kind: "classification" as const, name: "g", classes: ["a", "b"], values: classOf } };
 * const bins = binFeatures(dataset);
 * const tree = growOneFeatureTree({ feature, bins: bins[0], classes: 2, classOf, weights }, { minLeaf: 2 });
 * assert.deepEqual(tree, growTree({ dataset, bins, weights }, { minLeaf: 2 }));
 * assert.equal(tree.threshold[0], 2.5);
 * ```
 */
export function growOneFeatureTree(input: OneFeatureInput, options: GrowOptions = {}): FlatTree {
  const limits = growLimits(options);
  if ((options.increasing ?? []).length > 0) {
    throw new RangeError("increasing constrains a regression tree, not a class tree");
  }
  const { feature, bins, classes, classOf, weights } = input;
  const n = weights.length;
  if (classOf.length !== n || feature.values.length !== n) {
    throw new RangeError(`weights, classes and values differ in length`);
  }
  const stride = 2 + classes;
  const missingBin = bins.count;
  // Each bin's summary in the criterion's layout: rows, weight, weight per class.
  const sums = new Float64Array((missingBin + 1) * stride);
  let totalWeight = 0;
  for (let r = 0; r < n; r++) {
    const w = weights[r];
    if (!(w >= 0) || !Number.isInteger(w)) throw new RangeError(`weight of row ${r} is ${w}`);
    const c = classOf[r];
    if (!(c >= 0 && c < classes && Number.isInteger(c))) {
      throw new RangeError(`class of row ${r} is ${c}`);
    }
    if (w === 0) continue;
    const a = bins.ids[r] * stride;
    sums[a]++;
    sums[a + 1] += w;
    sums[a + 2 + c] += w;
    totalWeight += w;
  }
  return new OneFeatureBuilder(input, sums, totalWeight, limits).grow();
}

// The builder of growTree (lib/tree/grow_tree.ts) with bins in place of
// rows: the same stack order, node figures, stopping rules and split
// choice; a node's bins stay in ascending order through the partition.
class OneFeatureBuilder {
  private readonly limits: ReturnType<typeof growLimits>;
  private readonly sums: Float64Array;
  private readonly stride: number;
  private readonly classes: number;
  private readonly missingBin: number;
  private readonly categorical: boolean;
  private readonly totalWeight: number;
  private readonly nodes: TreeNodes;
  private readonly splitter: Splitter;
  // The node's bins (non-empty ones, the missing bin last), partitioned in
  // place through the scratch array as growTree partitions rows.
  private readonly index: Int32Array;
  private readonly scratch: Int32Array;
  // One node's known bins and their summaries, side by side, for the splitter.
  private readonly knownBins: Int32Array;
  private readonly knownSums: Float64Array;
  private readonly missing: Float64Array;
  private readonly classWeights: Float64Array;
  private readonly shares: Float64Array;
  private readonly inLeft: Uint8Array;

  constructor(
    input: OneFeatureInput,
    sums: Float64Array,
    totalWeight: number,
    limits: ReturnType<typeof growLimits>,
  ) {
    const { feature, bins, classes } = input;
    this.limits = limits;
    this.sums = sums;
    this.classes = classes;
    this.stride = 2 + classes;
    this.missingBin = bins.count;
    this.categorical = feature.kind === "categorical";
    this.totalWeight = totalWeight;
    const present: number[] = [];
    for (let b = 0; b <= bins.count; b++) if (sums[b * this.stride] > 0) present.push(b);
    this.index = Int32Array.from(present);
    this.scratch = new Int32Array(present.length);
    this.knownBins = new Int32Array(present.length);
    this.knownSums = new Float64Array(present.length * this.stride);
    this.missing = new Float64Array(this.stride);
    this.classWeights = new Float64Array(classes);
    this.shares = new Float64Array(classes);
    this.inLeft = new Uint8Array(Math.max(1, bins.count));
    const criterion = new Gini(classes);
    // The splitter sizes its buffers from these rows; a node's summaries
    // come to it ready (findInSummaries), so it reads nothing else of them.
    const binsAsRows: GrowRows = {
      count: present.length,
      features: 1,
      weight: new Float64Array(0),
      target: new Float64Array(0),
      classOf: new Int32Array(0),
      bins: new Uint32Array(0),
      offsets: Int32Array.of(0, bins.count + 1),
      moments: new Float64Array(0),
      totalWeight,
    };
    this.splitter = new Splitter(
      binsAsRows,
      [bins],
      [feature.kind],
      new Histograms(binsAsRows, [bins], this.stride),
      criterion,
      limits.minLeaf,
    );
    this.nodes = new TreeNodes("classification", classes, maskWordsOf([feature]));
  }

  grow(): FlatTree {
    if (this.index.length === 0) {
      throw new RangeError("no rows with positive weight to grow a tree on");
    }
    const { limits, splitter, nodes } = this;
    const stack: PendingNode[] = [{
      start: 0,
      end: this.index.length,
      depth: 0,
      parent: -1,
      side: "root",
    }];
    while (stack.length > 0) {
      const { start, end, depth, parent, side } = stack.pop()!;
      const { id, rows } = this.addNode(start, end);
      if (side !== "root") nodes.attach(parent, side, id);
      const impurity = nodes.impurityOf(id);
      if (isLeaf(limits, depth, rows, impurity)) continue;
      const m = this.collect(start, end);
      const found = splitter.findInSummaries(0, this.knownBins, this.knownSums, m, this.missing);
      const best = splitter.choice;
      const weight = nodes.weightOf(id);
      if (!found || !decreasesEnough(best, weight, impurity, this.totalWeight, limits)) continue;
      const missingLeft = missingGoesLeft(best);
      const mid = this.partition(start, end, best.lastLeftBin, best.leftBins, missingLeft);
      nodes.split(id, best, missingLeft);
      stack.push({ start: mid, end, depth: depth + 1, parent: id, side: "right" });
      stack.push({ start, end: mid, depth: depth + 1, parent: id, side: "left" });
    }
    return nodes.finish();
  }

  // A node's figures from its bins' summaries (exact integers: the same
  // as growTree's sums over its rows).
  private addNode(start: number, end: number): { id: number; rows: number } {
    const { sums, stride, classes, classWeights, shares, index } = this;
    classWeights.fill(0);
    let rows = 0;
    let weight = 0;
    for (let i = start; i < end; i++) {
      const a = index[i] * stride;
      rows += sums[a];
      weight += sums[a + 1];
      for (let c = 0; c < classes; c++) classWeights[c] += sums[a + 2 + c];
    }
    let sq = 0;
    for (let c = 0; c < classes; c++) sq += classWeights[c] * classWeights[c];
    const impurity = 1 - sq / (weight * weight);
    for (let c = 0; c < classes; c++) shares[c] = classWeights[c] / weight;
    return { id: this.nodes.add(shares, rows, weight, impurity), rows };
  }

  // The node's known bins and their summaries side by side, and its
  // missing values' summary; returns the known bins' count.
  private collect(start: number, end: number): number {
    const { sums, stride, index, knownBins, knownSums, missing } = this;
    missing.fill(0);
    let m = 0;
    for (let i = start; i < end; i++) {
      const b = index[i];
      const a = b * stride;
      if (b === this.missingBin) {
        for (let c = 0; c < stride; c++) missing[c] = sums[a + c];
        continue;
      }
      knownBins[m] = b;
      for (let c = 0; c < stride; c++) knownSums[m * stride + c] = sums[a + c];
      m++;
    }
    return m;
  }

  // Stable partition of the node's bins, left ones first; returns the
  // first right position.
  private partition(
    start: number,
    end: number,
    lastLeftBin: number,
    leftBins: readonly number[],
    missingLeft: boolean,
  ): number {
    const { index, scratch, inLeft, categorical, missingBin } = this;
    if (categorical) {
      inLeft.fill(0);
      for (const b of leftBins) inLeft[b] = 1;
    }
    let l = start;
    let r = 0;
    for (let i = start; i < end; i++) {
      const b = index[i];
      const left = b === missingBin
        ? missingLeft
        : categorical
        ? inLeft[b] === 1
        : b <= lastLeftBin;
      if (left) index[l++] = b;
      else scratch[r++] = b;
    }
    index.set(scratch.subarray(0, r), l);
    return l;
  }
}
