/**
 * Fitting an ensemble's trees in Web Workers. Every tree's resample comes
 * from its own seed, and out-of-bag sums are added in tree order, so the
 * model is bit-identical whatever the number of workers.
 *
 * @module
 */

import type { Dataset } from "../dataset/types.ts";
import { binFeatures, type FeatureBins } from "../tree/bins.ts";
import type { FlatTree } from "../tree/flat_tree.ts";
import { canonicalRowOrder } from "../tree/grow_tree.ts";
import { resampleStates } from "./bootstrap.ts";
import { shareData } from "./_shared_data.ts";
import type { ToWorker } from "./_fit_worker.ts";
import { onFittingWorkers } from "./_worker_pool.ts";
import {
  assembleEnsemble,
  checkEnsembleOptions,
  type Ensemble,
  type EnsembleOptions,
  fitEnsemble,
  importanceParts,
} from "./fit_ensemble.ts";

/** Options of {@linkcode fitEnsembleParallel}. */
export interface ParallelOptions extends EnsembleOptions {
  /**
   * Number of workers; 1 fits in this thread.
   * @default navigator.hardwareConcurrency
   */
  workers?: number;
}

/**
 * Fits a bagged ensemble with trees grown in parallel workers. Gives the
 * same model as {@linkcode fitEnsemble} with the same options.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { fitEnsemble, fitEnsembleParallel } from "../../mod.ts";
 * const years = Array.from({ length: 80 }, (_, i) => i % 40);
 * const dataset = {
 *   rows: 80,
 *   features: [{ name: "years", kind: "numeric" as const, values: Float64Array.from(years) }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.from(years, (y) => 40 + y) },
 * };
 * const options = { trees: 8, seed: 4, prune: "none" as const };
 * const parallel = await fitEnsembleParallel(dataset, { ...options, workers: 2 });
 * assert.deepEqual(parallel.oob, fitEnsemble(dataset, options).oob);
 * ```
 */
export async function fitEnsembleParallel(
  dataset: Dataset,
  options: ParallelOptions = {},
  bins: FeatureBins[] = binFeatures(dataset),
): Promise<Ensemble> {
  checkEnsembleOptions(options);
  const count = options.trees ?? 200;
  const seed = options.seed ?? 1;
  const workers = Math.min(count, options.workers ?? navigator.hardwareConcurrency ?? 1);
  if (!Number.isInteger(workers) || workers < 1) {
    throw new RangeError(`workers must be a whole number >= 1, got ${options.workers}`);
  }
  if (workers === 1) return fitEnsemble(dataset, options, bins);
  const order = canonicalRowOrder(dataset);
  const data = shareData(dataset, bins, order);
  const states = resampleStates(seed, dataset.target.values, count);
  const { onProgress, ...plain } = options;
  const trees: FlatTree[] = new Array(count);
  const alphas = new Float64Array(count);
  const oobValues: Float64Array[] = new Array(count);
  const parts: Float64Array[] = [];
  const shared: FlatTree[] = new Array(count);
  let done = 0;
  const init: ToWorker = { kind: "data", data, options: plain, states };
  const tasks: ToWorker[] = Array.from({ length: count }, (_, index) => ({ kind: "tree", index }));
  await onFittingWorkers(workers, [init], tasks, (reply) => {
    if (reply.kind !== "tree") return;
    trees[reply.index] = reply.tree;
    alphas[reply.index] = reply.alpha;
    oobValues[reply.index] = reply.oob;
    if (reply.importance !== undefined) parts[reply.index] = reply.importance;
    if (reply.shared !== undefined) shared[reply.index] = reply.shared;
    done++;
    onProgress?.(done, count);
  });
  const ensemble = assembleEnsemble(
    dataset,
    trees,
    alphas,
    oobValues,
    states,
    importanceParts(options, parts),
  );
  if (options.share !== undefined) ensemble.shared = shared;
  return ensemble;
}
