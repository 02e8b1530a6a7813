/**
 * Choosing the size of a tree by k-fold cross-validation over its
 * cost-complexity pruning path (Breiman et al. 1984, ch. 3.4, 8.5 and 11).
 *
 * The full tree grown on all rows gives the path alpha_0 = 0 < alpha_1 <
 * ... ; each candidate subtree T_j is scored at the geometric mean
 * sqrt(alpha_j * alpha_(j+1)) of its interval, by growing a tree on each
 * training fold, pruning it at that alpha and predicting the held-out fold.
 * The error is the mean squared error (regression) or the misclassification
 * rate (classification) over all rows, with the standard error of that mean
 * from the per-row losses. The 1-SE rule takes the smallest tree whose error
 * is within one standard error of the minimum.
 *
 * @module
 */

import type { Dataset } from "../dataset/types.ts";
import { makeRng, shuffle } from "../random.ts";
import { binFeatures, type FeatureBins } from "./bins.ts";
import { type FlatTree, pathOfRow, predictedClass } from "./flat_tree.ts";
import { canonicalRowOrder, type GrowOptions, growTree } from "./grow_tree.ts";
import { collapsedWithin, distinctSteps, pruningPath, subtreeAfter } from "./prune.ts";

/** How to choose the tree size. */
export interface CrossValidateOptions {
  /**
   * Number of folds.
   * @default {10}
   */
  folds?: number;
  /**
   * Seed of the fold assignment.
   * @default {1}
   */
  seed?: number;
  /**
   * `"one-se"`: smallest tree within one standard error of the best; `"min"`: the best.
   * @default {"one-se"}
   */
  rule?: "one-se" | "min";
  /** Stopping rules of every tree grown. */
  grow?: GrowOptions;
  /**
   * Further losses of a held-out row (regression), averaged per candidate
   * into `cvExtra`: e.g. squared error in money when the fit is on log pay.
   */
  extraLosses?: readonly ((actual: number, predicted: number) => number)[];
  /** Called after the full tree and after each fold, with steps done and the total. */
  onProgress?: (done: number, total: number) => void;
}

/** One candidate subtree of the full tree's path. */
export interface AlphaCandidate {
  /** The path's alpha at which this subtree appears. */
  alpha: number;
  /** Where it was scored: the geometric mean of its alpha interval. */
  scoredAt: number;
  /** Leaves of the subtree of the full tree. */
  leaves: number;
  /** Risk (training) of the subtree of the full tree. */
  risk: number;
  /** Cross-validated error: mean squared error or misclassification rate. */
  cvError: number;
  /** Standard error of `cvError`. */
  cvSe: number;
  /** Regression: the root of `cvError` (the cross-validated RMSE). */
  cvRmse: number;
  /** Regression: its standard error by the delta method, `cvSe / (2 cvRmse)`. */
  cvRmseSe: number;
  /** The mean held-out value of each of the options' `extraLosses`. */
  cvExtra: number[];
}

/** The result of {@linkcode crossValidateTree}. */
export interface CrossValidatedTree {
  /** The tree grown on all rows to the stopping rules. */
  fullTree: FlatTree;
  /** Candidates in order of growing alpha (shrinking trees); distinct alphas only. */
  candidates: AlphaCandidate[];
  /** Index of the chosen candidate. */
  chosen: number;
  /** Index of the candidate with the lowest error. */
  best: number;
  /** The reference tree: the full tree pruned at the chosen alpha. */
  tree: FlatTree;
  /** The fold of each row. */
  fold: Int32Array;
}

/**
 * Grows the full tree, cross-validates its pruning path and returns the
 * reference tree at the chosen alpha.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { crossValidateTree, leafCount } from "../../mod.ts";
 * const years = Array.from({ length: 40 }, (_, i) => i % 20);
 * const dataset = {
 *   rows: 40,
 *   features: [{ name: "years", kind: "numeric" as const, values: Float64Array.from(years) }],
 *   target: {
 *     kind: "regression" as const,
 *     name: "pay",
 *     values: Float64Array.from(years, (y, i) => (y < 10 ? 50 : 80) + (i % 3)),
 *   },
 * };
 * const result = crossValidateTree(dataset, { folds: 5, seed: 7, grow: { minLeaf: 2 } });
 * assert(leafCount(result.tree) === 2); // the one real step in pay
 * ```
 */
export function crossValidateTree(
  dataset: Dataset,
  options: CrossValidateOptions = {},
  bins: FeatureBins[] = binFeatures(dataset),
): CrossValidatedTree {
  const folds = options.folds ?? 10;
  if (!(folds >= 2) || folds > dataset.rows || !Number.isInteger(folds)) {
    throw new RangeError(`folds must be a whole number from 2 to the row count, got ${folds}`);
  }
  const order = canonicalRowOrder(dataset);
  const fullTree = growTree({ dataset, bins, order }, options.grow);
  options.onProgress?.(1, folds + 1);
  const fold = assignFolds(dataset, folds, options.seed ?? 1);
  const foldTrees: FlatTree[] = [];
  const weights = new Float64Array(dataset.rows);
  for (let k = 0; k < folds; k++) {
    for (let r = 0; r < dataset.rows; r++) weights[r] = fold[r] === k ? 0 : 1;
    foldTrees.push(growTree({ dataset, bins, weights, order }, options.grow));
    options.onProgress?.(k + 2, folds + 1);
  }
  return crossValidateGrown(dataset, fullTree, foldTrees, fold, options);
}

/**
 * The second half of {@linkcode crossValidateTree}, for trees grown
 * elsewhere (e.g. in workers): the full tree's pruning path, each
 * candidate scored on every fold's held-out rows with that fold's tree,
 * and the choice by the rule.
 *
 * @param fullTree The tree grown on every row.
 * @param foldTrees Fold k's tree, grown with fold k's rows left out (weight 0).
 * @param fold Each row's fold ({@linkcode assignFolds}).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { assignFolds, binFeatures, crossValidateGrown, crossValidateTree, growTree } from "../../mod.ts";
 * const years = Array.from({ length: 40 }, (_, i) => i % 20);
 * const dataset = {
 *   rows: 40,
 *   features: [{ name: "years", kind: "numeric" as const, values: Float64Array.from(years) }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.from(years, (y) => (y < 10 ? 50 : 80)) },
 * };
 * const bins = binFeatures(dataset);
 * const grow = { minLeaf: 2 };
 * const fold = assignFolds(dataset, 4, 3);
 * const foldTrees = [0, 1, 2, 3].map((k) =>
 *   growTree({ dataset, bins, weights: Float64Array.from(fold, (f) => (f === k ? 0 : 1)) }, grow)
 * );
 * const whole = crossValidateGrown(dataset, growTree({ dataset, bins }, grow), foldTrees, fold, {});
 * const direct = crossValidateTree(dataset, { folds: 4, seed: 3, grow });
 * assert.deepEqual(whole.candidates, direct.candidates);
 * ```
 */
export function crossValidateGrown(
  dataset: Dataset,
  fullTree: FlatTree,
  foldTrees: readonly FlatTree[],
  fold: Int32Array,
  options: Pick<CrossValidateOptions, "rule" | "extraLosses"> = {},
): CrossValidatedTree {
  const scores = new FoldScores(dataset, fullTree, fold, foldTrees.length, options);
  foldTrees.forEach((foldTree, k) => scores.add(k, foldTree));
  return scores.result();
}

/**
 * {@linkcode crossValidateGrown} one fold tree at a time, in any order: a
 * fold tree can be scored as soon as it is grown (while workers grow the
 * others). Each fold's sums are kept apart and added in fold order at the
 * end, so the result is the same number for number whatever the order.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { assignFolds, binFeatures, crossValidateGrown, growTree } from "../../mod.ts";
 * import { FoldScores } from "./cross_validate.ts";
 * const years = Array.from({ length: 40 }, (_, i) => i % 20);
 * const dataset = {
 *   rows: 40,
 *   features: [{ name: "years", kind: "numeric" as const, values: Float64Array.from(years) }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.from(years, (y, i) => 50 + 3 * y + (i % 4)) },
 * };
 * const bins = binFeatures(dataset);
 * const fold = assignFolds(dataset, 4, 3);
 * const trees = [0, 1, 2, 3].map((k) =>
 *   growTree({ dataset, bins, weights: Float64Array.from(fold, (f) => (f === k ? 0 : 1)) }, { minLeaf: 2 })
 * );
 * const full = growTree({ dataset, bins }, { minLeaf: 2 });
 * const scores = new FoldScores(dataset, full, fold, 4);
 * for (const k of [2, 0, 3, 1]) scores.add(k, trees[k]);
 * assert.deepEqual(scores.result().candidates, crossValidateGrown(dataset, full, trees, fold).candidates);
 * assert.throws(() => new FoldScores(dataset, full, fold, 4).result(), /fold 0 is not scored/);
 * ```
 */
export class FoldScores {
  readonly #dataset: Dataset;
  readonly #fullTree: FlatTree;
  readonly #fold: Int32Array;
  readonly #rule: "one-se" | "min";
  readonly #extraLosses: readonly ((actual: number, predicted: number) => number)[];
  readonly #path: ReturnType<typeof pruningPath>;
  readonly #steps: number[];
  readonly #alphas: number[];
  readonly #scoredAt: number[];
  // Per fold: its sums, squares and extra losses at each candidate (null
  // until the fold is scored).
  readonly #parts: ({ sum: Float64Array; sumSq: Float64Array; extra: Float64Array[] } | null)[];

  /**
   * @param fullTree The tree grown on every row.
   * @param fold Each row's fold ({@linkcode assignFolds}).
   * @param folds How many folds there are.
   */
  constructor(
    dataset: Dataset,
    fullTree: FlatTree,
    fold: Int32Array,
    folds: number,
    options: Pick<CrossValidateOptions, "rule" | "extraLosses"> = {},
  ) {
    this.#dataset = dataset;
    this.#fullTree = fullTree;
    this.#fold = fold;
    this.#rule = options.rule ?? "one-se";
    this.#extraLosses = options.extraLosses ?? [];
    this.#path = pruningPath(fullTree);
    // Distinct alphas: of a run of equal alphas keep the last step.
    this.#steps = distinctSteps(this.#path);
    this.#alphas = this.#steps.map((s) => this.#path.alphas[s]);
    // Each candidate is scored at the geometric mean of its alpha interval.
    const alphas = this.#alphas;
    const last = alphas.length - 1;
    this.#scoredAt = alphas.map((a, j) => (j < last ? Math.sqrt(a * alphas[j + 1]) : a));
    this.#parts = Array.from({ length: folds }, () => null);
  }

  /** Scores fold `k`'s tree, grown with fold k's rows left out (weight 0), on those rows. */
  add(k: number, foldTree: FlatTree): void {
    if (!(Number.isInteger(k) && k >= 0 && k < this.#parts.length)) {
      throw new RangeError(`no fold ${k} of ${this.#parts.length}`);
    }
    const count = this.#alphas.length;
    const part = {
      sum: new Float64Array(count),
      sumSq: new Float64Array(count),
      extra: this.#extraLosses.map(() => new Float64Array(count)),
    };
    const fold = this.#fold;
    scoreSubtrees(
      foldTree,
      this.#dataset,
      (r) => fold[r] === k,
      this.#scoredAt,
      part.sum,
      part.sumSq,
      {
        losses: this.#extraLosses,
        sums: part.extra,
      },
    );
    this.#parts[k] = part;
  }

  /** The candidates and the choice, once every fold is scored. */
  result(): CrossValidatedTree {
    const alphas = this.#alphas;
    const steps = this.#steps;
    const path = this.#path;
    const sum = new Float64Array(alphas.length);
    const sumSq = new Float64Array(alphas.length);
    const extraSums = this.#extraLosses.map(() => new Float64Array(alphas.length));
    // Fold by fold, as crossValidateGrown adds them.
    this.#parts.forEach((part, k) => {
      if (part === null) throw new Error(`fold ${k} is not scored`);
      for (let j = 0; j < alphas.length; j++) {
        sum[j] += part.sum[j];
        sumSq[j] += part.sumSq[j];
      }
      part.extra.forEach((values, e) => {
        for (let j = 0; j < alphas.length; j++) extraSums[e][j] += values[j];
      });
    });
    const n = this.#dataset.rows;
    const candidates: AlphaCandidate[] = alphas.map((alpha, j) => {
      const mean = sum[j] / n;
      const variance = n > 1 ? Math.max(0, (sumSq[j] - n * mean * mean) / (n - 1)) : 0;
      return {
        alpha,
        scoredAt: this.#scoredAt[j],
        leaves: path.leaves[steps[j]],
        risk: path.risks[steps[j]],
        cvError: mean,
        cvSe: Math.sqrt(variance / n),
        cvRmse: Math.sqrt(mean),
        cvRmseSe: mean > 0 ? Math.sqrt(variance / n) / (2 * Math.sqrt(mean)) : 0,
        cvExtra: extraSums.map((s) => s[j] / n),
      };
    });
    let best = 0;
    for (let j = 1; j < candidates.length; j++) {
      if (candidates[j].cvError < candidates[best].cvError) best = j;
    }
    let chosen = best;
    if (this.#rule === "one-se") {
      const limit = candidates[best].cvError + candidates[best].cvSe;
      for (let j = candidates.length - 1; j > best; j--) {
        if (candidates[j].cvError <= limit) {
          chosen = j;
          break;
        }
      }
    }
    const tree = subtreeAfter(this.#fullTree, path, steps[chosen]);
    return { fullTree: this.#fullTree, candidates, chosen, best, tree, fold: this.#fold };
  }
}

/**
 * Adds the losses of held-out rows under the subtrees of `foldTree` at each
 * scored alpha to `sum` and `sumSq` (squared error, or 0/1 for classes).
 * Rather than building a subtree per alpha, each held-out row walks the tree
 * once: its leaf in a subtree is the first node on its path that the pruning
 * has collapsed by then, which moves up the path as alpha grows.
 *
 * @param heldOut Whether a row is scored.
 * @param scoredAt Alphas in increasing order.
 * @param extra Further regression losses, each added into its own sums.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, growTree } from "../../mod.ts";
 * import { scoreSubtrees } from "./cross_validate.ts";
 * // Pay 1, 2, 5, 6 over x = 1..4, leaves of 2: one split, means 1.5 and 5.5.
 * const dataset = {
 *   rows: 4,
 *   features: [{ name: "x", kind: "numeric" as const, values: new Float64Array([1, 2, 3, 4]) }],
 *   target: { kind: "regression" as const, name: "pay", values: new Float64Array([1, 2, 5, 6]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 2 });
 * const sum = new Float64Array(2);
 * const sumSq = new Float64Array(2);
 * // Rows 0, 2, 3 held out; alpha 0 keeps the split, 1e9 leaves the root (mean 3.5).
 * scoreSubtrees(tree, dataset, (r) => r !== 1, [0, 1e9], sum, sumSq);
 * // Split: losses 0.25 each. Root: 2.5^2 + 1.5^2 + 2.5^2 = 14.75.
 * assert.deepEqual([...sum], [0.75, 14.75]);
 * assert.deepEqual([...sumSq], [3 * 0.0625, 2 * 39.0625 + 5.0625]);
 * ```
 */
export function scoreSubtrees(
  foldTree: FlatTree,
  dataset: Dataset,
  heldOut: (row: number) => boolean,
  scoredAt: ArrayLike<number>,
  sum: Float64Array,
  sumSq: Float64Array,
  extra: {
    losses: readonly ((actual: number, predicted: number) => number)[];
    sums: Float64Array[];
  } = { losses: [], sums: [] },
): void {
  const path = pruningPath(foldTree);
  const never = path.nodes.length;
  const collapsedAt = new Int32Array(foldTree.nodeCount);
  for (let i = 0; i < foldTree.nodeCount; i++) collapsedAt[i] = foldTree.left[i] === -1 ? 0 : never;
  for (let s = 1; s < path.nodes.length; s++) collapsedAt[path.nodes[s]] = s;
  // Steps of the fold's path taken at each scored alpha.
  const stepAt = new Int32Array(scoredAt.length);
  const rootRisk = path.risks[path.risks.length - 1];
  // scoredAt grows, so the step only moves forward (stepAt's rule, one pass).
  for (let j = 0, s = 0; j < scoredAt.length; j++) {
    while (
      s + 1 < path.alphas.length && collapsedWithin(path.alphas[s + 1], scoredAt[j], rootRisk)
    ) {
      s++;
    }
    stepAt[j] = s;
  }
  const target = dataset.target;
  const earliest: number[] = [];
  // A held-out row sits in one leaf over a run of candidates and changes
  // leaf only where the path collapses above it (at most its depth times):
  // each run adds its loss once, as a difference at its two ends, summed
  // up the candidates at the end (rows x depth instead of rows x
  // candidates; the sums differ from adding candidate by candidate in the
  // last bits only).
  const count = scoredAt.length;
  const dSum = new Float64Array(count + 1);
  const dSq = new Float64Array(count + 1);
  const dExtra = extra.losses.map(() => new Float64Array(count + 1));
  for (let r = 0; r < dataset.rows; r++) {
    if (!heldOut(r)) continue;
    const nodes = pathOfRow(foldTree, dataset.features, r);
    // earliest[i]: the first step at which some node of path[0..i] is a leaf.
    earliest.length = nodes.length;
    for (let i = 0; i < nodes.length; i++) {
      earliest[i] = Math.min(i > 0 ? earliest[i - 1] : never, collapsedAt[nodes[i]]);
    }
    let at = nodes.length - 1;
    for (let j = 0; j < count;) {
      while (at > 0 && earliest[at - 1] <= stepAt[j]) at--;
      // The leaf holds until the first candidate whose step reaches the
      // collapse above it (stepAt only grows: a binary search).
      let end = count;
      if (at > 0) {
        const limit = earliest[at - 1];
        let low = j + 1;
        while (low < end) {
          const mid = (low + end) >>> 1;
          if (stepAt[mid] >= limit) end = mid;
          else low = mid + 1;
        }
      }
      const leaf = nodes[at];
      let lossValue: number;
      if (target.kind === "regression") {
        const d = target.values[r] - foldTree.value[leaf];
        lossValue = d * d;
        for (let e = 0; e < extra.losses.length; e++) {
          const value = extra.losses[e](target.values[r], foldTree.value[leaf]);
          dExtra[e][j] += value;
          dExtra[e][end] -= value;
        }
      } else {
        lossValue = predictedClass(foldTree, leaf) === target.values[r] ? 0 : 1;
      }
      dSum[j] += lossValue;
      dSum[end] -= lossValue;
      dSq[j] += lossValue * lossValue;
      dSq[end] -= lossValue * lossValue;
      j = end;
    }
  }
  let runSum = 0;
  let runSq = 0;
  const runExtra = new Float64Array(extra.losses.length);
  for (let j = 0; j < count; j++) {
    runSum += dSum[j];
    runSq += dSq[j];
    sum[j] += runSum;
    sumSq[j] += runSq;
    for (let e = 0; e < extra.losses.length; e++) {
      runExtra[e] += dExtra[e][j];
      extra.sums[e][j] += runExtra[e];
    }
  }
}

/**
 * Stratified fold labels: rows are sorted by target (regression) or by
 * class, in blocks of `folds` consecutive rows, and each block's rows get
 * the fold labels in a random order. Every fold then spans the target's
 * range.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { assignFolds } from "./cross_validate.ts";
 * const dataset = {
 *   rows: 6,
 *   features: [],
 *   target: { kind: "regression" as const, name: "y", values: new Float64Array([5, 1, 4, 2, 6, 3]) },
 * };
 * const fold = assignFolds(dataset, 3, 1);
 * assert([0, 1, 2].every((k) => fold.filter((f) => f === k).length === 2));
 * ```
 */
export function assignFolds(dataset: Dataset, folds: number, seed: number): Int32Array {
  const rng = makeRng(seed);
  const n = dataset.rows;
  const values = dataset.target.values;
  const order = Array.from({ length: n }, (_, i) => i);
  // Ties in the target are ordered at random, so equal values spread over folds.
  const tieBreak = shuffle(Array.from({ length: n }, (_, i) => i), rng);
  order.sort((a, b) => values[a] - values[b] || tieBreak[a] - tieBreak[b]);
  const fold = new Int32Array(n);
  for (let start = 0; start < n; start += folds) {
    const labels = shuffle(Array.from({ length: folds }, (_, i) => i), rng);
    for (let i = start; i < Math.min(n, start + folds); i++) fold[order[i]] = labels[i - start];
  }
  return fold;
}
