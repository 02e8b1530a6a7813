/**
 * One profile's answer: the estimate with how sure it is, the range for
 * comparable people, the decision path (merged and step by step), the
 * support behind it and what is unusual about it; class shares for a class
 * model. Plain data, every amount in money.
 *
 * @module
 */

import { percentileInterval } from "../ensemble/intervals.ts";
import { toMoney } from "../ensemble/pay_scale.ts";
import { type ProfileReader, type ProfileReading, readProfile } from "../ensemble/read_profile.ts";
import { classVotes } from "../ensemble/class_votes.ts";
import { applyValues } from "../tree/flat_tree.ts";
import { explainPath } from "../tree/explain.ts";
import { mergePath, type PathCondition } from "../tree/merge_path.ts";
import { describeProfile, type Profile, type ProfileWarning, rangeWarnings } from "./profile.ts";
import { type AnswerNote, distinctNotes, type SupportReason } from "./answer_notes.ts";
import type { Model, Provenance } from "./types.ts";
import type { OfferAnswer } from "./offer.ts";
import { checkCoverage, type ModelSession } from "./model_session.ts";
import { type ContributionsAnswer, contributionsOf } from "./contributions_answer.ts";

/** An interval with its coverage and how it was made. */
export interface NamedInterval {
  /** Nominal coverage, e.g. 0.9. */
  coverage: number;
  /** Lower end (money). */
  low: number;
  /** Upper end (money). */
  high: number;
  /** The method, in words. */
  method: string;
}

/**
 * One condition of the reference tree's decision path: every split on one
 * attribute merged into what they mean together (`level G2 to G4`).
 */
export type PathAnswer = Omit<PathCondition, "profileMissing" | "node" | "value"> & {
  /** Typical pay of the node reached (money; null for fewer rows than the privacy minimum). */
  value: number | null;
};

/** One split of the reference tree's decision path, as the tree tests it. */
export interface PathSplitAnswer {
  /** Its number along the path (1-based). */
  step: number;
  /** The feature tested. */
  feature: string;
  /** The condition the profile met at this split. */
  condition: string;
  /** Training rows in the node reached. */
  rows: number;
  /** Typical pay of the node reached (money; null for fewer rows than the privacy minimum). */
  value: number | null;
}

/** How much the training data supports a profile. */
export interface SupportAnswer {
  /** Training rows in the reference tree's leaf. */
  rows: number;
  /** Training rows that share the profile's levels of the two most important level features. */
  peers: { features: string[]; levels: string[]; rows: number } | null;
  /** Whether the profile is unusual for the data. */
  unusual: boolean;
  /** Why, as notes ({@linkcode SupportReason}). */
  reasons: SupportReason[];
}

/** The answer for one profile (the estimate command's JSON document). */
export interface EstimateAnswer {
  /** The profile in words. */
  profile: Record<string, string | number | null>;
  /** The target and its unit. */
  target: { name: string; scale: string; currency: string | null; period: string | null };
  /**
   * The estimate in money (regression): the ensemble's, or the reference
   * tree's leaf without an ensemble. Classification: the likeliest class's share.
   */
  estimate: number;
  /** Classification: the likeliest class and every class's share. */
  classes?: {
    predicted: string;
    shares: Record<string, number>;
    /** Per class, the percentile interval of the trees' leaf shares (null without an ensemble). */
    intervals: Record<string, { low: number; high: number }> | null;
  };
  /**
   * What the estimate is (regression; null for a class): `median`, the
   * median pay of comparable people (log scale with the measured shift);
   * `geometric-mean`, exp of a mean of log pay (the reference tree's leaf,
   * or a model written before the shift); `mean` (raw scale). With
   * `meanOverEstimate`, mean pay of people like this over the estimate
   * (Duan's smearing factor over the shift), where it is measured, and
   * `meanPay`, the estimate times it.
   */
  center: {
    kind: "median" | "geometric-mean" | "mean";
    shift: number;
    meanOverEstimate: number | null;
    meanPay: number | null;
  } | null;
  /**
   * The reference tree's own estimate: its leaf's mean on the fitting scale
   * in money (a geometric mean on the log scale, not shifted).
   */
  referenceTree: number;
  /** How sure the estimate is (null without an ensemble). */
  confidence: NamedInterval | null;
  /** The jackknife's interval and standard error (fitting scale), where shown. */
  jackknife: (NamedInterval & { se: number }) | null;
  /**
   * True where the model has enough trees per row for the jackknife but it
   * cannot be computed: it needs the trees' in-bag rows, which only the
   * analyst's file holds.
   */
  jackknifeNeedsAnalystFile: boolean;
  /** The range comparable people's pay falls in (null without an ensemble). */
  range: NamedInterval | null;
  /** The reference tree's decision path, one merged condition per attribute. */
  path: PathAnswer[];
  /** The same path split by split (an attribute may be tested more than once). */
  pathSplits: PathSplitAnswer[];
  /** The leaf the path ends in. */
  leaf: { rows: number; value: number | null };
  /** Support. */
  support: SupportAnswer;
  /** Each tree's estimate (money), for the chart. */
  trees: number[];
  /**
   * Each attribute's part of the estimate ({@linkcode contributionsOf}; null
   * for a class model, or when not asked for).
   */
  contributions: ContributionsAnswer | null;
  /** What to bear in mind about the estimate ({@linkcode AnswerNote}). */
  warnings: AnswerNote[];
  /** With an offer: where it sits ({@linkcode checkOffer}). */
  offer?: OfferAnswer;
  /** Where it came from. */
  provenance: Provenance;
}

const CONFIDENCE_METHOD = "percentile interval of the trees' estimates (how much one tree's " +
  "estimate moves between resamples)";
const JACKKNIFE_METHOD = "bias-corrected infinitesimal jackknife (Wager, Hastie & Efron 2014); " +
  "leaves the model's bias out";
const RANGE_METHOD = "out-of-bag residual quantiles of people with similar estimates";

/**
 * The answer for one profile.
 *
 * @param extraWarnings Warnings from building the profile (e.g. `--set`).
 * @param withParts Whether to work out each attribute's part (a few
 * milliseconds over 200 trees; a sweep's points leave them out).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { applyValues } from "../tree/flat_tree.ts";
 * import { estimateProfile } from "./estimate_answer.ts";
 * import { openModel } from "./model_session.ts";
 * import { typicalProfile } from "./profile.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 200, seed: 4 }), { target: "base_pay_eur" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 6, folds: 5, workers: 1 });
 * // On the log scale the estimate is exp(the trees' mean leaf value + the measured shift).
 * const estimateOf = (p: Float64Array) => {
 *   const logs = model.ensemble!.trees.map((t) => t.value[applyValues(t, p)]);
 *   return Math.exp(logs.reduce((a, b) => a + b) / logs.length + model.target.center!.shift);
 * };
 * const near = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.abs(b);
 * const profile = typicalProfile(model);
 * const answer = estimateProfile(openModel(model), profile, 0.9);
 * assert(near(answer.estimate, estimateOf(profile)));
 * assert.equal(answer.trees.length, 6);
 * // The reference tree's own figure: its leaf's geometric mean, not shifted.
 * const tree = model.reference.tree;
 * const leaf = applyValues(tree, profile);
 * assert(near(answer.referenceTree, Math.exp(tree.value[leaf])));
 * assert.equal(answer.leaf.rows, tree.rows[leaf]);
 * const level = model.features.findIndex((f) => f.name === "level");
 * assert.equal(answer.profile.level, model.features[level].levels![profile[level]]);
 * assert(answer.range!.low < answer.estimate && answer.estimate < answer.range!.high);
 * assert.equal(answer.range!.coverage, 0.9);
 * ```
 */
export function estimateProfile(
  session: ModelSession,
  profile: Profile,
  coverage = 0.9,
  extraWarnings: ProfileWarning[] = [],
  withParts = true,
): EstimateAnswer {
  checkCoverage(coverage);
  const { model, reader } = session;
  const scale = model.target.scale;
  const privacy = model.settings.privacyMin;
  const tree = model.reference.tree;
  const classes = model.target.classes;
  const steps = explainPath(tree, model.features, profile, classes);
  const shown = (rows: number, value: number) =>
    rows >= privacy ? (model.target.kind === "regression" ? toMoney(value, scale) : value) : null;
  const pathSplits = steps.map((s, i) => ({
    step: i + 1,
    feature: s.feature,
    condition: s.condition,
    rows: s.rows,
    value: shown(s.rows, s.value),
  }));
  const path = mergePath(tree, model.features, profile, classes).map((c) => ({
    feature: c.feature,
    kind: c.kind,
    condition: c.condition,
    above: c.above,
    atMost: c.atMost,
    levels: c.levels,
    missing: c.missing,
    known: c.known,
    steps: c.steps,
    rows: c.rows,
    value: shown(c.rows, c.value),
  }));
  const leafNode = applyValues(tree, profile);
  const leafRows = tree.rows[leafNode];
  const warnings: AnswerNote[] = distinctNotes([
    ...extraWarnings,
    ...rangeWarnings(model, profile),
  ]);
  const support = profileSupport(model, profile, leafRows);
  if (support.unusual) warnings.push({ kind: "unusualProfile", reasons: support.reasons });
  const base = {
    profile: describeProfile(model, profile),
    target: {
      name: model.target.name,
      scale,
      currency: model.target.money?.currency ?? null,
      period: model.target.money?.period ?? null,
    },
    path,
    pathSplits,
    leaf: { rows: leafRows, value: shown(leafRows, tree.value[leafNode * tree.width]) },
    support,
    provenance: model.provenance,
  };
  if (model.target.kind === "classification") {
    const width = tree.width;
    const { shares, perTree, best } = classVotes(model.ensemble?.trees ?? [tree], profile);
    if (model.ensemble === null) warnings.push({ kind: "noEnsemble" });
    return {
      ...base,
      estimate: shares[best],
      classes: {
        predicted: classes![best],
        shares: Object.fromEntries(classes!.map((name, c) => [name, shares[c]])),
        intervals: model.ensemble === null ? null : Object.fromEntries(
          classes!.map((name, c) => {
            const { low, high } = percentileInterval(perTree[c], coverage);
            return [name, { low, high }];
          }),
        ),
      },
      referenceTree: tree.value[leafNode * width + best],
      center: null,
      contributions: null,
      ...NO_INTERVALS,
      warnings,
    };
  }
  const referenceTree = toMoney(tree.value[leafNode], scale);
  if (reader === null) {
    warnings.push({ kind: "noEnsemble" });
    return {
      ...base,
      estimate: referenceTree,
      referenceTree,
      center: {
        kind: scale === "log" ? "geometric-mean" : "mean",
        shift: 0,
        meanOverEstimate: null,
        meanPay: null,
      },
      contributions: withParts ? contributionsOf(model, profile) : null,
      ...NO_INTERVALS,
      warnings,
    };
  }
  const reading = readProfile(reader, profile, coverage);
  if (reading.howSure.low < reading.range.low || reading.howSure.high > reading.range.high) {
    warnings.push({ kind: "treesDisagree" });
  }
  return {
    ...base,
    ...fromReading(reading),
    jackknifeNeedsAnalystFile: reader.jackknifeWithheld,
    referenceTree,
    center: estimateCenterOf(reader, reading.estimate),
    contributions: withParts ? contributionsOf(model, profile) : null,
    warnings,
  };
}

/** What an ensemble's estimate is, from its reader (see `EstimateAnswer.center`). */
function estimateCenterOf(reader: ProfileReader, estimate: number): EstimateAnswer["center"] {
  const none = { shift: 0, meanOverEstimate: null, meanPay: null };
  if (reader.scale === "raw") return { kind: "mean", ...none };
  if (reader.center === null) return { kind: "geometric-mean", ...none };
  return {
    kind: "median",
    shift: reader.center.shift,
    meanOverEstimate: reader.center.meanOverEstimate,
    meanPay: estimate * reader.center.meanOverEstimate,
  };
}

// An answer without an ensemble (a class model's or a tree alone) has no
// interval, range or trees.
const NO_INTERVALS = {
  confidence: null,
  jackknife: null,
  jackknifeNeedsAnalystFile: false,
  range: null,
  trees: [] as number[],
};

function fromReading(reading: ProfileReading) {
  return {
    estimate: reading.estimate,
    confidence: { ...reading.howSure, method: CONFIDENCE_METHOD },
    jackknife: reading.jackknife === null
      ? null
      : { ...reading.jackknife.interval, method: JACKKNIFE_METHOD, se: reading.jackknife.se },
    range: { ...reading.range, method: RANGE_METHOD },
    trees: Array.from(reading.trees),
  };
}

/**
 * How many people stand behind a profile's answer, and why it is unusual
 * for the data: a pair of levels few people have, an attribute beyond
 * what 99% of people at its level have, a value outside the data.
 *
 * @param leafRows Training rows in the profile's leaf of the reference tree.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable, typicalProfile } from "../../mod.ts";
 * import { profileSupport } from "./estimate_answer.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 400, seed: 4 }), { target: "base_pay_eur" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 6, folds: 5, workers: 1 });
 * const typical = typicalProfile(model);
 * assert.equal(profileSupport(model, typical, 40).unusual, false);
 * const years = model.features.findIndex((f) => f.name === "years_experience");
 * const old = Float64Array.from(typical);
 * old[years] = 99;
 * const support = profileSupport(model, old, 40);
 * assert(support.unusual);
 * assert(support.reasons.some((r) => r.kind !== "fewPeers" && r.feature === "years_experience"));
 * ```
 */
export function profileSupport(model: Model, profile: Profile, leafRows: number): SupportAnswer {
  const reasons: SupportReason[] = [];
  const privacy = model.settings.privacyMin;
  const byName = new Map(model.features.map((f, i) => [f.name, i]));
  let peers: SupportAnswer["peers"] = null;
  const p = model.support.peers;
  if (p !== null) {
    const [a, b] = p.features.map((n) => byName.get(n)!);
    const la = model.features[a].levels![profile[a]];
    const lb = model.features[b].levels![profile[b]];
    if (la !== undefined && lb !== undefined) {
      const rows = p.counts[`${la}\u0000${lb}`] ?? 0;
      peers = { features: [...p.features], levels: [la, lb], rows };
      if (rows < privacy) {
        reasons.push({ kind: "fewPeers", features: [...p.features], levels: [la, lb], rows });
      }
    }
  }
  for (const group of model.support.levelRanges) {
    const f = byName.get(group.feature)!;
    if (model.features[f].levels![profile[f]] !== group.level) continue;
    for (const range of group.ranges) {
      const g = byName.get(range.feature)!;
      const x = profile[g];
      if (Number.isNaN(x)) continue;
      const beyond = { feature: range.feature, value: x, group: group.feature, level: group.level };
      if (x > range.p99) {
        reasons.push({ kind: "aboveLevelRange", ...beyond, bound: round(range.p99) });
      } else if (x < range.p01) {
        reasons.push({ kind: "belowLevelRange", ...beyond, bound: round(range.p01) });
      }
    }
  }
  for (const w of rangeWarnings(model, profile)) {
    reasons.push({ kind: "outsideData", feature: w.feature });
  }
  return { rows: leafRows, peers, unusual: reasons.length > 0, reasons };
}

function round(x: number): number {
  return Number(x.toPrecision(4));
}
