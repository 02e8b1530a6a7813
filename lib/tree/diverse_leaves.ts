/**
 * Leaves whose value is everyone's pay in them, merged away before a tree
 * is shared. A leaf of five drawn people paid the same (a pay scale paid
 * exactly) has their pay as its value; a staff list then tells who may be
 * in it, and the value recurs across trees. Unpruned ensembles gave 173 of
 * the demo's 2,000 people their exact pay this way. A leaf whose drawn
 * members' pay spans no more than `tolerance` (relative) is merged with its
 * sibling (its parent made a leaf, the parent's drawn-row mean its value)
 * until none is; the tree then predicts what a coarser tree would. (A
 * mean that falls on one member of a mixed group by chance does not recur
 * across trees, and names no one.)
 *
 * @module
 */

import type { Feature } from "../dataset/types.ts";
import { applyRow, type FlatTree } from "./flat_tree.ts";
import { collapseNodes } from "./prune.ts";

/**
 * Drawn members whose pay spans no more than this share are paid the same (0.05%).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, diverseLeaves, growTree, SAME_PAY_SHARE } from "../../mod.ts";
 * // A leaf of three people whose pay spans `spread` (a share of the highest).
 * const leaves = (spread: number) => {
 *   const top = 50000;
 *   const pay = [top * (1 - spread), top * (1 - spread / 2), top, 61000, 70000, 83000];
 *   const dataset = {
 *     rows: 6,
 *     features: [
 *       { name: "x", kind: "numeric" as const, values: Float64Array.of(1, 2, 3, 8, 9, 10) },
 *     ],
 *     target: { kind: "regression" as const, name: "y", values: Float64Array.from(pay) },
 *   };
 *   const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 3 });
 *   return diverseLeaves(tree, dataset.features, new Float64Array(6).fill(1), pay).nodeCount;
 * };
 * assert.equal(leaves(SAME_PAY_SHARE / 2), 1); // paid the same: merged away
 * assert.equal(leaves(2 * SAME_PAY_SHARE), 3); // kept
 * ```
 */
export const SAME_PAY_SHARE = 5e-4;

/**
 * The tree with every leaf whose drawn members are paid the same merged
 * into its parent (regression trees; a class tree is returned as it is).
 *
 * @param tree A tree grown on drawn rows (`counts` > 0).
 * @param money The target in money, row by row.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, diverseLeaves, growTree } from "../../mod.ts";
 * const pay = [50, 50, 50, 61, 70, 83];
 * const dataset = {
 *   rows: 6,
 *   features: [{ name: "x", kind: "numeric" as const, values: new Float64Array([1, 2, 3, 8, 9, 10]) }],
 *   target: { kind: "regression" as const, name: "y", values: Float64Array.from(pay) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 3 });
 * assert.equal(tree.value[1], 50); // a leaf of three people paid 50 each
 * const shared = diverseLeaves(tree, dataset.features, new Float64Array(6).fill(1), pay);
 * assert.equal(shared.nodeCount, 1);
 * ```
 */
export function diverseLeaves(
  tree: FlatTree,
  features: readonly Feature[],
  counts: ArrayLike<number>,
  money: ArrayLike<number>,
  tolerance = SAME_PAY_SHARE,
): FlatTree {
  if (tree.task !== "regression") return tree;
  let current = tree;
  for (;;) {
    // Each leaf's drawn members' lowest and highest pay.
    const low = new Float64Array(current.nodeCount).fill(Infinity);
    const high = new Float64Array(current.nodeCount).fill(-Infinity);
    for (let r = 0; r < counts.length; r++) {
      if (!(counts[r] > 0)) continue;
      const leaf = applyRow(current, features, r);
      if (money[r] < low[leaf]) low[leaf] = money[r];
      if (money[r] > high[leaf]) high[leaf] = money[r];
    }
    const revealing = new Uint8Array(current.nodeCount);
    for (let k = 0; k < current.nodeCount; k++) {
      if (current.left[k] === -1 && high[k] - low[k] <= tolerance * Math.abs(high[k])) {
        revealing[k] = 1;
      }
    }
    const parents: number[] = [];
    for (let k = 0; k < current.nodeCount; k++) {
      if (current.left[k] === -1) continue;
      if (revealing[current.left[k]] || revealing[current.right[k]]) parents.push(k);
    }
    if (parents.length === 0 || (revealing[0] === 1 && current.nodeCount === 1)) return current;
    current = collapseNodes(current, parents);
  }
}
