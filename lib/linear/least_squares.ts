/**
 * The linear baseline: ordinary least squares on the same features as the
 * trees, so a user sees whether trees beat a straight line on the data.
 * The solve is ml-matrix's QR decomposition.
 *
 * @module
 */

import { CholeskyDecomposition, Matrix, QrDecomposition } from "ml-matrix";
import type { Dataset } from "../dataset/types.ts";

/** A design matrix: named columns of equal length. */
export interface Design {
  /** Column names (the intercept is added by {@linkcode fitLeastSquares}). */
  names: string[];
  /** Columns, one value per row. */
  columns: Float64Array[];
}

/** A least-squares fit. */
export interface LinearFit {
  /** Coefficient names: `(Intercept)` first, then the design's columns. */
  names: string[];
  /** Coefficients in the same order. */
  coefficients: Float64Array;
  /** Standard errors of the coefficients (classical, homoscedastic). */
  standardErrors: Float64Array;
  /** Residual standard deviation, sqrt(SSE / (n - p)). */
  residualSd: number;
}

/**
 * Fits y = b0 + X b by least squares (QR), with classical standard errors.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { fitLeastSquares } from "./least_squares.ts";
 * // y = 1 + 2x exactly.
 * const fit = fitLeastSquares({ names: ["x"], columns: [new Float64Array([0, 1, 2, 3])] }, [1, 3, 5, 7]);
 * assert(Math.abs(fit.coefficients[0] - 1) < 1e-12 && Math.abs(fit.coefficients[1] - 2) < 1e-12);
 * ```
 */
export function fitLeastSquares(design: Design, y: ArrayLike<number>): LinearFit {
  const n = y.length;
  const p = design.columns.length + 1;
  if (n <= p) throw new RangeError(`need more rows (${n}) than coefficients (${p})`);
  const x = new Matrix(n, p);
  for (let r = 0; r < n; r++) {
    x.set(r, 0, 1);
    for (let j = 1; j < p; j++) x.set(r, j, design.columns[j - 1][r]);
  }
  const target = Matrix.columnVector(Array.from(y));
  const qr = new QrDecomposition(x);
  if (!qr.isFullRank()) {
    throw new RangeError("the design is rank deficient (a column is a combination of others)");
  }
  const beta = qr.solve(target);
  let sse = 0;
  for (let r = 0; r < n; r++) {
    let fitted = 0;
    for (let j = 0; j < p; j++) fitted += x.get(r, j) * beta.get(j, 0);
    sse += (y[r] - fitted) ** 2;
  }
  const sigma2 = sse / (n - p);
  // (X'X)^-1 = R^-1 R^-T from the QR factor R.
  const rInverse = inverseUpper(qr.upperTriangularMatrix);
  const standardErrors = new Float64Array(p);
  for (let j = 0; j < p; j++) {
    let sum = 0;
    for (let k = j; k < p; k++) sum += rInverse.get(j, k) ** 2;
    standardErrors[j] = Math.sqrt(sigma2 * sum);
  }
  return {
    names: ["(Intercept)", ...design.names],
    coefficients: Float64Array.from({ length: p }, (_, j) => beta.get(j, 0)),
    standardErrors,
    residualSd: Math.sqrt(sigma2),
  };
}

function inverseUpper(r: Matrix): Matrix {
  const p = r.rows;
  const inv = new Matrix(p, p);
  for (let j = p - 1; j >= 0; j--) {
    inv.set(j, j, 1 / r.get(j, j));
    for (let i = j - 1; i >= 0; i--) {
      let sum = 0;
      for (let k = i + 1; k <= j; k++) sum += r.get(i, k) * inv.get(k, j);
      inv.set(i, j, -sum / r.get(i, i));
    }
  }
  return inv;
}

/**
 * The design of a dataset for the linear baseline: numeric and ordinal
 * features as numbers (ordinal as their level rank), categorical features
 * as 0/1 columns for every level but the most frequent. A numeric feature
 * with missing values gets its mean in their place plus a 0/1 column
 * marking them; a missing level is a level of its own.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { designOf } from "./least_squares.ts";
 * const design = designOf({
 *   rows: 3,
 *   features: [{ name: "site", kind: "categorical" as const, levels: ["A", "B"], values: new Float64Array([0, 0, 1]) }],
 *   target: { kind: "regression" as const, name: "pay", values: new Float64Array(3) },
 * });
 * assert.deepEqual(design.names, ["site=B"]);
 * ```
 */
export function designOf(dataset: Dataset): Design {
  const names: string[] = [];
  const columns: Float64Array[] = [];
  for (const feature of dataset.features) {
    const values = feature.values;
    if (feature.kind !== "categorical") {
      let sum = 0;
      let known = 0;
      for (const v of values) {
        if (!Number.isNaN(v)) {
          sum += v;
          known++;
        }
      }
      const mean = known > 0 ? sum / known : 0;
      columns.push(values.map((v) => (Number.isNaN(v) ? mean : v)));
      names.push(feature.name);
      if (known < values.length) {
        columns.push(values.map((v) => (Number.isNaN(v) ? 1 : 0)));
        names.push(`${feature.name} missing`);
      }
      continue;
    }
    const levels = feature.levels ?? [];
    const counts = new Array<number>(levels.length + 1).fill(0);
    for (const v of values) counts[Number.isNaN(v) ? levels.length : v]++;
    let base = 0;
    for (let c = 1; c < counts.length; c++) if (counts[c] > counts[base]) base = c;
    for (let c = 0; c < counts.length; c++) {
      if (c === base || counts[c] === 0) continue;
      const code = c === levels.length ? NaN : c;
      columns.push(
        values.map((v) => ((Number.isNaN(code) ? Number.isNaN(v) : v === code) ? 1 : 0)),
      );
      names.push(`${feature.name}=${c === levels.length ? "(missing)" : levels[c]}`);
    }
  }
  return { names, columns };
}

/**
 * The linear baseline's k-fold cross-validated RMSE on the given folds (the
 * trees' folds, so the two are compared on the same split).
 *
 * @param fold The fold of each row, 0..k-1.
 */
export function crossValidateLinear(dataset: Dataset, fold: Int32Array): number {
  const predicted = crossValidatedLinearPredictions(dataset, fold);
  const y = dataset.target.values;
  let sse = 0;
  for (let r = 0; r < dataset.rows; r++) sse += (y[r] - predicted[r]) ** 2;
  return Math.sqrt(sse / dataset.rows);
}

/**
 * Each row's prediction by the least-squares fit on the other folds.
 *
 * @param fold The fold of each row, 0..k-1.
 */
export function crossValidatedLinearPredictions(dataset: Dataset, fold: Int32Array): Float64Array {
  if (dataset.target.kind !== "regression") {
    throw new TypeError("the linear baseline needs a numeric target");
  }
  const y = dataset.target.values;
  const design = designOf(dataset);
  const folds = Math.max(...fold) + 1;
  const out = new Float64Array(dataset.rows);
  for (let k = 0; k < folds; k++) {
    const beta = centredNormalSolve(design.columns, y, fold, k);
    for (let r = 0; r < dataset.rows; r++) {
      if (fold[r] !== k) continue;
      let predicted = beta[0];
      for (let j = 0; j < design.columns.length; j++) {
        predicted += beta[j + 1] * design.columns[j][r];
      }
      out[r] = predicted;
    }
  }
  return out;
}

// Least squares on the rows outside fold `k` by the normal equations of the
// centred columns (centring keeps X'X well conditioned; the intercept is
// recovered from the means). Cholesky on the small p x p system; ten such
// fits take milliseconds where ten QR fits of the full design take seconds.
function centredNormalSolve(
  columns: Float64Array[],
  y: ArrayLike<number>,
  fold: Int32Array,
  k: number,
): Float64Array {
  const p = columns.length;
  const means = new Float64Array(p);
  let yMean = 0;
  let n = 0;
  for (let r = 0; r < y.length; r++) {
    if (fold[r] === k) continue;
    n++;
    yMean += y[r];
    for (let j = 0; j < p; j++) means[j] += columns[j][r];
  }
  yMean /= n;
  for (let j = 0; j < p; j++) means[j] /= n;
  const xtx = new Matrix(p, p);
  const xty = new Matrix(p, 1);
  const row = new Float64Array(p);
  const a = xtx.to2DArray();
  const b = new Float64Array(p);
  for (let r = 0; r < y.length; r++) {
    if (fold[r] === k) continue;
    for (let j = 0; j < p; j++) row[j] = columns[j][r] - means[j];
    const yc = y[r] - yMean;
    for (let i = 0; i < p; i++) {
      b[i] += row[i] * yc;
      for (let j = 0; j <= i; j++) a[i][j] += row[i] * row[j];
    }
  }
  for (let i = 0; i < p; i++) {
    xty.set(i, 0, b[i]);
    for (let j = 0; j <= i; j++) {
      xtx.set(i, j, a[i][j]);
      xtx.set(j, i, a[i][j]);
    }
  }
  const cholesky = new CholeskyDecomposition(xtx);
  if (!cholesky.isPositiveDefinite()) {
    throw new RangeError("the design is rank deficient (a column is a combination of others)");
  }
  const slope = cholesky.solve(xty);
  const beta = new Float64Array(p + 1);
  beta[0] = yMean;
  for (let j = 0; j < p; j++) {
    beta[j + 1] = slope.get(j, 0);
    beta[0] -= beta[j + 1] * means[j];
  }
  return beta;
}
