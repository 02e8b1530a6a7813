/**
 * Possible proxies of a protected attribute: legitimate-looking features
 * that on their own predict it well. A pay model that leaves the attribute
 * out can still pay by it through such a feature, so they are named with
 * their figure wherever a pay model or a gap check is shown.
 *
 * The figure is the out-of-bag balanced accuracy (the mean of the recall of
 * each group, so a large group cannot make a weak predictor look strong) of
 * a bagged classification ensemble fitted on the one feature alone.
 *
 * @module
 */

import type { Feature } from "../dataset/types.ts";
import { binFeatures } from "../tree/bins.ts";
import { applyRow, applyValues } from "../tree/flat_tree.ts";
import { growOneFeatureTree } from "../tree/grow_one_feature.ts";
import { bootstrapCounts, resampleStates } from "./bootstrap.ts";
import type { Ensemble } from "./fit_ensemble.ts";
import { oobClassificationMetrics } from "./intervals.ts";

/**
 * The default balanced accuracy from which a feature is named a possible proxy.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { fitModel, loadTable } from "../../mod.ts";
 * import { PROXY_THRESHOLD } from "./proxies.ts";
 * // team follows gender exactly; level does not.
 * const rows = Array.from({ length: 120 }, (_, i) => {
 *   const k = (i >> 1) % 4;
 *   const pay = 40000 + 5000 * k + 1000 * (i % 3);
 *   return `${i % 2 ? "Woman" : "Man"},${i % 2 ? "Blue" : "Red"},G${k + 1},${pay}`;
 * });
 * const table = loadTable(`gender,team,level,pay\n${rows.join("\n")}\n`);
 * const model = await fitModel(table, { target: "pay", trees: 3, folds: 3, workers: 1 });
 * assert.deepEqual(model.proxies!.map((p) => p.feature), ["team"]);
 * assert(model.proxies![0].balancedAccuracy >= PROXY_THRESHOLD);
 * ```
 */
export const PROXY_THRESHOLD = 0.65;

/**
 * Out-of-bag balanced accuracy of a classification ensemble: the mean,
 * over the classes present, of the share of each class's rows whose
 * out-of-bag vote is that class.
 *
 * @param classes Each row's class code.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { fitEnsemble } from "../../mod.ts";
 * import { oobBalancedAccuracy } from "./proxies.ts";
 * // The class is the feature: every out-of-bag vote is right.
 * const values = Int32Array.from({ length: 60 }, (_, i) => i % 2);
 * const ensemble = fitEnsemble({
 *   rows: 60,
 *   features: [{ name: "x", kind: "numeric", values: Float64Array.from(values) }],
 *   target: { kind: "classification", name: "g", classes: ["a", "b"], values },
 * }, { trees: 10, prune: "none" });
 * assert(oobBalancedAccuracy(ensemble, values) === 1);
 * ```
 */
export function oobBalancedAccuracy(
  ensemble: Pick<Ensemble, "oob" | "oobTrees" | "width">,
  classes: ArrayLike<number>,
): number {
  const metrics = oobClassificationMetrics(ensemble, classes);
  const present = metrics.confusion.flatMap((row, c) =>
    row.reduce((a, b) => a + b, 0) > 0 ? [metrics.recall[c]] : []
  );
  return present.reduce((a, b) => a + b, 0) / present.length;
}

/** One feature's power to predict a protected attribute. */
export interface ProxyFigure {
  /** The feature. */
  feature: string;
  /** The protected attribute it predicts. */
  attribute: string;
  /** Out-of-bag balanced accuracy, 1 / (number of groups) for no power at all. */
  balancedAccuracy: number;
}

/** Options of {@linkcode proxyFigures}. */
export interface ProxyOptions {
  /** Trees per ensemble. @default {50} */
  trees?: number;
  /** Seed. @default {1} */
  seed?: number;
  /** Fewest people in a leaf. @default {5} */
  minLeaf?: number;
}

/**
 * Balanced accuracy of each feature alone predicting the attribute, highest
 * first.
 *
 * @param features The pay model's features, over the same rows as `attribute`.
 * @param attribute The protected attribute's group code per row (no missing).
 * @param groups Its group names.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { proxyFigures } from "./proxies.ts";
 * // "shift" equals the group for 90% of people; "floor" is unrelated.
 * const n = 400;
 * const group = Int32Array.from({ length: n }, (_, i) => i % 2);
 * const shift = Float64Array.from(group, (g, i) => (i % 10 === 0 ? 1 - g : g));
 * const floor = Float64Array.from({ length: n }, (_, i) => Math.floor(i / 2) % 7);
 * const figures = await proxyFigures(
 *   [{ name: "shift", kind: "numeric", values: shift }, { name: "floor", kind: "numeric", values: floor }],
 *   group, ["A", "B"], "sex", { trees: 20 },
 * );
 * assert(figures[0].feature === "shift" && figures[0].balancedAccuracy > 0.85);
 * assert(figures[1].balancedAccuracy < 0.6);
 * ```
 */
export function proxyFigures(
  features: readonly Feature[],
  attribute: Int32Array,
  groups: readonly string[],
  attributeName: string,
  options: ProxyOptions = {},
): ProxyFigure[] {
  const [figures] = proxyFigureSets(
    [{ features, attribute, groups, attributeName }],
    options,
  );
  return figures;
}

/** One protected attribute of {@linkcode proxyFigureSets}, as `proxyFigures` takes it. */
export interface ProxyQuestion {
  /** The pay model's features, over the same rows as `attribute`. */
  features: readonly Feature[];
  /** The protected attribute's group code per row (no missing). */
  attribute: Int32Array;
  /** Its group names. */
  groups: readonly string[];
  /** Its name. */
  attributeName: string;
}

/**
 * {@linkcode proxyFigures} of several attributes at once.
 *
 * Each feature's ensemble is the one `fitEnsemble` fits on the one-feature
 * dataset with `prune: "none"` (the same resamples, trees and out-of-bag
 * votes), grown from the feature's bins (lib/tree/grow_one_feature.ts):
 * on CPS1988 the check took 0.7 s on two workers that way and takes a few
 * hundredths of a second here, in this thread.
 *
 * @param onDone Called as each attribute's figures are in, with the number
 * done and the total.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { proxyFigures, proxyFigureSets } from "./proxies.ts";
 * const n = 200;
 * const group = Int32Array.from({ length: n }, (_, i) => i % 2);
 * const site = Int32Array.from({ length: n }, (_, i) => (i >> 1) % 3);
 * const shift = Float64Array.from(group, (g, i) => (i % 10 === 0 ? 1 - g : g));
 * const features = [{ name: "shift", kind: "numeric" as const, values: shift }];
 * const questions = [
 *   { features, attribute: group, groups: ["A", "B"], attributeName: "sex" },
 *   { features, attribute: site, groups: ["X", "Y", "Z"], attributeName: "site" },
 * ];
 * const done: number[] = [];
 * const [sex, site_] = proxyFigureSets(questions, { trees: 8 }, (d) => done.push(d));
 * assert.deepEqual(sex, proxyFigures(features, group, ["A", "B"], "sex", { trees: 8 }));
 * assert(sex[0].balancedAccuracy > 0.85 && site_[0].balancedAccuracy < 0.5);
 * assert.deepEqual(done, [1, 2]);
 * ```
 */
export function proxyFigureSets(
  questions: readonly ProxyQuestion[],
  options: ProxyOptions = {},
  onDone?: (done: number, total: number) => void,
): ProxyFigure[][] {
  const trees = options.trees ?? 50;
  const seed = options.seed ?? 1;
  const minLeaf = options.minLeaf ?? 5;
  return questions.map((q, i) => {
    const votes = oneFeatureOutOfBag(
      q.features,
      q.attribute,
      q.groups.length,
      trees,
      seed,
      minLeaf,
    );
    const out: ProxyFigure[] = q.features.map((feature, f) => ({
      feature: feature.name,
      attribute: q.attributeName,
      balancedAccuracy: oobBalancedAccuracy(votes[f], q.attribute),
    }));
    onDone?.(i + 1, questions.length);
    return out.sort((a, b) => b.balancedAccuracy - a.balancedAccuracy);
  });
}

/**
 * The out-of-bag class shares of the unpruned bagged ensemble on each
 * feature alone: for each, `fitEnsemble`'s `oob` and `oobTrees` on that
 * one-feature dataset (the same resampling states, the same trees, each
 * tree's votes added in tree order), with each tree grown from the
 * feature's bins. The resamples depend on the seed and the classes only,
 * so each tree's is drawn once for all the features.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { fitEnsemble } from "./fit_ensemble.ts";
 * import { oneFeatureOutOfBag } from "./proxies.ts";
 * const values = Float64Array.from({ length: 80 }, (_, i) => (i * 7) % 11);
 * const groups = Int32Array.from(values, (v, i) => (v > 4 ? 1 : 0) ^ (i % 9 === 0 ? 1 : 0));
 * const feature = { name: "x", kind: "numeric" as const, values };
 * const dataset = { rows: 80, features: [feature], target: { kind: "classification" as const, name: "g", classes: ["a", "b"], values: groups } };
 * const ensemble = fitEnsemble(dataset, { trees: 6, seed: 2, prune: "none", grow: { minLeaf: 3 } });
 * const [votes] = oneFeatureOutOfBag([feature], groups, 2, 6, 2, 3);
 * assert.deepEqual(votes.oob, ensemble.oob);
 * assert.deepEqual(votes.oobTrees, ensemble.oobTrees);
 * ```
 */
export function oneFeatureOutOfBag(
  features: readonly Feature[],
  classOf: Int32Array,
  classes: number,
  trees: number,
  seed: number,
  minLeaf: number,
): Pick<Ensemble, "oob" | "oobTrees" | "width">[] {
  const rows = classOf.length;
  const votes = features.map((feature) => ({
    feature: [feature],
    bins: binFeatures({
      rows,
      features: [feature],
      target: { kind: "classification", name: "", classes: [], values: classOf },
    })[0],
    sums: new Float64Array(rows * classes),
    oobTrees: new Int32Array(rows),
  }));
  const states = resampleStates(seed, classOf, trees);
  // Each bin's leaf when all its values share one (-1: walk its rows).
  const leafOfBin = new Int32Array(Math.max(0, ...votes.map((v) => v.bins.count)) + 1);
  const missing = [NaN];
  for (let b = 0; b < trees; b++) {
    const weights = bootstrapCounts(rows, states, b);
    for (const { feature, bins, sums, oobTrees } of votes) {
      const tree = growOneFeatureTree(
        { feature: feature[0], bins, classes, classOf, weights },
        { minLeaf },
      );
      // On one feature a leaf holds an interval of values (or a set of
      // levels): a bin whose lowest and highest values land in one leaf
      // has all its values there.
      for (let k = 0; k < bins.count; k++) {
        const low = applyValues(tree, [bins.lower[k]]);
        leafOfBin[k] = low === applyValues(tree, [bins.upper[k]]) ? low : -1;
      }
      leafOfBin[bins.count] = applyValues(tree, missing);
      const value = tree.value;
      const ids = bins.ids;
      for (let r = 0; r < rows; r++) {
        if (weights[r] !== 0) continue;
        let leaf = leafOfBin[ids[r]];
        if (leaf < 0) leaf = applyRow(tree, feature, r);
        for (let c = 0; c < classes; c++) sums[r * classes + c] += value[leaf * classes + c];
        oobTrees[r]++;
      }
    }
  }
  return votes.map(({ sums, oobTrees }) => {
    const oob = new Float64Array(rows * classes);
    for (let r = 0; r < rows; r++) {
      for (let c = 0; c < classes; c++) {
        oob[r * classes + c] = oobTrees[r] > 0 ? sums[r * classes + c] / oobTrees[r] : NaN;
      }
    }
    return { oob, oobTrees, width: classes };
  });
}
