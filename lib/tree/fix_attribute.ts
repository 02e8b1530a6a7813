/**
 * A tree with one attribute held at a value: every split on that attribute
 * replaced by the side the value takes, so the copy predicts, for any
 * profile, what the tree predicts for that profile with the attribute set to
 * the value. The gap decomposition (lib/gap/decompose_gap.ts) splits such a
 * copy's estimates by attribute: with the group held fixed, the group can
 * take no part, and the other attributes' parts add up to the estimate.
 *
 * Node values, counts and weights are copied as they are; a caller who
 * needs covers of the copy counts them again (`shareTree`), since a held
 * split's side holds only the rows of one value.
 *
 * @module
 */

import { copyNodes, type FlatTree, goesLeft } from "./flat_tree.ts";

/**
 * The tree as it predicts with feature `feature` held at `value` (a number,
 * or a level code; NaN: missing), its nodes renumbered so that children
 * still follow their parent.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { applyValues, binFeatures, growTree } from "../../mod.ts";
 * import { fixAttribute } from "./fix_attribute.ts";
 * // Pay 50 + 10 x level, 8 less in group 1.
 * const level = [0, 1, 2, 0, 1, 2, 0, 1, 2, 0, 1, 2];
 * const group = [0, 0, 0, 1, 1, 1, 0, 0, 0, 1, 1, 1];
 * const dataset = {
 *   rows: 12,
 *   features: [
 *     { name: "level", kind: "numeric" as const, values: Float64Array.from(level) },
 *     { name: "group", kind: "categorical" as const, levels: ["A", "B"], values: Float64Array.from(group) },
 *   ],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.from(level, (l, i) => 50 + 10 * l - 8 * group[i]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
 * const asA = fixAttribute(tree, 1, 0);
 * assert(!asA.feature.includes(1)); // no split on the group is left
 * assert(asA.nodeCount < tree.nodeCount);
 * for (const l of [0, 1, 2]) {
 *   for (const g of [0, 1]) {
 *     assert.equal(asA.value[applyValues(asA, [l, g])], tree.value[applyValues(tree, [l, 0])]);
 *   }
 * }
 * ```
 */
export function fixAttribute(tree: FlatTree, feature: number, value: number): FlatTree {
  // Preorder over the kept nodes: a held split is passed through to the
  // side the value takes, so it never gets an id of its own.
  const order: number[] = [];
  const stack = [0];
  while (stack.length > 0) {
    let node = stack.pop()!;
    while (tree.feature[node] === feature && tree.left[node] !== -1) {
      node = goesLeft(tree, node, value) ? tree.left[node] : tree.right[node];
    }
    order.push(node);
    if (tree.left[node] !== -1) stack.push(tree.right[node], tree.left[node]);
  }
  return rebuilt(tree, feature, value, order);
}

// The copy with the kept nodes in `order` (a preorder), children found again
// by passing through held splits.
function rebuilt(tree: FlatTree, feature: number, value: number, order: number[]): FlatTree {
  const newId = new Map<number, number>();
  order.forEach((node, i) => newId.set(node, i));
  const through = (node: number) => {
    while (tree.feature[node] === feature && tree.left[node] !== -1) {
      node = goesLeft(tree, node, value) ? tree.left[node] : tree.right[node];
    }
    return newId.get(node)!;
  };
  return copyNodes(
    tree,
    order,
    (j) =>
      tree.left[order[j]] === -1
        ? null
        : [through(tree.left[order[j]]), through(tree.right[order[j]])],
  );
}
