/**
 * What-if sweeps: estimates over a grid of one attribute with the others
 * held fixed, and the averaged version over a table's rows (partial
 * dependence, Friedman 2001, *Annals of Statistics* 29). Both assume the
 * other attributes can be held fixed; with correlated attributes (level and
 * tenure) they visit profiles that may never occur.
 *
 * @module
 */

import type { Dataset, Feature } from "../dataset/types.ts";
import { quantile } from "../table/quality.ts";
import { mean, treeEstimates } from "./intervals.ts";
import { type ProfileReader, type ProfileReading, readProfile } from "./read_profile.ts";
import type { Ensemble } from "./fit_ensemble.ts";

/**
 * The grid of a feature: every level of an ordinal or categorical feature
 * (as codes); for a numeric one `steps` evenly spaced values from `from` to
 * `to`, by default the 1% and 99% quantiles of the data (as the sweep
 * command's grid, from the model's stored range).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { sweepGrid } from "./sweep.ts";
 * const years = { name: "years", kind: "numeric" as const, values: Float64Array.from({ length: 101 }, (_, i) => i) };
 * assert.deepEqual(sweepGrid(years, { steps: 3 }), [1, 50, 99]);
 * ```
 */
export function sweepGrid(
  feature: Feature,
  options: { from?: number; to?: number; steps?: number } = {},
): number[] {
  if (feature.kind !== "numeric") return (feature.levels ?? []).map((_, i) => i);
  const known = feature.values.filter((v) => !Number.isNaN(v)).sort();
  if (known.length === 0) throw new RangeError(`"${feature.name}" has no values to sweep over`);
  const from = options.from ?? quantile(known, 0.01);
  const to = options.to ?? quantile(known, 0.99);
  const steps = options.steps ?? 20;
  if (!Number.isInteger(steps) || steps < 2) {
    throw new RangeError(`steps must be >= 2, got ${steps}`);
  }
  return Array.from({ length: steps }, (_, i) => from + ((to - from) * i) / (steps - 1));
}

/** One point of a sweep: the feature's value and the reading there. */
export interface SweepPoint extends ProfileReading {
  /** The feature's value (a level code for ordinal and categorical features). */
  value: number;
}

/**
 * Readings of one profile (estimate, how sure, range, all in money) as one
 * feature runs over a grid with the others held fixed.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { sweepProfile } from "./sweep.ts";
 * import { binFeatures } from "../tree/bins.ts";
 * import { growTree } from "../tree/grow_tree.ts";
 * import { readerFromParts } from "./read_profile.ts";
 * // Two trees split after x = 2: one says 10 or 30, the other 10 or 40.
 * const tree = (high: number) => {
 *   const dataset = {
 *     rows: 4,
 *     features: [{ name: "x", kind: "numeric" as const, values: Float64Array.of(1, 2, 3, 4) }],
 *     target: { kind: "regression" as const, name: "pay", values: Float64Array.of(10, 10, high, high) },
 *   };
 *   return growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
 * };
 * // One group of residuals -1, 0, 1 for every estimate.
 * const groups = { edges: Float64Array.of(Infinity), residuals: [Float64Array.of(-1, 0, 1)] };
 * const reader = readerFromParts({
 *   ensemble: { trees: [tree(30), tree(40)] },
 *   scale: "raw",
 *   groups,
 *   trainingRows: 10,
 *   resamples: null,
 * });
 * // x from 1 to 4: both trees say 10 up to x = 2, then 30 and 40 (mean 35).
 * const points = sweepProfile(reader, [0], 0, [1, 2, 3, 4]);
 * assert.deepEqual(points.map((p) => p.value), [1, 2, 3, 4]);
 * assert.deepEqual(points.map((p) => p.estimate), [10, 10, 35, 35]);
 * assert.deepEqual([...points[3].trees], [30, 40]);
 * ```
 */
export function sweepProfile(
  reader: ProfileReader,
  profile: ArrayLike<number>,
  feature: number,
  grid: readonly number[],
  coverage = 0.9,
): SweepPoint[] {
  const values = Float64Array.from(profile);
  return grid.map((value) => {
    values[feature] = value;
    return { value, ...readProfile(reader, values, coverage) };
  });
}

/**
 * Partial dependence: at each grid value, the ensemble's estimate averaged
 * over the dataset's rows with the feature set to that value.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { fitEnsemble, partialDependence } from "../../mod.ts";
 * const years = Array.from({ length: 60 }, (_, i) => i % 30);
 * const dataset = {
 *   rows: 60,
 *   features: [{ name: "years", kind: "numeric" as const, values: Float64Array.from(years) }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.from(years, (y) => 40 + y) },
 * };
 * const ensemble = fitEnsemble(dataset, { trees: 10, prune: "none", grow: { minLeaf: 2 } });
 * const curve = partialDependence(ensemble, dataset, 0, [2, 27]);
 * assert(curve[1] - curve[0] > 15);
 * ```
 */
export function partialDependence(
  ensemble: Ensemble,
  dataset: Dataset,
  feature: number,
  grid: readonly number[],
): number[] {
  const features = dataset.features.length;
  const profile = new Float64Array(features);
  return grid.map((value) => {
    let sum = 0;
    for (let r = 0; r < dataset.rows; r++) {
      for (let f = 0; f < features; f++) profile[f] = dataset.features[f].values[r];
      profile[feature] = value;
      sum += mean(treeEstimates(ensemble, profile));
    }
    return sum / dataset.rows;
  });
}
