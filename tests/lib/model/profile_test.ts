// Profiles in the hand model's terms (tests/lib/model/_hand_model.ts):
// the typical person, --set and --change edits, their refusals (class and
// the name or value they name, not the sentence) and the profile in words.
import assert from "node:assert/strict";
import { OptionError, UnknownNameError } from "../../../mod.ts";
import {
  applyChanges,
  applySets,
  describeProfile,
  findFeature,
  rangeWarnings,
  splitAssignment,
  typicalProfile,
  valueOf,
} from "../../../lib/model/profile.ts";
import { FEATURES, handModel } from "./_hand_model.ts";

const names = (text: string) => (e: Error) => e instanceof OptionError && e.message.includes(text);

Deno.test("the typical profile is each feature's typical value", () => {
  assert.deepEqual(Array.from(typicalProfile(handModel())), [1, 8, 0]);
});

Deno.test("findFeature: exact, then without case; the target, dropped and unknown names refused", () => {
  const model = handModel();
  assert.equal(findFeature(model, "site", "--set"), 2);
  assert.equal(findFeature(model, "Years", "--set"), 1);
  assert.throws(() => findFeature(model, "pay_eur", "--set"), names('"pay_eur"'));
  assert.throws(() => findFeature(model, "gender", "--set"), names("protected attribute"));
  assert.throws(
    () => findFeature(model, "yeers", "--set"),
    (e: Error) =>
      e instanceof UnknownNameError && e.asked === "yeers" && e.nearest === "years" &&
      e.what === "attribute" && e.known.join() === "level,years,site",
  );
});

Deno.test("valueOf: numbers, NA, levels by name or case; bad values name themselves", () => {
  const [level, years, site] = FEATURES;
  assert.equal(valueOf(years, "12.5", "--set"), 12.5);
  assert.equal(valueOf(years, "1_000", "--set"), 1000);
  assert(Number.isNaN(valueOf(years, "na", "--set")));
  assert.equal(valueOf(level, "G3", "--set"), 2);
  assert.equal(valueOf(site, "south", "--set"), 1);
  assert.throws(() => valueOf(years, "", "--set"), names('"years='));
  assert.throws(() => valueOf(years, "ten", "--set"), names('"ten"'));
  // A decimal comma gets the point spelled out.
  assert.throws(() => valueOf(years, "3,5", "--set"), names("3.5"));
  assert.throws(
    () => valueOf(level, "G9", "--set"),
    (e: Error) => e instanceof UnknownNameError && e.asked === "G9" && e.column === "level",
  );
});

Deno.test("splitAssignment splits at the first '=' and trims", () => {
  assert.deepEqual(splitAssignment(" level = G2 ", "--set"), ["level", "G2"]);
  assert.deepEqual(splitAssignment("note=a=b", "--set"), ["note", "a=b"]);
  assert.throws(() => splitAssignment("=G2", "--set"), names('"=G2"'));
  assert.throws(() => splitAssignment("level", "--set"), names('"level"'));
});

Deno.test("applySets edits a copy and warns about values outside the data", () => {
  const model = handModel();
  const base = typicalProfile(model);
  const { profile, warnings } = applySets(model, base, ["level=G3", "years=25"]);
  assert.deepEqual(Array.from(profile), [2, 25, 0]);
  assert.deepEqual(Array.from(base), [1, 8, 0]);
  assert.deepEqual(warnings.map((w) => w.feature), ["years"]);
  assert.equal(warnings[0].value, 25);
  assert.deepEqual(applySets(model, base, []).warnings, []);
});

Deno.test("a protected attribute is no lever, unless the model allows protected attributes", () => {
  const model = handModel();
  model.features[2] = { ...model.features[2], protected: true };
  assert.throws(() => applySets(model, typicalProfile(model), ["site=South"]), names('"site"'));
  assert.throws(() => applyChanges(model, typicalProfile(model), ["site=South"]), names('"site"'));
  model.settings = { ...model.settings, allowProtected: true };
  assert.equal(applySets(model, typicalProfile(model), ["site=South"]).profile[2], 1);
});

Deno.test("applyChanges: +N and -N steps of a ladder or a number, else a value", () => {
  const model = handModel();
  const base = typicalProfile(model); // G2, 8 years, North
  assert.deepEqual(Array.from(applyChanges(model, base, ["level=+1"]).profile), [2, 8, 0]);
  assert.deepEqual(Array.from(applyChanges(model, base, ["level=-1", "years=+2"]).profile), [
    0,
    10,
    0,
  ]);
  assert.deepEqual(Array.from(applyChanges(model, base, ["years=3", "site=South"]).profile), [
    1,
    3,
    1,
  ]);
  assert.throws(() => applyChanges(model, base, ["level=+2"]), names("G1 to G3"));
  const missing = Float64Array.of(NaN, 8, 0);
  assert.throws(() => applyChanges(model, missing, ["level=+1"]), names('"level"'));
  // A number's step from a missing value is refused too (it gave NaN, said nowhere).
  const noYears = Float64Array.of(1, NaN, 0);
  assert.throws(() => applyChanges(model, noYears, ["years=+2"]), names('"years"'));
  assert.deepEqual(Array.from(applyChanges(model, noYears, ["years=3"]).profile), [1, 3, 0]);
  assert.equal(applyChanges(model, base, ["years=+20"]).warnings.length, 1);
  // A number's step may have decimals: 8 + 2.5 and 8 - 1.5 (it set 2.5 and -1.5 before).
  assert.equal(applyChanges(model, base, ["years=+2.5"]).profile[1], 10.5);
  assert.equal(applyChanges(model, base, ["years=-1.5"]).profile[1], 6.5);
  assert.throws(() => applyChanges(model, base, ["level=+1.5"]));
});

Deno.test("rangeWarnings and describeProfile", () => {
  const model = handModel();
  assert.deepEqual(rangeWarnings(model, Float64Array.of(1, 20, 0)), []);
  assert.deepEqual(rangeWarnings(model, Float64Array.of(1, NaN, 0)), []);
  assert.deepEqual(rangeWarnings(model, Float64Array.of(1, -1, 0)).map((w) => w.feature), [
    "years",
  ]);
  assert.deepEqual(describeProfile(model, Float64Array.of(2, 4.5, 1)), {
    level: "G3",
    years: 4.5,
    site: "South",
  });
  assert.deepEqual(describeProfile(model, Float64Array.of(NaN, NaN, 7)), {
    level: null,
    years: null,
    site: "7",
  });
});
