/**
 * What a shared model keeps of figures computed exactly over its people.
 * An exact mean over a known set of people is safe alone (the privacy
 * minimum sees to that) but not beside another: two files fitted on sets
 * that differ by one person give that person's pay by subtraction (a
 * reference tree's root is the mean of everyone fitted; an attack on two
 * `--where` fits got one pay to the cent). So:
 *
 * - a reference tree node's mean over n people is kept to a step of
 *   {@linkcode MEAN_STEP_RMSE} times the tree's cross-validated RMSE,
 *   divided by n (on the fitting scale): n times the mean, the sum a
 *   subtraction works with, is then known only to within half that many
 *   RMSEs either way, so the difference of two files puts one person's pay
 *   anywhere within 4 RMSEs of it (measured in
 *   tests/privacy/differencing_attack_test.ts: 8.3% of 120 people within
 *   1%, median error 9,482, against 13.3% and 4,350 for the file's own
 *   estimate; with 3 RMSEs the subtraction was still a little closer than
 *   the estimate); a node of 2,000 people moves by a five-hundredth of an
 *   RMSE, a leaf of 5 by up to 0.4 of one;
 * - every other figure computed over the people (accuracy, the pruning
 *   path, importance, proxies) is kept to {@linkcode FIGURE_DIGITS}
 *   significant digits, as many as any screen shows.
 *
 * The ensemble's trees need neither: each leaf mean weighs its people by a
 * resample nobody can regenerate, and two fits draw different resamples.
 *
 * @module
 */

import type { FlatTree } from "../tree/flat_tree.ts";

/**
 * Steps of a reference node's mean, in cross-validated RMSEs over its people.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, growTree } from "../../mod.ts";
 * import { MEAN_STEP_RMSE, shareableReference } from "./shareable_figures.ts";
 * const dataset = {
 *   rows: 6,
 *   features: [
 *     { name: "years", kind: "numeric" as const, values: Float64Array.of(1, 2, 3, 8, 9, 10) },
 *   ],
 *   target: {
 *     kind: "regression" as const, name: "pay", values: Float64Array.of(50, 52, 54, 80, 82, 85),
 *   },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 3 });
 * const rmse = 0.75;
 * const kept = shareableReference(tree, rmse);
 * // Every node's mean is a whole number of steps of MEAN_STEP_RMSE * rmse / its people.
 * for (let k = 0; k < kept.nodeCount; k++) {
 *   const steps = kept.value[k] / ((MEAN_STEP_RMSE * rmse) / kept.rows[k]);
 *   assert(Math.abs(steps - Math.round(steps)) < 1e-9);
 *   assert(Math.abs(kept.value[k] - tree.value[k]) <= (MEAN_STEP_RMSE * rmse) / kept.rows[k] / 2);
 * }
 * ```
 */
export const MEAN_STEP_RMSE = 4;

/**
 * Significant digits kept of figures computed over the people.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { FIGURE_DIGITS, roundedFigures } from "./shareable_figures.ts";
 * const kept = roundedFigures({ rmse: 2 / 3, mae: 123456.789 });
 * assert.deepEqual(kept, { rmse: 0.6667, mae: 123500 });
 * assert.equal(String(kept.rmse).replace("0.", "").length, FIGURE_DIGITS);
 * ```
 */
export const FIGURE_DIGITS = 4;

/**
 * The reference tree as a shared file keeps it: regression node means
 * rounded to steps of `MEAN_STEP_RMSE * rmse / n` (n the node's people),
 * node variances dropped. Class shares are kept as they are.
 *
 * @param rmse The tree's cross-validated RMSE on the fitting scale.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, growTree, shareableReference } from "../../mod.ts";
 * const dataset = {
 *   rows: 6,
 *   features: [{ name: "years", kind: "numeric" as const, values: new Float64Array([1, 2, 3, 8, 9, 10]) }],
 *   target: { kind: "regression" as const, name: "pay", values: new Float64Array([50, 52, 54, 80, 82, 85]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 3 });
 * const kept = shareableReference(tree, 0.75);
 * // The root (6 people) to steps of 4 * 0.75 / 6 = 0.5; a leaf (3) to steps of 1.
 * assert.equal(kept.value[0], 67); // 67.1666...
 * assert.equal(kept.value[2], 82); // 82.333...
 * assert(Number.isNaN(kept.impurity[0]));
 * // On one grid (a constrained tree): every node to the leaves' step of 1.
 * assert.equal(shareableReference(tree, 0.75, true).value[0], 67);
 * ```
 */
export function shareableReference(tree: FlatTree, rmse: number, oneStep = false): FlatTree {
  const value = Float64Array.from(tree.value);
  if (tree.task === "regression" && rmse > 0) {
    // A tree that must never fall along some attribute (fit's increasing)
    // is rounded on one grid, the coarsest of its nodes' steps: rounding
    // to one grid keeps the order of any two values (each node's own step
    // could put two clipped neighbours the wrong way round).
    let fewest = Infinity;
    for (let k = 0; k < tree.nodeCount; k++) fewest = Math.min(fewest, Math.max(1, tree.rows[k]));
    for (let k = 0; k < tree.nodeCount; k++) {
      const step = (MEAN_STEP_RMSE * rmse) / (oneStep ? fewest : Math.max(1, tree.rows[k]));
      value[k] = Math.round(value[k] / step) * step;
    }
  }
  return { ...tree, value, impurity: new Float64Array(tree.nodeCount).fill(NaN) };
}

/**
 * Every number in a plain object or array (recursively) kept to
 * {@linkcode FIGURE_DIGITS} significant digits; NaN and infinities as they
 * are. Returns a new value.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { roundedFigures } from "./shareable_figures.ts";
 * assert.deepEqual(
 *   roundedFigures({ rmse: 5226.4129, r2: 0.97451, classes: [0.123456], name: "x" }),
 *   { rmse: 5226, r2: 0.9745, classes: [0.1235], name: "x" },
 * );
 * ```
 */
export function roundedFigures<T>(value: T): T {
  if (typeof value === "number") {
    return (Number.isFinite(value) ? Number(value.toPrecision(FIGURE_DIGITS)) : value) as T;
  }
  if (Array.isArray(value)) return value.map((v) => roundedFigures(v)) as T;
  if (value !== null && typeof value === "object") {
    return Object.fromEntries(
      Object.entries(value).map(([k, v]) => [k, roundedFigures(v)]),
    ) as T;
  }
  return value;
}
