/**
 * A bagged ensemble of pruned trees (Breiman 1996, *Machine Learning* 24):
 * each tree is grown on a bootstrap resample, given as integer weights (the
 * table is never copied), then pruned; out-of-bag rows (those a tree never
 * saw) give honest predictions for every row (Breiman 1996b).
 *
 * @module
 */

import type { Dataset } from "../dataset/types.ts";
import { KeptArray } from "../kept_array.ts";
import { binFeatures, type FeatureBins } from "../tree/bins.ts";
import { scoreSubtrees } from "../tree/cross_validate.ts";
import { applyRow, type FlatTree } from "../tree/flat_tree.ts";
import {
  canonicalRowOrder,
  type GrowOptions,
  growTree,
  growTreeLeaves,
} from "../tree/grow_tree.ts";
import {
  distinctSteps,
  pruneTree,
  type PruningPath,
  pruningPath,
  stepAt,
  subtreeAfter,
  subtreeNodeOf,
} from "../tree/prune.ts";
import { shareableTree } from "../tree/share_tree.ts";
import { bootstrapCounts, resampleStates } from "./bootstrap.ts";
import { importanceRng, treeImportanceIncrease } from "./importance.ts";

/**
 * How each tree is pruned: at one alpha for all (`"alpha"`, e.g. the one the
 * reference tree's cross-validation chose), at the alpha that minimises the
 * tree's own out-of-bag error (`"oob"`), or not at all (`"none"`).
 */
export type PruneMode = "alpha" | "oob" | "none";

/** Options of {@linkcode fitEnsemble}. */
export interface EnsembleOptions {
  /**
   * Number of trees.
   * @default {200}
   */
  trees?: number;
  /**
   * Seed of the resamples; the same seed and table give the same ensemble
   * (the resamples are also keyed by the target, see `resampleStates`).
   * @default {1}
   */
  seed?: number;
  /** Stopping rules of every tree. */
  grow?: GrowOptions;
  /**
   * How trees are pruned.
   * @default {"alpha"}
   */
  prune?: PruneMode;
  /** The alpha of `prune: "alpha"`. */
  alpha?: number;
  /** Called after each tree with the number done and the total. */
  onProgress?: (done: number, total: number) => void;
  /**
   * Measure each tree's part of permutation importance as it is fitted
   * (regression; see `featureImportance`), with these shuffles per feature
   * and this seed.
   */
  importance?: { repeats: number; seed: number };
  /**
   * Also make each tree's shareable copy as it is fitted (`shareableTree`),
   * with the target in money for a regression tree's leaves (see
   * `diverseLeaves`).
   */
  share?: { money?: Float64Array };
}

/** A fitted ensemble with its out-of-bag predictions. */
export interface Ensemble {
  /** The pruned trees. */
  trees: FlatTree[];
  /**
   * Each tree's resampling generator state, four words per tree (see
   * `resampleStates`): with them the in-bag counts can be regenerated, so
   * they stay in memory and in the analyst's file, never in a shared model.
   */
  resamples: Int32Array;
  /** The alpha each tree was pruned at (0 when not pruned). */
  alphas: Float64Array;
  /** Values per prediction: 1 (regression) or the number of classes. */
  width: number;
  /**
   * Out-of-bag prediction per row (`width` values each): the mean over the
   * trees that did not draw the row; NaN where every tree drew it.
   */
  oob: Float64Array;
  /** How many trees each row was out of bag for. */
  oobTrees: Int32Array;
  /**
   * With the `importance` option: each tree's part of permutation
   * importance (`treeImportanceIncrease`), in tree order.
   */
  importance?: { repeats: number; seed: number; parts: Float64Array[] };
  /** With the `share` option: each tree's shareable copy, in tree order. */
  shared?: FlatTree[];
}

/**
 * Fits a bagged ensemble.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { fitEnsemble } from "./fit_ensemble.ts";
 * const years = Array.from({ length: 60 }, (_, i) => i % 30);
 * const dataset = {
 *   rows: 60,
 *   features: [{ name: "years", kind: "numeric" as const, values: Float64Array.from(years) }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.from(years, (y) => 40 + y) },
 * };
 * const ensemble = fitEnsemble(dataset, { trees: 20, seed: 3, prune: "none" });
 * assert(ensemble.trees.length === 20 && ensemble.oobTrees.every((n) => n > 0));
 * ```
 */
export function fitEnsemble(
  dataset: Dataset,
  options: EnsembleOptions = {},
  bins: FeatureBins[] = binFeatures(dataset),
): Ensemble {
  checkEnsembleOptions(options);
  const count = options.trees ?? 200;
  const seed = options.seed ?? 1;
  const order = canonicalRowOrder(dataset);
  const states = resampleStates(seed, dataset.target.values, count);
  const trees: FlatTree[] = [];
  const alphas = new Float64Array(count);
  const outOfBag = new OutOfBagSums(dataset.rows, widthOf(dataset));
  const parts: Float64Array[] = [];
  const shared: FlatTree[] = [];
  for (let b = 0; b < count; b++) {
    const fitted = fitOneTree(dataset, bins, order, states, b, options);
    trees.push(fitted.tree);
    alphas[b] = fitted.alpha;
    outOfBag.add(b, fitted.oob);
    if (fitted.importance !== undefined) parts.push(fitted.importance);
    if (fitted.shared !== undefined) shared.push(fitted.shared);
    options.onProgress?.(b + 1, count);
  }
  const ensemble = assembleEnsemble(
    dataset,
    trees,
    alphas,
    outOfBag,
    states,
    importanceParts(options, parts),
  );
  if (options.share !== undefined) ensemble.shared = shared;
  return ensemble;
}

/**
 * Checks ensemble options, throwing a RangeError for bad ones.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { checkEnsembleOptions } from "./fit_ensemble.ts";
 * checkEnsembleOptions({ trees: 5, alpha: 0 });
 * checkEnsembleOptions({ prune: "none" });
 * assert.throws(() => checkEnsembleOptions({ trees: 0, prune: "none" }), RangeError);
 * assert.throws(() => checkEnsembleOptions({ trees: 1.5, prune: "none" }), RangeError);
 * // Pruning at one alpha (the default mode) needs the alpha.
 * assert.throws(() => checkEnsembleOptions({ trees: 5 }), /needs an alpha/);
 * assert.throws(() => checkEnsembleOptions({ alpha: -1 }), /needs an alpha/);
 * ```
 */
export function checkEnsembleOptions(options: EnsembleOptions): void {
  const count = options.trees ?? 200;
  if (!Number.isInteger(count) || count < 1) {
    throw new RangeError(`trees must be a whole number >= 1, got ${count}`);
  }
  if (
    (options.prune ?? "alpha") === "alpha" && !(options.alpha !== undefined && options.alpha >= 0)
  ) {
    throw new RangeError(`prune "alpha" needs an alpha >= 0`);
  }
}

// Each tree's bootstrap counts, in one array per thread reused from tree to
// tree (225 KB a tree on CPS1988).
const threadCounts = new KeptArray((n) => new Float64Array(n));

/**
 * Grows and prunes tree `index`, whose resample comes from its generator
 * state in `states`; the same arguments give the same tree in any thread.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures } from "../tree/bins.ts";
 * import { canonicalRowOrder } from "../tree/grow_tree.ts";
 * import { bootstrapCounts, resampleStates } from "./bootstrap.ts";
 * import { fitOneTree } from "./fit_ensemble.ts";
 * // Three rows at each x = 1..4; pay 10 up to x = 2, 30 above.
 * const x = Float64Array.from({ length: 12 }, (_, i) => 1 + (i % 4));
 * const y = x.map((v) => (v <= 2 ? 10 : 30));
 * const dataset = {
 *   rows: 12,
 *   features: [{ name: "x", kind: "numeric" as const, values: x }],
 *   target: { kind: "regression" as const, name: "pay", values: y },
 * };
 * const states = resampleStates(5, y, 3);
 * const args = [dataset, binFeatures(dataset), canonicalRowOrder(dataset), states, 2] as const;
 * const fitted = fitOneTree(...args, { prune: "none", grow: { minLeaf: 1 } });
 * assert.equal(fitted.alpha, 0);
 * // Rows the tree drew get NaN; the others its prediction, which (grown to
 * // pure leaves) is the row's pay wherever a row of the same x was drawn.
 * const drawn = bootstrapCounts(12, states, 2);
 * let checked = 0;
 * for (let r = 0; r < 12; r++) {
 *   if (drawn[r] > 0) assert(Number.isNaN(fitted.oob[r]));
 *   else if (drawn.some((n, s) => n > 0 && x[s] === x[r])) {
 *     assert.equal(fitted.oob[r], y[r]);
 *     checked++;
 *   }
 * }
 * assert(checked > 0);
 * assert.equal(fitOneTree(...args, { alpha: 5 }).alpha, 5);
 * ```
 */
export function fitOneTree(
  dataset: Dataset,
  bins: FeatureBins[],
  order: Int32Array,
  states: Int32Array,
  index: number,
  options: EnsembleOptions,
): {
  tree: FlatTree;
  alpha: number;
  oob: Float64Array;
  importance?: Float64Array;
  shared?: FlatTree;
} {
  const mode = options.prune ?? "alpha";
  // Read while the tree is fitted, never kept: the thread's one array.
  const weights = bootstrapCounts(dataset.rows, states, index, threadCounts.view(dataset.rows));
  // The drawn rows' leaves are kept when a shareable copy needs every row's.
  const input = { dataset, bins, weights, order };
  const { tree: grown, leafOf } = options.share === undefined
    ? { tree: growTree(input, options.grow), leafOf: null }
    : growTreeLeaves(input, options.grow);
  let alpha = mode === "alpha" ? options.alpha! : 0;
  let tree = grown;
  if (mode === "oob") {
    // One pruning path serves both the choice of alpha and the subtree.
    const path = pruningPath(grown);
    alpha = oobAlpha(path, grown, dataset, weights);
    // At alpha 0 the tree stays whole, as pruneTree keeps it.
    if (alpha > 0) tree = subtreeAfter(grown, path, stepAt(path, alpha));
  } else if (alpha > 0) {
    tree = pruneTree(grown, alpha);
  }
  // The undrawn rows' leaves, walked down the tree once (by the importance
  // measure's walk when there is one); with a shareable copy, the drawn
  // rows' too, from the partition that grew the tree (the grown leaf's
  // place in the pruned tree).
  const leaves = leafOf ?? new Int32Array(dataset.rows);
  if (leafOf !== null && tree !== grown) {
    const nodeOf = subtreeNodeOf(grown, tree);
    for (let r = 0; r < dataset.rows; r++) if (leaves[r] !== -1) leaves[r] = nodeOf[leaves[r]];
  }
  const wanted = dataset.target.kind === "regression" ? options.importance : undefined;
  const importance = wanted === undefined ? undefined : treeImportanceIncrease(
    tree,
    dataset,
    weights,
    wanted.repeats,
    importanceRng(wanted.seed, index),
    leaves,
  );
  if (importance === undefined) {
    for (let r = 0; r < dataset.rows; r++) {
      if (weights[r] === 0) leaves[r] = applyRow(tree, dataset.features, r);
    }
  }
  // The tree's prediction for each row it did not draw (NaN for the others).
  const width = tree.width;
  const oob = new Float64Array(dataset.rows * width).fill(NaN);
  for (let r = 0; r < dataset.rows; r++) {
    if (weights[r] !== 0) continue;
    const leaf = leaves[r];
    for (let c = 0; c < width; c++) oob[r * width + c] = tree.value[leaf * width + c];
  }
  const shared = options.share === undefined
    ? undefined
    : shareableTree(tree, dataset.features, weights, options.share.money, leaves);
  return {
    tree,
    alpha,
    oob,
    ...(importance ? { importance } : {}),
    ...(shared ? { shared } : {}),
  };
}

/**
 * The importance parts of an ensemble's trees with their settings, when
 * they were measured (all trees' parts, in tree order).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { importanceParts } from "./fit_ensemble.ts";
 * const parts = [Float64Array.of(1), Float64Array.of(2)];
 * assert.deepEqual(importanceParts({ importance: { repeats: 1, seed: 3 } }, parts), { repeats: 1, seed: 3, parts });
 * assert.equal(importanceParts({}, []), undefined);
 * ```
 */
export function importanceParts(
  options: EnsembleOptions,
  parts: Float64Array[],
): Ensemble["importance"] {
  const wanted = options.importance;
  if (wanted === undefined || parts.length === 0) return undefined;
  return { repeats: wanted.repeats, seed: wanted.seed, parts };
}

/**
 * The trees' out-of-bag predictions summed as they come, in tree order (so
 * the sums do not depend on which thread grew which tree): a tree that
 * comes before those ahead of it waits until they are in. Only the waiting
 * trees' predictions are held, not every tree's; on a million rows that
 * is 8 MB a tree.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { OutOfBagSums } from "./fit_ensemble.ts";
 * const sums = new OutOfBagSums(4, 1);
 * // Tree 1 comes first and waits for tree 0; no tree left out row 3.
 * sums.add(1, Float64Array.of(6, NaN, 8, NaN));
 * assert.equal(sums.waiting, 1);
 * sums.add(0, Float64Array.of(NaN, 2, 4, NaN));
 * assert.equal(sums.waiting, 0);
 * const { oob, oobTrees } = sums.finish(2);
 * assert.deepEqual([...oob], [6, 2, 6, NaN]); // row 2: (4 + 8) / 2
 * assert.deepEqual([...oobTrees], [1, 1, 2, 0]);
 * assert.throws(() => new OutOfBagSums(4, 1).finish(1), /0 of 1 trees/);
 * ```
 */
export class OutOfBagSums {
  readonly #width: number;
  readonly #sums: Float64Array;
  readonly #trees: Int32Array;
  readonly #held = new Map<number, Float64Array>();
  #next = 0;

  /** @param width Values per row: 1 (regression) or the number of classes. */
  constructor(rows: number, width: number) {
    this.#width = width;
    this.#sums = new Float64Array(rows * width);
    this.#trees = new Int32Array(rows);
  }

  /** Trees in and waiting for one before them. */
  get waiting(): number {
    return this.#held.size;
  }

  /**
   * Adds tree `tree`'s prediction for each row it did not draw (`width`
   * values per row; NaN for rows it drew), from `fitOneTree`.
   */
  add(tree: number, values: Float64Array): void {
    if (tree < this.#next || this.#held.has(tree)) {
      throw new RangeError(`tree ${tree}'s out-of-bag predictions were already added`);
    }
    this.#held.set(tree, values);
    for (
      let next = this.#held.get(this.#next);
      next !== undefined;
      next = this.#held.get(this.#next)
    ) {
      this.#held.delete(this.#next);
      addOutOfBag(next, this.#width, this.#sums, this.#trees);
      this.#next++;
    }
  }

  /** The mean per row over the trees that left it out (NaN: none did), once all `count` are in. */
  finish(count: number): { oob: Float64Array; oobTrees: Int32Array } {
    if (this.#next !== count) {
      throw new RangeError(`${this.#next} of ${count} trees' out-of-bag predictions are in`);
    }
    const width = this.#width;
    const oobTrees = this.#trees;
    const oob = new Float64Array(this.#sums.length);
    for (let r = 0; r < oobTrees.length; r++) {
      for (let c = 0; c < width; c++) {
        oob[r * width + c] = oobTrees[r] > 0 ? this.#sums[r * width + c] / oobTrees[r] : NaN;
      }
    }
    return { oob, oobTrees };
  }
}

/**
 * Puts fitted trees together with their out-of-bag predictions.
 *
 * @param outOfBag Every tree's out-of-bag predictions, added.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures } from "../tree/bins.ts";
 * import { growTree } from "../tree/grow_tree.ts";
 * import { assembleEnsemble, OutOfBagSums } from "./fit_ensemble.ts";
 * const dataset = {
 *   rows: 4,
 *   features: [{ name: "x", kind: "numeric" as const, values: Float64Array.of(1, 2, 3, 4) }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.of(2, 2, 6, 8) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) });
 * const outOfBag = new OutOfBagSums(4, 1);
 * outOfBag.add(0, Float64Array.of(NaN, 2, 4, NaN));
 * outOfBag.add(1, Float64Array.of(6, NaN, 8, NaN));
 * const ensemble = assembleEnsemble(dataset, [tree, tree], new Float64Array(2), outOfBag, new Int32Array(8));
 * assert.deepEqual([...ensemble.oob], [6, 2, 6, NaN]);
 * assert.deepEqual([...ensemble.oobTrees], [1, 1, 2, 0]);
 * assert.equal(ensemble.width, 1);
 * ```
 */
export function assembleEnsemble(
  dataset: Dataset,
  trees: FlatTree[],
  alphas: Float64Array,
  outOfBag: OutOfBagSums,
  resamples: Int32Array,
  importance?: Ensemble["importance"],
): Ensemble {
  const width = widthOf(dataset);
  const { oob, oobTrees } = outOfBag.finish(trees.length);
  const ensemble: Ensemble = { trees, resamples, alphas, width, oob, oobTrees };
  if (importance !== undefined) ensemble.importance = importance;
  return ensemble;
}

/**
 * Values per prediction of a dataset's trees: 1 (regression) or the number of classes.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { widthOf } from "./fit_ensemble.ts";
 * const target = { kind: "classification" as const, name: "g", classes: ["a", "b", "c"], values: new Int32Array(0) };
 * assert.equal(widthOf({ rows: 0, features: [], target }), 3);
 * ```
 */
export function widthOf(dataset: Dataset): number {
  return dataset.target.kind === "regression" ? 1 : dataset.target.classes.length;
}

// Adds one tree's out-of-bag predictions (NaN: rows it drew) to the sums.
// A function of its own, called once per tree, is optimised after a few
// trees; the same loop inline ran mostly unoptimised (0.44 s of a CPS1988
// fit's main thread in a profile).
function addOutOfBag(
  values: Float64Array,
  width: number,
  oobSum: Float64Array,
  oobTrees: Int32Array,
): void {
  const rows = oobTrees.length;
  if (width === 1) {
    for (let r = 0; r < rows; r++) {
      const v = values[r];
      if (v !== v) continue;
      oobSum[r] += v;
      oobTrees[r]++;
    }
    return;
  }
  for (let r = 0; r < rows; r++) {
    if (Number.isNaN(values[r * width])) continue;
    for (let c = 0; c < width; c++) oobSum[r * width + c] += values[r * width + c];
    oobTrees[r]++;
  }
}

// The alpha of the tree's own path whose subtree has the lowest error on the
// tree's out-of-bag rows (the larger alpha among equal errors).
function oobAlpha(
  path: PruningPath,
  tree: FlatTree,
  dataset: Dataset,
  weights: Float64Array,
): number {
  const alphas = distinctSteps(path).map((s) => path.alphas[s]);
  const sum = new Float64Array(alphas.length);
  const sumSq = new Float64Array(alphas.length);
  scoreSubtrees(tree, dataset, (r) => weights[r] === 0, alphas, sum, sumSq);
  let best = 0;
  for (let j = 1; j < alphas.length; j++) if (sum[j] <= sum[best]) best = j;
  return alphas[best];
}
