import assert from "node:assert/strict";
import {
  classificationMetrics,
  constantBaseline,
  regressionMetrics,
} from "../../../lib/tree/metrics.ts";

const close = (a: number, b: number, tol = 1e-12) =>
  assert.ok(Math.abs(a - b) <= tol * Math.max(1, Math.abs(b)), `${a} vs ${b}`);

// scikit-learn 1.2.1 (Debian's python3-sklearn): sqrt(mean_squared_error(a, p)),
// mean_absolute_error(a, p), r2_score(a, p) on the arrays below.
Deno.test("RMSE, MAE and R-squared equal scikit-learn's", () => {
  const actual = [52000, 61000, 48000, 75000, 66000, 59000];
  const predicted = [50000, 63000, 49500, 70000, 66000, 61000];
  const m = regressionMetrics(actual, predicted);
  close(m.rmse, 2557.668208870468);
  close(m.mae, 2083.3333333333335);
  close(m.r2, 0.9166371681415929);
  // The same from typed arrays.
  assert.deepEqual(regressionMetrics(Float64Array.from(actual), Float64Array.from(predicted)), m);
});

Deno.test("a perfect fit, one row, and a constant target", () => {
  assert.deepEqual(regressionMetrics([1, 2, 3], [1, 2, 3]), { rmse: 0, mae: 0, r2: 1 });
  // One row: no spread, so R-squared is undefined (NaN), errors still counted.
  const one = regressionMetrics([10], [7]);
  assert.equal(one.rmse, 3);
  assert.equal(one.mae, 3);
  assert.ok(Number.isNaN(one.r2));
  assert.ok(Number.isNaN(regressionMetrics([5, 5], [4, 6]).r2));
  // Predicting worse than the mean gives a negative R-squared: SSE 8 / SST 2.
  close(regressionMetrics([1, 3], [3, 1]).r2, 1 - 8 / 2);
});

Deno.test("the constant baseline predicts the mean: RMSE is the population SD, R-squared 0", () => {
  // Mean 4; squared deviations 9, 1, 1, 9 sum to 20: SD sqrt(5); absolute 3, 1, 1, 3: MAE 2.
  const m = constantBaseline([1, 3, 5, 7]);
  close(m.rmse, Math.sqrt(5));
  assert.equal(m.mae, 2);
  assert.equal(m.r2, 0);
});

Deno.test("empty or unequal arrays are refused", () => {
  assert.throws(() => regressionMetrics([], []), /need equal, non-empty arrays, got 0 and 0/);
  assert.throws(() => regressionMetrics([1, 2], [1]), /got 2 and 1/);
  assert.throws(() => constantBaseline([]), RangeError);
  assert.throws(() => classificationMetrics([], [], 2), RangeError);
  assert.throws(() => classificationMetrics([0], [0, 1], 2), /got 1 and 2/);
});

// scikit-learn 1.2.1: confusion_matrix(ya, yp, labels=[0, 1, 2, 3]), accuracy_score,
// precision_score and recall_score with average=None. Class 3 is never predicted:
// scikit-learn's precision is 0 with zero_division=0; paygrove says NaN (undefined).
Deno.test("confusion, accuracy, precision and recall equal scikit-learn's", () => {
  const actual = [0, 1, 2, 2, 1, 0, 3, 1, 2];
  const predicted = [0, 2, 2, 1, 1, 0, 1, 1, 2];
  const m = classificationMetrics(actual, predicted, 4);
  assert.deepEqual(m.confusion, [[2, 0, 0, 0], [0, 2, 1, 0], [0, 1, 2, 0], [0, 1, 0, 0]]);
  close(m.accuracy, 0.6666666666666666);
  assert.deepEqual(m.precision.slice(0, 3), [1.0, 0.5, 0.6666666666666666]);
  assert.ok(Number.isNaN(m.precision[3]));
  assert.deepEqual(m.recall, [1.0, 0.6666666666666666, 0.6666666666666666, 0.0]);
});

Deno.test("a class with no member has NaN recall; codes outside the classes are refused", () => {
  const m = classificationMetrics([0, 0], [0, 1], 3);
  assert.deepEqual(m.confusion, [[1, 1, 0], [0, 0, 0], [0, 0, 0]]);
  assert.equal(m.accuracy, 0.5);
  assert.ok(Number.isNaN(m.recall[1]) && Number.isNaN(m.recall[2]));
  assert.equal(m.precision[1], 0);
  assert.throws(
    () => classificationMetrics([0, 3], [0, 0], 3),
    /class code 3 at 1 is not in \[0, 3\)/,
  );
  assert.throws(() => classificationMetrics([0, 1], [0, -1], 3), /class code -1 at 1/);
  assert.throws(() => classificationMetrics([0.5], [0], 3), /class code 0.5 at 0/);
});
