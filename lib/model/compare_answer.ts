/**
 * A what-if: one profile before and after a change, the change in pay with
 * the interval of the trees' paired changes, and where the path changes.
 *
 * @module
 */

import { compareProfiles } from "../ensemble/read_profile.ts";
import { OptionError } from "../errors.ts";
import type { Profile, ProfileWarning } from "./profile.ts";
import type { Provenance } from "./types.ts";
import type { ModelSession } from "./model_session.ts";
import { type EstimateAnswer, estimateProfile } from "./estimate_answer.ts";
import { type ChangeContributions, changeContributions } from "./contributions_answer.ts";
import type { AnswerNote } from "./answer_notes.ts";
import { fallAlong } from "./sweep_answer.ts";

/** A what-if's answer (the compare command's JSON document). */
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
  /**
   * The change split by attribute ({@linkcode changeContributions}): the
   * attributes changed and those whose parts move with them.
   */
  parts: ChangeContributions | null;
  /**
   * Notes on the change itself: where the one change raises a ladder of
   * levels (a promotion), the trees agree the estimate falls (the paired
   * interval below 0) and the model is not constrained along it, an
   * `estimateFalls` note (the base's and the changed profile's own notes
   * are in `base.warnings` and `changed.warnings`).
   */
  warnings: AnswerNote[];
  /** Where it came from. */
  provenance: Provenance;
}

/**
 * Base vs changed profile.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { applyValues } from "../tree/flat_tree.ts";
 * import { compareAnswer } from "./compare_answer.ts";
 * import { openModel } from "./model_session.ts";
 * import { applyChanges, typicalProfile } from "./profile.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 200, seed: 4 }), { target: "base_pay_eur" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 6, folds: 5, workers: 1 });
 * // On the log scale the estimate is exp(the trees' mean leaf value + the measured shift).
 * const estimateOf = (p: Float64Array) => {
 *   const logs = model.ensemble!.trees.map((t) => t.value[applyValues(t, p)]);
 *   return Math.exp(logs.reduce((a, b) => a + b) / logs.length + model.target.center!.shift);
 * };
 * const near = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.abs(b);
 * const base = typicalProfile(model);
 * const changed = applyChanges(model, base, ["level=+1"]).profile;
 * const answer = compareAnswer(openModel(model), base, changed);
 * const levels = model.features.find((f) => f.name === "level")!.levels!;
 * const code = base[model.features.findIndex((f) => f.name === "level")];
 * assert.deepEqual(answer.changes, [{ feature: "level", from: levels[code], to: levels[code + 1] }]);
 * const [a, b] = [estimateOf(base), estimateOf(changed)];
 * assert(near(answer.base.estimate, a) && near(answer.changed.estimate, b));
 * assert(Math.abs(answer.difference.estimate - (b - a)) < 1e-6);
 * // The shift cancels in the ratio: relative change b / a - 1.
 * assert(Math.abs(answer.difference.relative.estimate - (b / a - 1)) < 1e-9);
 * assert.equal(answer.difference.coverage, 0.9);
 * // With the base's answer given, the same comparison without working it out again.
 * assert.deepEqual(compareAnswer(openModel(model), base, changed, 0.9, [], answer.base), answer);
 * ```
 */
export function compareAnswer(
  session: ModelSession,
  base: Profile,
  changed: Profile,
  coverage = 0.9,
  warnings: ProfileWarning[] = [],
  baseAnswer?: EstimateAnswer,
): CompareAnswer {
  const { model, reader } = session;
  if (model.target.kind !== "regression") {
    throw new OptionError(
      `compare needs a model of pay (a numeric target); "${model.target.name}" is a class`,
    );
  }
  // A caller comparing many profiles with one base (the explore screen)
  // passes the base's answer, made with the same coverage and warnings.
  const a = baseAnswer ?? estimateProfile(session, base, coverage, warnings);
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
  // A promotion that lowers the estimate: said, with the option that would
  // prevent it, when the one change is a rise along a ladder and the trees
  // agree that it falls (the paired interval below 0). With several changes
  // the fall cannot be put on one of them (see the change's parts).
  const notes: AnswerNote[] = [];
  const moved = model.features.map((_, i) => i).filter((i) => !Object.is(base[i], changed[i]));
  const agreed = difference.high !== null ? difference.high < 0 : difference.estimate < 0;
  if (moved.length === 1 && changed[moved[0]] > base[moved[0]] && agreed) {
    const i = moved[0];
    const note = fallAlong(model, i, [base[i], changed[i]], [a.estimate, b.estimate]);
    if (note !== null) notes.push(note);
  }
  return {
    base: a,
    changed: b,
    changes,
    difference,
    pathChange,
    // The parts each estimate already holds, not worked out a second time.
    parts: changeContributions(model, base, changed, [a.contributions, b.contributions]),
    warnings: notes,
    provenance: model.provenance,
  };
}
