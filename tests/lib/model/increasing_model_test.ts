// A promotion that lowers the estimate, as a manager meets it: an invented
// table where level G3 happens to be paid less than G2. Unconstrained, the
// what-if and the sweep say the estimate falls and name the option; fitted
// with `increasing: ["level"]` the estimate never falls and nothing is said.
import assert from "node:assert/strict";
import {
  compareAnswer,
  fitModel,
  loadTable,
  modelFromText,
  modelToText,
  openModel,
  OptionError,
  sweepAnswer,
  typicalProfile,
} from "../../../mod.ts";

// 40 people per level; G3 paid below G2 (a thin, odd part of a table).
const PAY = { G1: 50000, G2: 62000, G3: 58000, G4: 75000 };
const rows = Object.entries(PAY).flatMap(([level, pay]) =>
  Array.from({ length: 40 }, (_, i) => `${level},${i % 20},${pay + 150 * (i % 7)}`)
);
const table = loadTable(`level,years,pay\n${rows.join("\n")}\n`, {
  target: "pay",
  orders: { level: ["G1", "G2", "G3", "G4"] },
});
const settings = { target: "pay", trees: 20, folds: 5, workers: 1 };

Deno.test("unconstrained: the promotion and the sweep say the estimate falls", async () => {
  const model = await fitModel(table, settings);
  assert.deepEqual(model.settings.increasing, []);
  const session = openModel(model);
  const base = typicalProfile(model);
  const level = model.features.findIndex((f) => f.name === "level");
  base[level] = 1; // G2
  const promoted = Float64Array.from(base);
  promoted[level] = 2; // G3
  const answer = compareAnswer(session, base, promoted);
  assert.ok(answer.changed.estimate < answer.base.estimate);
  assert.deepEqual(answer.warnings, [
    { kind: "estimateFalls", feature: "level", from: "G2", to: "G3" },
  ]);
  const sweep = sweepAnswer(session, base, level, [0, 1, 2, 3]);
  assert.ok(sweep.warnings.some((w) => w.kind === "estimateFalls" && w.from === "G2"));
  // A change that is not a rise (a demotion) is not flagged; nor a fall
  // with two changes at once, which cannot be put on the promotion.
  const back = compareAnswer(session, promoted, base);
  assert.deepEqual(back.warnings, []);
  const both = Float64Array.from(promoted);
  both[model.features.findIndex((f) => f.name === "years")] += 3;
  const twice = compareAnswer(session, base, both);
  assert.ok(twice.changed.estimate < twice.base.estimate);
  assert.deepEqual(twice.warnings, []);
});

Deno.test("with increasing level: the estimate never falls, and the file says so", async () => {
  const model = await fitModel(table, { ...settings, increasing: ["level"] });
  assert.deepEqual(model.settings.increasing, ["level"]);
  // The model file keeps the constraint; a file written before it reads as none.
  const text = modelToText(model);
  assert.deepEqual(modelFromText(text, "m.json").settings.increasing, ["level"]);
  const session = openModel(model);
  const profile = typicalProfile(model);
  const level = model.features.findIndex((f) => f.name === "level");
  for (const years of [0, 7, 19]) {
    profile[model.features.findIndex((f) => f.name === "years")] = years;
    const sweep = sweepAnswer(session, profile, level, [0, 1, 2, 3]);
    const estimates = sweep.points.map((p) => p.estimate);
    for (let i = 1; i < 4; i++) assert.ok(estimates[i] >= estimates[i - 1], `${estimates}`);
    assert.ok(!sweep.warnings.some((w) => w.kind === "estimateFalls"));
  }
  // G2 and G3 are paid alike now: the constrained trees pool them.
  const g2 = Float64Array.from(profile);
  g2[level] = 1;
  const g3 = Float64Array.from(profile);
  g3[level] = 2;
  assert.deepEqual(compareAnswer(session, g2, g3).warnings, []);
});

Deno.test("increasing refuses a categorical attribute, an unknown one and a class target", async () => {
  const body = Array.from({ length: 20 }, (_, i) => `${"AB"[i % 2]},G${1 + (i % 3)},${40 + i}`);
  const sites = loadTable(`site,level,pay\n${body.join("\n")}\n`, { target: "pay" });
  await assert.rejects(
    fitModel(sites, { ...settings, increasing: ["site"] }),
    (e) => e instanceof OptionError && /"site" is categorical/.test(e.message),
  );
  await assert.rejects(
    fitModel(table, { ...settings, increasing: ["grade"] }),
    (e) => e instanceof OptionError && /"grade" is not among the attributes/.test(e.message),
  );
  await assert.rejects(
    fitModel(table, { ...settings, target: "level", increasing: ["years"] }),
    (e) => e instanceof OptionError && /constrains an estimate of pay/.test(e.message),
  );
});
