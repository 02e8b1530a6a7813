/**
 * The range to post for one role: the role's profile as a new hire (the
 * attributes that measure time with the employer set to their lowest value
 * in the training table), the model's estimate for it and the range
 * comparable people's pay falls in at a coverage, and, with the table of
 * current people, how many of them share the role's named attributes and
 * what share of those the range holds.
 *
 * A posting must rest on objective criteria: a model that uses a protected
 * attribute (fitted with `allowProtected`) gives no posting range.
 *
 * @module
 */

import { OptionError } from "../errors.ts";
import { estimateProfile } from "../model/estimate_answer.ts";
import { describeProfile, type Profile } from "../model/profile.ts";
import type { ModelRows } from "../model/model_table.ts";
import type { ModelSession } from "../model/model_session.ts";
import { checkedPrivacyMin } from "../model/pay_pipeline.ts";

/** Words in a column's name that mark time with the employer (tenure), not experience. */
const TENURE =
  /tenure|at_company|with_company|in_company|seniority|years_of_service|service_years|time_in_role|in_role/i;

/**
 * Whether a column measures time with the employer (set to its entry value
 * for a new hire).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { isTenureName } from "./posting_range.ts";
 * assert(isTenureName("years_at_company") && isTenureName("Tenure"));
 * assert(!isTenureName("years_experience") && !isTenureName("level"));
 * ```
 */
export function isTenureName(name: string): boolean {
  return TENURE.test(name);
}

/** The range to post for one role. */
export interface PostingRange {
  /** The role as a new hire, attribute by attribute. */
  profile: Record<string, string | number | null>;
  /** The attributes set to their entry value (the lowest in the training table). */
  newHire: string[];
  /** The estimate the range is centred on (money). */
  estimate: number;
  /** The range to post (money). */
  low: number;
  high: number;
  /** The coverage it is built for. */
  coverage: number;
  /** The attributes the range rests on: the model's, none of them protected. */
  criteria: string[];
  /**
   * With the table: the current people who share the role's named
   * attributes, and the share of them inside the range (null when fewer
   * than the privacy minimum); null without the table.
   */
  comparable: { named: string[]; people: number | null; inside: number | null } | null;
}

/**
 * The posting range for `profile` (the role; `named` the attributes the
 * user set, which define who is comparable).
 *
 * @throws {OptionError} for a model that uses a protected attribute, or one
 *   without an ensemble of pay.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { applySets, demoCompanyCsv, fitModel, loadTable, openModel, readForModel, typicalProfile } from "../../mod.ts";
 * import { postingRange } from "./posting_range.ts";
 * const csv = demoCompanyCsv({ rows: 600, seed: 4 });
 * const model = await fitModel(loadTable(csv, { target: "base_pay_eur" }), {
 *   target: "base_pay_eur", trees: 20, folds: 3, workers: 1,
 * });
 * const { profile } = applySets(model, typicalProfile(model), ["level=G3", "job_family=Sales"]);
 * const rows = readForModel(model, csv, "demo.csv");
 * const posting = postingRange(openModel(model), profile, ["level", "job_family"], rows);
 * assert.deepEqual(posting.newHire, ["years_at_company"]);
 * assert.equal(posting.profile.years_at_company, model.features.find((f) => f.name === "years_at_company")!.range!.min);
 * assert(posting.low < posting.estimate && posting.estimate < posting.high);
 * assert(posting.comparable!.people! > 5 && posting.comparable!.inside! > 0);
 * ```
 */
export function postingRange(
  session: ModelSession,
  profile: Profile,
  named: readonly string[],
  rows: ModelRows | null,
  options: { coverage?: number; privacyMin?: number } = {},
): PostingRange {
  const { model } = session;
  const protectedUsed = model.features.filter((f) => f.protected).map((f) => f.name);
  if (protectedUsed.length > 0) {
    throw new OptionError(
      `a posting range must rest on objective criteria, and this model uses protected ` +
        `attributes (${protectedUsed.join(", ")}); fit one without them`,
    );
  }
  if (session.reader === null) {
    throw new OptionError("a posting range needs a model with an ensemble of pay");
  }
  const coverage = options.coverage ?? 0.8;
  const privacyMin = checkedPrivacyMin(options.privacyMin);
  // The role as a new hire: time with the employer at its entry value.
  const role = Float64Array.from(profile);
  const newHire: string[] = [];
  model.features.forEach((f, j) => {
    if (
      f.kind === "numeric" && f.range !== undefined && isTenureName(f.name) &&
      !named.includes(f.name)
    ) {
      role[j] = f.range.min;
      newHire.push(f.name);
    }
  });
  const answer = estimateProfile(session, role, coverage, [], false);
  const range = answer.range!;
  let comparable: PostingRange["comparable"] = null;
  if (rows !== null && rows.target !== null) {
    const index = named.map((name) => model.features.findIndex((f) => f.name === name));
    let people = 0;
    let inside = 0;
    for (let r = 0; r < rows.rows; r++) {
      if (!(rows.target[r] > 0)) continue;
      if (!index.every((j) => rows.features[j][r] === profile[j])) continue;
      people++;
      if (rows.target[r] >= range.low && rows.target[r] <= range.high) inside++;
    }
    const shown = people >= privacyMin;
    comparable = {
      named: [...named],
      people: shown ? people : null,
      inside: shown ? inside / people : null,
    };
  }
  return {
    profile: describeProfile(model, role),
    newHire,
    estimate: answer.estimate,
    low: range.low,
    high: range.high,
    coverage,
    criteria: model.features.map((f) => f.name),
    comparable,
  };
}
