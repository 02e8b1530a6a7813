/**
 * A class model's answer for one profile: the mean of the trees' leaf class
 * shares (soft voting), each tree's shares kept for the intervals, and the
 * most likely class (ties to the lowest code).
 *
 * @module
 */

import { applyValues, type FlatTree } from "../tree/flat_tree.ts";

/** The trees' class shares for one profile. */
export interface ClassVotes {
  /** Mean share of each class over the trees. */
  shares: Float64Array;
  /** Each class's share in each tree (class, then tree). */
  perTree: Float64Array[];
  /** The class with the largest mean share. */
  best: number;
}

/**
 * The class shares of a profile over the trees of a class model.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, growTree } from "../../mod.ts";
 * import { classVotes } from "./class_votes.ts";
 * const dataset = {
 *   rows: 6,
 *   features: [{ name: "years", kind: "numeric" as const, values: new Float64Array([1, 2, 3, 10, 11, 12]) }],
 *   target: { kind: "classification" as const, name: "level", classes: ["junior", "senior"], values: new Int32Array([0, 0, 0, 1, 1, 0]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 3 });
 * const votes = classVotes([tree, tree], Float64Array.of(11));
 * // The right leaf holds years 10, 11, 12: senior, senior, junior.
 * assert(Math.abs(votes.shares[1] - 2 / 3) < 1e-12);
 * assert.equal(votes.best, 1);
 * assert.deepEqual(Array.from(votes.perTree[0]), [1 / 3, 1 / 3]);
 * ```
 */
export function classVotes(trees: readonly FlatTree[], profile: ArrayLike<number>): ClassVotes {
  const width = trees[0].width;
  const shares = new Float64Array(width);
  const perTree = Array.from({ length: width }, () => new Float64Array(trees.length));
  trees.forEach((t, b) => {
    const leaf = applyValues(t, profile);
    for (let c = 0; c < width; c++) {
      shares[c] += t.value[leaf * width + c] / trees.length;
      perTree[c][b] = t.value[leaf * width + c];
    }
  });
  let best = 0;
  for (let c = 1; c < width; c++) if (shares[c] > shares[best]) best = c;
  return { shares, perTree, best };
}
