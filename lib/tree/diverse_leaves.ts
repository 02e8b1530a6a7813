/**
 * Leaves whose value is someone's pay, merged away before a tree is shared.
 * A leaf of five drawn people whose pay is the same (a pay scale paid
 * exactly), or arranged so that their mean falls on one of them, has that
 * person's pay as its value; a staff list then tells who may be in it, and
 * the value repeats across trees. Unpruned ensembles gave 173 of the demo's
 * 2,000 people their exact pay this way. A leaf whose value lies within
 * `tolerance` (relative) of a drawn member's pay is merged with its sibling
 * (its parent made a leaf, the parent's drawn-row mean its value) until no
 * leaf is; the tree then predicts what a coarser tree would.
 *
 * @module
 */

import type { Feature } from "../dataset/types.ts";
import { applyRow, type FlatTree } from "./flat_tree.ts";
import { collapseNodes } from "./prune.ts";

/** A leaf value within this share of a member's pay is that member's pay (0.05%). */
export const SAME_PAY_SHARE = 5e-4;

/**
 * The tree with every leaf whose value is a drawn member's pay merged into
 * its parent (regression trees; a class tree is returned as it is).
 *
 * @param tree A tree grown on drawn rows (`counts` > 0).
 * @param money The target in money, row by row; `toMoney` maps a leaf value to money.
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
 * const shared = diverseLeaves(tree, dataset.features, new Float64Array(6).fill(1), pay, (v) => v);
 * assert.equal(shared.nodeCount, 1);
 * ```
 */
export function diverseLeaves(
  tree: FlatTree,
  features: readonly Feature[],
  counts: ArrayLike<number>,
  money: ArrayLike<number>,
  toMoney: (value: number) => number,
  tolerance = SAME_PAY_SHARE,
): FlatTree {
  if (tree.task !== "regression") return tree;
  let current = tree;
  for (;;) {
    const leafMoney = new Float64Array(current.nodeCount);
    for (let k = 0; k < current.nodeCount; k++) {
      if (current.left[k] === -1) leafMoney[k] = toMoney(current.value[k]);
    }
    const revealing = new Uint8Array(current.nodeCount);
    for (let r = 0; r < counts.length; r++) {
      if (!(counts[r] > 0)) continue;
      const leaf = applyRow(current, features, r);
      if (Math.abs(leafMoney[leaf] - money[r]) <= tolerance * Math.abs(money[r])) {
        revealing[leaf] = 1;
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
