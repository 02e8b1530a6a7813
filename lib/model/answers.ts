/**
 * The answers the commands and the guided flow give from a model: one
 * profile's estimate with how sure it is, the range for comparable people,
 * the decision path and the support behind it; a what-if comparison; a
 * sweep; and batch scoring. Plain data, ready for JSON or for rendering;
 * every amount in money.
 *
 * @module
 */

import { bootstrapCounts, STATE_WORDS } from "../ensemble/bootstrap.ts";
import { percentileInterval } from "../ensemble/intervals.ts";
import { toMoney } from "../ensemble/pay_scale.ts";
import {
  compareProfiles,
  type ProfileReader,
  type ProfileReading,
  rangeShareBelow,
  readerFromParts,
  readProfile,
} from "../ensemble/read_profile.ts";
import { applyValues, type FlatTree } from "../tree/flat_tree.ts";
import { explainPath } from "../tree/explain.ts";
import { mergePath } from "../tree/merge_path.ts";
import { OptionError } from "../errors.ts";
import { rowKey } from "./fit_model.ts";
import { describeProfile, type Profile, type ProfileWarning, rangeWarnings } from "./profile.ts";
import type { ModelRows } from "./model_table.ts";
import type { Model, Provenance } from "./types.ts";
import type { OfferAnswer } from "./offer.ts";

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
export interface PathAnswer {
  /** The attribute. */
  feature: string;
  /** How it splits: numeric bounds, an ordinal run of levels, a categorical set. */
  kind: "numeric" | "ordinal" | "categorical";
  /** The merged condition in words. */
  condition: string;
  /** Numeric: the value is above this (exclusive); null when unbounded. */
  above: number | null;
  /** Numeric: the value is at most this (inclusive); null when unbounded. */
  atMost: number | null;
  /** Ordinal: the levels allowed, lowest first; categorical: the levels left; numeric: null. */
  levels: string[] | null;
  /** Whether a missing value follows these splits too. */
  missing: boolean;
  /** Whether any known value does (false when a split sent every known value the other way). */
  known: boolean;
  /** The split steps it covers (1-based numbers of `pathSplits`). */
  steps: number[];
  /** Training rows in the node reached after its last step. */
  rows: number;
  /** Typical pay of that node (money; null for fewer rows than the privacy minimum). */
  value: number | null;
}

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
  /** Why, one sentence each. */
  reasons: string[];
}

/** The answer for one profile (the `estimate --json` document). */
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
  /** Warnings for the user. */
  warnings: string[];
  /** With an offer (`estimate --offer`): where it sits ({@linkcode checkOffer}). */
  offer?: OfferAnswer;
  /** Where it came from. */
  provenance: Provenance;
}

/** A prepared model: the reader of its ensemble, built once. */
export interface ModelSession {
  /** The model. */
  model: Model;
  /** The ensemble's reader (regression with an ensemble), else null. */
  reader: ProfileReader | null;
}

/**
 * Prepares a model for answers (regenerates what the jackknife needs when
 * the analyst's part is at hand).
 */
export function openModel(model: Model): ModelSession {
  const reader = model.ensemble !== null && model.residuals !== null &&
      model.target.kind === "regression"
    ? readerFromParts({
      ensemble: model.ensemble,
      scale: model.target.scale,
      groups: model.residuals,
      trainingRows: model.rows.used,
      resamples: resamplesOf(model),
      center: model.target.center ?? null,
    })
    : null;
  return { model, reader };
}

// The trees' resampling states, when the analyst's part has one per tree.
function resamplesOf(model: Model): Int32Array | null {
  const states = model.analyst?.resamples;
  const trees = model.ensemble?.trees.length ?? 0;
  return states !== undefined && trees > 0 && states.length === trees * STATE_WORDS ? states : null;
}

const CONFIDENCE_METHOD = "percentile interval of the trees' estimates (how much one tree's " +
  "estimate moves between resamples)";
const JACKKNIFE_METHOD = "bias-corrected infinitesimal jackknife (Wager, Hastie & Efron 2014); " +
  "leaves the model's bias out";
const RANGE_METHOD = "out-of-bag residual quantiles of people with similar estimates";

/** Checks a coverage option. */
export function checkCoverage(coverage: number): void {
  if (!(coverage >= 0.5 && coverage <= 0.99)) {
    throw new OptionError(`--coverage must be between 0.5 and 0.99, got ${coverage}`);
  }
}

/**
 * The answer for one profile.
 *
 * @param extraWarnings Warnings from building the profile (e.g. `--set`).
 */
export function estimateProfile(
  session: ModelSession,
  profile: Profile,
  coverage = 0.9,
  extraWarnings: ProfileWarning[] = [],
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
  const warnings = [...extraWarnings.map((w) => w.message)];
  for (const w of rangeWarnings(model, profile)) {
    if (!warnings.includes(w.message)) warnings.push(w.message);
  }
  const support = supportOf(model, profile, leafRows);
  if (support.unusual) {
    warnings.push(
      `unusual profile for this data: ${support.reasons.join("; ")}. Estimates for it rest on ` +
        `few comparable people; treat them with care`,
    );
  }
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
    const shares = new Float64Array(width);
    const trees = model.ensemble?.trees ?? [tree];
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
    if (model.ensemble === null) warnings.push(NO_ENSEMBLE);
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
      confidence: null,
      jackknife: null,
      jackknifeNeedsAnalystFile: false,
      range: null,
      trees: [],
      warnings,
    };
  }
  const referenceTree = toMoney(tree.value[leafNode], scale);
  if (reader === null) {
    warnings.push(NO_ENSEMBLE);
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
      confidence: null,
      jackknife: null,
      jackknifeNeedsAnalystFile: false,
      range: null,
      trees: [],
      warnings,
    };
  }
  const reading = readProfile(reader, profile, coverage);
  if (reading.howSure.low < reading.range.low || reading.howSure.high > reading.range.high) {
    warnings.push(
      "the trees disagree about such a profile more than comparable people's pay differs: " +
        "there are few people like it, so both intervals rest on little",
    );
  }
  return {
    ...base,
    ...fromReading(reading),
    jackknifeNeedsAnalystFile: reader.jackknifeWithheld,
    referenceTree,
    center: estimateCenterOf(reader, reading.estimate),
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

/**
 * A log-scale estimate in money, moved by the model's measured shift to a
 * median (batch and sweep figures, as `readProfile` moves the estimate).
 */
function shiftedMoney(model: Model, value: number): number {
  const shift = model.target.scale === "log" ? model.target.center?.shift ?? 0 : 0;
  return toMoney(value + shift, model.target.scale);
}

const NO_ENSEMBLE = "this model has no ensemble (fitted with --trees 0): the estimate is the " +
  "reference tree's leaf and carries no interval";

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

function supportOf(model: Model, profile: Profile, leafRows: number): SupportAnswer {
  const reasons: string[] = [];
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
        reasons.push(
          `${rows === 0 ? "no one" : `only ${rows} ${rows === 1 ? "person" : "people"}`} in the ` +
            `training data ${rows === 1 ? "has" : "have"} ${p.features[0]} ${la} and ` +
            `${p.features[1]} ${lb}`,
        );
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
      if (x > range.p99) {
        reasons.push(
          `${range.feature} ${x} is above what 99% of people at ${group.feature} ${group.level} ` +
            `have (up to ${round(range.p99)})`,
        );
      } else if (x < range.p01) {
        reasons.push(
          `${range.feature} ${x} is below what 99% of people at ${group.feature} ${group.level} ` +
            `have (from ${round(range.p01)})`,
        );
      }
    }
  }
  for (const w of rangeWarnings(model, profile)) reasons.push(`${w.feature} is outside the data`);
  return { rows: leafRows, peers, unusual: reasons.length > 0, reasons };
}

function round(x: number): number {
  return Number(x.toPrecision(4));
}

/** The `compare --json` document. */
export interface CompareAnswer {
  /** The base profile's answer. */
  base: EstimateAnswer;
  /** The changed profile's answer. */
  changed: EstimateAnswer;
  /** What changed. */
  changes: { feature: string; from: string | number | null; to: string | number | null }[];
  /**
   * The change in money (changed minus base), with the interval of the
   * trees' paired changes; `relative`, the change as a share of the base
   * with the interval of the trees' paired relative changes (on the log
   * scale, exp of the percentiles of the per-tree log changes, minus 1).
   */
  difference: {
    estimate: number;
    low: number | null;
    high: number | null;
    coverage: number;
    relative: { estimate: number; low: number | null; high: number | null };
    method: string;
  };
  /**
   * The first condition of the (merged) decision path that differs (1-based), or null if the
   * paths agree.
   */
  pathChange: { step: number; base: string | null; changed: string | null } | null;
  /** Where it came from. */
  provenance: Provenance;
}

/** Base vs changed profile. */
export function compareAnswer(
  session: ModelSession,
  base: Profile,
  changed: Profile,
  coverage = 0.9,
  warnings: ProfileWarning[] = [],
): CompareAnswer {
  const { model, reader } = session;
  if (model.target.kind !== "regression") {
    throw new OptionError(
      `compare needs a model of pay (a numeric target); "${model.target.name}" is a class`,
    );
  }
  const a = estimateProfile(session, base, coverage, warnings);
  const b = estimateProfile(session, changed, coverage, warnings);
  const changes = model.features
    .map((f, i) => ({ f, i }))
    .filter(({ i }) => !Object.is(base[i], changed[i]))
    .map(({ f }) => ({ feature: f.name, from: a.profile[f.name], to: b.profile[f.name] }));
  let difference: CompareAnswer["difference"];
  if (reader !== null) {
    const w = compareProfiles(reader, base, changed, coverage);
    // The share's interval is that of the trees' paired relative changes
    // (on the log scale exp(per-tree log change) - 1), not the money
    // interval over the base: the trees disagree about the base too.
    difference = {
      estimate: w.difference.estimate,
      low: w.difference.low,
      high: w.difference.high,
      coverage,
      relative: { estimate: w.relative.estimate, low: w.relative.low, high: w.relative.high },
      method: "percentile interval of the trees' paired differences",
    };
  } else {
    difference = {
      estimate: b.estimate - a.estimate,
      low: null,
      high: null,
      coverage,
      relative: { estimate: b.estimate / a.estimate - 1, low: null, high: null },
      method: "reference tree only (no ensemble): no interval",
    };
  }
  let pathChange: CompareAnswer["pathChange"] = null;
  const steps = Math.max(a.path.length, b.path.length);
  for (let s = 0; s < steps; s++) {
    if (a.path[s]?.condition !== b.path[s]?.condition) {
      pathChange = {
        step: s + 1,
        base: a.path[s]?.condition ?? null,
        changed: b.path[s]?.condition ?? null,
      };
      break;
    }
  }
  return { base: a, changed: b, changes, difference, pathChange, provenance: model.provenance };
}

/** One point of a sweep. */
export interface SweepAnswerPoint {
  /** The value (a level name or a number). */
  value: string | number;
  /** The estimate in money. */
  estimate: number;
  /** How sure (null without an ensemble). */
  confidence: { low: number; high: number } | null;
  /** The range for comparable people (null without an ensemble). */
  range: { low: number; high: number } | null;
  /** Partial dependence (with `--average`): the estimate averaged over the table's rows. */
  average?: number;
  /** Whether the profile at this value is unusual for the data. */
  unusual: boolean;
}

/** The `sweep --json` document. */
export interface SweepAnswer {
  /** The attribute swept. */
  feature: string;
  /** The rest of the profile. */
  profile: Record<string, string | number | null>;
  /** Coverage of the intervals. */
  coverage: number;
  /** The points. */
  points: SweepAnswerPoint[];
  /** Warnings. */
  warnings: string[];
  /** Where it came from. */
  provenance: Provenance;
}

/**
 * The grid of a sweep: every level, or `steps` values from `from` to `to`
 * (default: the training data's 1% to 99% quantiles).
 */
export function sweepValues(
  model: Model,
  feature: number,
  options: { from?: number; to?: number; steps?: number } = {},
): number[] {
  const f = model.features[feature];
  if (f.kind !== "numeric") return f.levels!.map((_, i) => i);
  const steps = options.steps ?? 20;
  if (!Number.isInteger(steps) || steps < 2 || steps > 500) {
    throw new OptionError(`--steps must be a whole number from 2 to 500, got ${steps}`);
  }
  const from = options.from ?? f.range!.p01;
  const to = options.to ?? f.range!.p99;
  if (!(to > from)) throw new OptionError(`--to must be above --from (got ${from} to ${to})`);
  // Rounded to 10 significant digits, so that 1.1 + 7.0755 reads 8.1755.
  return Array.from(
    { length: steps },
    (_, i) => Number((from + ((to - from) * i) / (steps - 1)).toPrecision(10)),
  );
}

/**
 * Estimates over one attribute with the rest of the profile held fixed;
 * with `averageOver`, also the estimate averaged over those rows with the
 * attribute set (partial dependence).
 */
export function sweepAnswer(
  session: ModelSession,
  profile: Profile,
  feature: number,
  grid: readonly number[],
  coverage = 0.9,
  averageOver: ModelRows | null = null,
  warnings: ProfileWarning[] = [],
): SweepAnswer {
  checkCoverage(coverage);
  const { model } = session;
  if (model.target.kind !== "regression") {
    throw new OptionError(`sweep needs a model of pay (a numeric target)`);
  }
  const f = model.features[feature];
  const values = Float64Array.from(profile);
  const points = grid.map((v): SweepAnswerPoint => {
    values[feature] = v;
    const answer = estimateProfile(session, values, coverage);
    const point: SweepAnswerPoint = {
      value: f.kind === "numeric" ? v : f.levels![v],
      estimate: answer.estimate,
      confidence: answer.confidence && { low: answer.confidence.low, high: answer.confidence.high },
      range: answer.range && { low: answer.range.low, high: answer.range.high },
      unusual: answer.support.unusual,
    };
    if (averageOver !== null) point.average = averageEstimate(session, averageOver, feature, v);
    return point;
  });
  values[feature] = profile[feature];
  const notes = [...warnings.map((w) => w.message)];
  if (f.range !== undefined) {
    const beyond = grid.filter((v) => v < f.range!.min || v > f.range!.max);
    if (beyond.length > 0) {
      notes.push(
        `${f.name} outside ${f.range.min} to ${f.range.max} (the data's range) gets the ` +
          `estimate at the nearest edge: trees cannot extrapolate`,
      );
    }
  }
  const unusual = points.filter((p) => p.unusual).map((p) =>
    typeof p.value === "number" ? String(Number(p.value.toPrecision(4))) : p.value
  );
  if (unusual.length > 0) {
    notes.push(
      `unusual for the data (few comparable people) at ${f.name} ${unusual.join(", ")}; ` +
        `treat those estimates with care`,
    );
  }
  return {
    feature: f.name,
    profile: describeProfile(model, profile),
    coverage,
    points,
    warnings: notes,
    provenance: model.provenance,
  };
}

function averageEstimate(session: ModelSession, rows: ModelRows, feature: number, v: number) {
  const { model } = session;
  const trees = model.ensemble?.trees ?? [model.reference.tree];
  const profile = new Float64Array(model.features.length);
  let sum = 0;
  for (let r = 0; r < rows.rows; r++) {
    for (let g = 0; g < profile.length; g++) profile[g] = rows.features[g][r];
    profile[feature] = v;
    let s = 0;
    for (const t of trees) s += t.value[applyValues(t, profile)];
    sum += model.ensemble === null
      ? toMoney(s / trees.length, model.target.scale)
      : shiftedMoney(model, s / trees.length);
  }
  return sum / rows.rows;
}

/** One scored row of `batch`. */
export interface BatchRow {
  /** The estimate in money (out-of-bag for training rows; null for a refused row). */
  estimate: number | null;
  /** Where the estimate came from; `not-scored` for a refused row. */
  estimateSource: "out-of-bag" | "ensemble" | "reference-tree" | "not-scored";
  /** The reference tree's leaf value (null for a refused row). */
  referenceTree: number | null;
  /** Why the row was not scored (a level the model never saw), or null. */
  refused: string | null;
  /** How sure. */
  ciLow: number | null;
  /** How sure. */
  ciHigh: number | null;
  /** Range. */
  rangeLow: number | null;
  /** Range. */
  rangeHigh: number | null;
  /** With an offer: offer / estimate. */
  offerToEstimate?: number | null;
  /** With an offer: (offer - range_low) / (range_high - range_low). */
  rangePosition?: number | null;
  /** With an offer: under, within or over the range. */
  offerPosition?: "under" | "within" | "over" | null;
  /**
   * With an offer: the share of comparable people paid less than it, from
   * the residual quantiles the range is read from (as `estimate --offer`).
   */
  shareBelow?: number | null;
  /** Why the row is unusual for the data, or outside it ("" when it is not). */
  warnings: string;
}

/**
 * Scores every row of a table. Rows that are the model's own training rows
 * (same identifier and feature values) get their out-of-bag estimate: the
 * mean of the trees that never saw them, as at fitting time. Rows listed
 * in `rows.refused` are not scored: their figures are null and `refused`
 * says why.
 *
 * @param offers Each row's offer in money (NaN where none), or null.
 */
export function batchAnswer(
  session: ModelSession,
  rows: ModelRows,
  coverage = 0.9,
  offers: Float64Array | null = null,
): BatchRow[] {
  checkCoverage(coverage);
  const { model, reader } = session;
  if (model.target.kind !== "regression") {
    throw new OptionError(`batch needs a model of pay (a numeric target)`);
  }
  const scale = model.target.scale;
  const training = trainingIndex(model);
  const ensemble = model.ensemble;
  const resamples = resamplesOf(model);
  const counts = ensemble !== null && resamples !== null && training.size > 0
    ? ensemble.trees.map((_, b) => bootstrapCounts(model.rows.used, resamples, b))
    : [];
  const out: BatchRow[] = [];
  const profile = new Float64Array(model.features.length);
  const refused = new Map((rows.refused ?? []).map((x) => [x.row, x.reasons.join("; ")]));
  for (let r = 0; r < rows.rows; r++) {
    const why = refused.get(r);
    if (why !== undefined) {
      out.push({
        estimate: null,
        estimateSource: "not-scored",
        referenceTree: null,
        refused: why,
        ciLow: null,
        ciHigh: null,
        rangeLow: null,
        rangeHigh: null,
        ...(offers !== null
          ? { offerToEstimate: null, rangePosition: null, offerPosition: null, shareBelow: null }
          : {}),
        warnings: "",
      });
      continue;
    }
    for (let g = 0; g < profile.length; g++) profile[g] = rows.features[g][r];
    const tree = model.reference.tree;
    const leaf = applyValues(tree, profile);
    const referenceTree = toMoney(tree.value[leaf], scale);
    const reasons = supportOf(model, profile, tree.rows[leaf]).reasons;
    let row: BatchRow;
    if (reader === null || ensemble === null) {
      row = {
        estimate: referenceTree,
        estimateSource: "reference-tree",
        referenceTree,
        refused: null,
        ciLow: null,
        ciHigh: null,
        rangeLow: null,
        rangeHigh: null,
        warnings: reasons.join("; "),
      };
    } else {
      const reading = readProfile(reader, profile, coverage);
      row = {
        estimate: reading.estimate,
        estimateSource: "ensemble",
        referenceTree,
        refused: null,
        ciLow: reading.howSure.low,
        ciHigh: reading.howSure.high,
        rangeLow: reading.range.low,
        rangeHigh: reading.range.high,
        warnings: reasons.join("; "),
      };
      const index = rows.ids[r] === "" || counts.length === 0
        ? undefined
        : training.get(rowKey(rows.ids[r], profile));
      if (index !== undefined) {
        const oob = outOfBag(ensemble, counts, index, profile);
        if (oob !== null) {
          row.estimate = shiftedMoney(model, oob);
          row.estimateSource = "out-of-bag";
        }
      }
    }
    if (offers !== null) {
      const offer = offers[r];
      if (Number.isNaN(offer) || row.rangeLow === null || row.rangeHigh === null) {
        row.offerToEstimate = Number.isNaN(offer) ? null : offer / row.estimate!;
        row.rangePosition = null;
        row.offerPosition = null;
        row.shareBelow = null;
      } else {
        row.offerToEstimate = offer / row.estimate!;
        row.rangePosition = (offer - row.rangeLow) / (row.rangeHigh - row.rangeLow);
        row.offerPosition = offer < row.rangeLow
          ? "under"
          : offer > row.rangeHigh
          ? "over"
          : "within";
        const tail = (1 - coverage) / 2;
        row.shareBelow = offer === row.rangeLow
          ? tail
          : offer === row.rangeHigh
          ? 1 - tail
          : rangeShareBelow(reader!, profile, offer, coverage);
      }
    }
    out.push(row);
  }
  return out;
}

/**
 * The out-of-bag estimate (money) of a profile that is one of the model's
 * training rows (same identifier and attributes), or null when it is not
 * one, the model has no ensemble, or the analyst's part (which alone can
 * tell training rows and their trees' resamples) is not at hand.
 */
export function outOfBagEstimate(
  session: ModelSession,
  id: string,
  profile: Profile,
): number | null {
  const { model } = session;
  const resamples = resamplesOf(model);
  if (
    model.ensemble === null || resamples === null || id === "" ||
    model.target.kind !== "regression"
  ) return null;
  const index = trainingIndex(model).get(rowKey(id, profile));
  if (index === undefined) return null;
  const counts = model.ensemble.trees.map((_, b) => bootstrapCounts(model.rows.used, resamples, b));
  const oob = outOfBag(model.ensemble, counts, index, profile);
  return oob === null ? null : shiftedMoney(model, oob);
}

// Training row keys -> training row index.
function trainingIndex(model: Model): Map<string, number> {
  const map = new Map<string, number>();
  const keys = model.analyst?.rowKeys ?? null;
  if (keys === null) return map;
  // Each key is 12 characters of base64 (8 bytes).
  for (let i = 0; i * 12 < keys.length; i++) {
    const key = keys.slice(12 * i, 12 * i + 12);
    // A key seen twice (duplicate rows) cannot say which row it is.
    map.set(key, map.has(key) ? -1 : i);
  }
  for (const [key, i] of map) if (i < 0) map.delete(key);
  return map;
}

function outOfBag(
  ensemble: { trees: readonly FlatTree[] },
  counts: Float64Array[],
  row: number,
  profile: Profile,
): number | null {
  let sum = 0;
  let n = 0;
  ensemble.trees.forEach((tree, b) => {
    if (counts[b][row] !== 0) return;
    sum += tree.value[applyValues(tree, profile)];
    n++;
  });
  return n > 0 ? sum / n : null;
}
