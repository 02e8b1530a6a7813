/**
 * A bagged tree made fit to share. A tree grown on a bootstrap resample
 * keeps, in its node counts, weights and internal node values, traces of
 * which rows were drawn; with a staff list those traces turn its leaf
 * means into equations in the unknown pays. The shared copy keeps only
 * what anyone holding the tree and a staff list could compute anyway, plus
 * the leaf values the tree exists for:
 *
 * - `rows` and `weight`: the count of every training row reaching the node
 *   (its cover), drawn or not;
 * - internal node values: the cover-weighted mean of the leaves below
 *   (what the tree predicts on average for the training rows there), not
 *   the drawn rows' mean;
 * - `impurity`: not kept (NaN), since each node's variance would tell the
 *   spread of its members' pay.
 *
 * Splits, thresholds and leaf values are unchanged, so every prediction is
 * the same.
 *
 * @module
 */

import type { Feature } from "../dataset/types.ts";
import { applyRows, type FlatTree } from "./flat_tree.ts";
import { diverseLeavesAt } from "./diverse_leaves.ts";

/**
 * The shareable copy of a tree, with cover counts from `rows` training
 * rows of `features`.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, growTree, shareTree } from "../../mod.ts";
 * const dataset = {
 *   rows: 6,
 *   features: [{ name: "years", kind: "numeric" as const, values: new Float64Array([1, 2, 3, 8, 9, 10]) }],
 *   target: { kind: "regression" as const, name: "pay", values: new Float64Array([50, 52, 54, 80, 82, 84]) },
 * };
 * // A resample that drew rows 0, 0, 2, 3, 3, 5.
 * const weights = new Float64Array([2, 0, 1, 2, 0, 1]);
 * const tree = growTree({ dataset, bins: binFeatures(dataset), weights }, { minLeaf: 2 });
 * const shared = shareTree(tree, dataset.features, 6);
 * assert.deepEqual(Array.from(shared.rows), [6, 3, 3]); // every row, drawn or not
 * assert.deepEqual(Array.from(shared.value.subarray(1)), Array.from(tree.value.subarray(1)));
 * assert.equal(shared.value[0], (3 * tree.value[1] + 3 * tree.value[2]) / 6);
 * assert(Number.isNaN(shared.impurity[0]));
 * ```
 */
export function shareTree(tree: FlatTree, features: readonly Feature[], rows: number): FlatTree {
  return shareTreeAt(tree, applyRows(tree, features, rows));
}

/**
 * {@linkcode shareTree} from each training row's leaf, walked already.
 *
 * @param leaves The leaf of every training row in `tree`.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { applyRows, binFeatures, growTree, shareTree, shareTreeAt } from "../../mod.ts";
 * const dataset = {
 *   rows: 4,
 *   features: [{ name: "x", kind: "numeric" as const, values: Float64Array.of(1, 2, 3, 4) }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.of(50, 52, 80, 84) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset), weights: Float64Array.of(3, 0, 1, 0) }, { minLeaf: 1 });
 * const shared = shareTreeAt(tree, applyRows(tree, dataset.features, 4));
 * assert.deepEqual([...shared.rows], [4, 2, 2]);
 * assert.deepEqual(shared, shareTree(tree, dataset.features, 4));
 * ```
 */
export function shareTreeAt(tree: FlatTree, leaves: ArrayLike<number>): FlatTree {
  const n = tree.nodeCount;
  const width = tree.width;
  const cover = new Int32Array(n);
  for (let r = 0; r < leaves.length; r++) cover[leaves[r]]++;
  const value = Float64Array.from(tree.value);
  // Children come after their parent, so one backward pass sums the covers
  // and the cover-weighted values of each subtree.
  const sums = new Float64Array(n * width);
  for (let k = n - 1; k >= 0; k--) {
    const l = tree.left[k];
    if (l === -1) {
      for (let c = 0; c < width; c++) sums[k * width + c] = cover[k] * value[k * width + c];
      continue;
    }
    const r = tree.right[k];
    cover[k] = cover[l] + cover[r];
    for (let c = 0; c < width; c++) {
      sums[k * width + c] = sums[l * width + c] + sums[r * width + c];
      // A node no training row reaches keeps its fitted value (it cannot
      // occur for a fitted tree, whose drawn rows are training rows).
      if (cover[k] > 0) value[k * width + c] = sums[k * width + c] / cover[k];
    }
  }
  return {
    ...tree,
    value,
    rows: cover,
    weight: Float64Array.from(cover),
    impurity: new Float64Array(n).fill(NaN),
  };
}

/**
 * The copy of a tree grown on a resample that a model file may hold: each
 * row walked once, leaves whose drawn people are paid the same merged away
 * (regression, with `money`; see `diverseLeaves`), then covers only
 * ({@linkcode shareTree}). The same tree as
 * `shareTree(diverseLeaves(tree, features, counts, money), features, rows)`.
 *
 * @param counts How often the resample drew each training row.
 * @param money The target in money, row by row (regression; omitted for classes).
 * @param leaves Each training row's leaf in `tree`, when the caller has
 *   walked them already (the fitting worker walks every row once for this
 *   and for the out-of-bag estimates).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { applyRow, binFeatures, diverseLeaves, growTree, shareableTree, shareTree } from "../../mod.ts";
 * // Four people paid 50 (x 1 to 4), the others paid differently.
 * const pay = [50, 50, 50, 50, 61, 70, 83, 90, 97, 64, 75, 99];
 * const x = [1, 2, 3, 4, 8, 9, 10, 11, 12, 7, 13, 14];
 * const dataset = {
 *   rows: 12,
 *   features: [{ name: "x", kind: "numeric" as const, values: Float64Array.from(x) }],
 *   target: { kind: "regression" as const, name: "y", values: Float64Array.from(pay) },
 * };
 * const counts = Float64Array.of(1, 2, 1, 1, 0, 1, 1, 0, 2, 1, 1, 1);
 * const tree = growTree({ dataset, bins: binFeatures(dataset), weights: counts }, { minLeaf: 3 });
 * const merged = diverseLeaves(tree, dataset.features, counts, pay);
 * assert.deepEqual([tree.nodeCount, merged.nodeCount], [5, 3]); // the leaf of the four went
 * const shared = shareableTree(tree, dataset.features, counts, pay);
 * assert.deepEqual(shared, shareTree(merged, dataset.features, 12));
 * assert.deepEqual([...shared.rows], [12, 7, 5]);
 * const leaves = Int32Array.from(x, (_, r) => applyRow(tree, dataset.features, r));
 * assert.deepEqual(shareableTree(tree, dataset.features, counts, pay, leaves), shared);
 * ```
 */
export function shareableTree(
  tree: FlatTree,
  features: readonly Feature[],
  counts: ArrayLike<number>,
  money?: ArrayLike<number>,
  leaves: Int32Array = applyRows(tree, features, counts.length),
): FlatTree {
  const merged = money === undefined
    ? { tree, leaves }
    : diverseLeavesAt(tree, leaves, counts, money);
  return shareTreeAt(merged.tree, merged.leaves);
}
