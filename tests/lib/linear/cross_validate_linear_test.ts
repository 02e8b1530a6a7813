import assert from "node:assert/strict";
import type { Dataset } from "../../../lib/dataset/types.ts";
import {
  crossValidatedLinear,
  crossValidatedLinearPredictions,
  crossValidateLinear,
} from "../../../lib/linear/cross_validate_linear.ts";

// Ten rows: x with two missing, site A/B/C (A most frequent), three folds.
const x = Float64Array.of(1, 2, NaN, 4, 5, 6, NaN, 8, 9, 10);
const site = Float64Array.of(0, 1, 2, 0, 1, 2, 0, 0, 1, 0);
const y = Float64Array.of(10, 14, 13, 19, 22, 27, 15, 30, 33, 36);
const fold = Int32Array.of(0, 1, 2, 0, 1, 2, 0, 1, 2, 0);
const data: Dataset = {
  rows: 10,
  features: [
    { name: "x", kind: "numeric", values: x },
    { name: "site", kind: "categorical", levels: ["A", "B", "C"], values: site },
  ],
  target: { kind: "regression", name: "y", values: y },
};

// R 4.2.2: the same design (x with its mean 5.625 for NA, an NA marker, site B and C
// against A), lm(y ~ x + xmiss + siteB + siteC) on the rows of the other folds, NA
// coefficients taken as 0, predictions X %*% b, printed with sprintf("%.15g").
// Fold 2's training rows have no site C, so lm gives siteC NA there.
const R_PREDICTIONS = [
  10.9864864864865,
  12.612293144208,
  15,
  19.1351351351351,
  21.3498817966903,
  24.462441314554,
  10.5675675675676,
  30.8463356973995,
  33.6737089201878,
  35.4324324324324,
];

Deno.test("cross-validated predictions equal R's lm fold by fold, aliased level left out", () => {
  const result = crossValidatedLinear(data, fold);
  for (let r = 0; r < 10; r++) {
    assert.ok(Math.abs(result.predictions[r] - R_PREDICTIONS[r]) < 1e-9, `row ${r}`);
  }
  assert.deepEqual(result.aliased, [{
    term: { feature: "site", kind: "level", level: "C" },
    folds: 1,
  }]);
  assert.deepEqual(crossValidatedLinearPredictions(data, fold), result.predictions);
});

Deno.test("the RMSE is that of the R predictions", () => {
  let sse = 0;
  for (let r = 0; r < 10; r++) sse += (y[r] - R_PREDICTIONS[r]) ** 2;
  assert.ok(Math.abs(crossValidateLinear(data, fold) - Math.sqrt(sse / 10)) < 1e-9);
});

// A second, plain implementation: ordinary least squares by the normal equations
// (Gauss-Jordan), fine for this small, well-conditioned design.
function olsPredict(X: number[][], yTrain: number[], Xtest: number[][]): number[] {
  const p = X[0].length;
  const A = Array.from(
    { length: p },
    (_, i) =>
      Array.from(
        { length: p + 1 },
        (_, j) =>
          j < p
            ? X.reduce((s, row) => s + row[i] * row[j], 0)
            : X.reduce((s, row, r) => s + row[i] * yTrain[r], 0),
      ),
  );
  for (let c = 0; c < p; c++) {
    let pivot = c;
    for (let r = c + 1; r < p; r++) if (Math.abs(A[r][c]) > Math.abs(A[pivot][c])) pivot = r;
    [A[c], A[pivot]] = [A[pivot], A[c]];
    for (let r = 0; r < p; r++) {
      if (r === c) continue;
      const f = A[r][c] / A[c][c];
      for (let k = c; k <= p; k++) A[r][k] -= f * A[c][k];
    }
  }
  const beta = A.map((row, i) => row[p] / row[i]);
  return Xtest.map((row) => row.reduce((s, v, j) => s + v * beta[j], 0));
}

Deno.test("on a full-rank design each fold matches the normal equations", () => {
  const n = 40;
  const a = Float64Array.from({ length: n }, (_, i) => (i * 7) % 11);
  const b = Float64Array.from({ length: n }, (_, i) => Math.floor(i / 2) % 4);
  const target = Float64Array.from(
    { length: n },
    (_, i) => 3 + 2 * a[i] + (b[i] === 2 ? 5 : 0) + ((i * 13) % 5) - 2,
  );
  const folds = Int32Array.from({ length: n }, (_, i) => i % 4);
  const d: Dataset = {
    rows: n,
    features: [
      { name: "a", kind: "numeric", values: a },
      { name: "b", kind: "categorical", levels: ["p", "q", "r", "s"], values: b },
    ],
    target: { kind: "regression", name: "pay", values: target },
  };
  // Design by hand: intercept, a, b=q, b=r, b=s (levels equally frequent: p is the base).
  const row = (i: number) => [1, a[i], b[i] === 1 ? 1 : 0, b[i] === 2 ? 1 : 0, b[i] === 3 ? 1 : 0];
  const result = crossValidatedLinear(d, folds);
  assert.deepEqual(result.aliased, []);
  for (let k = 0; k < 4; k++) {
    const train = [...Array(n).keys()].filter((i) => folds[i] !== k);
    const test = [...Array(n).keys()].filter((i) => folds[i] === k);
    const expected = olsPredict(train.map(row), train.map((i) => target[i]), test.map(row));
    test.forEach((i, t) =>
      assert.ok(Math.abs(result.predictions[i] - expected[t]) < 1e-8, `row ${i}`)
    );
  }
});

Deno.test("a fold that is every row has nothing to fit on and predicts 0", () => {
  const result = crossValidatedLinear(data, new Int32Array(10));
  assert.deepEqual(Array.from(result.predictions), new Array(10).fill(0));
});

Deno.test("an exact line is predicted exactly; one fold of a single row works", () => {
  const xs = Float64Array.of(0, 1, 2, 3, 4);
  const d: Dataset = {
    rows: 5,
    features: [{ name: "x", kind: "numeric", values: xs }],
    target: { kind: "regression", name: "y", values: xs.map((v) => 5 - 2 * v) },
  };
  // Leave-one-out: each row predicted from the other four.
  const predictions = crossValidatedLinearPredictions(d, Int32Array.of(0, 1, 2, 3, 4));
  predictions.forEach((p, r) => assert.ok(Math.abs(p - (5 - 2 * r)) < 1e-12));
  assert.ok(crossValidateLinear(d, Int32Array.of(0, 1, 2, 3, 4)) < 1e-12);
});

Deno.test("a class target is refused", () => {
  const d: Dataset = {
    rows: 2,
    features: [],
    target: {
      kind: "classification",
      name: "band",
      classes: ["a", "b"],
      values: Int32Array.of(0, 1),
    },
  };
  assert.throws(() => crossValidatedLinear(d, Int32Array.of(0, 1)), TypeError);
});
