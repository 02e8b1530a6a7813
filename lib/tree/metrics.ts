/**
 * Accuracy figures of predictions.
 *
 * @module
 */

/** Regression accuracy. */
export interface RegressionMetrics {
  /** Root mean squared error. */
  rmse: number;
  /** Mean absolute error. */
  mae: number;
  /** Coefficient of determination, 1 - SSE / SST. */
  r2: number;
}

/**
 * RMSE, MAE and R-squared of predictions.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { regressionMetrics } from "./metrics.ts";
 * const m = regressionMetrics([1, 2, 3], [1, 2, 4]);
 * assert(m.mae === 1 / 3 && m.r2 === 0.5);
 * ```
 */
export function regressionMetrics(
  actual: ArrayLike<number>,
  predicted: ArrayLike<number>,
): RegressionMetrics {
  const n = actual.length;
  if (n === 0 || predicted.length !== n) {
    throw new RangeError(`need equal, non-empty arrays, got ${n} and ${predicted.length}`);
  }
  let mean = 0;
  for (let i = 0; i < n; i++) mean += actual[i];
  mean /= n;
  let sse = 0;
  let sae = 0;
  let sst = 0;
  for (let i = 0; i < n; i++) {
    const e = actual[i] - predicted[i];
    sse += e * e;
    sae += Math.abs(e);
    sst += (actual[i] - mean) * (actual[i] - mean);
  }
  return { rmse: Math.sqrt(sse / n), mae: sae / n, r2: sst > 0 ? 1 - sse / sst : NaN };
}

/**
 * The constant model's accuracy: it predicts the mean, so its RMSE is the
 * population standard deviation of the target.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { constantBaseline } from "./metrics.ts";
 * assert(constantBaseline([2, 4, 4, 4, 5, 5, 7, 9]).rmse === 2);
 * ```
 */
export function constantBaseline(actual: ArrayLike<number>): RegressionMetrics {
  let mean = 0;
  for (let i = 0; i < actual.length; i++) mean += actual[i];
  mean /= actual.length;
  return regressionMetrics(actual, new Float64Array(actual.length).fill(mean));
}

/** Classification accuracy. */
export interface ClassificationMetrics {
  /** Share of rows predicted right. */
  accuracy: number;
  /** `confusion[actual][predicted]` row counts. */
  confusion: number[][];
  /** Per class: share of rows predicted as the class that are of it (NaN if none predicted). */
  precision: number[];
  /** Per class: share of the class's rows predicted as it (NaN if the class is absent). */
  recall: number[];
}

/**
 * Accuracy, confusion matrix, precision and recall.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { classificationMetrics } from "./metrics.ts";
 * const m = classificationMetrics([0, 0, 1, 1], [0, 1, 1, 1], 2);
 * assert(m.accuracy === 0.75 && m.recall[0] === 0.5 && m.precision[1] === 2 / 3);
 * ```
 */
export function classificationMetrics(
  actual: ArrayLike<number>,
  predicted: ArrayLike<number>,
  classes: number,
): ClassificationMetrics {
  if (actual.length === 0 || predicted.length !== actual.length) {
    throw new RangeError(
      `need equal, non-empty arrays, got ${actual.length} and ${predicted.length}`,
    );
  }
  const confusion = Array.from({ length: classes }, () => new Array<number>(classes).fill(0));
  let right = 0;
  for (let i = 0; i < actual.length; i++) {
    for (const code of [actual[i], predicted[i]]) {
      if (!Number.isInteger(code) || code < 0 || code >= classes) {
        throw new RangeError(`class code ${code} at ${i} is not in [0, ${classes})`);
      }
    }
  }
  for (let i = 0; i < actual.length; i++) {
    confusion[actual[i]][predicted[i]]++;
    if (actual[i] === predicted[i]) right++;
  }
  const precision = confusion.map((_, c) => {
    let column = 0;
    for (let a = 0; a < classes; a++) column += confusion[a][c];
    return column > 0 ? confusion[c][c] / column : NaN;
  });
  const recall = confusion.map((row, c) => {
    const total = row.reduce((a, b) => a + b, 0);
    return total > 0 ? row[c] / total : NaN;
  });
  return { accuracy: right / actual.length, confusion, precision, recall };
}
