/**
 * Trees written out node by node, so that every walk over them can be
 * followed by hand (invented values, no data).
 *
 * @module
 */

import type { Feature, FlatTree } from "../../../mod.ts";

/** An internal node: a threshold (`x <= t` left) or the level sets each side takes. */
export interface HandSplit {
  /** Feature index. */
  feature: number;
  /** A threshold, or the level codes sent left and right (others are unseen there). */
  split: number | { left: number[]; right: number[] };
  /** Left child. */
  left: number;
  /** Right child. */
  right: number;
  /** Whether missing values (and unseen levels) go left. */
  missingLeft?: boolean;
}

/**
 * A flat tree from its nodes (null: a leaf), each node's values (`width`
 * per node) and distinct rows.
 */
export function handTree(
  nodes: (HandSplit | null)[],
  features: readonly Pick<Feature, "kind" | "levels">[],
  values: readonly number[],
  rows: readonly number[],
  task: FlatTree["task"] = "regression",
): FlatTree {
  const n = nodes.length;
  const width = values.length / n;
  const words = features.map((f) =>
    f.kind === "categorical" ? Math.max(1, Math.ceil((f.levels?.length ?? 0) / 32)) : 0
  );
  const masks: number[] = [];
  const tree: FlatTree = {
    task,
    width,
    nodeCount: n,
    feature: new Int32Array(n).fill(-1),
    threshold: new Float64Array(n).fill(NaN),
    maskOffset: new Int32Array(n).fill(-1),
    masks: new Uint32Array(0),
    maskWords: Int32Array.from(words),
    left: new Int32Array(n).fill(-1),
    right: new Int32Array(n).fill(-1),
    missingLeft: new Uint8Array(n),
    value: Float64Array.from(values),
    rows: Int32Array.from(rows),
    weight: Float64Array.from(rows),
    impurity: new Float64Array(n),
  };
  nodes.forEach((node, i) => {
    if (node === null) return;
    tree.feature[i] = node.feature;
    tree.left[i] = node.left;
    tree.right[i] = node.right;
    tree.missingLeft[i] = node.missingLeft ? 1 : 0;
    if (typeof node.split === "number") {
      tree.threshold[i] = node.split;
      return;
    }
    tree.maskOffset[i] = masks.length;
    const w = words[node.feature];
    const bits = (codes: number[]) => {
      const out = new Array<number>(w).fill(0);
      for (const c of codes) out[c >>> 5] |= 1 << (c & 31);
      return out;
    };
    masks.push(...bits(node.split.left), ...bits(node.split.right));
  });
  tree.masks = Uint32Array.from(masks.map((m) => m >>> 0));
  return tree;
}
