/**
 * How a tree measures a node's impurity and ranks its candidate splits:
 * squared error for a numeric target, Gini for classes (Breiman et al.
 * 1984, ch. 4 and 8). The ranking uses the same cheap proxies as
 * scikit-learn's criteria (sklearn/tree/_criterion.pyx), so that equal data
 * gives equal trees: for squared error `sL^2/wL + sR^2/wR` (s = weighted
 * sum of y, w = weight), for Gini `-wL*giniL - wR*giniR`.
 *
 * A group of rows (a histogram bin, or one side of a split) is summarised by
 * `stride` numbers: its row count, its weight, then the criterion's own
 * sums (squared error: sum of w*y and of w*y^2; Gini: the weight of each
 * class). The splitter adds these vectors and hands the two sides to the
 * criterion, so it never branches on the kind of target.
 *
 * @module
 */

import type { Dataset } from "../dataset/types.ts";

/** Impurity and split ranking of one kind of target. */
export interface Criterion {
  /** The kind of target it serves. */
  readonly task: "regression" | "classification";
  /** Numbers in a summary of rows: count, weight, then the criterion's sums. */
  readonly stride: number;
  /** Values a node keeps: 1 (mean) or one share per class. */
  readonly width: number;
  /**
   * The proxy of a split (larger is better) whose sides' summaries start at
   * `left` and `right` in `sides`.
   */
  proxy(sides: Float64Array, left: number, right: number): number;
  /** The impurity of the rows summarised at `at` in `sides`. */
  impurity(sides: Float64Array, at: number): number;
}

/**
 * Squared error: a summary is [rows, w, sum w*y, sum w*y^2].
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { SquaredError } from "./criterion.ts";
 * const c = new SquaredError();
 * // Left: rows y = 1, 3 (w 1 each); right: one row y = 10.
 * const sides = Float64Array.of(2, 2, 4, 10, 1, 1, 10, 100);
 * assert.equal(c.proxy(sides, 0, 4), 16 / 2 + 100 / 1);
 * assert.equal(c.impurity(sides, 0), 1); // variance of 1 and 3
 * ```
 */
export class SquaredError implements Criterion {
  readonly task = "regression";
  readonly stride = 4;
  readonly width = 1;

  proxy(sides: Float64Array, left: number, right: number): number {
    const sl = sides[left + 2];
    const sr = sides[right + 2];
    return (sl * sl) / sides[left + 1] + (sr * sr) / sides[right + 1];
  }

  impurity(sides: Float64Array, at: number): number {
    const w = sides[at + 1];
    const mean = sides[at + 2] / w;
    return sides[at + 3] / w - mean * mean;
  }
}

/**
 * Gini impurity of `classes` classes: a summary is [rows, w, w of class 0,
 * ..., w of class K-1].
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { Gini } from "./criterion.ts";
 * const c = new Gini(2);
 * // Left: 2 rows of class 0; right: 1 of each class.
 * const sides = Float64Array.of(2, 2, 2, 0, 2, 2, 1, 1);
 * assert.equal(c.impurity(sides, 0), 0);
 * assert.equal(c.impurity(sides, 4), 0.5);
 * assert.equal(c.proxy(sides, 0, 4), -2 * 0.5 - 2 * 0);
 * ```
 */
export class Gini implements Criterion {
  readonly task = "classification";
  readonly stride: number;
  readonly width: number;

  constructor(classes: number) {
    this.width = classes;
    this.stride = 2 + classes;
  }

  proxy(sides: Float64Array, left: number, right: number): number {
    return -sides[right + 1] * this.impurity(sides, right) -
      sides[left + 1] * this.impurity(sides, left);
  }

  impurity(sides: Float64Array, at: number): number {
    const w = sides[at + 1];
    let sq = 0;
    for (let c = 0; c < this.width; c++) {
      const share = sides[at + 2 + c];
      sq += share * share;
    }
    return 1 - sq / (w * w);
  }
}

/**
 * The criterion of a dataset's target.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { criterionFor } from "./criterion.ts";
 * const target = { kind: "classification" as const, name: "band", values: Int32Array.of(0, 2), classes: ["a", "b", "c"] };
 * assert.equal(criterionFor({ rows: 2, features: [], target }).stride, 5);
 * ```
 */
export function criterionFor(dataset: Dataset): Criterion {
  return dataset.target.kind === "regression"
    ? new SquaredError()
    : new Gini(dataset.target.classes.length);
}
