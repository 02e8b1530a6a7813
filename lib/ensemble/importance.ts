/**
 * How much each feature matters to an ensemble's estimates.
 *
 * Permutation importance on out-of-bag rows (Breiman 2001, *Machine
 * Learning* 45) is the default: for every tree, the increase in its squared
 * error on the rows it did not draw when one feature's values are shuffled
 * among those rows, averaged over trees, with repeats and their spread.
 * Impurity decrease is a second view; it favours features with many
 * distinct values (Strobl et al. 2007, *BMC Bioinformatics* 8).
 *
 * @module
 */

import type { Dataset } from "../dataset/types.ts";
import { makeRng, shuffle } from "../random.ts";
import { goesLeft } from "../tree/flat_tree.ts";
import { bootstrapCounts } from "./bootstrap.ts";
import type { Ensemble } from "./fit_ensemble.ts";

/** One feature's importance. */
export interface FeatureImportance {
  /** Feature name. */
  feature: string;
  /** Mean increase of out-of-bag squared error when the feature is shuffled. */
  permutation: number;
  /** Standard deviation of that increase over the repeats. */
  permutationSd: number;
  /** Share of the total weighted impurity decrease of splits on the feature. */
  impurity: number;
}

/** Options of {@linkcode featureImportance}. */
export interface ImportanceOptions {
  /**
   * Shuffles per feature.
   * @default {3}
   */
  repeats?: number;
  /**
   * Seed of the shuffles.
   * @default {1}
   */
  seed?: number;
}

/**
 * Permutation and impurity importance of every feature (regression
 * ensembles), in feature order.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { featureImportance, fitEnsemble } from "../../mod.ts";
 * const years = Array.from({ length: 120 }, (_, i) => i % 30);
 * const noise = Array.from({ length: 120 }, (_, i) => (i * 37) % 11);
 * const dataset = {
 *   rows: 120,
 *   features: [
 *     { name: "years", kind: "numeric" as const, values: Float64Array.from(years) },
 *     { name: "noise", kind: "numeric" as const, values: Float64Array.from(noise) },
 *   ],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.from(years, (y) => 40 + 2 * y) },
 * };
 * const ensemble = fitEnsemble(dataset, { trees: 20, prune: "none", grow: { minLeaf: 3 } });
 * const [years_, noise_] = featureImportance(ensemble, dataset);
 * assert(years_.permutation > 10 * Math.abs(noise_.permutation));
 * ```
 */
export function featureImportance(
  ensemble: Ensemble,
  dataset: Dataset,
  options: ImportanceOptions = {},
): FeatureImportance[] {
  if (dataset.target.kind !== "regression") {
    throw new TypeError("featureImportance needs a regression ensemble");
  }
  const repeats = options.repeats ?? 3;
  const rng = makeRng(options.seed ?? 1);
  const y = dataset.target.values;
  const features = dataset.features.length;
  const increases = Array.from({ length: features }, () => new Float64Array(repeats));
  const columns = dataset.features.map((f) => f.values);
  for (let b = 0; b < ensemble.trees.length; b++) {
    const tree = ensemble.trees[b];
    const counts = bootstrapCounts(dataset.rows, ensemble.resamples, b);
    const oob: number[] = [];
    for (let r = 0; r < dataset.rows; r++) if (counts[r] === 0) oob.push(r);
    if (oob.length === 0) continue;
    const used = new Uint8Array(features);
    for (let n = 0; n < tree.nodeCount; n++) if (tree.feature[n] >= 0) used[tree.feature[n]] = 1;
    // Walks row r with feature f read from the donor row instead (no copy).
    const errorWith = (f: number, donor: number[] | undefined) => {
      let sse = 0;
      for (let i = 0; i < oob.length; i++) {
        const r = oob[i];
        const d = donor === undefined ? -1 : donor[i];
        let node = 0;
        while (tree.left[node] !== -1) {
          const g = tree.feature[node];
          const x = g === f && d >= 0 ? columns[g][d] : columns[g][r];
          node = goesLeft(tree, node, x) ? tree.left[node] : tree.right[node];
        }
        const e = y[r] - tree.value[node];
        sse += e * e;
      }
      return sse / oob.length;
    };
    const base = errorWith(-1, undefined);
    for (let f = 0; f < features; f++) {
      for (let k = 0; k < repeats; k++) {
        // Shuffled even when unused, so every feature's draws stay the same
        // whichever features a tree happens to use.
        const donor = shuffle(oob.slice(), rng);
        // A feature the tree never splits on changes no prediction: 0 exactly.
        if (used[f] === 0) continue;
        increases[f][k] += (errorWith(f, donor) - base) / ensemble.trees.length;
      }
    }
  }
  const decrease = impurityDecrease(ensemble, features);
  const total = decrease.reduce((a, b) => a + b, 0);
  return dataset.features.map((feature, f) => {
    const values = increases[f];
    const mean = values.reduce((a, b) => a + b, 0) / repeats;
    const sd = repeats > 1
      ? Math.sqrt(values.reduce((a, v) => a + (v - mean) ** 2, 0) / (repeats - 1))
      : 0;
    return {
      feature: feature.name,
      permutation: mean,
      permutationSd: sd,
      impurity: total > 0 ? decrease[f] / total : 0,
    };
  });
}

/**
 * Weighted impurity decrease of each feature's splits, summed over the
 * trees (any task): the impurity view of importance, before normalising.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures } from "../tree/bins.ts";
 * import { growTree } from "../tree/grow_tree.ts";
 * import { impurityDecrease } from "./importance.ts";
 * // x splits pay 1, 1, 5, 5 into two pure halves; z is constant and never splits.
 * const dataset = {
 *   rows: 4,
 *   features: [
 *     { name: "x", kind: "numeric" as const, values: Float64Array.of(1, 2, 3, 4) },
 *     { name: "z", kind: "numeric" as const, values: Float64Array.of(7, 7, 7, 7) },
 *   ],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.of(1, 1, 5, 5) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
 * // Root: weight 4 x variance 4 = 16; both leaves 0. Two such trees: 32.
 * assert.deepEqual([...impurityDecrease({ trees: [tree, tree] }, 2)], [32, 0]);
 * ```
 */
export function impurityDecrease(
  ensemble: Pick<Ensemble, "trees">,
  features: number,
): Float64Array {
  const out = new Float64Array(features);
  for (const tree of ensemble.trees) {
    for (let n = 0; n < tree.nodeCount; n++) {
      const l = tree.left[n];
      if (l === -1) continue;
      const r = tree.right[n];
      out[tree.feature[n]] += tree.weight[n] * tree.impurity[n] -
        tree.weight[l] * tree.impurity[l] - tree.weight[r] * tree.impurity[r];
    }
  }
  return out;
}
