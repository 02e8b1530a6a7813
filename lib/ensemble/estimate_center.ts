/**
 * Where a model fitted on log pay puts its estimate. exp(mean of the
 * trees' log estimates) is a geometric mean, which sits below the median
 * pay of comparable people when their log pay is skewed (on AER's CPSSW8,
 * 47.7% of held-out people were paid less than it, z = -5.2). One global
 * shift, the median out-of-bag log residual of the whole table, makes it a
 * measured median. A shift that varied by group of estimates would make the
 * estimate jump at the groups' edges, so that a promotion could lower it;
 * one number keeps every comparison's direction.
 *
 * Mean pay relates to the estimate by Duan's smearing factor, the mean of
 * exp(residual) (Duan 1983, *JASA* 78(383), 605-610): mean pay of people
 * like this is about `meanOverEstimate` times the estimate.
 *
 * @module
 */

import { quantile } from "../table/quality.ts";

/** The log-scale estimate's shift to a median, and how mean pay relates to it. */
export interface EstimateCenter {
  /** Added to the trees' mean log estimate: the median out-of-bag log residual. */
  shift: number;
  /** Duan's smearing factor, mean(exp(out-of-bag log residual)). */
  duan: number;
  /** Mean pay over the (shifted) estimate: duan / exp(shift). */
  meanOverEstimate: number;
  /** Rows whose out-of-bag residual entered. */
  rows: number;
}

/**
 * The shift and smearing factor from out-of-bag log estimates and log pay;
 * rows without an out-of-bag estimate (NaN) are skipped. With none, the
 * shift is 0 and the factors 1.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { estimateCenter } from "./estimate_center.ts";
 * // Residuals 0, 0.1, 0.1, 0.3, 0.5: median 0.1.
 * const y = [1, 1.1, 1.1, 1.3, 1.5];
 * const center = estimateCenter(new Float64Array(5).fill(1), y);
 * assert(Math.abs(center.shift - 0.1) < 1e-12);
 * const duan = (1 + 2 * Math.exp(0.1) + Math.exp(0.3) + Math.exp(0.5)) / 5;
 * assert(Math.abs(center.duan - duan) < 1e-12);
 * assert(Math.abs(center.meanOverEstimate - duan / Math.exp(0.1)) < 1e-12);
 * ```
 */
export function estimateCenter(
  oob: ArrayLike<number>,
  y: ArrayLike<number>,
): EstimateCenter {
  const residuals: number[] = [];
  for (let r = 0; r < y.length; r++) {
    const e = y[r] - oob[r];
    if (Number.isFinite(e)) residuals.push(e);
  }
  if (residuals.length === 0) return { shift: 0, duan: 1, meanOverEstimate: 1, rows: 0 };
  // The median by the same quantile rule (R's type 7) the intervals use.
  const shift = quantile(Float64Array.from(residuals).sort(), 0.5);
  let sum = 0;
  for (const e of residuals) sum += Math.exp(e);
  const duan = sum / residuals.length;
  return { shift, duan, meanOverEstimate: duan / Math.exp(shift), rows: residuals.length };
}
