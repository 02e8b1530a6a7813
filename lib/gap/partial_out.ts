/**
 * The adjusted (unexplained) gap by partialling out (Robinson 1988,
 * *Econometrica* 56, "Root-N-consistent semiparametric regression";
 * Chernozhukov et al. 2018, *Econometrics Journal* 21, "Double/debiased
 * machine learning"): the part of log pay the legitimate factors do not
 * predict is regressed on the part of group membership they do not predict.
 * Both parts come from out-of-bag predictions, which play the role of the
 * cross-fitting in Chernozhukov et al. The regression has an intercept, so a
 * category where the pay model is off on average does not bend the slope,
 * and heteroskedasticity-robust (HC1, White 1980 with the n / (n - p)
 * factor) standard errors, since pay spreads differ by level.
 *
 * @module
 */

import normalCdf from "@stdlib/stats-base-dists-normal-cdf";
import normalQuantile from "@stdlib/stats-base-dists-normal-quantile";
import { inverse, Matrix } from "ml-matrix";

/** One coefficient of the residual regression. */
export interface GapCoefficient {
  /** The coefficient b: the group's log-pay difference from the reference (negative: paid less). */
  coefficient: number;
  /** Its robust standard error. */
  se: number;
  /** Two-sided p-value of b = 0 (normal approximation). */
  p: number;
}

/**
 * Regresses `y` on an intercept and the columns `x` over the rows given,
 * with HC1 robust standard errors; returns one entry per column of `x`
 * (the intercept is left out). Null when the rows are too few or a column
 * has no spread among them.
 *
 * @param y Pay residuals (log points).
 * @param x Group-indicator residuals, one column per non-reference group.
 * @param rows The rows to use.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { residualRegression } from "./partial_out.ts";
 * // y = 0.5 - 0.2 x exactly: b = -0.2 and no error left.
 * const x = Float64Array.from([-1, -0.5, 0, 0.5, 1, 1.5]);
 * const y = x.map((v) => 0.5 - 0.2 * v);
 * const [fit] = residualRegression(y, [x], [0, 1, 2, 3, 4, 5])!;
 * assert(Math.abs(fit.coefficient + 0.2) < 1e-12 && fit.se < 1e-12);
 * ```
 */
export function residualRegression(
  y: ArrayLike<number>,
  x: readonly ArrayLike<number>[],
  rows: ArrayLike<number>,
): GapCoefficient[] | null {
  const n = rows.length;
  const p = x.length + 1;
  if (n <= p + 1) return null;
  const design = new Matrix(n, p);
  const target = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const r = rows[i];
    design.set(i, 0, 1);
    for (let j = 1; j < p; j++) design.set(i, j, x[j - 1][r]);
    target[i] = y[r];
  }
  const xtx = design.transpose().mmul(design);
  // A column with no spread (everyone in the rows has the same residual)
  // leaves nothing to estimate.
  for (let j = 1; j < p; j++) {
    let mean = 0;
    for (let i = 0; i < n; i++) mean += design.get(i, j) / n;
    let ss = 0;
    for (let i = 0; i < n; i++) ss += (design.get(i, j) - mean) ** 2;
    if (!(ss > 1e-12 * n)) return null;
  }
  const bread = inverse(xtx);
  const beta = bread.mmul(design.transpose().mmul(Matrix.columnVector(Array.from(target))));
  // Meat: sum of e_i^2 x_i x_i'.
  const meat = new Matrix(p, p);
  for (let i = 0; i < n; i++) {
    let fitted = 0;
    for (let j = 0; j < p; j++) fitted += design.get(i, j) * beta.get(j, 0);
    const e2 = (target[i] - fitted) ** 2;
    for (let a = 0; a < p; a++) {
      const xa = design.get(i, a) * e2;
      for (let b = a; b < p; b++) meat.set(a, b, meat.get(a, b) + xa * design.get(i, b));
    }
  }
  for (let a = 0; a < p; a++) for (let b = 0; b < a; b++) meat.set(a, b, meat.get(b, a));
  const covariance = bread.mmul(meat).mmul(bread).mul(n / (n - p));
  const out: GapCoefficient[] = [];
  for (let j = 1; j < p; j++) {
    const coefficient = beta.get(j, 0);
    const se = Math.sqrt(Math.max(covariance.get(j, j), 0));
    out.push({ coefficient, se, p: twoSidedP(coefficient, se) });
  }
  return out;
}

/**
 * Two-sided p-value of an estimate against 0 under the normal
 * approximation; 1 for a zero estimate with zero error, 0 for a non-zero
 * one.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { twoSidedP } from "./partial_out.ts";
 * assert(Math.abs(twoSidedP(1.959963984540054, 1) - 0.05) < 1e-12);
 * ```
 */
export function twoSidedP(estimate: number, se: number): number {
  if (se === 0) return estimate === 0 ? 1 : 0;
  return 2 * normalCdf(-Math.abs(estimate / se), 0, 1);
}

/**
 * Holm's (1979, *Scandinavian Journal of Statistics* 6) step-down adjusted
 * p-values: the k-th smallest of m p-values is multiplied by m - k + 1, then
 * made non-decreasing and capped at 1. Rejecting where the adjusted value is
 * at most 0.05 keeps the chance of any false flag at most 5%.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { holmAdjust } from "./partial_out.ts";
 * // Same as R's p.adjust(c(0.01, 0.04, 0.03, 0.005), "holm").
 * assert.deepEqual(holmAdjust([0.01, 0.04, 0.03, 0.005]), [0.03, 0.06, 0.06, 0.02]);
 * ```
 */
export function holmAdjust(p: readonly number[]): number[] {
  const m = p.length;
  const order = p.map((_, i) => i).sort((a, b) => p[a] - p[b] || a - b);
  const adjusted = new Array<number>(m);
  let running = 0;
  order.forEach((i, k) => {
    running = Math.max(running, Math.min(1, (m - k) * p[i]));
    // Rounded to 15 significant digits so 3 x 0.01 reads 0.03, as in R.
    adjusted[i] = Number(running.toPrecision(15));
  });
  return adjusted;
}

/**
 * A log-point coefficient as a gap: 1 - exp(b), the share by which the
 * group's pay falls short of the reference group's (0.06: 6% less), with
 * the confidence interval of b carried over (its ends swap, since a more
 * negative b is a larger gap).
 *
 * @param coverage Confidence level, e.g. 0.95.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { gapFromCoefficient } from "./partial_out.ts";
 * const gap = gapFromCoefficient(Math.log(0.94), 0, 0.95);
 * assert(Math.abs(gap.gap - 0.06) < 1e-12 && gap.low === gap.high);
 * ```
 */
export function gapFromCoefficient(
  coefficient: number,
  se: number,
  coverage: number,
): { gap: number; low: number; high: number } {
  const z = normalQuantile(1 - (1 - coverage) / 2, 0, 1);
  return {
    gap: 1 - Math.exp(coefficient),
    low: 1 - Math.exp(coefficient + z * se),
    high: 1 - Math.exp(coefficient - z * se),
  };
}
