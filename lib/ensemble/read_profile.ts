/**
 * What the model says about one profile, with the measured defaults
 * applied and every figure back in money: the estimate, how sure it is,
 * the range comparable people's pay falls in, and what-if differences.
 * This is the one place the terminal layer asks; it adds no method of its
 * own to those in intervals.ts, grouped_range.ts and quantile_forest.ts.
 *
 * @module
 */

import normalQuantile from "@stdlib/stats-base-dists-normal-quantile";
import type { Dataset } from "../dataset/types.ts";
import { STATE_WORDS } from "./bootstrap.ts";
import { DEFAULT_HOW_SURE } from "./defaults.ts";
import { type EstimateCenter, estimateCenter } from "./estimate_center.ts";
import type { Ensemble } from "./fit_ensemble.ts";
import {
  groupedRange,
  groupedShareBelow,
  groupResiduals,
  type ResidualGroups,
  summarizeResidualGroups,
} from "./grouped_range.ts";
import {
  type InBagCounts,
  inBagCounts,
  infinitesimalJackknife,
  type Interval,
  mean,
  percentileInterval,
  treeEstimates,
} from "./intervals.ts";
import { type PayScale, toFitScale, toMoney } from "./pay_scale.ts";
import { type LeafMembers, leafMembers, quantileForestRange } from "./quantile_forest.ts";

/** The z value of a central interval of `coverage` (standard normal quantile). */
function zOf(coverage: number): number {
  return normalQuantile(1 - (1 - coverage) / 2, 0, 1);
}

/** A regression ensemble with what its readings need, built once per model. */
export interface ProfileReader {
  /** The ensemble (fitted on `scale`). */
  ensemble: Ensemble;
  /** The scale the ensemble was fitted on. */
  scale: PayScale;
  /**
   * Out-of-bag residuals grouped by estimate (the default range), kept as
   * quantile grids (`summarizeResidualGroups`), as a saved model keeps them.
   */
  groups: ResidualGroups;
  /** Training rows (the jackknife needs their count). */
  trainingRows: number;
  /** The trees' bootstrap counts, when the jackknife is shown. */
  bag: InBagCounts | null;
  /**
   * Whether the jackknife would be shown (enough trees per row) but cannot
   * be, because the in-bag counts are not at hand (a shared model file
   * without its analyst's file).
   */
  jackknifeWithheld: boolean;
  /** Training rows by leaf, when the table is at hand (the forest range). */
  members: LeafMembers | null;
  /**
   * On the log scale, the shift that makes the estimate a median and the
   * smearing factor (estimate_center.ts); null on the raw scale, where the
   * estimate is the trees' mean.
   */
  center: EstimateCenter | null;
}

/**
 * Prepares readings of a regression ensemble.
 *
 * @param dataset The training table on the fitting scale. With
 * `withTable`, the range comes from quantile regression forest weights,
 * which need everyone's pay; otherwise from out-of-bag residuals grouped by
 * estimate and kept as a saved model keeps them (block means of at least
 * `privacyMin` residuals, default 5).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { fitEnsemble } from "./fit_ensemble.ts";
 * import { profileReader } from "./read_profile.ts";
 * const years = Array.from({ length: 200 }, (_, i) => i % 20);
 * const pay = years.map((y, i) => Math.log(40000 + 2000 * y + (i % 5) * 500));
 * const dataset = {
 *   rows: 200,
 *   features: [{ name: "years", kind: "numeric" as const, values: Float64Array.from(years) }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.from(pay) },
 * };
 * const ensemble = fitEnsemble(dataset, { trees: 30, prune: "none", grow: { minLeaf: 5 } });
 * const reader = profileReader(ensemble, dataset, "log");
 * // 200 rows: 4 groups of 50 residuals; 30 trees are fewer than one per row: no jackknife.
 * assert.equal(reader.groups.edges.length, 4);
 * assert.equal(reader.groups.edges[3], Infinity);
 * assert.equal(reader.trainingRows, 200);
 * assert.equal(reader.bag, null);
 * assert.equal(reader.members, null);
 * // On logs the centre is measured on every row with an out-of-bag estimate.
 * assert.equal(reader.center!.rows, ensemble.oobTrees.filter((n) => n > 0).length);
 * assert.equal(profileReader(ensemble, dataset, "raw").center, null);
 * assert.equal(profileReader(ensemble, dataset, "log", { withTable: true }).members!.rows.length, 30);
 * ```
 */
export function profileReader(
  ensemble: Ensemble,
  dataset: Dataset,
  scale: PayScale,
  options: { withTable?: boolean; privacyMin?: number } = {},
): ProfileReader {
  if (dataset.target.kind !== "regression" || ensemble.width !== 1) {
    throw new TypeError("profile readings need a regression ensemble");
  }
  const reader = readerFromParts({
    ensemble,
    scale,
    groups: summarizeResidualGroups(
      groupResiduals(ensemble.oob, dataset.target.values, residualGroupCount(dataset.rows)),
      options.privacyMin ?? 5,
    ),
    trainingRows: dataset.rows,
    resamples: ensemble.resamples,
    center: scale === "log" ? estimateCenter(ensemble.oob, dataset.target.values) : null,
  });
  if (options.withTable) reader.members = leafMembers(ensemble, dataset);
  return reader;
}

/**
 * How many groups of similar estimates the range uses: 10, fewer for small
 * tables so that each group keeps at least 50 rows (a 90% range from fewer
 * residuals rests on two or three people at each end).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { residualGroupCount } from "./read_profile.ts";
 * // floor(rows / 50), at least 1 and at most 10.
 * assert.deepEqual([20, 120, 499, 5000].map(residualGroupCount), [1, 2, 9, 10]);
 * ```
 */
export function residualGroupCount(rows: number): number {
  return Math.max(1, Math.min(10, Math.floor(rows / 50)));
}

/**
 * A reader from a saved model's parts (no table): the trees, the grouped
 * residual quantiles and the training row count, with the trees'
 * resampling states when the analyst's part is at hand (the jackknife
 * regenerates the in-bag counts from them when it is shown).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { readProfile } from "./read_profile.ts";
 * import { binFeatures } from "../tree/bins.ts";
 * import { growTree } from "../tree/grow_tree.ts";
 * import { readerFromParts } from "./read_profile.ts";
 * // Two trees split after x = 2: one says 10 or 30, the other 10 or 40.
 * const tree = (high: number) => {
 *   const dataset = {
 *     rows: 4,
 *     features: [{ name: "x", kind: "numeric" as const, values: Float64Array.of(1, 2, 3, 4) }],
 *     target: { kind: "regression" as const, name: "pay", values: Float64Array.of(10, 10, high, high) },
 *   };
 *   return growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
 * };
 * // One group of residuals -1, 0, 1 for every estimate.
 * const groups = { edges: Float64Array.of(Infinity), residuals: [Float64Array.of(-1, 0, 1)] };
 * const reader = readerFromParts({
 *   ensemble: { trees: [tree(30), tree(40)] },
 *   scale: "raw",
 *   groups,
 *   trainingRows: 10,
 *   resamples: null,
 * });
 * // Two trees for ten rows: no jackknife, and none withheld.
 * assert.equal(reader.bag, null);
 * assert.equal(reader.jackknifeWithheld, false);
 * assert.equal(reader.center, null);
 * // At x = 4 the trees say 30 and 40: estimate 35; coverage 0.5 reads the
 * // residuals' quantiles 0.25 and 0.75 (-0.5 and 0.5).
 * const reading = readProfile(reader, [4], 0.5);
 * assert.equal(reading.estimate, 35);
 * assert.deepEqual(reading.range, { low: 34.5, high: 35.5, coverage: 0.5 });
 * ```
 */
export function readerFromParts(parts: {
  ensemble: Pick<Ensemble, "trees">;
  scale: PayScale;
  groups: ResidualGroups;
  trainingRows: number;
  resamples: Int32Array | null;
  center?: EstimateCenter | null;
}): ProfileReader {
  const rows = parts.trainingRows;
  // Readings need only the trees; a saved model keeps no out-of-bag
  // predictions.
  const ensemble: Ensemble = {
    trees: parts.ensemble.trees,
    resamples: parts.resamples ?? new Int32Array(0),
    width: 1,
    alphas: new Float64Array(parts.ensemble.trees.length),
    oob: new Float64Array(0),
    oobTrees: new Int32Array(0),
  };
  const jackknife = ensemble.trees.length >= DEFAULT_HOW_SURE.jackknifeFromTreesPerRow * rows;
  const canRegenerate = parts.resamples !== null &&
    parts.resamples.length === ensemble.trees.length * STATE_WORDS;
  return {
    ensemble,
    scale: parts.scale,
    groups: parts.groups,
    trainingRows: rows,
    bag: jackknife && canRegenerate ? inBagCounts(ensemble, rows) : null,
    jackknifeWithheld: jackknife && !canRegenerate,
    members: null,
    center: parts.scale === "log" ? parts.center ?? null : null,
  };
}

/** What the model says about one profile, in money. */
export interface ProfileReading {
  /**
   * The estimate: on the log scale exp(trees' mean + the center's shift),
   * the median pay of comparable people; on the raw scale the trees' mean.
   */
  estimate: number;
  /**
   * How sure the estimate is: the percentile interval of the trees'
   * estimates (it measures how much one tree moves between resamples).
   */
  howSure: Interval;
  /**
   * The infinitesimal jackknife interval (estimate +/- z SE on the fitting
   * scale) and SE, where there are enough trees per row for it; else null.
   */
  jackknife: { se: number; interval: Interval } | null;
  /** The range comparable people's pay falls in. */
  range: Interval;
  /** How the range was made. */
  rangeMethod: "grouped-residuals" | "quantile-forest";
  /** Every tree's estimate in money (shifted as the estimate is), in tree order. */
  trees: Float64Array;
  /** The trees' estimates on the fitting scale (not shifted). */
  fitted: Float64Array;
}

/**
 * Reads one profile.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { fitEnsemble, profileReader, readProfile } from "../../mod.ts";
 * const years = Array.from({ length: 200 }, (_, i) => i % 20);
 * const pay = years.map((y, i) => Math.log(40000 + 2000 * y + (i % 5) * 500));
 * const dataset = {
 *   rows: 200,
 *   features: [{ name: "years", kind: "numeric" as const, values: Float64Array.from(years) }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.from(pay) },
 * };
 * const ensemble = fitEnsemble(dataset, { trees: 30, prune: "none", grow: { minLeaf: 5 } });
 * const reading = readProfile(profileReader(ensemble, dataset, "log"), [10], 0.9);
 * assert(reading.estimate > 59000 && reading.estimate < 63000);
 * assert(reading.range.low < reading.estimate && reading.estimate < reading.range.high);
 * ```
 */
export function readProfile(
  reader: ProfileReader,
  profile: ArrayLike<number>,
  coverage = 0.9,
): ProfileReading {
  const { ensemble, scale } = reader;
  // The estimate, its "how sure" interval and the trees move by the shift;
  // the range does not: its residuals were measured from the unshifted
  // estimate, so it keeps its measured coverage.
  const shift = reader.center?.shift ?? 0;
  const money = (v: number) => toMoney(v + shift, scale);
  const fitted = treeEstimates(ensemble, profile);
  const center = mean(fitted);
  const spread = percentileInterval(fitted, coverage);
  let jackknife: ProfileReading["jackknife"] = null;
  if (reader.bag !== null) {
    const ij = infinitesimalJackknife(ensemble, reader.trainingRows, profile, reader.bag);
    const z = zOf(coverage);
    jackknife = {
      se: ij.se,
      interval: {
        low: money(center - z * ij.se),
        high: money(center + z * ij.se),
        coverage,
      },
    };
  }
  const range = reader.members !== null
    ? quantileForestRange(ensemble, reader.members, profile, coverage)
    : groupedRange(rangeCenter(fitted), reader.groups, coverage);
  return {
    estimate: money(center),
    howSure: { low: money(spread.low), high: money(spread.high), coverage },
    jackknife,
    range: { low: toMoney(range.low, scale), high: toMoney(range.high, scale), coverage },
    rangeMethod: reader.members !== null ? "quantile-forest" : "grouped-residuals",
    trees: fitted.map(money),
    fitted,
  };
}

// Where a profile's grouped range is centred (fitting scale): one place, so
// that the range and the shares read from it cannot drift apart.
function rangeCenter(fitted: Float64Array): number {
  return mean(fitted);
}

/**
 * The share of comparable people paid less than `amount` (money), read
 * from the same residual quantiles as the profile's range
 * ({@linkcode groupedShareBelow}): the range's ends sit at (1 - coverage) / 2
 * and (1 + coverage) / 2. An amount of zero or less on the log scale has no
 * one paid less (0).
 *
 * @throws {TypeError} for a reader whose range comes from quantile forest
 * weights (a table at hand), which this share does not read.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { fitEnsemble, profileReader, rangeShareBelow, readProfile } from "../../mod.ts";
 * const years = Array.from({ length: 200 }, (_, i) => i % 20);
 * const pay = years.map((y, i) => Math.log(40000 + 2000 * y + (i % 5) * 500));
 * const dataset = {
 *   rows: 200,
 *   features: [{ name: "years", kind: "numeric" as const, values: Float64Array.from(years) }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.from(pay) },
 * };
 * const ensemble = fitEnsemble(dataset, { trees: 30, prune: "none", grow: { minLeaf: 5 } });
 * const reader = profileReader(ensemble, dataset, "log");
 * const { range } = readProfile(reader, [10], 0.8);
 * assert(Math.abs(rangeShareBelow(reader, [10], range.low, 0.8) - 0.1) < 1e-9);
 * assert(Math.abs(rangeShareBelow(reader, [10], range.high, 0.8) - 0.9) < 1e-9);
 * ```
 */
export function rangeShareBelow(
  reader: ProfileReader,
  profile: ArrayLike<number>,
  amount: number,
  coverage = 0.9,
): number {
  if (reader.members !== null) {
    throw new TypeError("rangeShareBelow reads grouped residual ranges, not forest weights");
  }
  if (reader.scale === "log" && !(amount > 0)) return 0;
  const center = rangeCenter(treeEstimates(reader.ensemble, profile));
  const value = toFitScale([amount], reader.scale, "amount")[0];
  return groupedShareBelow(center, reader.groups, value, coverage);
}

/** A what-if: base and changed readings with the paired change between them. */
export interface WhatIf {
  /** The base profile's reading. */
  base: ProfileReading;
  /** The changed profile's reading. */
  changed: ProfileReading;
  /**
   * The change in money (changed estimate minus base estimate) with the
   * percentile interval of the trees' paired changes in money.
   */
  difference: Interval & { estimate: number };
  /**
   * The change as a share of the base (0.1 = +10%), with the percentile
   * interval of the trees' paired relative changes; on the log scale
   * exp(percentiles of the per-tree log changes) - 1.
   */
  relative: Interval & { estimate: number };
}

/**
 * Base vs changed profile, with the per-tree paired differences: each tree
 * estimates both, so their shared errors cancel and the interval of the
 * change is far narrower than the two profiles' intervals suggest.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { compareProfiles } from "./read_profile.ts";
 * import { binFeatures } from "../tree/bins.ts";
 * import { growTree } from "../tree/grow_tree.ts";
 * import { readerFromParts } from "./read_profile.ts";
 * // Two trees split after x = 2: one says 10 or 30, the other 10 or 40.
 * const tree = (high: number) => {
 *   const dataset = {
 *     rows: 4,
 *     features: [{ name: "x", kind: "numeric" as const, values: Float64Array.of(1, 2, 3, 4) }],
 *     target: { kind: "regression" as const, name: "pay", values: Float64Array.of(10, 10, high, high) },
 *   };
 *   return growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
 * };
 * // One group of residuals -1, 0, 1 for every estimate.
 * const groups = { edges: Float64Array.of(Infinity), residuals: [Float64Array.of(-1, 0, 1)] };
 * const reader = readerFromParts({
 *   ensemble: { trees: [tree(30), tree(40)] },
 *   scale: "raw",
 *   groups,
 *   trainingRows: 10,
 *   resamples: null,
 * });
 * // From x = 1 (10 and 10) to x = 4 (30 and 40): the trees' changes are 20
 * // and 30, their quantiles 0.25 and 0.75 22.5 and 27.5; the estimate
 * // moves from 10 to 35.
 * const whatIf = compareProfiles(reader, [1], [4], 0.5);
 * assert.deepEqual(whatIf.difference, { estimate: 25, low: 22.5, high: 27.5, coverage: 0.5 });
 * // Relative: 35 / 10 - 1 = 2.5; per tree 2 and 3, quantiles 2.25 and 2.75.
 * assert.deepEqual(whatIf.relative, { estimate: 2.5, low: 2.25, high: 2.75, coverage: 0.5 });
 * assert.equal(whatIf.base.estimate, 10);
 * ```
 */
export function compareProfiles(
  reader: ProfileReader,
  base: ArrayLike<number>,
  changed: ArrayLike<number>,
  coverage = 0.9,
): WhatIf {
  const a = readProfile(reader, base, coverage);
  const b = readProfile(reader, changed, coverage);
  const money = b.trees.map((v, t) => v - a.trees[t]);
  let relative: WhatIf["relative"];
  if (reader.scale === "log") {
    // exp of the percentiles of the per-tree log changes, minus 1.
    const logChange = percentileInterval(b.fitted.map((v, t) => v - a.fitted[t]), coverage);
    relative = {
      estimate: Math.expm1(mean(b.fitted) - mean(a.fitted)),
      low: Math.expm1(logChange.low),
      high: Math.expm1(logChange.high),
      coverage,
    };
  } else {
    const ratio = b.trees.map((v, t) => v / a.trees[t] - 1);
    relative = { estimate: b.estimate / a.estimate - 1, ...percentileInterval(ratio, coverage) };
  }
  return {
    base: a,
    changed: b,
    difference: { estimate: b.estimate - a.estimate, ...percentileInterval(money, coverage) },
    relative,
  };
}
