/**
 * Each attribute's contribution to an ensemble's estimate for a profile:
 * the trees' exact contributions (lib/tree/contributions.ts) averaged over
 * the trees, on the fitting scale. They add up to the ensemble's prediction
 * minus its base: the mean over the trees of each tree's expected
 * prediction with nothing known, which, for trees whose covers count every
 * training row (shared trees, lib/tree/share_tree.ts), is the mean of the
 * ensemble's predictions over the training table.
 *
 * @module
 */

import { applyValues, type FlatTree } from "../tree/flat_tree.ts";
import {
  addContributions,
  ContributionSpace,
  coverMean,
  prepareTree,
} from "../tree/contributions.ts";

/** One profile's contributions. */
export interface Contributions {
  /** The mean of the trees' expected predictions with nothing known (fitting scale). */
  base: number;
  /** The ensemble's prediction for the profile: the trees' mean (fitting scale). */
  prediction: number;
  /** Per feature, its contribution (fitting scale); they add up to prediction - base. */
  parts: Float64Array;
}

/**
 * Works out contributions for any number of profiles over one set of
 * regression trees, with each tree's leaf paths and base worked out once.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { fitEnsemble } from "../../mod.ts";
 * import { ContributionReader } from "./contributions.ts";
 * const x = Float64Array.from({ length: 80 }, (_, i) => i % 8);
 * const z = Float64Array.from({ length: 80 }, (_, i) => (i >> 3) % 2);
 * const ensemble = fitEnsemble({
 *   rows: 80,
 *   features: [{ name: "x", kind: "numeric", values: x }, { name: "z", kind: "numeric", values: z }],
 *   target: { kind: "regression", name: "pay", values: x.map((v, i) => 50 + 3 * v + 10 * z[i]) },
 * }, { trees: 10, prune: "none", grow: { minLeaf: 1 } });
 * const reader = new ContributionReader(ensemble.trees, 2);
 * const { base, prediction, parts } = reader.profile(Float64Array.of(7, 1));
 * assert(Math.abs(base + parts[0] + parts[1] - prediction) < 1e-9);
 * assert(parts[0] > parts[1] && parts[1] > 0); // x = 7 is far above its mean, z = 1 a bit
 * // Over trees 2 and 5 alone, from their own base.
 * const two = reader.profile(Float64Array.of(7, 1), [2, 5]);
 * assert(Math.abs(two.base + two.parts[0] + two.parts[1] - two.prediction) < 1e-9);
 * ```
 */
export class ContributionReader {
  readonly trees: readonly FlatTree[];
  readonly features: number;
  /** The trees' mean expected prediction with nothing known. */
  readonly base: number;
  readonly #bases: Float64Array;
  readonly #space = new ContributionSpace();

  /** @throws {RangeError} for no tree, or a tree too deep (see `prepareTree`). */
  constructor(trees: readonly FlatTree[], features: number) {
    if (trees.length === 0) throw new RangeError("contributions need at least one tree");
    this.trees = trees;
    this.features = features;
    // Each tree's leaf paths now, so that a tree too deep to split is
    // refused here (RangeError) rather than at a profile.
    for (const tree of trees) prepareTree(tree);
    this.#bases = Float64Array.from(trees, coverMean);
    this.base = this.#bases.reduce((a, b) => a + b, 0) / trees.length;
  }

  /**
   * The contributions of one profile (one value per feature, NaN: missing),
   * over every tree or over the trees listed in `only` (for a training row,
   * those that did not draw it: then the base is theirs).
   */
  profile(profile: ArrayLike<number>, only?: ArrayLike<number>): Contributions {
    const parts = new Float64Array(this.features);
    const trees = this.trees;
    const count = only === undefined ? trees.length : only.length;
    if (count === 0) throw new RangeError("contributions need at least one tree");
    const share = 1 / count;
    let prediction = 0;
    let base = 0;
    for (let i = 0; i < count; i++) {
      const t = only === undefined ? i : only[i];
      const tree = trees[t];
      addContributions(tree, profile, parts, share, this.#space);
      prediction += tree.value[applyValues(tree, profile)];
      base += this.#bases[t];
    }
    return {
      base: only === undefined ? this.base : base / count,
      prediction: prediction / count,
      parts,
    };
  }
}
