import assert from "node:assert/strict";
import {
  accuracyInMoney,
  DataError,
  regressionMetrics,
  toFitScale,
  toMoney,
} from "../../../mod.ts";

Deno.test("money figures of a log fit are the figures of exp(prediction) against pay", () => {
  const pay = [41000, 52000, 67000, 90000, 120000];
  const predictedPay = [43000, 50000, 70000, 85000, 131000];
  const a = accuracyInMoney(
    toFitScale(pay, "log", "pay"),
    predictedPay.map(Math.log),
    "log",
  );
  // By hand: errors -2000, 2000, -3000, 5000, -11000.
  assert.ok(Math.abs(a.money.mae - 23000 / 5) < 1e-6);
  assert.ok(Math.abs(a.money.rmse - Math.sqrt((4 + 4 + 9 + 25 + 121) * 1e6 / 5)) < 1e-6);
  assert.deepEqual(a.log, regressionMetrics(pay.map(Math.log), predictedPay.map(Math.log)));
});

Deno.test("a raw fit has no log figures, and rows without a prediction are skipped", () => {
  const a = accuracyInMoney([10, 20, 30], [12, NaN, 27], "raw");
  assert.equal(a.log, null);
  assert.equal(a.money.mae, 2.5);
  assert.ok(Math.abs(toMoney(Math.log(5), "log") - 5) < 1e-12);
  assert.equal(toMoney(5, "raw"), 5);
});

Deno.test("the log scale refuses pay at or below zero, counting the rows", () => {
  assert.throws(
    () => toFitScale([100, 0, -5, 7], "log", "bonus"),
    (e) => e instanceof DataError && /"bonus" above zero; 2 are zero or below/.test(e.message),
  );
});
