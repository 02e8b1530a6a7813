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

import type { Dataset, Feature } from "../dataset/types.ts";
import type { Ensemble } from "./fit_ensemble.ts";
import { type EnsembleJob, fitEnsemblesParallel } from "./fit_parallel.ts";
import { FittingPool } from "./_worker_pool.ts";
import { oobClassificationMetrics } from "./intervals.ts";

// Rows from which the single-feature ensembles go to the workers. Below,
// starting and warming two workers costs more than they save: on the demo
// table (2,000 rows) the proxies took 0.56-0.74 s in this thread and
// 1.03-1.09 s on two workers (bench/fit_phases.ts, same run). The same
// trees either way.
const WORKERS_FROM_ROWS = 20_000;

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
export function oobBalancedAccuracy(ensemble: Ensemble, classes: ArrayLike<number>): number {
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
  /**
   * Workers, or a pool of them. Workers are started only from
   * WORKERS_FROM_ROWS rows; a pool's, already started, are used at any size.
   */
  workers?: number | FittingPool;
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
 *   group, ["A", "B"], "sex", { trees: 20, workers: 1 },
 * );
 * assert(figures[0].feature === "shift" && figures[0].balancedAccuracy > 0.85);
 * assert(figures[1].balancedAccuracy < 0.6);
 * ```
 */
export async function proxyFigures(
  features: readonly Feature[],
  attribute: Int32Array,
  groups: readonly string[],
  attributeName: string,
  options: ProxyOptions = {},
): Promise<ProxyFigure[]> {
  const [figures] = await proxyFigureSets(
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
 * {@linkcode proxyFigures} of several attributes at once: every feature's
 * ensemble of every attribute grown on one set of workers, started once
 * (the same trees as one at a time, in any thread).
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
 * const [sex, site_] = await proxyFigureSets(questions, { trees: 8, workers: 2 }, (d) => done.push(d));
 * assert.deepEqual(sex, await proxyFigures(features, group, ["A", "B"], "sex", { trees: 8, workers: 1 }));
 * assert(sex[0].balancedAccuracy > 0.85 && site_[0].balancedAccuracy < 0.5);
 * assert.deepEqual(done.sort(), [1, 2]);
 * ```
 */
export async function proxyFigureSets(
  questions: readonly ProxyQuestion[],
  options: ProxyOptions = {},
  onDone?: (done: number, total: number) => void,
): Promise<ProxyFigure[][]> {
  const trees = options.trees ?? 50;
  // Trees left per question, to tell when its figures are all in.
  const left = questions.map((q) => q.features.length * trees);
  let answered = 0;
  const jobs: EnsembleJob[] = questions.flatMap((q, i) =>
    q.features.map((feature): EnsembleJob => ({
      dataset: {
        rows: q.attribute.length,
        features: [feature],
        target: {
          kind: "classification",
          name: q.attributeName,
          classes: [...q.groups],
          values: q.attribute,
        },
      } satisfies Dataset,
      options: {
        trees,
        seed: options.seed ?? 1,
        prune: "none",
        grow: { minLeaf: options.minLeaf ?? 5 },
        onProgress: () => {
          left[i] -= 1;
          if (left[i] === 0) onDone?.(++answered, questions.length);
        },
      },
    }))
  );
  const rows = questions.length === 0 ? 0 : questions[0].attribute.length;
  // A pool's workers are already started, and serve at any size.
  const onWorkers = options.workers instanceof FittingPool || rows >= WORKERS_FROM_ROWS;
  const ensembles = await fitEnsemblesParallel(
    jobs,
    onWorkers ? options.workers ?? navigator.hardwareConcurrency ?? 1 : 1,
  );
  let next = 0;
  return questions.map((q) => {
    const out: ProxyFigure[] = q.features.map((feature) => ({
      feature: feature.name,
      attribute: q.attributeName,
      balancedAccuracy: oobBalancedAccuracy(ensembles[next++], q.attribute),
    }));
    return out.sort((a, b) => b.balancedAccuracy - a.balancedAccuracy);
  });
}
