/**
 * Cross-validation of the reference tree with its trees grown on fitting
 * workers: the tree of every row and each fold's tree are grown in
 * parallel and scored here as they come back (`FoldScores`), so the
 * result is the one `crossValidateTree` gives, whatever the worker count.
 *
 * @module
 */

import type { Dataset } from "../dataset/types.ts";
import { binFeatures, type FeatureBins } from "../tree/bins.ts";
import {
  assignFolds,
  type CrossValidatedTree,
  type CrossValidateOptions,
  crossValidateTree,
  FoldScores,
} from "../tree/cross_validate.ts";
import type { FlatTree } from "../tree/flat_tree.ts";
import type { ToWorker } from "./_fit_worker.ts";
import { FittingPool, onFittingWorkers, sharedDataFor } from "./_worker_pool.ts";

/**
 * {@linkcode crossValidateTree} with its trees grown on `workers` workers
 * (1: in this thread), or on a pool's. `onTreesGrown` is called when the
 * workers' trees are back, before this thread scores the last of them
 * (never when the trees are grown in this thread): the moment the workers
 * fall idle.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { crossValidateTree, crossValidateTreeParallel } from "../../mod.ts";
 * const years = Array.from({ length: 60 }, (_, i) => i % 20);
 * const dataset = {
 *   rows: 60,
 *   features: [{ name: "years", kind: "numeric" as const, values: Float64Array.from(years) }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.from(years, (y, i) => 50 + 2 * y + (i % 3)) },
 * };
 * const options = { folds: 4, seed: 2, grow: { minLeaf: 2 } };
 * const parallel = await crossValidateTreeParallel(dataset, { ...options, workers: 2 });
 * const alone = crossValidateTree(dataset, options);
 * assert.deepEqual(parallel.candidates, alone.candidates);
 * assert.equal(parallel.chosen, alone.chosen);
 * ```
 */
export async function crossValidateTreeParallel(
  dataset: Dataset,
  options: CrossValidateOptions & {
    workers?: number | FittingPool;
    onTreesGrown?: () => void;
  } = {},
  bins: FeatureBins[] = binFeatures(dataset),
): Promise<CrossValidatedTree> {
  const folds = options.folds ?? 10;
  // A pool, or a count (never more workers than the folds' trees are run).
  const on = options.workers ?? navigator.hardwareConcurrency ?? 1;
  const workers = Math.min(folds + 1, on instanceof FittingPool ? on.size : on);
  if (!(workers > 1) || !(folds >= 2) || folds > dataset.rows || !Number.isInteger(folds)) {
    // One thread, or options crossValidateTree refuses in its own words.
    return crossValidateTree(dataset, options, bins);
  }
  const fold = assignFolds(dataset, folds, options.seed ?? 1);
  const opening: ToWorker[] = [
    {
      kind: "data",
      data: sharedDataFor(on, dataset, bins),
      options: {},
      states: new Int32Array(0),
    },
    { kind: "folds", fold, grow: options.grow },
  ];
  // -1: the tree of every row; k: fold k's tree.
  const tasks: ToWorker[] = Array.from({ length: folds + 1 }, (_, i) => ({
    kind: "foldTree",
    index: i - 1,
  }));
  // Each fold tree is scored as soon as it and the full tree are back,
  // while the workers grow the others; the last tree back is scored after
  // `onTreesGrown`, when work sent aside keeps the workers busy. (FoldScores
  // adds the folds in fold order, so the arrival order changes no number.)
  let scores: FoldScores | null = null;
  const waiting: { index: number; tree: FlatTree }[] = [];
  // The fold trees waiting, once the full tree is here to score them by.
  const scoreWaiting = () => {
    for (const w of waiting.splice(0)) scores!.add(w.index, w.tree);
  };
  let done = 0;
  await onFittingWorkers(on, opening, tasks, (reply) => {
    if (reply.kind !== "foldTree") return;
    if (reply.index < 0) scores = new FoldScores(dataset, reply.tree, fold, folds, options);
    else waiting.push({ index: reply.index, tree: reply.tree });
    done++;
    if (scores !== null && done < folds + 1) scoreWaiting();
    options.onProgress?.(done, folds + 1);
  });
  options.onTreesGrown?.();
  scoreWaiting();
  return (scores as FoldScores | null)!.result();
}
