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
  // Only drawn rows' leaves are read.
  const leaves = new Int32Array(counts.length);
  for (let r = 0; r < counts.length; r++) {
    if (counts[r] > 0) leaves[r] = applyRow(tree, features, r);
  }
  return diverseLeavesAt(tree, leaves, counts, money, tolerance).tree;
}

/**
 * {@linkcode diverseLeaves} from each row's leaf, walked once: the merged
 * tree and each row's leaf in it (a merged leaf's rows move to the node
 * that took its place), so no row is walked again. The same tree as
 * `diverseLeaves`.
 *
 * @param leaves Each row's leaf in `tree` (read for drawn rows only).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { applyRows, binFeatures, diverseLeaves, diverseLeavesAt, growTree } from "../../mod.ts";
 * // Four people paid 50 (x 1 to 4), the others paid differently.
 * const pay = [50, 50, 50, 50, 61, 70, 83, 90, 97, 64, 75, 99];
 * const x = [1, 2, 3, 4, 8, 9, 10, 11, 12, 7, 13, 14];
 * const dataset = {
 *   rows: 12,
 *   features: [{ name: "x", kind: "numeric" as const, values: Float64Array.from(x) }],
 *   target: { kind: "regression" as const, name: "y", values: Float64Array.from(pay) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 3 });
 * const counts = new Float64Array(12).fill(1);
 * const leaves = applyRows(tree, dataset.features, 12);
 * assert.deepEqual([...leaves], [2, 2, 2, 2, 3, 3, 4, 4, 4, 3, 4, 4]); // leaf 2: the four paid 50
 * const merged = diverseLeavesAt(tree, leaves, counts, pay);
 * // Leaves 2 and 3 merged into their parent, node 1 (kept as 1); leaf 4 is now node 2.
 * assert.deepEqual([...merged.leaves], [1, 1, 1, 1, 1, 1, 2, 2, 2, 1, 2, 2]);
 * assert.deepEqual(merged.leaves, applyRows(merged.tree, dataset.features, 12));
 * assert.deepEqual(merged.tree, diverseLeaves(tree, dataset.features, counts, pay));
 * ```
 */
export function diverseLeavesAt(
  tree: FlatTree,
  leaves: Int32Array,
  counts: ArrayLike<number>,
  money: ArrayLike<number>,
  tolerance = SAME_PAY_SHARE,
): { tree: FlatTree; leaves: Int32Array } {
  if (tree.task !== "regression") return { tree, leaves };
  let current = tree;
  let at = leaves;
  for (;;) {
    // Each leaf's drawn members' lowest and highest pay.
    const low = new Float64Array(current.nodeCount).fill(Infinity);
    const high = new Float64Array(current.nodeCount).fill(-Infinity);
    for (let r = 0; r < counts.length; r++) {
      if (!(counts[r] > 0)) continue;
      const leaf = at[r];
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
    if (parents.length === 0 || (revealing[0] === 1 && current.nodeCount === 1)) {
      return { tree: current, leaves: at };
    }
    const moved = collapsedIds(current, parents);
    current = collapseNodes(current, parents);
    const next = new Int32Array(at.length);
    for (let r = 0; r < at.length; r++) next[r] = moved[at[r]];
    at = next;
  }
}

// Each node's id after `collapseNodes(tree, nodes)`, or for a node removed
// the id of the collapsed node above it (where its rows land): kept nodes are
// those reached without passing below a collapsed node, numbered in id order,
// as collapseNodes numbers them. Children come after their parent.
function collapsedIds(tree: FlatTree, nodes: readonly number[]): Int32Array {
  const n = tree.nodeCount;
  const collapsed = new Uint8Array(n);
  for (const k of nodes) collapsed[k] = 1;
  const parent = new Int32Array(n).fill(-1);
  for (let k = 0; k < n; k++) {
    if (tree.left[k] === -1) continue;
    parent[tree.left[k]] = k;
    parent[tree.right[k]] = k;
  }
  const kept = new Uint8Array(n);
  const id = new Int32Array(n);
  let count = 0;
  for (let k = 0; k < n; k++) {
    const p = parent[k];
    kept[k] = k === 0 || (kept[p] === 1 && collapsed[p] === 0) ? 1 : 0;
    id[k] = kept[k] === 1 ? count++ : id[p];
  }
  return id;
}
