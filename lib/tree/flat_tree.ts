/**
 * A fitted tree as flat typed arrays, one entry per node, and the walks over
 * it: the leaf a row lands in, predictions, the decision path.
 *
 * Node 0 is the root. A leaf has `left = right = -1` and `feature = -1`.
 * Children always have larger ids than their parent, so every walk ends.
 *
 * @module
 */

import type { Feature } from "../dataset/types.ts";

/** A fitted classification or regression tree. */
export interface FlatTree {
  /** Regression (one value per node) or classification (class shares). */
  task: "regression" | "classification";
  /** Values per node: 1 for regression, the number of classes otherwise. */
  width: number;
  /** Number of nodes. */
  nodeCount: number;
  /** Feature index split on; -1 at a leaf. */
  feature: Int32Array;
  /** `x <= threshold` goes left (numeric and ordinal splits); NaN otherwise. */
  threshold: Float64Array;
  /**
   * Offset into `masks` of a categorical split's level sets; -1 otherwise.
   * At the offset: the levels sent left, then the levels sent right, each
   * `maskWords[f]` 32-bit words.
   */
  maskOffset: Int32Array;
  /** Bit sets of the levels of categorical splits. */
  masks: Uint32Array;
  /** Words per level mask, per feature. */
  maskWords: Int32Array;
  /** Left child; -1 at a leaf. */
  left: Int32Array;
  /** Right child; -1 at a leaf. */
  right: Int32Array;
  /** 1 when missing values (and levels the node never saw) go left. */
  missingLeft: Uint8Array;
  /** `width` values per node: the mean, or the class shares. */
  value: Float64Array;
  /** Distinct training rows (with nonzero weight) in the node. */
  rows: Int32Array;
  /** Training weight in the node. */
  weight: Float64Array;
  /** Impurity of the node: variance (regression) or Gini index. */
  impurity: Float64Array;
}

/**
 * The leaf a row lands in.
 *
 * @param features The dataset's features (values read at `row`).
 * @param row Row index into the feature arrays.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { applyRow, binFeatures, growTree } from "../../mod.ts";
 * const dataset = {
 *   rows: 6,
 *   features: [{ name: "years", kind: "numeric" as const, values: new Float64Array([1, 2, 3, 8, 9, 10]) }],
 *   target: { kind: "regression" as const, name: "pay", values: new Float64Array([50, 52, 54, 80, 82, 84]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 3 });
 * assert(tree.value[applyRow(tree, dataset.features, 4)] === 82);
 * ```
 */
export function applyRow(tree: FlatTree, features: readonly Feature[], row: number): number {
  let node = 0;
  while (tree.left[node] !== -1) {
    node = goesLeft(tree, node, features[tree.feature[node]].values[row])
      ? tree.left[node]
      : tree.right[node];
  }
  return node;
}

/**
 * The leaf a profile lands in: one value per feature, `NaN` for missing,
 * level codes for ordinal and categorical features.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { applyValues, binFeatures, growTree } from "../../mod.ts";
 * const dataset = {
 *   rows: 4,
 *   features: [{ name: "x", kind: "numeric" as const, values: new Float64Array([1, 2, 3, 4]) }],
 *   target: { kind: "regression" as const, name: "pay", values: new Float64Array([1, 1, 5, 5]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
 * assert(tree.value[applyValues(tree, [3.5])] === 5);
 * ```
 */
export function applyValues(tree: FlatTree, profile: ArrayLike<number>): number {
  let node = 0;
  while (tree.left[node] !== -1) {
    node = goesLeft(tree, node, profile[tree.feature[node]]) ? tree.left[node] : tree.right[node];
  }
  return node;
}

/**
 * The level codes a categorical split sends to one side: the one decoder
 * of a node's level masks (left levels at `maskOffset`, right ones after).
 *
 * @param levels How many levels the feature has.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, growTree, splitLevels } from "../../mod.ts";
 * const dataset = {
 *   rows: 6,
 *   features: [{ name: "site", kind: "categorical" as const, levels: ["A", "B", "C"], values: new Float64Array([0, 1, 2, 0, 1, 2]) }],
 *   target: { kind: "regression" as const, name: "pay", values: new Float64Array([50, 90, 51, 50, 90, 51]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
 * assert.deepEqual(splitLevels(tree, 0, true, 3), [0, 2]); // A and C, paid about 50
 * assert.deepEqual(splitLevels(tree, 0, false, 3), [1]);
 * ```
 */
export function splitLevels(tree: FlatTree, node: number, left: boolean, levels: number): number[] {
  const offset = tree.maskOffset[node];
  if (offset < 0) return [];
  const words = tree.maskWords[tree.feature[node]];
  const out: number[] = [];
  for (let code = 0; code < Math.min(levels, 32 * words); code++) {
    if (inMask(tree, offset + (left ? 0 : words), code)) out.push(code);
  }
  return out;
}

/** Whether level `code` is in the mask starting at `offset`. */
function inMask(tree: FlatTree, offset: number, code: number): boolean {
  return ((tree.masks[offset + (code >>> 5)] >>> (code & 31)) & 1) === 1;
}

/**
 * Whether a value goes to the left child at an internal node. Missing
 * values, and at a categorical split levels outside the node's mask that it
 * never saw, follow the node's missing direction.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, goesLeft, growTree } from "../../mod.ts";
 * // Sites A and C are paid about 50, B 90: the root sends A and C one way.
 * const dataset = {
 *   rows: 6,
 *   features: [{ name: "site", kind: "categorical" as const, levels: ["A", "B", "C", "D"], values: new Float64Array([0, 1, 2, 0, 1, 2]) }],
 *   target: { kind: "regression" as const, name: "pay", values: new Float64Array([50, 90, 51, 50, 90, 51]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
 * const left = goesLeft(tree, 0, 0);
 * assert.equal(goesLeft(tree, 0, 2), left);
 * assert.equal(goesLeft(tree, 0, 1), !left);
 * // D (code 3), never seen, and a missing value follow the missing direction.
 * assert.equal(goesLeft(tree, 0, 3), tree.missingLeft[0] === 1);
 * assert.equal(goesLeft(tree, 0, NaN), tree.missingLeft[0] === 1);
 * ```
 */
export function goesLeft(tree: FlatTree, node: number, x: number): boolean {
  if (Number.isNaN(x)) return tree.missingLeft[node] === 1;
  const offset = tree.maskOffset[node];
  if (offset < 0) return x <= tree.threshold[node];
  const words = tree.maskWords[tree.feature[node]];
  if (x >= 32 * words) return tree.missingLeft[node] === 1;
  if (inMask(tree, offset, x)) return true;
  if (inMask(tree, offset + words, x)) return false;
  return tree.missingLeft[node] === 1;
}

/**
 * The leaf of every row.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { applyRows, binFeatures, growTree } from "../../mod.ts";
 * const dataset = {
 *   rows: 6,
 *   features: [{ name: "years", kind: "numeric" as const, values: new Float64Array([1, 2, 3, 8, 9, 10]) }],
 *   target: { kind: "regression" as const, name: "pay", values: new Float64Array([50, 52, 54, 80, 82, 84]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 3 });
 * assert(applyRows(tree, dataset.features, 6).join() === "1,1,1,2,2,2");
 * ```
 */
export function applyRows(tree: FlatTree, features: readonly Feature[], rows: number): Int32Array {
  const out = new Int32Array(rows);
  for (let r = 0; r < rows; r++) out[r] = applyRow(tree, features, r);
  return out;
}

/**
 * Predictions for every row (`value[apply(x)]`): one value per row for
 * regression, the class shares (`width` values per row) for classification.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, growTree, predictRows } from "../../mod.ts";
 * const dataset = {
 *   rows: 6,
 *   features: [{ name: "years", kind: "numeric" as const, values: new Float64Array([1, 2, 3, 8, 9, 10]) }],
 *   target: { kind: "regression" as const, name: "pay", values: new Float64Array([50, 52, 54, 80, 82, 84]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 3 });
 * assert(predictRows(tree, dataset.features, 6).join() === "52,52,52,82,82,82");
 * ```
 */
export function predictRows(
  tree: FlatTree,
  features: readonly Feature[],
  rows: number,
  out: Float64Array = new Float64Array(rows * tree.width),
): Float64Array {
  const width = tree.width;
  if (out.length !== rows * width) {
    throw new RangeError(`out has ${out.length} entries, need ${rows * width}`);
  }
  for (let r = 0; r < rows; r++) {
    const leaf = applyRow(tree, features, r);
    for (let c = 0; c < width; c++) out[r * width + c] = tree.value[leaf * width + c];
  }
  return out;
}

/**
 * The most probable class at a node of a classification tree (the lowest
 * class code among ties).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, growTree, predictedClass } from "../../mod.ts";
 * const dataset = {
 *   rows: 4,
 *   features: [{ name: "x", kind: "numeric" as const, values: new Float64Array([1, 2, 3, 4]) }],
 *   target: { kind: "classification" as const, name: "level", classes: ["L1", "L2"], values: new Int32Array([0, 1, 1, 1]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 2 });
 * assert(predictedClass(tree, 0) === 1);
 * ```
 */
export function predictedClass(tree: FlatTree, node: number): number {
  let best = 0;
  for (let c = 1; c < tree.width; c++) {
    if (tree.value[node * tree.width + c] > tree.value[node * tree.width + best]) best = c;
  }
  return best;
}

/**
 * Number of leaves.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, growTree, leafCount, treeDepth } from "../../mod.ts";
 * const dataset = {
 *   rows: 4,
 *   features: [{ name: "x", kind: "numeric" as const, values: new Float64Array([1, 2, 3, 4]) }],
 *   target: { kind: "regression" as const, name: "pay", values: new Float64Array([1, 2, 3, 4]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
 * assert(leafCount(tree) === 4 && treeDepth(tree) === 2);
 * ```
 */
export function leafCount(tree: FlatTree): number {
  let leaves = 0;
  for (let n = 0; n < tree.nodeCount; n++) if (tree.left[n] === -1) leaves++;
  return leaves;
}

/**
 * Depth of the deepest leaf (the root alone has depth 0).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, growTree, leafCount, treeDepth } from "../../mod.ts";
 * // Pay 0 for x = 1..6, then 10 and 20: the root splits after x = 6 (squared
 * // error 0 + 50, below every other split), the pure left side stays a leaf
 * // and the right one splits once more: 3 leaves, depth 2.
 * const dataset = {
 *   rows: 8,
 *   features: [{ name: "x", kind: "numeric" as const, values: new Float64Array([1, 2, 3, 4, 5, 6, 7, 8]) }],
 *   target: { kind: "regression" as const, name: "pay", values: new Float64Array([0, 0, 0, 0, 0, 0, 10, 20]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
 * assert.equal(treeDepth(tree), 2);
 * assert.equal(leafCount(tree), 3);
 * ```
 */
export function treeDepth(tree: FlatTree): number {
  const depth = new Int32Array(tree.nodeCount);
  let deepest = 0;
  for (let n = 0; n < tree.nodeCount; n++) {
    if (tree.left[n] === -1) continue;
    depth[tree.left[n]] = depth[n] + 1;
    depth[tree.right[n]] = depth[n] + 1;
    deepest = Math.max(deepest, depth[n] + 1);
  }
  return deepest;
}

/**
 * The node ids from the root to the leaf a row lands in.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, growTree, pathOfRow } from "../../mod.ts";
 * const dataset = {
 *   rows: 4,
 *   features: [{ name: "x", kind: "numeric" as const, values: new Float64Array([1, 2, 3, 4]) }],
 *   target: { kind: "regression" as const, name: "pay", values: new Float64Array([1, 1, 5, 5]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
 * assert.deepEqual(pathOfRow(tree, dataset.features, 3), [0, 2]);
 * ```
 */
export function pathOfRow(tree: FlatTree, features: readonly Feature[], row: number): number[] {
  const path = [0];
  let node = 0;
  while (tree.left[node] !== -1) {
    node = goesLeft(tree, node, features[tree.feature[node]].values[row])
      ? tree.left[node]
      : tree.right[node];
    path.push(node);
  }
  return path;
}

/**
 * A new tree whose node j is a copy of `tree`'s node `nodes[j]` (its split,
 * value, counts and impurity), with the children `children(j)` gives as new
 * ids, or made a leaf where it gives null. The callers keep children after
 * their parent (`nodes` in id order or in preorder). Pruning and holding an
 * attribute at a value build their trees through it.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, copyNodes, growTree } from "../../mod.ts";
 * const dataset = {
 *   rows: 6,
 *   features: [{ name: "x", kind: "numeric" as const, values: new Float64Array([1, 2, 3, 8, 9, 10]) }],
 *   target: { kind: "regression" as const, name: "y", values: new Float64Array([1, 1, 1, 5, 5, 5]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 3 });
 * // The root alone, made a leaf: the mean of every row.
 * const stump = copyNodes(tree, [0], () => null);
 * assert.deepEqual([stump.nodeCount, stump.value[0], stump.feature[0], stump.left[0]], [1, 3, -1, -1]);
 * // Every node with its own children: the same tree.
 * assert.deepEqual(copyNodes(tree, [0, 1, 2], (j) => (j === 0 ? [1, 2] : null)), tree);
 * ```
 */
export function copyNodes(
  tree: FlatTree,
  nodes: ArrayLike<number>,
  children: (j: number) => readonly [number, number] | null,
): FlatTree {
  const count = nodes.length;
  const width = tree.width;
  const out: FlatTree = {
    task: tree.task,
    width,
    nodeCount: count,
    feature: new Int32Array(count),
    threshold: new Float64Array(count),
    maskOffset: new Int32Array(count),
    masks: tree.masks,
    maskWords: tree.maskWords,
    left: new Int32Array(count),
    right: new Int32Array(count),
    missingLeft: new Uint8Array(count),
    value: new Float64Array(count * width),
    rows: new Int32Array(count),
    weight: new Float64Array(count),
    impurity: new Float64Array(count),
  };
  for (let j = 0; j < count; j++) {
    const i = nodes[j];
    const kids = children(j);
    out.feature[j] = kids === null ? -1 : tree.feature[i];
    out.threshold[j] = kids === null ? NaN : tree.threshold[i];
    out.maskOffset[j] = kids === null ? -1 : tree.maskOffset[i];
    out.left[j] = kids === null ? -1 : kids[0];
    out.right[j] = kids === null ? -1 : kids[1];
    out.missingLeft[j] = kids === null ? 0 : tree.missingLeft[i];
    for (let c = 0; c < width; c++) out.value[j * width + c] = tree.value[i * width + c];
    out.rows[j] = tree.rows[i];
    out.weight[j] = tree.weight[i];
    out.impurity[j] = tree.impurity[i];
  }
  return out;
}
