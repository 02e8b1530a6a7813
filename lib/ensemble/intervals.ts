/**
 * What an ensemble says about one profile: the estimate, how much it moves
 * between bootstrap resamples, the range comparable people's pay falls in,
 * and paired what-if differences.
 *
 * @module
 */

import { applyValues } from "../tree/flat_tree.ts";
import {
  type ClassificationMetrics,
  classificationMetrics,
  type RegressionMetrics,
  regressionMetrics,
} from "../tree/metrics.ts";
import { bootstrapCounts } from "./bootstrap.ts";
import { quantile } from "../table/quality.ts";
import type { Ensemble } from "./fit_ensemble.ts";

/**
 * Every tree's estimate for a profile (regression ensembles), in tree order.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { fitEnsemble, treeEstimates } from "../../mod.ts";
 * const years = Array.from({ length: 40 }, (_, i) => i % 20);
 * const dataset = {
 *   rows: 40,
 *   features: [{ name: "years", kind: "numeric" as const, values: Float64Array.from(years) }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.from(years, (y) => 50 + y) },
 * };
 * const ensemble = fitEnsemble(dataset, { trees: 10, prune: "none", grow: { minLeaf: 2 } });
 * const estimates = treeEstimates(ensemble, [15]);
 * assert(estimates.length === 10 && estimates.every((e) => e > 60 && e < 70));
 * ```
 */
export function treeEstimates(ensemble: Ensemble, profile: ArrayLike<number>): Float64Array {
  if (ensemble.width !== 1) throw new TypeError("treeEstimates needs a regression ensemble");
  return Float64Array.from(ensemble.trees, (tree) => tree.value[applyValues(tree, profile)]);
}

/**
 * The mean of values.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { mean } from "./intervals.ts";
 * assert.equal(mean([1, 2, 3, 6]), 3);
 * assert.equal(mean(Float64Array.of(-4, 5)), 0.5);
 * ```
 */
export function mean(values: ArrayLike<number>): number {
  let sum = 0;
  for (let i = 0; i < values.length; i++) sum += values[i];
  return sum / values.length;
}

/** An interval with the share it is meant to cover. */
export interface Interval {
  /** Lower end. */
  low: number;
  /** Upper end. */
  high: number;
  /** Nominal coverage, e.g. 0.9. */
  coverage: number;
}

/**
 * The central percentile interval of values (quantiles by R's type 7).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { percentileInterval } from "./intervals.ts";
 * const i = percentileInterval(Float64Array.from({ length: 101 }, (_, k) => k), 0.9);
 * assert(Math.abs(i.low - 5) < 1e-9 && Math.abs(i.high - 95) < 1e-9);
 * ```
 */
export function percentileInterval(values: ArrayLike<number>, coverage: number): Interval {
  checkCoverage(coverage);
  const sorted = Float64Array.from(values).sort();
  const tail = (1 - coverage) / 2;
  return { low: quantile(sorted, tail), high: quantile(sorted, 1 - tail), coverage };
}

/**
 * The out-of-bag residuals y - yhat(OOB) of the rows that have an
 * out-of-bag prediction (regression).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { oobResiduals } from "./intervals.ts";
 * // Row 1 was drawn by every tree: no out-of-bag prediction.
 * const ensemble = {
 *   trees: [],
 *   resamples: new Int32Array(0),
 *   alphas: new Float64Array(0),
 *   width: 1,
 *   oob: Float64Array.of(10, NaN, 25, 40),
 *   oobTrees: Int32Array.of(2, 0, 1, 3),
 * };
 * assert.deepEqual([...oobResiduals(ensemble, [12, 20, 20, 41])], [2, -5, 1]);
 * ```
 */
export function oobResiduals(ensemble: Ensemble, y: ArrayLike<number>): Float64Array {
  const out: number[] = [];
  for (let r = 0; r < y.length; r++) {
    if (ensemble.oobTrees[r] > 0) out.push(y[r] - ensemble.oob[r]);
  }
  return Float64Array.from(out);
}

/**
 * The range comparable people's pay falls in: the estimate plus the
 * out-of-bag residual quantiles (Zhang, Zimmerman, Nettleton & Nordman 2020,
 * *The American Statistician* 74(4)). It assumes a similar spread of pay
 * around the estimate for every profile.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { residualRange } from "./intervals.ts";
 * const residuals = Float64Array.from({ length: 101 }, (_, k) => k - 50);
 * const range = residualRange(1000, residuals, 0.9);
 * assert(Math.abs(range.low - 955) < 1e-9 && Math.abs(range.high - 1045) < 1e-9);
 * ```
 */
export function residualRange(
  estimate: number,
  residuals: ArrayLike<number>,
  coverage: number,
): Interval {
  const spread = percentileInterval(residuals, coverage);
  return { low: estimate + spread.low, high: estimate + spread.high, coverage };
}

/** A what-if difference: changed profile minus base profile. */
export interface Difference extends Interval {
  /** The ensemble's estimate of the difference. */
  estimate: number;
}

/**
 * The difference between two profiles from the trees' paired differences:
 * each tree estimates both profiles, and the interval is the percentile
 * interval of the per-tree differences, far narrower than subtracting two
 * separate intervals because the trees' shared errors cancel.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { fitEnsemble, pairedDifference } from "../../mod.ts";
 * const years = Array.from({ length: 60 }, (_, i) => i % 30);
 * const dataset = {
 *   rows: 60,
 *   features: [{ name: "years", kind: "numeric" as const, values: Float64Array.from(years) }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.from(years, (y) => 50 + (y >= 15 ? 20 : 0)) },
 * };
 * const ensemble = fitEnsemble(dataset, { trees: 20, prune: "none", grow: { minLeaf: 3 } });
 * const d = pairedDifference(ensemble, [5], [25], 0.9);
 * assert(Math.abs(d.estimate - 20) < 1e-9 && Math.abs(d.low - 20) < 1e-9);
 * ```
 */
export function pairedDifference(
  ensemble: Ensemble,
  base: ArrayLike<number>,
  changed: ArrayLike<number>,
  coverage: number,
): Difference {
  const a = treeEstimates(ensemble, base);
  const b = treeEstimates(ensemble, changed);
  const diffs = b.map((v, t) => v - a[t]);
  return { estimate: mean(diffs), ...percentileInterval(diffs, coverage) };
}

/**
 * Out-of-bag accuracy of a regression ensemble: RMSE, MAE and R-squared of
 * the out-of-bag predictions, over the rows that have one.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { oobRegressionMetrics } from "./intervals.ts";
 * // Row 1 has no out-of-bag prediction; the others have residuals 2, -5, 1.
 * const ensemble = {
 *   trees: [],
 *   resamples: new Int32Array(0),
 *   alphas: new Float64Array(0),
 *   width: 1,
 *   oob: Float64Array.of(10, NaN, 25, 40),
 *   oobTrees: Int32Array.of(2, 0, 1, 3),
 * };
 * const m = oobRegressionMetrics(ensemble, [12, 20, 20, 41]);
 * assert.equal(m.rows, 3);
 * assert(Math.abs(m.rmse - Math.sqrt(30 / 3)) < 1e-12);
 * assert(Math.abs(m.mae - 8 / 3) < 1e-12);
 * // Actual 12, 20, 41: SST = 2225 - 73^2 / 3 = 1346 / 3, SSE = 30.
 * assert(Math.abs(m.r2 - (1 - 90 / 1346)) < 1e-12);
 * ```
 */
export function oobRegressionMetrics(
  ensemble: Ensemble,
  y: ArrayLike<number>,
): RegressionMetrics & {
  rows: number;
} {
  const actual: number[] = [];
  const predicted: number[] = [];
  for (let r = 0; r < y.length; r++) {
    if (ensemble.oobTrees[r] === 0) continue;
    actual.push(y[r]);
    predicted.push(ensemble.oob[r]);
  }
  return { ...regressionMetrics(actual, predicted), rows: actual.length };
}

/**
 * Out-of-bag accuracy of a classification ensemble: the class with the
 * largest averaged share per row, against the row's class.
 *
 * @param classes Each row's class code.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { oobClassificationMetrics } from "./intervals.ts";
 * // Two classes; row 2 has no out-of-bag trees. Largest shares: 0, 1, -, 0.
 * const ensemble = {
 *   trees: [],
 *   resamples: new Int32Array(0),
 *   alphas: new Float64Array(0),
 *   width: 2,
 *   oob: Float64Array.of(0.8, 0.2, 0.3, 0.7, 0.5, 0.5, 0.6, 0.4),
 *   oobTrees: Int32Array.of(4, 2, 0, 3),
 * };
 * const m = oobClassificationMetrics(ensemble, [0, 1, 1, 1]);
 * // Rows 0, 1, 3: classes 0, 1, 1 predicted 0, 1, 0.
 * assert.equal(m.rows, 3);
 * assert(Math.abs(m.accuracy - 2 / 3) < 1e-12);
 * assert.deepEqual(m.confusion, [[1, 0], [1, 1]]);
 * ```
 */
export function oobClassificationMetrics(
  ensemble: Pick<Ensemble, "oob" | "oobTrees" | "width">,
  classes: ArrayLike<number>,
): ClassificationMetrics & { rows: number } {
  const width = ensemble.width;
  const actual: number[] = [];
  const predicted: number[] = [];
  for (let r = 0; r < classes.length; r++) {
    if (ensemble.oobTrees[r] === 0) continue;
    let best = 0;
    for (let c = 1; c < width; c++) {
      if (ensemble.oob[r * width + c] > ensemble.oob[r * width + best]) best = c;
    }
    actual.push(classes[r]);
    predicted.push(best);
  }
  return { ...classificationMetrics(actual, predicted, width), rows: actual.length };
}

/** The infinitesimal jackknife's standard error of an ensemble mean. */
export interface JackknifeError {
  /** Standard error after the bias correction (0 when the correction overshoots). */
  se: number;
  /** True when the bias-corrected variance came out negative and was set to 0. */
  clamped: boolean;
  /** Standard error without the bias correction. */
  uncorrectedSe: number;
}

/**
 * Every tree's bootstrap counts, regenerated once from the trees' generator states so
 * that many jackknife queries need not redraw them (tree-major: tree b's
 * count of row i is `counts[b * rows + i]`).
 */
export interface InBagCounts {
  /** Training rows. */
  rows: number;
  /** Tree-major counts (a row is drawn at most a few times, so 8 bits hold it). */
  counts: Uint8Array;
}

/**
 * Regenerates the bootstrap counts of every tree of an ensemble fitted on
 * `rows` rows.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { bootstrapCounts, fitEnsemble, inBagCounts } from "../../mod.ts";
 * const dataset = {
 *   rows: 30,
 *   features: [{ name: "x", kind: "numeric" as const, values: Float64Array.from({ length: 30 }, (_, i) => i) }],
 *   target: { kind: "regression" as const, name: "y", values: Float64Array.from({ length: 30 }, (_, i) => i) },
 * };
 * const ensemble = fitEnsemble(dataset, { trees: 3, prune: "none" });
 * const bag = inBagCounts(ensemble, 30);
 * assert.deepEqual(Array.from(bag.counts.subarray(30, 60)), Array.from(bootstrapCounts(30, ensemble.resamples, 1)));
 * ```
 */
export function inBagCounts(
  ensemble: Pick<Ensemble, "trees" | "resamples">,
  rows: number,
): InBagCounts {
  const counts = new Uint8Array(ensemble.trees.length * rows);
  for (let b = 0; b < ensemble.trees.length; b++) {
    counts.set(bootstrapCounts(rows, ensemble.resamples, b), b * rows);
  }
  return { rows, counts };
}

/**
 * The bias-corrected infinitesimal jackknife standard error of the
 * ensemble's estimate for a profile (Wager, Hastie & Efron 2014, *JMLR* 15,
 * eq. 5 and 7): V_IJ = sum over rows i of Cov_i^2, Cov_i = (1/B) sum over
 * trees b of (N_bi - 1)(t_b - tbar), minus (n / B^2) sum_b (t_b - tbar)^2.
 * It is the uncertainty of the typical pay for such a profile, not the
 * spread of one person's pay; its correction needs B of the order of n to
 * be stable (see {@linkcode DEFAULT_HOW_SURE} for the measured cut-off).
 *
 * @param bag The trees' counts from {@linkcode inBagCounts}, to reuse
 * across profiles (regenerated when omitted).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures } from "../tree/bins.ts";
 * import { growTree } from "../tree/grow_tree.ts";
 * import { infinitesimalJackknife } from "./intervals.ts";
 * // Two one-leaf trees estimating 10 and 14 (mean 12, deviations -2 and 2).
 * const leaf = (pay: number) => {
 *   const dataset = {
 *     rows: 2,
 *     features: [{ name: "x", kind: "numeric" as const, values: Float64Array.of(1, 2) }],
 *     target: { kind: "regression" as const, name: "pay", values: Float64Array.of(pay, pay) },
 *   };
 *   return growTree({ dataset, bins: binFeatures(dataset) });
 * };
 * const ensemble = {
 *   trees: [leaf(10), leaf(14)],
 *   resamples: new Int32Array(0),
 *   alphas: new Float64Array(2),
 *   width: 1,
 *   oob: new Float64Array(2),
 *   oobTrees: new Int32Array(2),
 * };
 * // Tree 0 drew row 0 twice, tree 1 row 1 twice:
 * // Cov_0 = ((2 - 1)(-2) + (0 - 1)(2)) / 2 = -2, Cov_1 = 2, so V = 8;
 * // the correction takes (n / B^2) x 8 = 4, leaving 4: SE 2.
 * const ij = infinitesimalJackknife(ensemble, 2, [1], { rows: 2, counts: Uint8Array.of(2, 0, 0, 2) });
 * assert.deepEqual(ij, { se: 2, clamped: false, uncorrectedSe: Math.sqrt(8) });
 * // Every row drawn once by each tree: V = 0, corrected -4, clamped at 0.
 * const flat = infinitesimalJackknife(ensemble, 2, [1], { rows: 2, counts: Uint8Array.of(1, 1, 1, 1) });
 * assert.deepEqual(flat, { se: 0, clamped: true, uncorrectedSe: 0 });
 * ```
 */
export function infinitesimalJackknife(
  ensemble: Ensemble,
  rows: number,
  profile: ArrayLike<number>,
  bag: InBagCounts = inBagCounts(ensemble, rows),
): JackknifeError {
  if (bag.rows !== rows) throw new RangeError(`counts are for ${bag.rows} rows, not ${rows}`);
  const estimates = treeEstimates(ensemble, profile);
  const trees = estimates.length;
  const average = mean(estimates);
  const cov = new Float64Array(rows);
  let spread = 0;
  let sumD = 0;
  const counts = bag.counts;
  for (let b = 0; b < trees; b++) {
    const d = estimates[b] - average;
    spread += d * d;
    sumD += d;
    if (d === 0) continue;
    const offset = b * rows;
    for (let i = 0; i < rows; i++) cov[i] += counts[offset + i] * d;
  }
  let v = 0;
  // Cov_i * B = sum_b N_bi d_b - sum_b d_b (the -1 of (N_bi - 1)).
  for (let i = 0; i < rows; i++) v += ((cov[i] - sumD) / trees) ** 2;
  const corrected = v - (rows / (trees * trees)) * spread;
  return {
    se: Math.sqrt(Math.max(0, corrected)),
    clamped: corrected < 0,
    uncorrectedSe: Math.sqrt(v),
  };
}

function checkCoverage(coverage: number): void {
  if (!(coverage > 0 && coverage < 1)) {
    throw new RangeError(`coverage must lie strictly between 0 and 1, got ${coverage}`);
  }
}
