/**
 * The default model in one call: the reference tree chosen by
 * cross-validation, and the ensemble whose trees are pruned as
 * {@linkcode DEFAULT_PRUNING} says, at the alpha that cross-validation gave.
 *
 * @module
 */

import type { Dataset } from "../dataset/types.ts";
import { binFeatures } from "../tree/bins.ts";
import { type CrossValidatedTree, crossValidateTree } from "../tree/cross_validate.ts";
import type { GrowOptions } from "../tree/grow_tree.ts";
import { DEFAULT_PRUNING } from "./defaults.ts";
import type { Ensemble } from "./fit_ensemble.ts";
import { fitEnsembleParallel } from "./fit_parallel.ts";

/** Options of {@linkcode fitDefaultEnsemble}. */
export interface DefaultEnsembleOptions {
  /**
   * Trees in the ensemble.
   * @default {200}
   */
  trees?: number;
  /**
   * Seed of the ensemble's resamples.
   * @default {1}
   */
  seed?: number;
  /**
   * Folds of the reference tree's cross-validation.
   * @default {10}
   */
  folds?: number;
  /**
   * Seed of the fold assignment.
   * @default {1}
   */
  foldSeed?: number;
  /** Workers for the ensemble (default: one per core). */
  workers?: number;
  /** Stopping rules of every tree. */
  grow?: GrowOptions;
  /** Called as trees are done. */
  onProgress?: (done: number, total: number) => void;
}

/** The reference tree, the alpha the trees were pruned at, and the ensemble. */
export interface DefaultEnsemble {
  /** The cross-validated reference tree. */
  reference: CrossValidatedTree;
  /** The alpha every tree of the ensemble was pruned at. */
  alpha: number;
  /** The ensemble. */
  ensemble: Ensemble;
}

/**
 * Fits the reference tree and the default ensemble.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { fitDefaultEnsemble } from "../../mod.ts";
 * const years = Array.from({ length: 60 }, (_, i) => i % 30);
 * const dataset = {
 *   rows: 60,
 *   features: [{ name: "years", kind: "numeric" as const, values: Float64Array.from(years) }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.from(years, (y) => 40 + y) },
 * };
 * const model = await fitDefaultEnsemble(dataset, { trees: 10, folds: 5, workers: 1 });
 * assert(model.ensemble.alphas.every((a) => a === model.alpha));
 * ```
 */
export async function fitDefaultEnsemble(
  dataset: Dataset,
  options: DefaultEnsembleOptions = {},
): Promise<DefaultEnsemble> {
  const bins = binFeatures(dataset);
  const reference = crossValidateTree(dataset, {
    folds: options.folds ?? 10,
    seed: options.foldSeed ?? 1,
    rule: DEFAULT_PRUNING.alphaRule,
    grow: options.grow,
  }, bins);
  const alpha = reference.candidates[reference.chosen].alpha;
  const ensemble = await fitEnsembleParallel(dataset, {
    trees: options.trees ?? 200,
    seed: options.seed ?? 1,
    prune: DEFAULT_PRUNING.mode,
    alpha,
    grow: options.grow,
    workers: options.workers,
    onProgress: options.onProgress,
  }, bins);
  return { reference, alpha, ensemble };
}
