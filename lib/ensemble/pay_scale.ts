/**
 * The scale pay is fitted on. Pay spreads in proportion to its level, so
 * money targets are fitted on log pay by default ({@linkcode DEFAULT_RANGE}),
 * and every figure is brought back to money: an estimate on the log scale
 * becomes exp(estimate), the median (not the mean) pay of such a profile.
 *
 * @module
 */

import { DataError } from "../errors.ts";
import { type RegressionMetrics, regressionMetrics } from "../tree/metrics.ts";

/** `"log"`: fitted on the natural log of pay; `"raw"`: on pay itself. */
export type PayScale = "log" | "raw";

/**
 * The target on the fitting scale. Log needs every value above zero.
 *
 * @param name The target's name, for the error message.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { toFitScale } from "./pay_scale.ts";
 * assert.deepEqual(Array.from(toFitScale([1, Math.E], "log", "pay")), [0, 1]);
 * assert.throws(() => toFitScale([0, 5], "log", "pay"), /above zero/);
 * ```
 */
export function toFitScale(values: ArrayLike<number>, scale: PayScale, name: string): Float64Array {
  const out = Float64Array.from(values);
  if (scale === "raw") return out;
  let bad = 0;
  for (let i = 0; i < out.length; i++) {
    if (!(out[i] > 0)) bad++;
    out[i] = Math.log(out[i]);
  }
  if (bad > 0) {
    throw new DataError(
      `the log scale needs every value of "${name}" above zero; ${bad} are zero or below ` +
        `(use the raw scale, or leave such rows out)`,
    );
  }
  return out;
}

/**
 * A value on the fitting scale back in money (exp for log: the median of
 * pay, since the mean of log pay is the log of the median when its spread
 * is symmetric).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { toMoney } from "./pay_scale.ts";
 * assert(Math.abs(toMoney(Math.log(52000), "log") - 52000) < 1e-8);
 * assert.equal(toMoney(52000, "raw"), 52000);
 * ```
 */
export function toMoney(value: number, scale: PayScale): number {
  return scale === "log" ? Math.exp(value) : value;
}

/** Accuracy in money, and on the fitting scale where that is log. */
export interface ScaledAccuracy {
  /** The scale of the fit. */
  scale: PayScale;
  /** RMSE, MAE and R-squared in money on the original scale. */
  money: RegressionMetrics;
  /** The same on the log scale (null for a raw-scale fit). */
  log: RegressionMetrics | null;
}

/**
 * Accuracy of predictions given on the fitting scale, reported in money
 * (and on logs beside it where the fit was on logs). Rows where the
 * prediction is NaN (no out-of-bag trees) are skipped.
 *
 * @param actual The target on the fitting scale.
 * @param predicted Predictions on the fitting scale.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { accuracyInMoney } from "./pay_scale.ts";
 * const a = accuracyInMoney([Math.log(100), Math.log(200)], [Math.log(110), Math.log(200)], "log");
 * assert(Math.abs(a.money.mae - 5) < 1e-9 && a.log !== null);
 * ```
 */
export function accuracyInMoney(
  actual: ArrayLike<number>,
  predicted: ArrayLike<number>,
  scale: PayScale,
): ScaledAccuracy {
  const fittedActual: number[] = [];
  const fittedPredicted: number[] = [];
  for (let i = 0; i < actual.length; i++) {
    if (Number.isNaN(predicted[i])) continue;
    fittedActual.push(actual[i]);
    fittedPredicted.push(predicted[i]);
  }
  const money = regressionMetrics(
    fittedActual.map((v) => toMoney(v, scale)),
    fittedPredicted.map((v) => toMoney(v, scale)),
  );
  return {
    scale,
    money,
    log: scale === "log" ? regressionMetrics(fittedActual, fittedPredicted) : null,
  };
}
