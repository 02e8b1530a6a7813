/**
 * How much each feature matters to an ensemble's estimates.
 *
 * Permutation importance on out-of-bag rows (Breiman 2001, *Machine
 * Learning* 45) is the default: for every tree, the increase in its squared
 * error on the rows it did not draw when one feature's values are shuffled
 * among those rows, averaged over trees, with repeats and their spread.
 * Impurity decrease is a second view; it favours features with many
 * distinct values (Strobl et al. 2007, *BMC Bioinformatics* 8).
 *
 * @module
 */

import type { Dataset } from "../dataset/types.ts";
import { createHash } from "node:crypto";
import { xoroshiro128plusFromState } from "pure-rand/generator/xoroshiro128plus";
import { KeptArray } from "../kept_array.ts";
import { type Rng, shuffleDoubles } from "../random.ts";
import { type FlatTree, goesLeft } from "../tree/flat_tree.ts";
import { bootstrapCounts } from "./bootstrap.ts";
import type { Ensemble } from "./fit_ensemble.ts";

/** One feature's importance. */
export interface FeatureImportance {
  /** Feature name. */
  feature: string;
  /** Mean increase of out-of-bag squared error when the feature is shuffled. */
  permutation: number;
  /** Standard deviation of that increase over the repeats. */
  permutationSd: number;
  /** Share of the total weighted impurity decrease of splits on the feature. */
  impurity: number;
}

/** Options of {@linkcode featureImportance}. */
export interface ImportanceOptions {
  /**
   * Shuffles per feature.
   * @default {3}
   */
  repeats?: number;
  /**
   * Seed of the shuffles.
   * @default {1}
   */
  seed?: number;
}

/**
 * Each tree's own random generator for its shuffles, from the seed and the
 * tree's number (SHA-256 keyed, as the resamples are): a tree's shuffles do
 * not depend on which thread handles it, nor on the trees before it.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { importanceRng } from "./importance.ts";
 * const draw = (seed: number, tree: number) => importanceRng(seed, tree).next();
 * assert.equal(draw(1, 3), draw(1, 3));
 * assert.notEqual(draw(1, 3), draw(1, 4));
 * assert.notEqual(draw(1, 3), draw(2, 3));
 * ```
 */
export function importanceRng(seed: number, tree: number): Rng {
  const index = new Uint8Array(8);
  new DataView(index.buffer).setInt32(0, seed, true);
  new DataView(index.buffer).setUint32(4, tree, true);
  const digest = createHash("sha256").update("paygrove importance shuffles 1\u0000").update(
    index,
  ).digest();
  const words: number[] = Array.from(new Int32Array(digest.buffer, digest.byteOffset, 4));
  // xoroshiro128+ is stuck at an all-zero state (probability 2^-128).
  if (!words.some((w) => w !== 0)) words[0] = 1;
  return xoroshiro128plusFromState(words);
}

/**
 * One tree's part of permutation importance: for each feature and repeat
 * (`f * repeats + k`), the increase of the tree's mean squared error on the
 * rows it did not draw when the feature's values are shuffled among those
 * rows. Exactly 0 for a feature the tree never splits on, and for a tree
 * that drew every row.
 *
 * @param counts How often the tree drew each row (0: out of bag).
 * @param leaves When given, each out-of-bag row's leaf is written at its
 *   row (the walk that scores the rows finds it; a bagged tree's fit needs
 *   it too, and need not walk them again).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures } from "../tree/bins.ts";
 * import { growTree } from "../tree/grow_tree.ts";
 * import { importanceRng, treeImportanceIncrease } from "./importance.ts";
 * const dataset = {
 *   rows: 8,
 *   features: [
 *     { name: "x", kind: "numeric" as const, values: Float64Array.of(1, 2, 3, 4, 5, 6, 7, 8) },
 *     { name: "z", kind: "numeric" as const, values: Float64Array.of(0, 0, 0, 0, 0, 0, 0, 0) },
 *   ],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.of(1, 1, 1, 1, 5, 5, 5, 5) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
 * // The tree learned from every row; rows 0 and 7 are scored as if out of bag.
 * const counts = Float64Array.of(0, 1, 1, 1, 1, 1, 1, 0);
 * const leaves = new Int32Array(8).fill(-1);
 * const part = treeImportanceIncrease(tree, dataset, counts, 2, importanceRng(1, 0), leaves);
 * // The first shuffle swaps rows 0 and 7's x, making both wrong by 4 (MSE
 * // 0 -> 16); the second keeps them in place (0). z is never split on.
 * assert.deepEqual([...part], [16, 0, 0, 0]);
 * // The out-of-bag rows' leaves, found on the way; the others untouched.
 * assert.deepEqual([0, 7].map((r) => tree.value[leaves[r]]), [1, 5]);
 * assert.equal(leaves[3], -1);
 * ```
 */
export function treeImportanceIncrease(
  tree: FlatTree,
  dataset: Dataset,
  counts: ArrayLike<number>,
  repeats: number,
  rng: Rng,
  leaves: Int32Array | null = null,
): Float64Array {
  const features = dataset.features.length;
  const out = new Float64Array(features * repeats);
  const columns = dataset.features.map((f) => f.values);
  let n = 0;
  for (let r = 0; r < dataset.rows; r++) if (counts[r] === 0) n++;
  if (n === 0) return out;
  const work = scratchFor(n, features);
  const oob = work.oob;
  for (let r = 0, i = 0; r < dataset.rows; r++) if (counts[r] === 0) oob[i++] = r;
  const used = new Uint8Array(features);
  for (let node = 0; node < tree.nodeCount; node++) {
    if (tree.feature[node] >= 0) used[tree.feature[node]] = 1;
  }
  const paths = outOfBagPaths(tree, columns, dataset.target.values, oob, work, leaves);
  let baseSse = 0;
  for (let i = 0; i < n; i++) baseSse += paths.sqError[i];
  const base = baseSse / n;
  // The shuffled feature's values in out-of-bag order: shuffling them gives
  // row i the value of its donor (the same draws as shuffling row numbers),
  // read in order rather than from a random row.
  const donated = work.donated;
  // Each row's last re-walk for the feature: the donor value and its
  // squared error. Another repeat that gives the row the same value (a
  // two-level feature always does) reads it instead of walking again.
  const walked: WalkCache = { value: work.walkedValue, sqError: work.walkedError };
  for (let f = 0; f < features; f++) {
    if (used[f] === 1) walked.value.fill(NaN);
    for (let k = 0; k < repeats; k++) {
      // Shuffled even when unused, so every feature's draws stay the same
      // whichever features a tree happens to use.
      valuesOf(columns[f], oob, donated);
      shuffleDoubles(donated, rng);
      // A feature the tree never splits on changes no prediction: 0 exactly.
      if (used[f] === 0) continue;
      out[f * repeats + k] =
        shuffledSse(tree, columns, dataset.target.values, oob, f, donated, paths, walked) /
          n - base;
    }
  }
  return out;
}

// One tree's working arrays, kept from tree to tree (a thread measures one
// tree at a time): on CPS1988 they are 1.5 MB a tree.
interface Scratch {
  oob: Int32Array;
  donated: Float64Array;
  walkedValue: Float64Array;
  walkedError: Float64Array;
  sqError: Float64Array;
  firstNode: Int32Array;
  low: Float64Array;
  high: Float64Array;
  levelSet: Uint32Array;
}
const doubles = () => new KeptArray((n) => new Float64Array(n));
const kept = {
  oob: new KeptArray((n) => new Int32Array(n)),
  donated: doubles(),
  walkedValue: doubles(),
  walkedError: doubles(),
  sqError: doubles(),
  firstNode: new KeptArray((n) => new Int32Array(n)),
  low: doubles(),
  high: doubles(),
  levelSet: new KeptArray((n) => new Uint32Array(n)),
};

// The working arrays of `n` out-of-bag rows (and `n * features` cells).
function scratchFor(n: number, features: number): Scratch {
  const cells = n * features;
  return {
    oob: kept.oob.view(n),
    donated: kept.donated.view(n),
    walkedValue: kept.walkedValue.view(n),
    walkedError: kept.walkedError.view(n),
    sqError: kept.sqError.view(n),
    firstNode: kept.firstNode.view(cells),
    low: kept.low.view(cells),
    high: kept.high.view(cells),
    levelSet: kept.levelSet.view(cells),
  };
}

// The loops below are functions of their own, each called many times per
// tree: the compiler optimises them whole and keeps them, where one long
// function was entered and left through its inner loops (a deopt at each
// loop's exit, every tree, in a trace).

/**
 * What permutation importance needs of each out-of-bag row's path, per
 * feature (feature-major: feature g of row i at `g * n + i`): the first node
 * that tests the feature (-1: none) and the values of the feature that
 * follow the row's whole path, an interval (low, high] for thresholds and a
 * set of level codes for categorical splits of at most 32 levels (empty
 * above). A shuffled feature changes nothing above the first node, so a
 * re-walk starts there; a row whose path never tests it, or whose donor's
 * value follows the same path, keeps its error: the same sums, in the same
 * order, as walking every row from the root.
 */
interface OutOfBagPaths {
  firstNode: Int32Array;
  low: Float64Array;
  high: Float64Array;
  levelSet: Uint32Array;
  /** Each row's squared error. */
  sqError: Float64Array;
}

function outOfBagPaths(
  tree: FlatTree,
  columns: Float64Array[],
  y: ArrayLike<number>,
  oob: Int32Array,
  work: Scratch,
  leaves: Int32Array | null,
): OutOfBagPaths {
  const n = oob.length;
  // Set where a path first tests a feature; unread before.
  const { low, high, levelSet, sqError } = work;
  const firstNode = work.firstNode.fill(-1);
  for (let i = 0; i < n; i++) {
    const r = oob[i];
    let node = 0;
    while (tree.left[node] !== -1) {
      const g = tree.feature[node];
      const at = g * n + i;
      const left = goesLeft(tree, node, columns[g][r]);
      if (firstNode[at] === -1) {
        firstNode[at] = node;
        low[at] = -Infinity;
        high[at] = Infinity;
        levelSet[at] = 0xffffffff;
      }
      const offset = tree.maskOffset[node];
      if (offset < 0) {
        if (left) high[at] = Math.min(high[at], tree.threshold[node]);
        else low[at] = Math.max(low[at], tree.threshold[node]);
      } else if (tree.maskWords[g] === 1) {
        // Levels in neither mask follow the missing direction.
        const unseen = ~(tree.masks[offset] | tree.masks[offset + 1]);
        const goesWithMissing = (tree.missingLeft[node] === 1) === left;
        levelSet[at] &= tree.masks[offset + (left ? 0 : 1)] | (goesWithMissing ? unseen : 0);
      } else {
        levelSet[at] = 0;
      }
      node = left ? tree.left[node] : tree.right[node];
    }
    const e = y[r] - tree.value[node];
    sqError[i] = e * e;
    if (leaves !== null) leaves[r] = node;
  }
  return { firstNode, low, high, levelSet, sqError };
}

// Row i's value of a column, for each out-of-bag row i.
function valuesOf(column: Float64Array, oob: Int32Array, into: Float64Array): void {
  for (let i = 0; i < oob.length; i++) into[i] = column[oob[i]];
}

// The out-of-bag squared error with feature f's values replaced by `donated`.
function shuffledSse(
  tree: FlatTree,
  columns: Float64Array[],
  y: ArrayLike<number>,
  oob: Int32Array,
  f: number,
  donated: Float64Array,
  paths: OutOfBagPaths,
  walked: WalkCache,
): number {
  const { firstNode, low, high, levelSet, sqError } = paths;
  const { value: walkedValue, sqError: walkedError } = walked;
  const n = oob.length;
  const column = columns[f];
  // Categorical splits test level masks; every other split a threshold.
  const masked = tree.maskWords[f] > 0;
  let sse = 0;
  for (let i = 0; i < n; i++) {
    const at = f * n + i;
    const node = firstNode[at];
    if (node === -1) {
      sse += sqError[i];
      continue;
    }
    const r = oob[i];
    const v = donated[i];
    const x = column[r];
    // NaN is only ever followed by NaN down the same path.
    const same = Number.isNaN(x) ? Number.isNaN(v) : v === x || (
      !Number.isNaN(v) &&
      (masked ? v < 32 && ((levelSet[at] >>> v) & 1) === 1 : v > low[at] && v <= high[at])
    );
    if (same) {
      sse += sqError[i];
      continue;
    }
    // A NaN donor is never equal to the value kept: walked each time.
    if (walkedValue[i] === v) {
      sse += walkedError[i];
      continue;
    }
    const e = y[r] - tree.value[walkFrom(tree, node, columns, r, f, v)];
    walkedValue[i] = v;
    walkedError[i] = e * e;
    sse += e * e;
  }
  return sse;
}

// Per out-of-bag row, the donor value of its last re-walk (NaN: none) and
// the squared error it gave.
interface WalkCache {
  value: Float64Array;
  sqError: Float64Array;
}

// The leaf row r reaches from `node` with feature f's value replaced by v.
function walkFrom(
  tree: FlatTree,
  node: number,
  columns: Float64Array[],
  r: number,
  f: number,
  v: number,
): number {
  while (tree.left[node] !== -1) {
    const g = tree.feature[node];
    node = goesLeft(tree, node, g === f ? v : columns[g][r]) ? tree.left[node] : tree.right[node];
  }
  return node;
}

/**
 * Permutation and impurity importance of every feature from the trees'
 * parts ({@linkcode treeImportanceIncrease}), averaged in tree order so the
 * result does not depend on which thread computed which part.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { importanceFromParts } from "./importance.ts";
 * const dataset = {
 *   rows: 2,
 *   features: [{ name: "x", kind: "numeric" as const, values: Float64Array.of(1, 2) }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.of(1, 2) },
 * };
 * // Two trees without splits (impurity 0), parts of two repeats each.
 * const leaf = { nodeCount: 1, left: Int32Array.of(-1) };
 * const [x] = importanceFromParts([Float64Array.of(2, 4), Float64Array.of(4, 6)], { trees: [leaf, leaf] as never }, dataset, 2);
 * assert.equal(x.permutation, 4); // repeat means 3 and 5
 * assert.equal(x.permutationSd, Math.SQRT2);
 * ```
 */
export function importanceFromParts(
  parts: readonly Float64Array[],
  ensemble: Pick<Ensemble, "trees">,
  dataset: Dataset,
  repeats: number,
): FeatureImportance[] {
  const features = dataset.features.length;
  const trees = ensemble.trees.length;
  const increases = Array.from({ length: features }, () => new Float64Array(repeats));
  for (const part of parts) {
    for (let f = 0; f < features; f++) {
      for (let k = 0; k < repeats; k++) increases[f][k] += part[f * repeats + k] / trees;
    }
  }
  const decrease = impurityDecrease(ensemble, features);
  const total = decrease.reduce((a, b) => a + b, 0);
  return dataset.features.map((feature, f) => {
    const values = increases[f];
    const mean = values.reduce((a, b) => a + b, 0) / repeats;
    const sd = repeats > 1
      ? Math.sqrt(values.reduce((a, v) => a + (v - mean) ** 2, 0) / (repeats - 1))
      : 0;
    return {
      feature: feature.name,
      permutation: mean,
      permutationSd: sd,
      impurity: total > 0 ? decrease[f] / total : 0,
    };
  });
}

/**
 * Permutation and impurity importance of every feature (regression
 * ensembles), in feature order: each tree's part with its own generator
 * ({@linkcode importanceRng}), averaged in tree order. An ensemble fitted
 * with the `importance` option carries its parts already.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { featureImportance, fitEnsemble } from "../../mod.ts";
 * const years = Array.from({ length: 120 }, (_, i) => i % 30);
 * const noise = Array.from({ length: 120 }, (_, i) => (i * 37) % 11);
 * const dataset = {
 *   rows: 120,
 *   features: [
 *     { name: "years", kind: "numeric" as const, values: Float64Array.from(years) },
 *     { name: "noise", kind: "numeric" as const, values: Float64Array.from(noise) },
 *   ],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.from(years, (y) => 40 + 2 * y) },
 * };
 * const ensemble = fitEnsemble(dataset, { trees: 20, prune: "none", grow: { minLeaf: 3 } });
 * const [years_, noise_] = featureImportance(ensemble, dataset);
 * assert(years_.permutation > 10 * Math.abs(noise_.permutation));
 * // Fitted with the parts: the same figures.
 * const withParts = fitEnsemble(dataset, {
 *   trees: 20, prune: "none", grow: { minLeaf: 3 }, importance: { repeats: 3, seed: 1 },
 * });
 * assert.deepEqual(featureImportance(withParts, dataset), featureImportance(ensemble, dataset));
 * ```
 */
export function featureImportance(
  ensemble: Ensemble,
  dataset: Dataset,
  options: ImportanceOptions = {},
): FeatureImportance[] {
  if (dataset.target.kind !== "regression") {
    throw new TypeError("featureImportance needs a regression ensemble");
  }
  const repeats = options.repeats ?? 3;
  const seed = options.seed ?? 1;
  const fitted = ensemble.importance;
  if (fitted !== undefined && fitted.repeats === repeats && fitted.seed === seed) {
    return importanceFromParts(fitted.parts, ensemble, dataset, repeats);
  }
  const parts = ensemble.trees.map((tree, b) =>
    treeImportanceIncrease(
      tree,
      dataset,
      bootstrapCounts(dataset.rows, ensemble.resamples, b),
      repeats,
      importanceRng(seed, b),
    )
  );
  return importanceFromParts(parts, ensemble, dataset, repeats);
}

/**
 * Weighted impurity decrease of each feature's splits, summed over the
 * trees (any task): the impurity view of importance, before normalising.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures } from "../tree/bins.ts";
 * import { growTree } from "../tree/grow_tree.ts";
 * import { impurityDecrease } from "./importance.ts";
 * // x splits pay 1, 1, 5, 5 into two pure halves; z is constant and never splits.
 * const dataset = {
 *   rows: 4,
 *   features: [
 *     { name: "x", kind: "numeric" as const, values: Float64Array.of(1, 2, 3, 4) },
 *     { name: "z", kind: "numeric" as const, values: Float64Array.of(7, 7, 7, 7) },
 *   ],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.of(1, 1, 5, 5) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
 * // Root: weight 4 x variance 4 = 16; both leaves 0. Two such trees: 32.
 * assert.deepEqual([...impurityDecrease({ trees: [tree, tree] }, 2)], [32, 0]);
 * ```
 */
export function impurityDecrease(
  ensemble: Pick<Ensemble, "trees">,
  features: number,
): Float64Array {
  const out = new Float64Array(features);
  for (const tree of ensemble.trees) {
    for (let n = 0; n < tree.nodeCount; n++) {
      const l = tree.left[n];
      if (l === -1) continue;
      const r = tree.right[n];
      out[tree.feature[n]] += tree.weight[n] * tree.impurity[n] -
        tree.weight[l] * tree.impurity[l] - tree.weight[r] * tree.impurity[r];
    }
  }
  return out;
}
