/**
 * Why this estimate: each attribute's part of one profile's estimate, and
 * of the change between two profiles (a what-if), from the ensemble's exact
 * contributions (lib/ensemble/contributions.ts). Plain data; amounts in
 * money.
 *
 * On the log scale the parts add up on that scale, so in money they
 * multiply: the estimate is the base times (1 + each part's percentage).
 * Each part's money amount is what the estimate would lose without that
 * part (estimate x (1 - exp(-part))); those amounts do not add up to the
 * estimate minus the base exactly, and the answer says so with a note.
 *
 * @module
 */

import { ContributionReader, type Contributions } from "../ensemble/contributions.ts";
import type { FlatTree } from "../tree/flat_tree.ts";
import { describeProfile, type Profile } from "./profile.ts";
import { toMoney } from "../ensemble/pay_scale.ts";
import { shiftedMoney } from "./model_session.ts";
import type { Model } from "./types.ts";

/** One attribute's part. */
export interface AttributePart {
  /** The attribute. */
  feature: string;
  /** The profile's value (the changed profile's, for a change; null: missing). */
  value: string | number | null;
  /** For a change: the starting profile's value. */
  from?: string | number | null;
  /** The part on the fitting scale (log pay, or pay on the raw scale). */
  part: number;
  /** Log scale: the factor's percentage, exp(part) - 1; null on the raw scale. */
  percent: number | null;
  /**
   * Money: what the answer would lose without this part (the estimate, or
   * the changed profile's estimate, times 1 - exp(-part)); the part itself
   * on the raw scale.
   */
  money: number;
}

/** Each attribute's part of one profile's estimate. */
export interface ContributionsAnswer {
  /** What the parts are measured from and what they add up to. */
  scale: "log" | "raw";
  /**
   * The estimate with nothing known about the person: the mean of the
   * ensemble's estimates over the training table, on the fitting scale,
   * in money (with the model's shift to a median, as the estimate).
   */
  base: number;
  /** The estimate (money), as `estimate` gives it. */
  estimate: number;
  /** Every attribute's part, largest in size first. */
  parts: AttributePart[];
  /** Log scale: the money amounts do not add up exactly (the parts multiply). */
  moneyPartsMultiply: boolean;
  /** How many trees the parts average over (1: the reference tree alone). */
  trees: number;
}

/** Each attribute's part of the change from one profile to another. */
export interface ChangeContributions {
  scale: "log" | "raw";
  /** The starting profile's estimate (money). */
  fromEstimate: number;
  /** The changed profile's estimate (money). */
  toEstimate: number;
  /** Every attribute's part of the change, largest in size first (zero parts left out). */
  parts: AttributePart[];
  /** Log scale: the money amounts do not add up exactly (the parts multiply). */
  moneyPartsMultiply: boolean;
  trees: number;
}

// One reader per model: each tree's depth and base are measured once.
const readers = new WeakMap<Model, ContributionReader | null>();

function readerOf(model: Model): ContributionReader | null {
  if (readers.has(model)) return readers.get(model)!;
  let reader: ContributionReader | null = null;
  if (model.target.kind === "regression") {
    try {
      reader = new ContributionReader(
        model.ensemble?.trees ?? [model.reference.tree],
        model.features.length,
      );
    } catch (error) {
      // A tree too deep to split by attribute (none a fit makes): no parts.
      if (!(error instanceof RangeError)) throw error;
    }
  }
  readers.set(model, reader);
  return reader;
}

/**
 * Each attribute's part of a profile's estimate (null for a class model),
 * over every tree or over the trees listed in `only` (a training row's
 * out-of-bag trees: then the parts add up to its out-of-bag estimate, from
 * those trees' base).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, estimateProfile, fitModel, loadTable, openModel, typicalProfile } from "../../mod.ts";
 * import { contributionsOf } from "./contributions_answer.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 300, seed: 4 }), { target: "base_pay_eur" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 8, folds: 5, workers: 1 });
 * const profile = typicalProfile(model);
 * profile[model.features.findIndex((f) => f.name === "level")] += 2;
 * const answer = contributionsOf(model, profile)!;
 * // On the log scale the parts multiply: base x the product of (1 + percent) is the estimate.
 * const product = answer.parts.reduce((p, a) => p * (1 + a.percent!), answer.base);
 * assert(Math.abs(product - answer.estimate) < 1e-6 * answer.estimate);
 * assert(Math.abs(answer.estimate - estimateProfile(openModel(model), profile).estimate) < 1e-6);
 * assert.equal(answer.parts[0].feature, "level"); // two levels up: the largest part
 * ```
 */
export function contributionsOf(
  model: Model,
  profile: Profile,
  only?: ArrayLike<number>,
): ContributionsAnswer | null {
  const reader = readerOf(model);
  if (reader === null) return null;
  return contributionsAnswer(model, profile, reader.profile(profile, only), only?.length);
}

/**
 * The trees a model's contributions are read from (null for a class model,
 * or trees too deep to split by attribute), for work done elsewhere
 * (`contributionsOfMany` on the workers).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { contributionTrees } from "./contributions_answer.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 200, seed: 4 }), { target: "base_pay_eur" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 4, folds: 3, workers: 1 });
 * assert.equal(contributionTrees(model), model.ensemble!.trees);
 * ```
 */
export function contributionTrees(model: Model): readonly FlatTree[] | null {
  return readerOf(model)?.trees ?? null;
}

/**
 * The answer for a profile from its contributions on the fitting scale
 * (worked out here or on a worker): in money, named, largest first.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable, typicalProfile } from "../../mod.ts";
 * import { ContributionReader, type Contributions } from "../ensemble/contributions.ts";
import type { FlatTree } from "../tree/flat_tree.ts";
 * import { contributionsAnswer, contributionsOf } from "./contributions_answer.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 200, seed: 4 }), { target: "base_pay_eur" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 4, folds: 3, workers: 1 });
 * const profile = typicalProfile(model);
 * const raw = new ContributionReader(model.ensemble!.trees, model.features.length).profile(profile);
 * assert.deepEqual(contributionsAnswer(model, profile, raw, 4), contributionsOf(model, profile));
 * ```
 */
export function contributionsAnswer(
  model: Model,
  profile: Profile,
  raw: Contributions,
  trees?: number,
): ContributionsAnswer {
  const { base, prediction, parts } = raw;
  const scale = model.target.scale === "log" ? "log" : "raw";
  const estimate = inMoney(model, prediction);
  const values = describeProfile(model, profile);
  return {
    scale,
    base: inMoney(model, base),
    estimate,
    parts: partsInMoney(model, parts, estimate, scale, values),
    moneyPartsMultiply: scale === "log",
    trees: trees ?? readerOf(model)!.trees.length,
  };
}

/**
 * Each attribute's part of the change from profile `from` to profile `to`:
 * the difference of their parts, which adds up to the change of the
 * estimate on the fitting scale (null for a class model). `known`: the two
 * profiles' parts when their estimates already hold them.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable, typicalProfile } from "../../mod.ts";
 * import { changeContributions } from "./contributions_answer.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 300, seed: 4 }), { target: "base_pay_eur" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 8, folds: 5, workers: 1 });
 * const from = typicalProfile(model);
 * const to = Float64Array.from(from);
 * to[model.features.findIndex((f) => f.name === "level")] += 1;
 * const change = changeContributions(model, from, to)!;
 * const sum = change.parts.reduce((s, p) => s + p.part, 0);
 * assert(Math.abs(Math.exp(sum) * change.fromEstimate - change.toEstimate) < 1e-6 * change.toEstimate);
 * assert(change.parts.some((p) => p.feature === "level" && p.from !== p.value));
 * ```
 */
export function changeContributions(
  model: Model,
  from: Profile,
  to: Profile,
  known?: [ContributionsAnswer | null, ContributionsAnswer | null],
): ChangeContributions | null {
  // The two profiles' parts: those their estimates already worked out
  // (compare's), else worked out here.
  const before = known?.[0] ?? contributionsOf(model, from);
  const after = known?.[1] ?? contributionsOf(model, to);
  if (before === null || after === null) return null;
  const partOf = (answer: ContributionsAnswer) =>
    new Map(answer.parts.map((p) => [p.feature, p.part]));
  const was = partOf(before);
  const now = partOf(after);
  const delta = model.features.map((f) => now.get(f.name)! - was.get(f.name)!);
  const fromValues = describeProfile(model, from);
  const parts = partsInMoney(model, delta, after.estimate, after.scale, describeProfile(model, to))
    .filter((p) => p.part !== 0)
    .map((p) => ({ ...p, from: fromValues[p.feature] }));
  return {
    scale: after.scale,
    fromEstimate: before.estimate,
    toEstimate: after.estimate,
    parts,
    moneyPartsMultiply: after.moneyPartsMultiply,
    trees: after.trees,
  };
}

// Money of a value on the fitting scale as the estimate gives it: with the
// model's shift to a median for an ensemble, without for the reference tree
// alone (its estimate is its leaf).
function inMoney(model: Model, value: number): number {
  return model.ensemble === null ? toMoney(value, model.target.scale) : shiftedMoney(model, value);
}

function partsInMoney(
  model: Model,
  parts: ArrayLike<number>,
  estimate: number,
  scale: "log" | "raw",
  values: Record<string, string | number | null>,
): AttributePart[] {
  return model.features.map((f, j) => {
    const part = parts[j];
    return {
      feature: f.name,
      value: values[f.name],
      part,
      percent: scale === "log" ? Math.expm1(part) : null,
      money: scale === "log" ? -estimate * Math.expm1(-part) : part,
    };
  }).sort((a, b) => Math.abs(b.part) - Math.abs(a.part));
}
