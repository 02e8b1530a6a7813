/**
 * Ensembles of trees written out by hand (stumps on one numeric feature),
 * with the out-of-bag figures given, so that everything read from them can
 * be worked out on paper (invented values).
 *
 * @module
 */

import type { Ensemble, FlatTree } from "../../../mod.ts";
import { handTree } from "../tree/_hand_tree.ts";

/** A stump on feature 0: `x <= threshold` gets `left`, else `right` (values per class). */
export function stump(
  threshold: number,
  left: number[],
  right: number[],
  rows: [number, number] = [2, 2],
): FlatTree {
  const root = left.map((v, c) => (v + right[c]) / 2);
  return handTree(
    [{ feature: 0, split: threshold, left: 1, right: 2 }, null, null],
    [{ kind: "numeric" }],
    [...root, ...left, ...right],
    [rows[0] + rows[1], ...rows],
    left.length === 1 ? "regression" : "classification",
  );
}

/** An ensemble of the given trees and out-of-bag figures (no resampling states). */
export function handEnsemble(
  trees: FlatTree[],
  oob: number[] = [],
  oobTrees: number[] = [],
  resamples: Int32Array = new Int32Array(0),
): Ensemble {
  return {
    trees,
    resamples,
    alphas: new Float64Array(trees.length),
    width: trees[0].width,
    oob: Float64Array.from(oob),
    oobTrees: Int32Array.from(oobTrees),
  };
}
