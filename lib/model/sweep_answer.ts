/**
 * A sweep: one attribute walked over a grid with the rest of the profile
 * fixed, each point's estimate and intervals, optionally averaged over a
 * table's rows (partial dependence).
 *
 * @module
 */

import { toMoney } from "../ensemble/pay_scale.ts";
import { applyValues } from "../tree/flat_tree.ts";
import { OptionError } from "../errors.ts";
import { describeProfile, type Profile, type ProfileWarning } from "./profile.ts";
import type { ModelRows } from "./model_table.ts";
import type { Model, Provenance } from "./types.ts";
import { checkCoverage, type ModelSession, shiftedMoney } from "./model_session.ts";
import { estimateProfile } from "./estimate_answer.ts";
import type { AnswerNote } from "./answer_notes.ts";

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
  /** Partial dependence (when asked): the estimate averaged over the table's rows. */
  average?: number;
  /** Whether the profile at this value is unusual for the data. */
  unusual: boolean;
}

/** A sweep's answer (the sweep command's JSON document). */
export interface SweepAnswer {
  /** The attribute swept. */
  feature: string;
  /** The rest of the profile. */
  profile: Record<string, string | number | null>;
  /** Coverage of the intervals. */
  coverage: number;
  /** The points. */
  points: SweepAnswerPoint[];
  /** What to bear in mind ({@linkcode AnswerNote}). */
  warnings: AnswerNote[];
  /** Where it came from. */
  provenance: Provenance;
}

/**
 * The grid of a sweep: every level, or `steps` values from `from` to `to`
 * (default: the training data's 1% to 99% quantiles).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { sweepValues } from "./sweep_answer.ts";
 * const model = {
 *   features: [
 *     { name: "years", kind: "numeric", range: { min: 0, max: 40, p01: 1, p99: 31 } },
 *     { name: "level", kind: "ordinal", levels: ["L1", "L2", "L3"] },
 *   ],
 * } as unknown as import("./types.ts").Model;
 * // 1 to 31 in 4 steps of 10; a level feature sweeps every level's code.
 * assert.deepEqual(sweepValues(model, 0, { steps: 4 }), [1, 11, 21, 31]);
 * assert.deepEqual(sweepValues(model, 1), [0, 1, 2]);
 * // 1.1 + (8.1755 - 1.1) is 8.175500000000001 in floating point; read as 8.1755.
 * assert.deepEqual(sweepValues(model, 0, { from: 1.1, to: 8.1755, steps: 2 }), [1.1, 8.1755]);
 * assert.throws(() => sweepValues(model, 0, { steps: 1 }), /steps must be a whole number/);
 * assert.throws(() => sweepValues(model, 0, { from: 5, to: 5 }), /to must be above from/);
 * ```
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
    throw new OptionError(`{steps} must be a whole number from 2 to 500, got ${steps}`);
  }
  const from = options.from ?? f.range!.p01;
  const to = options.to ?? f.range!.p99;
  if (!(to > from)) throw new OptionError(`{to} must be above {from} (got ${from} to ${to})`);
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
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { applyValues } from "../tree/flat_tree.ts";
 * import { openModel } from "./model_session.ts";
 * import { typicalProfile } from "./profile.ts";
 * import { sweepAnswer } from "./sweep_answer.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 200, seed: 4 }), { target: "base_pay_eur" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 6, folds: 5, workers: 1 });
 * // On the log scale the estimate is exp(the trees' mean leaf value + the measured shift).
 * const estimateOf = (p: Float64Array) => {
 *   const logs = model.ensemble!.trees.map((t) => t.value[applyValues(t, p)]);
 *   return Math.exp(logs.reduce((a, b) => a + b) / logs.length + model.target.center!.shift);
 * };
 * const near = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.abs(b);
 * const profile = typicalProfile(model);
 * const f = model.features.findIndex((x) => x.name === "level");
 * const levels = model.features[f].levels!;
 * const sweep = sweepAnswer(openModel(model), profile, f, levels.map((_, i) => i));
 * assert.equal(sweep.feature, "level");
 * assert.deepEqual(sweep.points.map((p) => p.value), levels);
 * sweep.points.forEach((point, i) => {
 *   const at = Float64Array.from(profile);
 *   at[f] = i;
 *   assert(near(point.estimate, estimateOf(at)));
 * });
 * // A value beyond the data's range is said to take the edge's estimate.
 * const years = model.features.findIndex((x) => x.name === "years_experience");
 * const beyond = sweepAnswer(openModel(model), profile, years, [model.features[years].range!.max + 5]);
 * assert(beyond.warnings.some((w) => w.kind === "sweepBeyondData" && w.feature === "years_experience"));
 * ```
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
    // A sweep shows no parts: each point without them.
    const answer = estimateProfile(session, values, coverage, [], false);
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
  const notes: AnswerNote[] = [...warnings];
  if (f.range !== undefined) {
    const beyond = grid.filter((v) => v < f.range!.min || v > f.range!.max);
    if (beyond.length > 0) {
      notes.push({ kind: "sweepBeyondData", feature: f.name, min: f.range.min, max: f.range.max });
    }
  }
  const unusual = points.filter((p) => p.unusual).map((p) => p.value);
  if (unusual.length > 0) notes.push({ kind: "sweepUnusual", feature: f.name, values: unusual });
  const falls = fallAlong(model, feature, grid, points.map((p) => p.estimate));
  if (falls !== null) notes.push(falls);
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

/**
 * The smallest fall a sweep calls a fall: half a percent of the estimate
 * (a smaller one, e.g. 14 of 50,430, is within what the trees' paired
 * intervals leave open; a what-if asks its own paired interval instead).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { FALL_NOTICED } from "./sweep_answer.ts";
 * assert.equal(FALL_NOTICED, 0.005);
 * ```
 */
export const FALL_NOTICED = 0.005;

/**
 * Where an estimate first falls as an ordinal feature (a ladder of levels)
 * rises through `grid` (estimates in the same order), as a note, when the
 * model is not constrained along it (`settings.increasing`); null when it
 * never falls, the feature is not a ladder, or the model keeps it from
 * falling.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { fallAlong } from "./sweep_answer.ts";
 * const model = {
 *   features: [{ name: "level", kind: "ordinal", levels: ["G1", "G2", "G3"] }],
 *   settings: { increasing: [] as string[] },
 * } as unknown as import("./types.ts").Model;
 * assert.deepEqual(fallAlong(model, 0, [0, 1, 2], [50, 49, 60]), {
 *   kind: "estimateFalls", feature: "level", from: "G1", to: "G2",
 * });
 * assert.equal(fallAlong(model, 0, [0, 1, 2], [50, 50, 60]), null);
 * // Half a percent or less is not called a fall.
 * assert.equal(fallAlong(model, 0, [0, 1, 2], [50000, 49800, 60000]), null);
 * model.settings.increasing = ["level"];
 * assert.equal(fallAlong(model, 0, [0, 1, 2], [50, 49, 60]), null);
 * ```
 */
export function fallAlong(
  model: Model,
  feature: number,
  grid: readonly number[],
  estimates: readonly number[],
): AnswerNote | null {
  const f = model.features[feature];
  // Only a ladder of levels: pay may rightly fall along a number (years of
  // experience, late in a career), so a fall along one is not flagged.
  if (f.kind !== "ordinal" || model.settings.increasing.includes(f.name)) return null;
  const shown = (v: number) => f.levels![v];
  for (let i = 1; i < grid.length; i++) {
    if (grid[i] > grid[i - 1] && estimates[i] < estimates[i - 1] * (1 - FALL_NOTICED)) {
      return {
        kind: "estimateFalls",
        feature: f.name,
        from: shown(grid[i - 1]),
        to: shown(grid[i]),
      };
    }
  }
  return null;
}
