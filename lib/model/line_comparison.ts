/**
 * Whether the trees beat the straight line, measure by measure. A verdict
 * is given only when the measures agree: on one table the ensemble's money
 * RMSE was 3% below the line's while the line was better on MAE and on log
 * RMSE, the scale the model is fitted on, and a one-measure verdict then
 * called the tree better. A gap under 1% is no difference.
 *
 * @module
 */

import type { Accuracy } from "./types.ts";

/** One measure, the model's figure beside the line's. */
export interface MeasureComparison {
  /** The measure and its scale. */
  measure: "rmse" | "mae" | "log-rmse" | "log-mae";
  /** The trees' figure (ensemble, else reference tree). */
  model: number;
  /** The straight line's figure. */
  line: number;
  /** 1 - model / line: above 0 when the trees err less. */
  gain: number;
  /** Which is better by more than 1%, or `tie`. */
  better: "model" | "line" | "tie";
}

/** The comparison and the verdict it supports. */
export interface LineComparison {
  /** Whose figures: the ensemble's, or the reference tree's without one. */
  who: "ensemble" | "reference";
  /** Each measure. */
  measures: MeasureComparison[];
  /**
   * `model`: better on every measure where they differ, and on at least one;
   * `line`: the line as good or better on every measure; `mixed`: each is
   * better on some; `tie`: within 1% on all.
   */
  verdict: "model" | "line" | "mixed" | "tie";
}

/**
 * Measures closer than this share are called a tie.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { compareWithLine, TIE_SHARE } from "./line_comparison.ts";
 * const line = { measuredBy: "cross-validation" as const, money: { rmse: 100, mae: 80, r2: 0 } };
 * const trees = (rmse: number) => ({
 *   measuredBy: "out-of-bag" as const, money: { rmse, mae: 80, r2: 0 },
 * });
 * // RMSE lower by just under TIE_SHARE: a tie; by just over: the trees err less.
 * const near = compareWithLine(trees(100 * (1 - TIE_SHARE) + 0.01), null, line)!;
 * const far = compareWithLine(trees(100 * (1 - TIE_SHARE) - 0.01), null, line)!;
 * assert.deepEqual([near.measures[0].better, near.verdict], ["tie", "tie"]);
 * assert.deepEqual([far.measures[0].better, far.verdict], ["model", "model"]);
 * ```
 */
export const TIE_SHARE = 0.01;

/**
 * Compares the trees with the straight line on every measure both have
 * (money RMSE and MAE; on the log scale, log RMSE and MAE too).
 *
 * @returns null where there is no line (a class target) or no figures.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { compareWithLine } from "./line_comparison.ts";
 * const fig = (rmse: number, mae: number) => ({ rmse, mae, r2: 0 });
 * const c = compareWithLine(
 *   { measuredBy: "out-of-bag", money: fig(97, 80), log: fig(0.20, 0.15) },
 *   null,
 *   { measuredBy: "cross-validation", money: fig(100, 78), log: fig(0.19, 0.15) },
 * )!;
 * assert(c.verdict === "mixed" && c.who === "ensemble");
 * assert.deepEqual(c.measures.map((m) => m.better), ["model", "line", "line", "tie"]);
 * ```
 */
export function compareWithLine(
  ensemble: Accuracy | null,
  reference: Accuracy | null,
  line: Accuracy | null,
): LineComparison | null {
  const best = ensemble ?? reference;
  if (best?.money === undefined || line?.money === undefined) return null;
  const pairs: [MeasureComparison["measure"], number, number][] = [
    ["rmse", best.money.rmse, line.money.rmse],
    ["mae", best.money.mae, line.money.mae],
  ];
  if (best.log !== undefined && line.log !== undefined) {
    pairs.push(["log-rmse", best.log.rmse, line.log.rmse], ["log-mae", best.log.mae, line.log.mae]);
  }
  const measures = pairs.map(([measure, model, lineValue]): MeasureComparison => {
    const gain = 1 - model / lineValue;
    const better = gain > TIE_SHARE ? "model" : gain < -TIE_SHARE ? "line" : "tie";
    return { measure, model, line: lineValue, gain, better };
  });
  const wins = measures.filter((m) => m.better === "model").length;
  const losses = measures.filter((m) => m.better === "line").length;
  const verdict = wins > 0 && losses > 0
    ? "mixed"
    : wins > 0
    ? "model"
    : losses > 0
    ? "line"
    : "tie";
  return { who: ensemble !== null ? "ensemble" : "reference", measures, verdict };
}
