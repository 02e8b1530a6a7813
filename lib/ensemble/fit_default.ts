/**
 * The default model in one call: the reference tree chosen by
 * cross-validation, and the ensemble whose trees are pruned as
 * {@linkcode DEFAULT_PRUNING} says, at the alpha that cross-validation gave.
 * The one recipe every command's ensemble comes from (lib/model/pay_pipeline.ts
 * prepares its rows); the gap check asks for unpruned trees and no
 * cross-validation.
 *
 * @module
 */

import type { Dataset } from "../dataset/types.ts";
import { binFeatures } from "../tree/bins.ts";
import type { CrossValidatedTree } from "../tree/cross_validate.ts";
import { crossValidateTreeParallel } from "./cross_validate_parallel.ts";
import type { GrowOptions } from "../tree/grow_tree.ts";
import type { CrossValidateOptions } from "../tree/cross_validate.ts";
import { DEFAULT_PRUNING } from "./defaults.ts";
import type { Ensemble, EnsembleOptions } from "./fit_ensemble.ts";
import { fitEnsembleParallel } from "./fit_parallel.ts";
import type { FittingPool } from "./_worker_pool.ts";

/** Options of {@linkcode fitDefaultEnsemble}. */
export interface DefaultEnsembleOptions {
  /**
   * Trees in the ensemble; 0 fits the reference tree alone.
   * @default {200}
   */
  trees?: number;
  /**
   * How the ensemble's trees are pruned: at the alpha {@linkcode DEFAULT_PRUNING}
   * names, or not at all ("none": then no cross-validation is run unless
   * `crossValidate` asks for it).
   * @default {"alpha-min"}
   */
  prune?: "alpha-min" | "none";
  /**
   * Whether to cross-validate the reference tree.
   * @default {true, unless prune is "none"}
   */
  crossValidate?: boolean;
  /**
   * Rule for the reference tree's size (the ensemble's alpha follows
   * {@linkcode DEFAULT_PRUNING} whatever this says).
   * @default {"one-se"}
   */
  rule?: "one-se" | "min";
  /** Further losses measured over the folds (see crossValidateTree). */
  extraLosses?: CrossValidateOptions["extraLosses"];
  /**
   * Seed of the ensemble's resamples.
   * @default {1}
   */
  seed?: number;
  /**
   * Folds of the reference tree's cross-validation (never more than rows).
   * @default {10}
   */
  folds?: number;
  /**
   * Seed of the fold assignment.
   * @default {1}
   */
  foldSeed?: number;
  /**
   * Workers for the cross-validation and the ensemble (default: one per
   * core), or a pool whose workers to use for both.
   */
  workers?: number | FittingPool;
  /** Stopping rules of every tree. */
  grow?: GrowOptions;
  /** Called as trees are done. */
  onProgress?: (done: number, total: number) => void;
  /** Called as folds are done. */
  onCrossValidation?: (done: number, total: number) => void;
  /**
   * Called when the cross-validation's trees are back from the workers,
   * before this thread scores the last of them (see
   * crossValidateTreeParallel): work sent aside to the pool then fills the
   * workers' wait.
   */
  onCrossValidationGrown?: () => void;
  /** Measure permutation importance as the trees are fitted (see `EnsembleOptions.importance`). */
  importance?: EnsembleOptions["importance"];
  /** Make each tree's shareable copy as it is fitted (see `EnsembleOptions.share`). */
  share?: EnsembleOptions["share"];
}

/** The reference tree, the alpha the trees were pruned at, and the ensemble. */
export interface DefaultEnsemble {
  /** The cross-validated reference tree (null when not cross-validated). */
  reference: CrossValidatedTree | null;
  /** The alpha every tree of the ensemble was pruned at (0: unpruned). */
  alpha: number;
  /** The ensemble (null for 0 trees). */
  ensemble: Ensemble | null;
  /** The folds used (fewer than asked when there are fewer rows). */
  folds: number;
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
 * assert(model.ensemble!.alphas.every((a) => a === model.alpha));
 * assert.equal(model.alpha, model.reference!.candidates[model.reference!.best].alpha);
 * ```
 */
export async function fitDefaultEnsemble(
  dataset: Dataset,
  options: DefaultEnsembleOptions = {},
): Promise<DefaultEnsemble> {
  const bins = binFeatures(dataset);
  const prune = options.prune ?? "alpha-min";
  const trees = options.trees ?? 200;
  // Each fold holds at least one row.
  const folds = Math.min(options.folds ?? 10, dataset.rows);
  const reference = (options.crossValidate ?? prune !== "none")
    ? await crossValidateTreeParallel(dataset, {
      workers: options.workers,
      folds,
      seed: options.foldSeed ?? 1,
      rule: options.rule ?? "one-se",
      grow: options.grow,
      extraLosses: options.extraLosses,
      onProgress: options.onCrossValidation,
      onTreesGrown: options.onCrossValidationGrown,
    }, bins)
    : null;
  // The alpha of the lowest cross-validated error (DEFAULT_PRUNING.alphaRule).
  const alpha = prune === "none" || reference === null
    ? 0
    : reference.candidates[reference.best].alpha;
  const ensemble = trees === 0 ? null : await fitEnsembleParallel(dataset, {
    trees,
    seed: options.seed ?? 1,
    prune: prune === "none" ? "none" : DEFAULT_PRUNING.mode,
    alpha: prune === "none" ? undefined : alpha,
    grow: options.grow,
    workers: options.workers,
    onProgress: options.onProgress,
    importance: options.importance,
    share: options.share,
  }, bins);
  return { reference, alpha, ensemble, folds };
}
