/**
 * A range for one person's pay from quantile regression forest weights
 * (Meinshausen 2006, *JMLR* 7): each training row weighs, averaged over the
 * trees, one over the size of the leaf it shares with the profile; the range
 * is the weighted quantiles of the training pay. It adapts to unequal spread
 * without grouping, but needs the training pay at hand, so it runs only
 * where the table is given (a model file stores no one's pay).
 *
 * @module
 */

import type { Dataset } from "../dataset/types.ts";
import { applyRows, applyValues } from "../tree/flat_tree.ts";
import type { Ensemble } from "./fit_ensemble.ts";
import type { Interval } from "./intervals.ts";

/**
 * Every tree's training rows grouped by leaf (compressed: the rows of leaf
 * node `k` of tree `b` are `rows[b][start[b][k] .. start[b][k + 1])`).
 */
export interface LeafMembers {
  /** Per tree, the rows ordered by the leaf they fall in. */
  rows: Int32Array[];
  /** Per tree, the first position of each node's rows (node count + 1 entries). */
  start: Int32Array[];
  /** The training target of each row. */
  target: Float64Array;
}

/**
 * Drops every training row down every tree and groups the rows by leaf
 * (all training rows, as in Meinshausen 2006, not only a tree's in-bag rows).
 *
 * @param dataset The table the ensemble was fitted on.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures } from "../tree/bins.ts";
 * import { applyRow } from "../tree/flat_tree.ts";
 * import { growTree } from "../tree/grow_tree.ts";
 * import { leafMembers } from "./quantile_forest.ts";
 * const values = Float64Array.of(1, 2, 3, 4);
 * const dataset = {
 *   rows: 4,
 *   features: [{ name: "x", kind: "numeric" as const, values }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.of(1, 1, 5, 5) },
 * };
 * // Tree 0 splits x into {1, 2} and {3, 4}; tree 1 is a single leaf (grown on constant pay).
 * const split = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
 * const flat = { ...dataset, target: { ...dataset.target, values: Float64Array.of(3, 3, 3, 3) } };
 * const root = growTree({ dataset: flat, bins: binFeatures(flat) });
 * const ensemble = {
 *   trees: [split, root],
 *   resamples: new Int32Array(0),
 *   alphas: new Float64Array(2),
 *   width: 1,
 *   oob: new Float64Array(4),
 *   oobTrees: new Int32Array(4),
 * };
 * const m = leafMembers(ensemble, dataset);
 * const rowsOf = (b: number, leaf: number) => [...m.rows[b].subarray(m.start[b][leaf], m.start[b][leaf + 1])];
 * assert.deepEqual(rowsOf(0, applyRow(split, dataset.features, 0)), [0, 1]);
 * assert.deepEqual(rowsOf(0, applyRow(split, dataset.features, 3)), [2, 3]);
 * assert.deepEqual(rowsOf(0, 0), []); // the root is not a leaf
 * assert.deepEqual(rowsOf(1, 0), [0, 1, 2, 3]);
 * assert.deepEqual([...m.target], [1, 1, 5, 5]);
 * ```
 */
export function leafMembers(ensemble: Ensemble, dataset: Dataset): LeafMembers {
  if (dataset.target.kind !== "regression") {
    throw new TypeError("quantile forest ranges need a regression target");
  }
  const rows: Int32Array[] = [];
  const start: Int32Array[] = [];
  for (const tree of ensemble.trees) {
    const leaves = applyRows(tree, dataset.features, dataset.rows);
    const nodes = tree.left.length;
    const begin = new Int32Array(nodes + 1);
    for (let r = 0; r < dataset.rows; r++) begin[leaves[r] + 1]++;
    for (let k = 0; k < nodes; k++) begin[k + 1] += begin[k];
    const fill = begin.slice(0, nodes);
    const ordered = new Int32Array(dataset.rows);
    for (let r = 0; r < dataset.rows; r++) ordered[fill[leaves[r]]++] = r;
    rows.push(ordered);
    start.push(begin);
  }
  return { rows, start, target: Float64Array.from(dataset.target.values) };
}

/**
 * The quantile regression forest range for a profile: the weighted
 * quantiles (lower and upper tail of `1 - coverage`, split evenly) of the
 * training target, on the scale the ensemble was fitted on.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { fitEnsemble, leafMembers, quantileForestRange } from "../../mod.ts";
 * const x = Float64Array.from({ length: 200 }, (_, i) => i % 2);
 * // Group 0 pays 100 +/- 1, group 1 pays 200 +/- 20.
 * const y = x.map((g, i) => (g === 0 ? 100 + ((i % 7) - 3) / 3 : 200 + ((i % 9) - 4) * 5));
 * const dataset = {
 *   rows: 200,
 *   features: [{ name: "g", kind: "numeric" as const, values: x }],
 *   target: { kind: "regression" as const, name: "pay", values: y },
 * };
 * const ensemble = fitEnsemble(dataset, { trees: 20, prune: "none" });
 * const members = leafMembers(ensemble, dataset);
 * const narrow = quantileForestRange(ensemble, members, [0], 0.9);
 * const wide = quantileForestRange(ensemble, members, [1], 0.9);
 * assert(narrow.high - narrow.low <= 2 && wide.high - wide.low >= 30);
 * ```
 */
export function quantileForestRange(
  ensemble: Ensemble,
  members: LeafMembers,
  profile: ArrayLike<number>,
  coverage: number,
): Interval {
  if (!(coverage > 0 && coverage < 1)) {
    throw new RangeError(`coverage must lie strictly between 0 and 1, got ${coverage}`);
  }
  const weight = new Map<number, number>();
  const trees = ensemble.trees.length;
  for (let b = 0; b < trees; b++) {
    const leaf = applyValues(ensemble.trees[b], profile);
    const from = members.start[b][leaf];
    const to = members.start[b][leaf + 1];
    // Never empty for the ensemble's own table (the leaf held in-bag rows);
    // the guard keeps a mismatched table from dividing by zero.
    if (to === from) continue;
    const share = 1 / ((to - from) * trees);
    for (let k = from; k < to; k++) {
      const r = members.rows[b][k];
      weight.set(r, (weight.get(r) ?? 0) + share);
    }
  }
  if (weight.size === 0) {
    throw new RangeError(
      "no leaf the profile reaches holds a member row: the members are not of this ensemble's table",
    );
  }
  const rows = [...weight.keys()].sort((a, b) => members.target[a] - members.target[b]);
  let total = 0;
  for (const r of rows) total += weight.get(r)!;
  const tail = (1 - coverage) / 2;
  return {
    low: weightedQuantile(rows, weight, members.target, total, tail),
    high: weightedQuantile(rows, weight, members.target, total, 1 - tail),
    coverage,
  };
}

// The smallest target value whose cumulative weight reaches p of the total
// (Meinshausen's Q(alpha) = inf{y : F(y | x) >= alpha}).
function weightedQuantile(
  sortedRows: number[],
  weight: Map<number, number>,
  target: Float64Array,
  total: number,
  p: number,
): number {
  let cumulative = 0;
  // A relative tolerance so that rounding in the sums cannot skip a row.
  const goal = p * total * (1 - 1e-12);
  for (const r of sortedRows) {
    cumulative += weight.get(r)!;
    if (cumulative >= goal) return target[r];
  }
  return target[sortedRows[sortedRows.length - 1]];
}
