// The pivoted QR against R's rule and against an independent solver.
// R's rule (documented in R's src/appl/dqrdc2.f, used by lm() with
// tol = 1e-7): a column whose norm, after the reflections of the columns
// kept before it, is below tol times its own norm moves to the end; the
// others keep their order. Full-rank fits are compared with ml-matrix's
// unpivoted QR (npm ml-matrix 6.15.1), which we did not write.
import assert from "node:assert/strict";
import fc from "fast-check";
import { determinant, inverse, Matrix, QrDecomposition } from "ml-matrix";
import { pivotedQr, qrCoefficients, unscaledVariances } from "../../../lib/linear/pivoted_qr.ts";

const x = [1, 2, 3, 5, 8];
const z = [0.3, -1, 0.2, 0.9, -0.4];
const ones = [1, 1, 1, 1, 1];

Deno.test("a column just above 1e-7 of its norm is kept, just below it is moved to the end", () => {
  // Column 3 is 2x + eps z: after 1 and x, what is left of it is
  // 7.14e-2 * eps of its norm. R 4.2.2, qr(cbind(1, x, 2*x + eps*z, z),
  // tol = 1e-7): eps = 1e-5 gives rank 3, pivot 1 2 3 4 (z, now a
  // combination of the first three, is left out); eps = 1e-7 gives rank 3,
  // pivot 1 2 4 3.
  const kept = pivotedQr([ones, x, x.map((v, i) => 2 * v + 1e-5 * z[i]), z]);
  assert.equal(kept.rank, 3);
  assert.deepEqual([...kept.pivot], [0, 1, 2, 3]);
  const moved = pivotedQr([ones, x, x.map((v, i) => 2 * v + 1e-7 * z[i]), z]);
  assert.equal(moved.rank, 3);
  assert.deepEqual([...moved.pivot], [0, 1, 3, 2]);
});

Deno.test("an all-zero column is left out wherever it stands, the rest in order", () => {
  const qr = pivotedQr([ones, [0, 0, 0, 0, 0], x, z]);
  assert.equal(qr.rank, 3);
  assert.deepEqual([...qr.pivot], [0, 2, 3, 1]);
  const b = qrCoefficients(qr, [3, 1, 4, 1, 5]);
  assert.ok(Number.isNaN(b[1]));
  const without = qrCoefficients(pivotedQr([ones, x, z]), [3, 1, 4, 1, 5]);
  assert.deepEqual([b[0], b[2], b[3]], [...without]);
});

Deno.test("more columns than rows: the rank is at most the rows and the later columns are left out", () => {
  // As lm() does: with 3 rows, coefficients of the 4th and 5th columns are NA.
  const qr = pivotedQr([[1, 1, 1], [1, 2, 4], [0, 1, 0], [2, 7, 1], [5, 3, 3]]);
  assert.equal(qr.rank, 3);
  const b = qrCoefficients(qr, [1, 2, 3]);
  assert.ok(Number.isNaN(b[3]) && Number.isNaN(b[4]));
  // Three equations, three unknowns: an exact fit.
  const fitted = [0, 1, 2].map((r) => b[0] + b[1] * [1, 2, 4][r] + b[2] * [0, 1, 0][r]);
  fitted.forEach((v, r) => assert.ok(Math.abs(v - [1, 2, 3][r]) < 1e-12));
});

const fullRank = fc.integer({ min: 1, max: 6 }).chain((p) =>
  fc.record({
    p: fc.constant(p),
    extra: fc.integer({ min: 1, max: 20 }),
    // Values in tenths, as pay tables hold them (no denormals, no 1e300).
    seedValues: fc.array(fc.integer({ min: -1000, max: 1000 }).map((v) => v / 10), {
      minLength: 30 * 7,
      maxLength: 30 * 7,
    }),
  })
);

function columnsOf(p: number, n: number, values: number[]): number[][] {
  return Array.from({ length: p }, (_, j) => values.slice(j * n, (j + 1) * n));
}

Deno.test("on full-rank columns the coefficients and variances equal ml-matrix's unpivoted QR", () => {
  fc.assert(
    fc.property(fullRank, ({ p, extra, seedValues }) => {
      const n = p + extra;
      const columns = columnsOf(p, n, seedValues);
      const y = seedValues.slice(p * n, p * n + n);
      const matrix = new Matrix(Array.from({ length: n }, (_, r) => columns.map((c) => c[r])));
      const reference = new QrDecomposition(matrix);
      fc.pre(reference.isFullRank());
      // Keep to well-conditioned draws: the comparison is of two solvers, not of rounding.
      const xtx = matrix.transpose().mmul(matrix);
      fc.pre(Math.abs(determinant(xtx)) > 1e-6);
      const xtxInverse = inverse(xtx);
      fc.pre(xtxInverse.norm() * xtx.norm() < 1e8);
      const qr = pivotedQr(columns);
      if (qr.rank !== p) return false;
      const b = qrCoefficients(qr, y);
      const expected = reference.solve(Matrix.columnVector(y)).to1DArray();
      const variances = unscaledVariances(qr);
      return expected.every((e, j) =>
        Math.abs(b[j] - e) <= 1e-8 * Math.max(1, Math.abs(e)) &&
        Math.abs(variances[j] - xtxInverse.get(j, j)) <= 1e-8 * xtxInverse.get(j, j)
      );
    }),
    { numRuns: 200 },
  );
});

Deno.test("a combination of earlier columns inserted anywhere is left out and changes nothing else", () => {
  fc.assert(
    fc.property(
      fullRank,
      fc.array(fc.integer({ min: -3, max: 3 }), { minLength: 6, maxLength: 6 }),
      fc.nat(),
      ({ p, extra, seedValues }, weights, at) => {
        const n = p + 1 + extra;
        const columns = columnsOf(p, n, seedValues);
        const y = seedValues.slice(p * n, p * n + n);
        const base = pivotedQr(columns);
        fc.pre(base.rank === p && weights.slice(0, p).some((w) => w !== 0));
        // The combination goes after the columns it is made of.
        const position = p === 1 ? 1 : 1 + (at % p);
        const combination = Array.from(
          { length: n },
          (_, r) => columns.slice(0, position).reduce((s, c, j) => s + weights[j] * c[r], 0),
        );
        fc.pre(combination.some((v) => v !== 0));
        const withIt = [...columns.slice(0, position), combination, ...columns.slice(position)];
        const b = qrCoefficients(pivotedQr(withIt), y);
        const expected = qrCoefficients(base, y);
        if (!Number.isNaN(b[position])) return false;
        const rest = [...b.slice(0, position), ...b.slice(position + 1)];
        return rest.every((v, j) =>
          Math.abs(v - expected[j]) <= 1e-7 * Math.max(1, Math.abs(expected[j]))
        );
      },
    ),
    { numRuns: 200 },
  );
});

Deno.test("pivotedQr in place: the same decomposition, held in the columns given", () => {
  const make = () => [
    Float64Array.of(1, 1, 1, 1, 1),
    Float64Array.of(2, 4, 4, 5, 7),
    Float64Array.of(4, 8, 8, 10, 14), // twice the second: aliased
    Float64Array.of(0.5, -1, 3, 2, 0),
  ];
  const copied = pivotedQr(make());
  const columns = make();
  const inPlace = pivotedQr(columns, 1e-7, true);
  assert.deepEqual(inPlace, copied);
  assert.equal(inPlace.rank, 3);
  // The decomposition's columns are the arrays given, reordered by the pivot.
  for (const c of inPlace.columns) assert(columns.some((given) => given === c));
  // Without inPlace the columns given are left as they were.
  const untouched = make();
  pivotedQr(untouched);
  assert.deepEqual(untouched, make());
});
