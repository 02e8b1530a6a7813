// Levers of the explore screen (lib/model/levers.ts) on the invented demo
// company: the steps a person would expect, and properties of a move that
// hold for any profile and any sequence of keys (fast-check).
import assert from "node:assert/strict";
import fc from "fast-check";
import { demoCompanyCsv, fitModel, loadTable, typicalProfile } from "../../../mod.ts";
import { levers, moveLever } from "../../../lib/model/levers.ts";

const model = await fitModel(loadTable(demoCompanyCsv({ rows: 600, seed: 5 })), {
  target: "base_pay_eur",
  trees: 5,
  folds: 3,
  workers: 1,
});
const all = levers(model);
const byName = (name: string) => all.find((l) => l.name === name)!;
const typical = typicalProfile(model);

Deno.test("the demo's levers: no protected attribute, a year of experience, a whole rating", () => {
  assert(!all.some((l) => l.name === "gender"));
  assert.deepEqual(
    all.map((l) => l.index),
    model.features.flatMap((f, i) => (f.protected ? [] : [i])),
  );
  assert.equal(byName("years_experience").step, 1);
  assert.equal(byName("performance_rating").step, 1);
  assert.deepEqual(byName("level").levels, ["G1", "G2", "G3", "G4", "G5", "G6", "G7"]);
});

Deno.test("any keys: a level stays on the ladder, a number inside the table's range and on its step", () => {
  fc.assert(
    fc.property(
      fc.array(fc.tuple(fc.nat(all.length - 1), fc.boolean(), fc.boolean()), { maxLength: 60 }),
      (keys) => {
        let profile = typical;
        for (const [which, up, big] of keys) {
          const lever = all[which];
          const previous = profile;
          const before = profile[lever.index];
          profile = moveLever(profile, lever, up ? 1 : -1, big, typical);
          const after = profile[lever.index];
          // Only the moved attribute changes.
          profile.forEach((v, i) => {
            if (i !== lever.index) assert(Object.is(v, previous[i]));
          });
          if (lever.step === null) {
            assert(Number.isInteger(after) && after >= 0 && after < lever.levels!.length);
            assert(up ? after >= before : after <= before);
          } else {
            assert(after >= lever.min! && after <= lever.max!);
            const onGrid = Math.abs(after / lever.step - Math.round(after / lever.step)) < 1e-9;
            assert(onGrid || after === lever.min || after === lever.max, `${after}`);
            assert(up ? after >= before : after <= before);
          }
        }
      },
    ),
  );
});

Deno.test("up then down returns a number on its step to where it was", () => {
  const years = byName("years_experience");
  fc.assert(
    fc.property(fc.integer({ min: 2, max: 30 }), fc.boolean(), (start, big) => {
      const profile = Float64Array.from(typical);
      profile[years.index] = start;
      const up = moveLever(profile, years, 1, big, typical);
      const back = moveLever(up, years, -1, big, typical);
      assert.equal(back[years.index], start);
    }),
  );
});
