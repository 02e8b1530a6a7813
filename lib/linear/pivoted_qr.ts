/**
 * QR decomposition with the limited column pivoting of R's `lm()` (its
 * LINPACK routine dqrdc2, as described in the routine's documentation in
 * R's sources, src/appl/dqrdc2.f): Householder reflections taken column by
 * column in the given order; before column `l` is reduced, a column whose
 * norm, after the reflections so far, has fallen below `tol` times its
 * original norm is moved to the right-hand end (the others keep their
 * order), so the kept columns are the first `rank` and an aliased column is
 * always a later one. `lm()` uses `tol = 1e-7`.
 *
 * Written here because no npm package does this rule: ml-matrix's QR does
 * not pivot, @stdlib/lapack (0.2.1) has no QR routine, and LAPACK's dgeqp3
 * (full pivoting, largest norm first) would reorder the columns and so
 * leave out a different column than `lm()` does.
 *
 * @module
 */

/**
 * R's `lm()` tolerance for a column to count as aliased.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { LM_TOLERANCE, pivotedQr } from "./pivoted_qr.ts";
 * // Months that are twelve times the years but for 1e-8 in one row: aliased at
 * // lm()'s tolerance (R's default tol = 1e-7), kept at a tighter one.
 * const ones = [1, 1, 1, 1];
 * const years = [1, 2, 3, 5];
 * const months = years.map((y, i) => 12 * y + (i === 3 ? 1e-8 : 0));
 * assert.equal(pivotedQr([ones, years, months], LM_TOLERANCE).rank, 2);
 * assert.equal(pivotedQr([ones, years, months], 1e-12).rank, 3);
 * ```
 */
export const LM_TOLERANCE = 1e-7;

/** A pivoted QR decomposition, in LINPACK's compact form. */
export interface PivotedQr {
  /** Rows of the decomposed matrix. */
  rows: number;
  /**
   * The columns in pivoted order: R on and above the diagonal, the
   * Householder vectors below it (their first entries in `qraux`).
   */
  columns: Float64Array[];
  /** The first entry of each Householder vector (0: no reflection). */
  qraux: Float64Array;
  /** `pivot[j]`: the original index of the column now at position `j`. */
  pivot: Int32Array;
  /** Columns judged linearly independent: the first `rank` of `pivot`. */
  rank: number;
}

/**
 * Decomposes the matrix whose columns are given (copied, never changed,
 * unless `inPlace`).
 *
 * @param tol Relative norm below which a column counts as aliased.
 * @param inPlace Decompose Float64Array columns in place (they then hold
 * the decomposition): a caller that builds the columns for this alone
 * saves a copy of each.
 * @throws {RangeError} when the columns differ in length.
 *
 * @example Aliased columns move to the end
 * ```ts
 * import assert from "node:assert/strict";
 * import { pivotedQr } from "./pivoted_qr.ts";
 * const ones = [1, 1, 1, 1];
 * const years = [1, 2, 3, 5];
 * const months = years.map((y) => 12 * y);
 * const hours = [0, 2, 1, 0];
 * const qr = pivotedQr([ones, years, months, hours]);
 * assert.equal(qr.rank, 3);
 * assert.deepEqual([...qr.pivot], [0, 1, 3, 2]);
 * ```
 */
export function pivotedQr(
  columns: readonly ArrayLike<number>[],
  tol: number = LM_TOLERANCE,
  inPlace = false,
): PivotedQr {
  const p = columns.length;
  const n = p === 0 ? 0 : columns[0].length;
  const x = columns.map((c) => {
    if (c.length !== n) throw new RangeError(`columns differ in length: ${c.length} and ${n}`);
    return inPlace && c instanceof Float64Array ? c : Float64Array.from(c);
  });
  const pivot = Int32Array.from({ length: p }, (_, j) => j);
  // Current norms of the columns below the rows reduced so far, and the
  // norms they are compared with (an all-zero column is compared with 1, so
  // it counts as aliased).
  const qraux = new Float64Array(p);
  const original = new Float64Array(p);
  for (let j = 0; j < p; j++) {
    qraux[j] = norm2(x[j], 0, n);
    original[j] = qraux[j] === 0 ? 1 : qraux[j];
  }
  // Columns [limit, p) are the ones moved to the end.
  let limit = p;
  const steps = Math.min(n, p);
  for (let l = 0; l < steps; l++) {
    while (l < limit && qraux[l] < original[l] * tol) {
      moveToEnd(x, l);
      moveToEnd(pivot, l);
      moveToEnd(qraux, l);
      moveToEnd(original, l);
      limit--;
    }
    // The last row has nothing below it to reflect.
    if (l === n - 1) continue;
    const xl = x[l];
    let nrmxl = norm2(xl, l, n);
    if (nrmxl === 0) continue;
    // The sign of the diagonal, so 1 + x[l] below never cancels.
    if (xl[l] !== 0) nrmxl = Math.abs(nrmxl) * Math.sign(xl[l]);
    for (let i = l; i < n; i++) xl[i] /= nrmxl;
    xl[l] += 1;
    for (let j = l + 1; j < p; j++) {
      const xj = x[j];
      let dot = 0;
      for (let i = l; i < n; i++) dot += xl[i] * xj[i];
      const t = -dot / xl[l];
      for (let i = l; i < n; i++) xj[i] += t * xl[i];
      if (qraux[j] === 0) continue;
      // Downdate the column's norm by the entry now in row l; recompute it
      // when most of it is gone, where the downdate loses accuracy (the
      // 1e-6 is on the squared ratio, as in dqrdc2).
      const share = Math.max(0, 1 - (Math.abs(xj[l]) / qraux[j]) ** 2);
      if (share >= 1e-6) {
        qraux[j] *= Math.sqrt(share);
      } else {
        qraux[j] = norm2(xj, l + 1, n);
      }
    }
    qraux[l] = xl[l];
    xl[l] = -nrmxl;
  }
  return { rows: n, columns: x, qraux, pivot, rank: Math.min(limit, n) };
}

/**
 * Least-squares coefficients from a pivoted QR, in the original column
 * order, `NaN` for the aliased columns (as R's `NA`).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { pivotedQr, qrCoefficients } from "./pivoted_qr.ts";
 * const x = [[1, 1, 1], [0, 0, 0], [1, 2, 3]];
 * const b = qrCoefficients(pivotedQr(x), [3, 5, 7]);
 * assert(Math.abs(b[0] - 1) < 1e-12 && Number.isNaN(b[1]) && Math.abs(b[2] - 2) < 1e-12);
 * ```
 */
export function qrCoefficients(qr: PivotedQr, y: ArrayLike<number>): Float64Array {
  const { rows: n, columns: x, qraux, pivot, rank: k } = qr;
  if (y.length !== n) throw new RangeError(`y has ${y.length} values for ${n} rows`);
  const qty = Float64Array.from(y);
  // Q'y: the reflections in order (the last row of a square block has none).
  const reflections = Math.min(k, n - 1);
  for (let j = 0; j < reflections; j++) {
    if (qraux[j] === 0) continue;
    const xj = x[j];
    // The vector's first entry is kept in qraux (R's diagonal sits in xj[j]).
    let dot = qraux[j] * qty[j];
    for (let i = j + 1; i < n; i++) dot += xj[i] * qty[i];
    const t = -dot / qraux[j];
    qty[j] += t * qraux[j];
    for (let i = j + 1; i < n; i++) qty[i] += t * xj[i];
  }
  // Back substitution with the leading k x k block of R.
  const b = qty.slice(0, k);
  for (let j = k - 1; j >= 0; j--) {
    b[j] /= x[j][j];
    const bj = b[j];
    const xj = x[j];
    for (let i = 0; i < j; i++) b[i] -= bj * xj[i];
  }
  const out = new Float64Array(pivot.length).fill(NaN);
  for (let j = 0; j < k; j++) out[pivot[j]] = b[j];
  return out;
}

/**
 * The diagonal of (R'R)^-1 for the kept columns, in the original column
 * order (`NaN` for aliased ones): times the residual variance, the squared
 * classical standard errors (as R's `summary.lm` computes them with
 * `chol2inv`).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { pivotedQr, unscaledVariances } from "./pivoted_qr.ts";
 * // One column of ones over 4 rows: (X'X)^-1 = 1/4.
 * assert(Math.abs(unscaledVariances(pivotedQr([[1, 1, 1, 1]]))[0] - 0.25) < 1e-15);
 * ```
 */
export function unscaledVariances(qr: PivotedQr): Float64Array {
  const { columns: x, pivot, rank: k } = qr;
  // R^-1, upper triangular, column by column.
  const inv = Array.from({ length: k }, () => new Float64Array(k));
  for (let j = 0; j < k; j++) {
    inv[j][j] = 1 / x[j][j];
    for (let i = j - 1; i >= 0; i--) {
      let sum = 0;
      for (let m = i + 1; m <= j; m++) sum += x[m][i] * inv[j][m];
      inv[j][i] = -sum / x[i][i];
    }
  }
  const out = new Float64Array(pivot.length).fill(NaN);
  for (let i = 0; i < k; i++) {
    // Row i of R^-1 squared and summed: (R^-1 R^-T)[i][i].
    let sum = 0;
    for (let j = i; j < k; j++) sum += inv[j][i] ** 2;
    out[pivot[i]] = sum;
  }
  return out;
}

function norm2(v: Float64Array, from: number, to: number): number {
  // Scaled like BLAS dnrm2, so large or tiny values neither overflow nor vanish.
  let scale = 0;
  let ssq = 1;
  for (let i = from; i < to; i++) {
    const a = Math.abs(v[i]);
    if (a === 0) continue;
    if (scale < a) {
      ssq = 1 + ssq * (scale / a) ** 2;
      scale = a;
    } else {
      ssq += (a / scale) ** 2;
    }
  }
  return scale * Math.sqrt(ssq);
}

function moveToEnd<T>(array: { [i: number]: T; length: number }, at: number): void {
  const moved = array[at];
  for (let j = at + 1; j < array.length; j++) array[j - 1] = array[j];
  array[array.length - 1] = moved;
}
