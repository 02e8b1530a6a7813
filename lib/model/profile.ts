/**
 * Profiles in a model's terms: the typical person, `--set COLUMN=VALUE`
 * edits checked against the model's schema, `--change` edits (with `+1` /
 * `-1` steps of an ordinal), and the profile back in words.
 *
 * @module
 */

import { OptionError } from "../errors.ts";
import { matchName, nearest, unknownLevel, UnknownNameError } from "../table/column_named.ts";
import type { FeatureSchema, Model } from "./types.ts";
import type { OutsideDataNote } from "./answer_notes.ts";

/** A profile: one value per model feature (level codes for level features, NaN for missing). */
export type Profile = Float64Array;

/** A warning about a profile: a value outside the data's range. */
export type ProfileWarning = OutsideDataNote;

/**
 * The typical profile: each numeric feature at its median, each level
 * feature at its most common level.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { typicalProfile } from "./profile.ts";
 * const model = {
 *   target: { name: "pay" },
 *   dropped: [{ name: "employee_id", reason: "an identifier" }],
 *   settings: { allowProtected: false },
 *   features: [
 *     { name: "level", kind: "ordinal", levels: ["L1", "L2", "L3"], typical: 1, protected: false },
 *     { name: "years", kind: "numeric", typical: 6, range: { min: 0, max: 30 }, protected: false },
 *     { name: "gender", kind: "categorical", levels: ["Man", "Woman"], typical: 0, protected: true },
 *   ],
 * } as unknown as import("./types.ts").Model;
 * assert.deepEqual([...typicalProfile(model)], [1, 6, 0]);
 * ```
 */
export function typicalProfile(model: Model): Profile {
  return Float64Array.from(model.features, (f) => f.typical);
}

export { editDistance, nearest } from "../table/column_named.ts";

/**
 * The feature named `name`, or an OptionError listing the model's features.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { findFeature } from "./profile.ts";
 * const model = {
 *   target: { name: "pay" },
 *   dropped: [{ name: "employee_id", reason: "an identifier" }],
 *   settings: { allowProtected: false },
 *   features: [
 *     { name: "level", kind: "ordinal", levels: ["L1", "L2", "L3"], typical: 1, protected: false },
 *     { name: "years", kind: "numeric", typical: 6, range: { min: 0, max: 30 }, protected: false },
 *     { name: "gender", kind: "categorical", levels: ["Man", "Woman"], typical: 0, protected: true },
 *   ],
 * } as unknown as import("./types.ts").Model;
 * assert.equal(findFeature(model, "years", "--set"), 1);
 * assert.equal(findFeature(model, "LEVEL", "--set"), 0); // a case match
 * assert.throws(() => findFeature(model, "pay", "--set"), /what the model estimates/);
 * assert.throws(() => findFeature(model, "employee_id", "--set"), /not used by this model \(an identifier\)/);
 * assert.throws(() => findFeature(model, "yeers", "--set"), /did you mean "years"/);
 * ```
 */
export function findFeature(model: Model, name: string, option: string): number {
  const index = model.features.findIndex((f) => f.name === name);
  if (index >= 0) return index;
  const names = model.features.map((f) => f.name);
  if (name === model.target.name) {
    throw new OptionError(`{${option}}: "${name}" is what the model estimates, not an attribute`);
  }
  const dropped = model.dropped.find((d) => d.name === name);
  if (dropped !== undefined) {
    throw new OptionError(
      `{${option}}: "${name}" is not used by this model (${dropped.reason}); its attributes are: ` +
        names.join(", "),
    );
  }
  const folded = matchName(name, names);
  if (folded.kind === "case") return names.indexOf(folded.name);
  const guess = nearest(name, names);
  throw new UnknownNameError(
    `{${option}}: the model has no attribute "${name}"${
      guess ? ` (did you mean "${guess}"?)` : ""
    }; ` +
      `its attributes are: ${names.join(", ")}`,
    {
      option,
      what: "attribute",
      asked: name,
      known: names,
      ...(guess !== undefined ? { nearest: guess } : {}),
    },
  );
}

/**
 * The code of a value of a feature: a level's code, or the number.
 *
 * @throws {OptionError} for an unseen level (listing the levels, suggesting
 * the nearest) or a value that is not a number for a numeric feature.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { valueOf } from "./profile.ts";
 * const level = { name: "level", kind: "ordinal", levels: ["L1", "L2", "L3"] } as unknown as import("./types.ts").FeatureSchema;
 * const years = { name: "years", kind: "numeric" } as unknown as import("./types.ts").FeatureSchema;
 * assert.equal(valueOf(level, "L3", "--set"), 2);
 * assert.equal(valueOf(level, "l2", "--set"), 1); // levels match without case
 * assert.equal(valueOf(years, "1_000.5", "--set"), 1000.5);
 * assert(Number.isNaN(valueOf(years, "NA", "--set")));
 * assert.throws(() => valueOf(years, "4,5", "--set"), /write decimals with a point: 4\.5/);
 * assert.throws(() => valueOf(level, "L9", "--set"));
 * ```
 */
export function valueOf(feature: FeatureSchema, text: string, option: string): number {
  if (text === "") {
    throw new OptionError(
      `{${option}}: "${feature.name}=" has no value; give one, or ${feature.name}=NA for missing`,
    );
  }
  if (text.toUpperCase() === "NA") return NaN;
  if (feature.kind === "numeric") {
    const value = Number(text.replace(/_/g, ""));
    if (!Number.isFinite(value)) {
      const comma = /^\d+,\d+$/.test(text)
        ? ` (write decimals with a point: ${text.replace(",", ".")})`
        : "";
      throw new OptionError(
        `{${option}}: "${feature.name}" is a number, and "${text}" is not one${comma}`,
      );
    }
    return value;
  }
  const levels = feature.levels ?? [];
  const code = levels.indexOf(text);
  if (code >= 0) return code;
  const folded = levels.findIndex((l) => l.toLowerCase() === text.toLowerCase());
  if (folded >= 0) return folded;
  throw unknownLevel(option, feature.name, text, levels);
}

/**
 * Splits `COLUMN=VALUE`.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { splitAssignment } from "./profile.ts";
 * // At the first "=", both sides trimmed.
 * assert.deepEqual(splitAssignment(" site = Harbour=side ", "--set"), ["site", "Harbour=side"]);
 * assert.throws(() => splitAssignment("=5", "--set"), /expected COLUMN=VALUE/);
 * assert.throws(() => splitAssignment("site", "--set"), /expected COLUMN=VALUE/);
 * ```
 */
export function splitAssignment(text: string, option: string): [string, string] {
  const at = text.indexOf("=");
  if (at <= 0) throw new OptionError(`{${option}}: expected COLUMN=VALUE, got "${text}"`);
  return [text.slice(0, at).trim(), text.slice(at + 1).trim()];
}

/**
 * Whether an attribute may be changed in a what-if, and by whom: the one
 * place this policy is decided. A protected attribute is never offered as
 * a lever by the guided flow ("offered"), even in a model fitted with
 * protected attributes allowed; a command accepts one ("accepted") only in
 * such a model (with the caution the terminal shows for it).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { isLever } from "./profile.ts";
 * const model = { settings: { allowProtected: true } } as unknown as import("./types.ts").Model;
 * const gender = { name: "gender", protected: true } as unknown as import("./types.ts").FeatureSchema;
 * assert.equal(isLever(model, gender, "offered"), false);
 * assert.equal(isLever(model, gender, "accepted"), true);
 * const shut = { settings: { allowProtected: false } } as unknown as import("./types.ts").Model;
 * assert.equal(isLever(shut, gender, "accepted"), false);
 * ```
 */
export function isLever(
  model: Model,
  feature: Pick<FeatureSchema, "protected">,
  how: "offered" | "accepted",
): boolean {
  if (!feature.protected) return true;
  return how === "accepted" && model.settings.allowProtected;
}

/**
 * The attributes the guided flow offers as what-if levers (indices).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { offeredLevers } from "./profile.ts";
 * const model = {
 *   settings: { allowProtected: true },
 *   features: [{ name: "level", protected: false }, { name: "gender", protected: true }],
 * } as unknown as import("./types.ts").Model;
 * assert.deepEqual(offeredLevers(model), [0]);
 * ```
 */
export function offeredLevers(model: Model): number[] {
  return model.features.flatMap((f, i) => (isLever(model, f, "offered") ? [i] : []));
}

// Refuses a protected attribute as a lever of a pay estimate unless the
// model was fitted with protected attributes allowed.
function checkLever(model: Model, feature: FeatureSchema, option: string): void {
  if (!isLever(model, feature, "accepted")) {
    throw new OptionError(
      `{${option}}: "${feature.name}" is a protected attribute and cannot be changed in a pay ` +
        `estimate`,
    );
  }
}

/**
 * Applies `--set COLUMN=VALUE` edits to a profile (a copy is returned).
 *
 * @returns The profile and warnings (values outside the training range).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { applySets } from "./profile.ts";
 * const model = {
 *   target: { name: "pay" },
 *   dropped: [{ name: "employee_id", reason: "an identifier" }],
 *   settings: { allowProtected: false },
 *   features: [
 *     { name: "level", kind: "ordinal", levels: ["L1", "L2", "L3"], typical: 1, protected: false },
 *     { name: "years", kind: "numeric", typical: 6, range: { min: 0, max: 30 }, protected: false },
 *     { name: "gender", kind: "categorical", levels: ["Man", "Woman"], typical: 0, protected: true },
 *   ],
 * } as unknown as import("./types.ts").Model;
 * const base = Float64Array.of(1, 6, 0);
 * const set = applySets(model, base, ["level=L3", "years=40"]);
 * assert.deepEqual([...set.profile], [2, 40, 0]);
 * assert.deepEqual([...base], [1, 6, 0]); // the base is left as it was
 * // 40 lies beyond the 0-30 the model saw.
 * assert.deepEqual(set.warnings.map((w) => w.feature), ["years"]);
 * // A protected attribute is no lever in a model fitted without them.
 * assert.throws(() => applySets(model, base, ["gender=Woman"]), /protected attribute/);
 * ```
 */
export function applySets(
  model: Model,
  profile: Profile,
  sets: readonly string[],
  option = "set",
): { profile: Profile; warnings: ProfileWarning[] } {
  const out = Float64Array.from(profile);
  for (const text of sets) {
    const [name, value] = splitAssignment(text, option);
    const f = findFeature(model, name, option);
    checkLever(model, model.features[f], option);
    out[f] = valueOf(model.features[f], value, option);
  }
  return { profile: out, warnings: rangeWarnings(model, out) };
}

/**
 * Applies `--change COLUMN=VALUE` edits; for an ordinal, `+N` / `-N` moves
 * N steps up or down its order (a promotion is `level=+1`).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { applyChanges } from "./profile.ts";
 * const model = {
 *   target: { name: "pay" },
 *   dropped: [{ name: "employee_id", reason: "an identifier" }],
 *   settings: { allowProtected: false },
 *   features: [
 *     { name: "level", kind: "ordinal", levels: ["L1", "L2", "L3"], typical: 1, protected: false },
 *     { name: "years", kind: "numeric", typical: 6, range: { min: 0, max: 30 }, protected: false },
 *     { name: "gender", kind: "categorical", levels: ["Man", "Woman"], typical: 0, protected: true },
 *   ],
 * } as unknown as import("./types.ts").Model;
 * const base = Float64Array.of(1, 6, 0);
 * // L2 up one step is L3; 6 years plus 3 is 9; a level named outright is set.
 * assert.deepEqual([...applyChanges(model, base, ["level=+1", "years=+3"]).profile], [2, 9, 0]);
 * assert.deepEqual([...applyChanges(model, base, ["level=L1"]).profile], [0, 6, 0]);
 * // L2 two steps up would leave the ladder L1 to L3.
 * assert.throws(() => applyChanges(model, base, ["level=+2"]), /beyond the ladder \(L1 to L3\)/);
 * ```
 */
export function applyChanges(
  model: Model,
  profile: Profile,
  changes: readonly string[],
): { profile: Profile; warnings: ProfileWarning[] } {
  const out = Float64Array.from(profile);
  for (const text of changes) {
    const [name, value] = splitAssignment(text, "change");
    const f = findFeature(model, name, "change");
    const feature = model.features[f];
    checkLever(model, feature, "change");
    // A signed value is a step: whole levels of a ladder, any amount of a
    // number (years=+2.5 adds two and a half years; it set 2.5 before).
    const step = (feature.kind === "numeric" ? /^[+-]\d+(\.\d+)?$/ : /^[+-]\d+$/).exec(value);
    // A step from a missing value has nowhere to start (a number plus NaN
    // would be NaN, said nowhere).
    if (step !== null && feature.kind !== "categorical" && Number.isNaN(out[f])) {
      throw new OptionError(`{change}: "${name}" is missing in the base profile; set it first`);
    }
    if (step !== null && feature.kind === "ordinal") {
      const levels = feature.levels!;
      const to = out[f] + Number(value);
      if (to < 0 || to >= levels.length) {
        throw new OptionError(
          `{change}: ${name}=${value} moves ${levels[out[f]]} beyond the ladder ` +
            `(${levels[0]} to ${levels[levels.length - 1]})`,
        );
      }
      out[f] = to;
    } else if (step !== null && feature.kind === "numeric") {
      out[f] = out[f] + Number(value);
    } else {
      out[f] = valueOf(feature, value, "change");
    }
  }
  return { profile: out, warnings: rangeWarnings(model, out) };
}

/**
 * Warnings for numeric values outside the range the model saw.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { rangeWarnings } from "./profile.ts";
 * const model = {
 *   target: { name: "pay" },
 *   dropped: [{ name: "employee_id", reason: "an identifier" }],
 *   settings: { allowProtected: false },
 *   features: [
 *     { name: "level", kind: "ordinal", levels: ["L1", "L2", "L3"], typical: 1, protected: false },
 *     { name: "years", kind: "numeric", typical: 6, range: { min: 0, max: 30 }, protected: false },
 *     { name: "gender", kind: "categorical", levels: ["Man", "Woman"], typical: 0, protected: true },
 *   ],
 * } as unknown as import("./types.ts").Model;
 * // years runs 0 to 30 in the training data; 30 is inside, -1 and 31 are not.
 * assert.deepEqual(rangeWarnings(model, Float64Array.of(2, 30, 0)), []);
 * assert.deepEqual(rangeWarnings(model, Float64Array.of(2, 31, 0)).map((w) => w.feature), ["years"]);
 * assert.deepEqual(rangeWarnings(model, Float64Array.of(2, -1, 0)), [
 *   { kind: "valueOutsideData", feature: "years", value: -1, min: 0, max: 30 },
 * ]);
 * ```
 */
export function rangeWarnings(model: Model, profile: Profile): ProfileWarning[] {
  const warnings: ProfileWarning[] = [];
  model.features.forEach((f, i) => {
    const x = profile[i];
    if (f.range === undefined || Number.isNaN(x)) return;
    if (x < f.range.min || x > f.range.max) {
      warnings.push({
        kind: "valueOutsideData",
        feature: f.name,
        value: x,
        min: f.range.min,
        max: f.range.max,
      });
    }
  });
  return warnings;
}

/**
 * The profile in words: feature name -> value (level name, number, or null for missing).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { describeProfile } from "./profile.ts";
 * const model = {
 *   target: { name: "pay" },
 *   dropped: [{ name: "employee_id", reason: "an identifier" }],
 *   settings: { allowProtected: false },
 *   features: [
 *     { name: "level", kind: "ordinal", levels: ["L1", "L2", "L3"], typical: 1, protected: false },
 *     { name: "years", kind: "numeric", typical: 6, range: { min: 0, max: 30 }, protected: false },
 *     { name: "gender", kind: "categorical", levels: ["Man", "Woman"], typical: 0, protected: true },
 *   ],
 * } as unknown as import("./types.ts").Model;
 * assert.deepEqual(describeProfile(model, Float64Array.of(2, 7.5, NaN)), {
 *   level: "L3",
 *   years: 7.5,
 *   gender: null,
 * });
 * ```
 */
export function describeProfile(
  model: Model,
  profile: Profile,
): Record<string, string | number | null> {
  const out: Record<string, string | number | null> = {};
  model.features.forEach((f, i) => {
    const x = profile[i];
    out[f.name] = Number.isNaN(x) ? null : f.kind === "numeric" ? x : (f.levels![x] ?? String(x));
  });
  return out;
}
