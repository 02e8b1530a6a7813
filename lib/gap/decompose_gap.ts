/**
 * The raw gap in mean log pay between a group and the reference group,
 * split into the part each attribute explains, the part no attribute
 * explains, and the rest.
 *
 * One ensemble is fitted on everyone compared with the group among its
 * attributes (a pooled model with a group indicator: Fortin 2008, Jann 2008;
 * without the indicator, attributes that go with the group would be
 * credited with part of a group effect, Neumark 1988). Call h_R(x) and
 * h_G(x) its estimates for a person's attributes x with the group held at
 * the reference R or at the group G (lib/tree/fix_attribute.ts), each person
 * read by the trees that did not draw them (out of bag). With w the
 * reference's share of the two groups' people, N their number:
 *
 * - explained, attribute j: w (mean_R phi_j^G - mean_G phi_j^G) +
 *   (1 - w) (mean_R phi_j^R - mean_G phi_j^R), where phi_j^G are the exact
 *   tree contributions (lib/tree/contributions.ts) of h_G, whose trees no
 *   longer split on the group and whose covers count every person: the
 *   difference of the two groups' mean contributions of j;
 * - unexplained: the mean over the N people of the difference the group
 *   makes, h_R(x) - h_G(x), plus the trees' shrinkage of it put back: each
 *   person's out-of-bag residual weighted by the inverse chance of their
 *   group given the attributes (augmented inverse-probability weighting,
 *   Robins, Rotnitzky & Zhao 1994; out-of-bag estimates standing in for
 *   cross-fitting as in Chernozhukov et al. 2018), with a normal interval
 *   from the scores' spread;
 * - the rest: the raw gap less both.
 *
 * In the linear case (log pay = x b + g c + noise) the explained parts are
 * b_j (mean_R x_j - mean_G x_j) and the unexplained part c: the
 * Oaxaca (1973) / Blinder (1973) decomposition with pooled coefficients.
 *
 * Why the correction: trees that see a small group effect among larger ones
 * often put people of both groups in one leaf, so h_R - h_G alone comes out
 * short of the effect (on the planted tables of the tests, 0.046 for 0.06)
 * and the residuals keep the difference. The chance of the group is
 * estimated by a classification ensemble with larger leaves
 * ({@linkcode PROPENSITY_MIN_LEAF}), since a noisy chance inflates 1/chance.
 *
 * @module
 */

import type { Dataset, Feature } from "../dataset/types.ts";
import { fitDefaultEnsemble } from "../ensemble/fit_default.ts";
import type { Ensemble } from "../ensemble/fit_ensemble.ts";
import { ContributionReader } from "../ensemble/contributions.ts";
import { inBagCounts, mean } from "../ensemble/intervals.ts";
import normalQuantile from "@stdlib/stats-base-dists-normal-quantile";
import { makeRng, randomBelow, type Rng, shuffle } from "../random.ts";
import { applyValues, type FlatTree } from "../tree/flat_tree.ts";
import { fixAttribute } from "../tree/fix_attribute.ts";
import { shareTree } from "../tree/share_tree.ts";

/** What {@linkcode decomposeGap} needs. */
export interface DecomposeInput {
  /** The legitimate factors and log pay, one row per person compared. */
  dataset: Dataset;
  /** The group column's name (the indicator's name in the pooled model). */
  group: string;
  /** Every group compared, the reference first. */
  groups: string[];
  /** Each person's group as its index in `groups`. */
  groupCode: Int32Array;
  /** Trees in each ensemble. @default {200} */
  trees?: number;
  /** Fewest people in a leaf of the pay model. @default {5} */
  minLeaf?: number;
  /** Seed of the resamples and of the people sampled. @default {1} */
  seed?: number;
  /** Workers. */
  workers?: number;
  /** Confidence level of the unexplained part's interval. @default {0.95} */
  confidence?: number;
  /** Fewest people in a leaf of the group-chance ensemble. @default {PROPENSITY_MIN_LEAF} */
  chanceMinLeaf?: number;
  /** Most people of each group whose contributions are worked out. @default {2000} */
  sampleCap?: number;
  /**
   * Out-of-bag trees, drawn per person, whose contributions are averaged
   * (contributions of deep trees cost about 0.14 ms a tree on CPS1988; the
   * draws differ from person to person, so their noise averages out over
   * the group). @default {10}
   */
  contributionTrees?: number;
  /** How the pooled model's trees are pruned (as `fitDefaultEnsemble`). @default {"none"} */
  prune?: "none" | "alpha-min";
  /** Progress of the two fits. */
  onProgress?: (stage: "pooled model" | "group chances", done: number, total: number) => void;
}

/** One group's gap against the reference, decomposed (log points; positive: the group earns less). */
export interface GapDecomposition {
  /** The group. */
  group: string;
  /** People of the reference group and of the group with an out-of-bag estimate. */
  people: { reference: number; group: number };
  /** Mean log pay of the reference less that of the group. */
  rawLog: number;
  /**
   * The same as a share: 1 - exp(-rawLog), how much lower the group's
   * geometric mean pay is than the reference's (the Directive's gap compares
   * arithmetic means).
   */
  geometricGap: number;
  /** Each attribute's explained part, in the dataset's feature order. */
  explained: { attribute: string; part: number }[];
  /** The explained parts' sum. */
  explainedTotal: number;
  /** The part no attribute explains: the group indicator's, corrected. */
  unexplained: {
    /** The estimate. */
    value: number;
    /** Its standard error. */
    se: number;
    /** Low end of the interval. */
    low: number;
    /** High end. */
    high: number;
    /** The group's difference in the pooled model before the correction. */
    plugIn: number;
  };
  /** rawLog less the explained parts and the unexplained part. */
  rest: number;
  /** Mean out-of-bag residual (log pay less its estimate) of the reference less the group's. */
  residualDifference: number;
  /**
   * People whose contributions were worked out, per group (all of them up
   * to `sampleCap`; beyond, a seeded sample of that many).
   */
  sampled: { reference: number; group: number };
  /** People whose chance of their group was held to [CHANCE_FLOOR, 1 - CHANCE_FLOOR]. */
  clippedChances: number;
}

/** Everything {@linkcode decomposeGap} returns. */
export interface GapDecompositionReport {
  /** Per group compared, its decomposition. */
  groups: GapDecomposition[];
  /** Confidence level of the intervals. */
  confidence: number;
  /** Trees per ensemble. */
  trees: number;
  /** Fewest people in a leaf of the group-chance ensemble. */
  chanceMinLeaf: number;
}

/**
 * Fewest people in a leaf of the ensemble that estimates each person's
 * chance of their group. On 20 planted tables (2,000 people, effect 0.06;
 * bench/gap_decomposition.ts, bench/results/gap_decomposition.md), leaves of
 * 5 gave unexplained parts averaging 0.0675 (sd 0.011 over the tables), leaves
 * of 25 0.0606 (sd 0.006), leaves of 60 0.0598 (sd 0.006); each interval held
 * 0.06 in 18 of 20. Noisy chances inflate 1 / chance; beyond 25 nothing
 * changed, and smaller leaves follow a group that clusters sharply.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { PROPENSITY_MIN_LEAF } from "./decompose_gap.ts";
 * assert.equal(PROPENSITY_MIN_LEAF, 25);
 * ```
 */
export const PROPENSITY_MIN_LEAF = 25;

/**
 * A chance of one's group below this (or above 1 less it) is held at it, so
 * that no single person's residual is weighted more than 1 / CHANCE_FLOOR.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { CHANCE_FLOOR } from "./decompose_gap.ts";
 * assert(1 / CHANCE_FLOOR <= 100);
 * ```
 */
export const CHANCE_FLOOR = 0.01;

/**
 * Decomposes each compared group's raw gap in mean log pay against the
 * reference (the module's documentation says how).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { decomposeGap } from "./decompose_gap.ts";
 * // Log pay 10 + 0.2 level, 0.1 less for group B, who sit lower.
 * const n = 300;
 * const level = Float64Array.from({ length: n }, (_, i) => i % 3);
 * const groupCode = Int32Array.from({ length: n }, (_, i) => (i % 3 === 0 ? i % 4 !== 0 : i % 4 === 0) ? 1 : 0);
 * const pay = Float64Array.from(level, (l, i) => 10 + 0.2 * l - 0.1 * groupCode[i] + 0.01 * ((i * 37) % 7 - 3));
 * const report = await decomposeGap({
 *   dataset: { rows: n, features: [{ name: "level", kind: "numeric", values: level }], target: { kind: "regression", name: "pay", values: pay } },
 *   group: "group", groups: ["A", "B"], groupCode, trees: 30, workers: 1,
 * });
 * const [b] = report.groups;
 * // The parts add up to the raw gap; the level explains most of it.
 * assert(Math.abs(b.explainedTotal + b.unexplained.value + b.rest - b.rawLog) < 1e-12);
 * assert(b.explained[0].part > 0.05 && Math.abs(b.unexplained.value - 0.1) < 0.03);
 * ```
 */
export async function decomposeGap(input: DecomposeInput): Promise<GapDecompositionReport> {
  const trees = input.trees ?? 200;
  const seed = input.seed ?? 1;
  const confidence = input.confidence ?? 0.95;
  const cap = input.sampleCap ?? 2000;
  const { dataset, groupCode, groups } = input;
  const n = dataset.rows;
  const y = dataset.target.values as Float64Array;
  const g = dataset.features.length; // the indicator's index
  const indicator: Feature = {
    name: input.group,
    kind: "categorical",
    levels: groups,
    values: Float64Array.from(groupCode),
  };
  const pooled: Dataset = { ...dataset, features: [...dataset.features, indicator] };
  const pay = (await fitDefaultEnsemble(pooled, {
    trees,
    seed,
    prune: input.prune ?? "none",
    grow: { minLeaf: Math.max(input.minLeaf ?? 5, 1) },
    workers: input.workers,
    onProgress: (done, total) => input.onProgress?.("pooled model", done, total),
  })).ensemble!;
  const chanceMinLeaf = input.chanceMinLeaf ?? Math.max(PROPENSITY_MIN_LEAF, input.minLeaf ?? 5);
  const chances = (await fitDefaultEnsemble({
    rows: n,
    features: dataset.features,
    target: { kind: "classification", name: input.group, classes: groups, values: groupCode },
  }, {
    trees,
    seed: seed + 1,
    prune: "none",
    grow: { minLeaf: chanceMinLeaf },
    workers: input.workers,
    onProgress: (done, total) => input.onProgress?.("group chances", done, total),
  })).ensemble!;

  const reading = new OutOfBagReading(pay, pooled, g);
  const held = groups.map((_, code) => reading.heldAt(code));
  const out: GapDecomposition[] = [];
  for (let code = 1; code < groups.length; code++) {
    out.push(decomposeOne(reading, held[0], held[code], {
      y,
      groupCode,
      code,
      name: groups[code],
      chances,
      width: groups.length,
      z: normalQuantile(1 - (1 - confidence) / 2, 0, 1),
      cap,
      seed,
      treesEach: input.contributionTrees ?? 10,
      features: dataset.features.map((f) => f.name),
    }));
  }
  return { groups: out, confidence, trees, chanceMinLeaf };
}

/** The pooled ensemble's trees read out of bag, and held at a group. */
class OutOfBagReading {
  readonly rows: number;
  /** Per row, the trees that did not draw it. */
  readonly oob: Int32Array[];
  readonly #pooled: Dataset;
  readonly #ensemble: Ensemble;
  readonly #indicator: number;

  constructor(ensemble: Ensemble, pooled: Dataset, indicator: number) {
    this.rows = pooled.rows;
    this.#pooled = pooled;
    this.#ensemble = ensemble;
    this.#indicator = indicator;
    const bag = inBagCounts(ensemble, pooled.rows);
    const count = ensemble.trees.length;
    this.oob = Array.from({ length: pooled.rows }, (_, r) => {
      const list: number[] = [];
      for (let b = 0; b < count; b++) if (bag.counts[b * pooled.rows + r] === 0) list.push(b);
      return Int32Array.from(list);
    });
  }

  /** The profile of row `r` (the indicator's value is never read by held trees). */
  profile(r: number, into: Float64Array): Float64Array {
    const features = this.#pooled.features;
    for (let j = 0; j < features.length; j++) into[j] = features[j].values[r];
    return into;
  }

  /** The trees held at group `code`, with covers of every person, and their reader. */
  heldAt(code: number): { trees: FlatTree[]; reader: ContributionReader } {
    const trees = this.#ensemble.trees.map((tree) =>
      shareTree(fixAttribute(tree, this.#indicator, code), this.#pooled.features, this.rows)
    );
    return { trees, reader: new ContributionReader(trees, this.#pooled.features.length) };
  }
}

interface OneGroup {
  y: Float64Array;
  groupCode: Int32Array;
  code: number;
  name: string;
  chances: Ensemble;
  width: number;
  z: number;
  cap: number;
  seed: number;
  treesEach: number;
  features: string[];
}

function decomposeOne(
  reading: OutOfBagReading,
  asReference: { trees: FlatTree[]; reader: ContributionReader },
  asGroup: { trees: FlatTree[]; reader: ContributionReader },
  one: OneGroup,
): GapDecomposition {
  const { y, groupCode, code, chances, width } = one;
  const overTrees = (trees: FlatTree[], x: Float64Array, only: Int32Array) => {
    let sum = 0;
    for (let i = 0; i < only.length; i++) {
      const tree = trees[only[i]];
      sum += tree.value[applyValues(tree, x)];
    }
    return sum / only.length;
  };
  const x = new Float64Array(one.features.length + 1);
  const rowsOf: [number[], number[]] = [[], []];
  for (let r = 0; r < reading.rows; r++) {
    if (reading.oob[r].length === 0) continue;
    if (groupCode[r] === 0) rowsOf[0].push(r);
    else if (groupCode[r] === code) rowsOf[1].push(r);
  }
  const total = rowsOf[0].length + rowsOf[1].length;
  const w = rowsOf[0].length / total;

  // Everyone: the group's difference, the residuals, the corrected scores.
  let clipped = 0;
  const score = new Float64Array(total);
  const sums = [{ y: 0, fit: 0, diff: 0 }, { y: 0, fit: 0, diff: 0 }];
  let k = 0;
  for (const side of [0, 1] as const) {
    for (const r of rowsOf[side]) {
      reading.profile(r, x);
      const only = reading.oob[r];
      const atReference = overTrees(asReference.trees, x, only);
      const atGroup = overTrees(asGroup.trees, x, only);
      const fit = side === 0 ? atReference : atGroup;
      const s = sums[side];
      s.y += y[r];
      s.fit += fit;
      s.diff += atReference - atGroup;
      let chance = referenceChance(chances, r, width, code, w);
      if (chance < CHANCE_FLOOR || chance > 1 - CHANCE_FLOOR) {
        chance = Math.min(1 - CHANCE_FLOOR, Math.max(CHANCE_FLOOR, chance));
        clipped++;
      }
      const residual = y[r] - fit;
      score[k++] = atReference - atGroup +
        (side === 0 ? residual / chance : -residual / (1 - chance));
    }
  }
  const [nR, nG] = [rowsOf[0].length, rowsOf[1].length];
  const rawLog = sums[0].y / nR - sums[1].y / nG;
  const plugIn = (sums[0].diff + sums[1].diff) / total;
  const value = mean(score);
  let spread = 0;
  for (const s of score) spread += (s - value) ** 2;
  const se = Math.sqrt(spread / (total - 1) / total);

  // A sample of each group: the contributions of the two held models.
  const rng = makeRng(one.seed);
  const sample = rowsOf.map((rows) => {
    if (rows.length <= one.cap) return rows;
    const copy = [...rows];
    shuffle(copy, rng);
    return copy.slice(0, one.cap);
  });
  const explained = new Float64Array(one.features.length);
  for (const side of [0, 1] as const) {
    const sign = side === 0 ? 1 : -1;
    const rows = sample[side];
    for (const r of rows) {
      reading.profile(r, x);
      const only = someOf(reading.oob[r], one.treesEach, rng);
      const ofGroup = asGroup.reader.profile(x, only).parts;
      const ofReference = asReference.reader.profile(x, only).parts;
      for (let j = 0; j < explained.length; j++) {
        explained[j] += sign * (w * ofGroup[j] + (1 - w) * ofReference[j]) / rows.length;
      }
    }
  }
  const explainedTotal = explained.reduce((a, b) => a + b, 0);
  return {
    group: one.name,
    people: { reference: nR, group: nG },
    rawLog,
    geometricGap: 1 - Math.exp(-rawLog),
    explained: one.features.map((attribute, j) => ({ attribute, part: explained[j] })),
    explainedTotal,
    unexplained: {
      value,
      se,
      low: value - one.z * se,
      high: value + one.z * se,
      plugIn,
    },
    rest: rawLog - explainedTotal - value,
    residualDifference: (sums[0].y - sums[0].fit) / nR - (sums[1].y - sums[1].fit) / nG,
    sampled: { reference: sample[0].length, group: sample[1].length },
    clippedChances: clipped,
  };
}

// The chance of the reference group among the two compared, out of bag
// (the share of the two where no tree left the person out).
function referenceChance(
  chances: Ensemble,
  r: number,
  width: number,
  code: number,
  share: number,
): number {
  if (chances.oobTrees[r] === 0) return share;
  const p0 = chances.oob[r * width];
  const p1 = chances.oob[r * width + code];
  return p0 + p1 > 0 ? p0 / (p0 + p1) : share;
}

// `count` of the trees, drawn without replacement (all when there are no more).
function someOf(trees: Int32Array, count: number, rng: Rng): Int32Array {
  if (trees.length <= count) return trees;
  const copy = Int32Array.from(trees);
  for (let i = 0; i < count; i++) {
    const j = i + randomBelow(rng, copy.length - i);
    const t = copy[i];
    copy[i] = copy[j];
    copy[j] = t;
  }
  return copy.subarray(0, count);
}
