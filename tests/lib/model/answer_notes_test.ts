// An answer's notes are data: the kinds and figures an estimate, a sweep
// and a batch row carry, and distinctNotes keeping the first of repeats.
import assert from "node:assert/strict";
import { distinctNotes, estimateProfile, openModel, rangeWarnings } from "../../../mod.ts";
import { handModel } from "./_hand_model.ts";

Deno.test("distinctNotes keeps the first of equal notes, in order", () => {
  const outside = {
    kind: "valueOutsideData" as const,
    feature: "years",
    value: 25,
    min: 0,
    max: 20,
  };
  const notes = distinctNotes([
    { kind: "treesDisagree" as const },
    { ...outside },
    { kind: "treesDisagree" as const },
    { ...outside, value: 26 },
    { ...outside },
  ]);
  assert.deepEqual(notes, [{ kind: "treesDisagree" }, outside, { ...outside, value: 26 }]);
});

Deno.test("an estimate's notes carry the figures they rest on, not sentences", () => {
  const model = handModel();
  // years 25: beyond the data (0 to 20) and beyond what level G2 has.
  const profile = Float64Array.of(1, 25, 0);
  const answer = estimateProfile(openModel(model), profile, 0.9, rangeWarnings(model, profile));
  assert.deepEqual(answer.warnings[0], {
    kind: "valueOutsideData",
    feature: "years",
    value: 25,
    min: 0,
    max: 20,
  });
  const unusual = answer.warnings.find((w) => w.kind === "unusualProfile");
  assert(unusual?.kind === "unusualProfile");
  assert.deepEqual(unusual.reasons, answer.support.reasons);
  assert.deepEqual(unusual.reasons.map((r) => r.kind), ["aboveLevelRange", "outsideData"]);
  for (const note of answer.warnings) {
    for (const value of Object.values(note)) assert.notEqual(typeof value, "function");
  }
  assert.equal(
    JSON.stringify(answer.warnings).includes(" the "),
    false,
    "no sentence in the notes",
  );
});
