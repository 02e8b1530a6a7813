/**
 * Ordinary least squares with an intercept, as R's `lm()` fits it: a QR
 * decomposition with limited column pivoting (./pivoted_qr.ts) that leaves
 * a column out when it is a combination of earlier ones (a constant, a
 * multiple of another column, a level nobody in the rows has), reports
 * which, and fits the rest.
 *
 * @module
 */

import { inverse, Matrix } from "ml-matrix";
import { pivotedQr, qrCoefficients, unscaledVariances } from "./pivoted_qr.ts";

/** A least-squares fit. */
export interface LinearFit {
  /** Coefficient names: `(Intercept)` first, then the design's columns. */
  names: string[];
  /** Coefficients in the same order; `NaN` for an aliased column (R's `NA`). */
  coefficients: Float64Array;
  /** Classical (homoscedastic) standard errors; `NaN` for an aliased column. */
  standardErrors: Float64Array;
  /**
   * Heteroskedasticity-robust standard errors, HC1 (White's sandwich with
   * the n / (n - rank) correction, R's `sandwich::vcovHC(type = "HC1")`);
   * `NaN` for an aliased column or when n = rank.
   */
  robustStandardErrors: Float64Array;
  /** Residual standard deviation, sqrt(SSE / (n - rank)); `NaN` when n = rank. */
  residualSd: number;
  /** Coefficients estimated (columns judged linearly independent). */
  rank: number;
  /**
   * Positions in `names` of the columns left out as combinations of earlier
   * ones (ascending; never 0, the intercept comes first).
   */
  aliased: number[];
}

/**
 * Fits y = b0 + X b by least squares, leaving out aliased columns as R's
 * `lm()` does (their coefficient is `NaN`; {@linkcode predictLinear} counts
 * them as 0). More columns than rows is allowed: the later ones are left out.
 *
 * @throws {RangeError} without rows, or when the columns and y differ in length.
 *
 * @example A multiple of another column is left out
 * ```ts
 * import assert from "node:assert/strict";
 * import { fitLeastSquares } from "./least_squares.ts";
 * const years = [0, 1, 2, 3];
 * const fit = fitLeastSquares(
 *   { names: ["years", "months"], columns: [years, years.map((v) => 12 * v)] },
 *   [1, 3, 5, 7],
 * );
 * assert.deepEqual(fit.aliased, [2]);
 * assert(Math.abs(fit.coefficients[0] - 1) < 1e-12 && Math.abs(fit.coefficients[1] - 2) < 1e-12);
 * assert(Number.isNaN(fit.coefficients[2]));
 * ```
 */
export function fitLeastSquares(
  design: { names: readonly string[]; columns: readonly ArrayLike<number>[] },
  y: ArrayLike<number>,
): LinearFit {
  const n = y.length;
  if (n === 0) throw new RangeError("least squares needs at least one row");
  const qr = pivotedQr([new Float64Array(n).fill(1), ...design.columns]);
  const coefficients = qrCoefficients(qr, y);
  const fitted = predictLinear(coefficients, design.columns, n);
  let sse = 0;
  for (let r = 0; r < n; r++) sse += (y[r] - fitted[r]) ** 2;
  const sigma2 = n > qr.rank ? sse / (n - qr.rank) : NaN;
  const standardErrors = unscaledVariances(qr).map((v) => Math.sqrt(sigma2 * v));
  const aliased: number[] = [];
  coefficients.forEach((b, j) => Number.isNaN(b) && aliased.push(j));
  const all = [null, ...design.columns];
  const kept = Array.from(coefficients.keys()).filter((j) => !Number.isNaN(coefficients[j]));
  const robust = new Float64Array(coefficients.length).fill(NaN);
  if (n > qr.rank) {
    const column = (j: number, r: number) => (j === 0 ? 1 : all[j]![r]);
    const residuals = Float64Array.from(y, (v, r) => v - fitted[r]);
    hc1Variances(kept.length, n, (a, r) => column(kept[a], r), residuals).forEach((v, a) => {
      robust[kept[a]] = Math.sqrt(v);
    });
  }
  return {
    names: ["(Intercept)", ...design.names],
    coefficients,
    standardErrors,
    robustStandardErrors: robust,
    residualSd: Math.sqrt(sigma2),
    rank: qr.rank,
    aliased,
  };
}

/**
 * Predictions b0 + X b for every row of the columns, an aliased (`NaN`)
 * coefficient counting as 0.
 *
 * @param coefficients Intercept first, then one per column.
 * @param rows Rows to predict (the columns' length).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { predictLinear } from "./least_squares.ts";
 * const out = predictLinear(new Float64Array([1, 2, NaN]), [[0, 1], [5, 5]], 2);
 * assert.deepEqual([...out], [1, 3]);
 * ```
 */
export function predictLinear(
  coefficients: ArrayLike<number>,
  columns: readonly ArrayLike<number>[],
  rows: number,
): Float64Array {
  const out = new Float64Array(rows).fill(Number.isNaN(coefficients[0]) ? 0 : coefficients[0]);
  columns.forEach((column, j) => {
    const b = coefficients[j + 1];
    if (Number.isNaN(b)) return;
    for (let r = 0; r < rows; r++) out[r] += b * column[r];
  });
  return out;
}

// The HC1 variances of p coefficients: (X'X)^-1 X' diag(e^2) X (X'X)^-1
// times n / (n - p), with x(a, r) the design's column a at row r.
function hc1Variances(
  p: number,
  n: number,
  x: (a: number, r: number) => number,
  residuals: Float64Array,
): Float64Array {
  const xtx = new Matrix(p, p);
  const meat = new Matrix(p, p);
  const row = new Float64Array(p);
  for (let r = 0; r < n; r++) {
    for (let a = 0; a < p; a++) row[a] = x(a, r);
    const e2 = residuals[r] ** 2;
    for (let a = 0; a < p; a++) {
      for (let b = a; b < p; b++) {
        xtx.set(a, b, xtx.get(a, b) + row[a] * row[b]);
        meat.set(a, b, meat.get(a, b) + e2 * row[a] * row[b]);
      }
    }
  }
  for (let a = 0; a < p; a++) {
    for (let b = 0; b < a; b++) {
      xtx.set(a, b, xtx.get(b, a));
      meat.set(a, b, meat.get(b, a));
    }
  }
  const bread = inverse(xtx);
  const covariance = bread.mmul(meat).mmul(bread).mul(n / (n - p));
  return Float64Array.from({ length: p }, (_, a) => Math.max(covariance.get(a, a), 0));
}
