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
import { resampleStates } from "./bootstrap.ts";
import type { ToWorker } from "./_fit_worker.ts";
import { FittingPool, onFittingWorkers, sharedDataFor } from "./_worker_pool.ts";
import {
  assembleEnsemble,
  checkEnsembleOptions,
  type Ensemble,
  type EnsembleOptions,
  fitEnsemble,
  importanceParts,
  OutOfBagSums,
  widthOf,
} from "./fit_ensemble.ts";

/** Options of {@linkcode fitEnsembleParallel}. */
export interface ParallelOptions extends EnsembleOptions {
  /**
   * Number of workers (1 fits in this thread), or a pool whose workers to
   * use.
   * @default navigator.hardwareConcurrency
   */
  workers?: number | FittingPool;
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
  const [ensemble] = await fitEnsemblesParallel(
    [{ dataset, options, bins }],
    options.workers ?? navigator.hardwareConcurrency ?? 1,
  );
  return ensemble;
}

/** One ensemble of {@linkcode fitEnsemblesParallel}. */
export interface EnsembleJob {
  /** Its rows. */
  dataset: Dataset;
  /** Its options (`onProgress` counts this ensemble's trees). */
  options: EnsembleOptions;
  /** Its dataset's bins (default: binned here). */
  bins?: FeatureBins[];
}

/**
 * Fits several ensembles with all their trees on one set of workers,
 * started once: each ensemble is the one {@linkcode fitEnsemble} gives with
 * its options, whatever the worker count.
 *
 * @param workers Number of workers (1 fits in this thread), or a pool.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { fitEnsemble } from "./fit_ensemble.ts";
 * import { fitEnsemblesParallel } from "./fit_parallel.ts";
 * const years = Array.from({ length: 80 }, (_, i) => i % 40);
 * const dataset = (slope: number) => ({
 *   rows: 80,
 *   features: [{ name: "years", kind: "numeric" as const, values: Float64Array.from(years) }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.from(years, (y) => 40 + slope * y) },
 * });
 * const options = { trees: 6, seed: 4, prune: "none" as const };
 * const [a, b] = await fitEnsemblesParallel([
 *   { dataset: dataset(1), options },
 *   { dataset: dataset(3), options: { ...options, trees: 3 } },
 * ], 2);
 * assert.deepEqual(a.oob, fitEnsemble(dataset(1), options).oob);
 * assert.deepEqual(b.trees, fitEnsemble(dataset(3), { ...options, trees: 3 }).trees);
 * ```
 */
export async function fitEnsemblesParallel(
  jobs: readonly EnsembleJob[],
  workers: number | FittingPool,
): Promise<Ensemble[]> {
  for (const job of jobs) checkEnsembleOptions(job.options);
  const size = workers instanceof FittingPool ? workers.size : workers;
  if (!Number.isInteger(size) || size < 1) {
    throw new RangeError(`workers must be a whole number >= 1, got ${size}`);
  }
  const counts = jobs.map((job) => job.options.trees ?? 200);
  const total = counts.reduce((a, b) => a + b, 0);
  const binned = jobs.map((job) => job.bins ?? binFeatures(job.dataset));
  if (Math.min(total, size) <= 1) {
    return jobs.map((job, j) => fitEnsemble(job.dataset, job.options, binned[j]));
  }
  const opening: ToWorker[] = [];
  const tasks: ToWorker[] = [];
  const fits = jobs.map((job, key) => {
    const { dataset, options } = job;
    const count = counts[key];
    const data = sharedDataFor(workers, dataset, binned[key]);
    const states = resampleStates(options.seed ?? 1, dataset.target.values, count);
    const { onProgress: _, ...plain } = options;
    opening.push({ kind: "data", data, options: plain, states, key });
    for (let index = 0; index < count; index++) tasks.push({ kind: "tree", index, key });
    return {
      states,
      trees: new Array<FlatTree>(count),
      alphas: new Float64Array(count),
      outOfBag: new OutOfBagSums(dataset.rows, widthOf(dataset)),
      parts: [] as Float64Array[],
      shared: new Array<FlatTree>(count),
      done: 0,
    };
  });
  // A run uses no more workers than it has tasks.
  await onFittingWorkers(workers, opening, tasks, (reply) => {
    if (reply.kind !== "tree") return;
    const key = reply.key ?? 0;
    const fit = fits[key];
    fit.trees[reply.index] = reply.tree;
    fit.alphas[reply.index] = reply.alpha;
    fit.outOfBag.add(reply.index, reply.oob);
    if (reply.importance !== undefined) fit.parts[reply.index] = reply.importance;
    if (reply.shared !== undefined) fit.shared[reply.index] = reply.shared;
    fit.done++;
    jobs[key].options.onProgress?.(fit.done, counts[key]);
  });
  return jobs.map((job, key) => {
    const fit = fits[key];
    const ensemble = assembleEnsemble(
      job.dataset,
      fit.trees,
      fit.alphas,
      fit.outOfBag,
      fit.states,
      importanceParts(job.options, fit.parts),
    );
    if (job.options.share !== undefined) ensemble.shared = fit.shared;
    return ensemble;
  });
}
