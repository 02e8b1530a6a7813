// Each attribute's part of an estimate (lib/model/contributions_answer.ts):
// on the hand model every part is worked out on paper from its one-split
// trees (a one-split tree's part is its leaf minus the cover mean of its two
// leaves, Shapley 1953 with one player); on the demo model the parts add up
// to the estimate on every row of the table.
import assert from "node:assert/strict";
import {
  changeContributions,
  contributionsOf,
  estimateProfile,
  openModel,
  readForModel,
  rowProfile,
} from "../../../mod.ts";
import { BY_LEVEL, classModel, handModel, HIGH, LOW, SHIFT, treeOnlyModel } from "./_hand_model.ts";
import { close } from "./_quantile.ts";
import { DEMO_PATH, demoModel } from "./_demo_model.ts";

// Level G2 (code 1), 5 years, North.
const G2_5_NORTH = Float64Array.of(1, 5, 0);

Deno.test("the hand model's parts, worked out from its three one-split trees", () => {
  const answer = contributionsOf(handModel(), G2_5_NORTH)!;
  // Trees 0 and 1 split on years at 10 (10 people each side), tree 2 on level.
  const years = (0.5 * Math.log(LOW[0] / HIGH[0]) + 0.5 * Math.log(LOW[1] / HIGH[1])) / 3;
  const level = (0.5 * Math.log(BY_LEVEL[1] / BY_LEVEL[0])) / 3;
  const base = (Math.log(LOW[0] * HIGH[0]) / 2 + Math.log(LOW[1] * HIGH[1]) / 2 +
    Math.log(BY_LEVEL[0] * BY_LEVEL[1]) / 2) / 3;
  assert.deepEqual(answer.parts.map((p) => p.feature), ["years", "level", "site"]);
  const [y, l, s] = answer.parts;
  close(y.part, years);
  close(l.part, level);
  assert.equal(s.part, 0);
  close(answer.base, Math.exp(base + SHIFT));
  close(y.percent!, Math.exp(years) - 1);
  // Money: what the estimate would lose without the part.
  close(y.money, answer.estimate * (1 - Math.exp(-years)));
  assert.deepEqual([y.value, l.value, s.value], [5, "G2", "North"]);
  close(answer.estimate, estimateProfile(openModel(handModel()), G2_5_NORTH).estimate);
  assert.equal(answer.moneyPartsMultiply, true);
  assert.equal(answer.trees, 3);
});

Deno.test("a change's parts: only the attributes whose parts move, adding up to the change", () => {
  const to = Float64Array.of(1, 12, 0); // 12 years instead of 5
  const change = changeContributions(handModel(), G2_5_NORTH, to)!;
  assert.deepEqual(change.parts.map((p) => p.feature), ["years"]);
  const part = (Math.log(HIGH[0] / LOW[0]) + Math.log(HIGH[1] / LOW[1])) / 3;
  close(change.parts[0].part, part);
  assert.deepEqual([change.parts[0].from, change.parts[0].value], [5, 12]);
  close(change.toEstimate, change.fromEstimate * Math.exp(part));
});

Deno.test("no parts for a class model; the reference tree's without an ensemble", () => {
  assert.equal(contributionsOf(classModel(), G2_5_NORTH), null);
  const answer = contributionsOf(treeOnlyModel(), G2_5_NORTH)!;
  assert.equal(answer.trees, 1);
  close(answer.estimate, estimateProfile(openModel(treeOnlyModel()), G2_5_NORTH).estimate);
});

Deno.test("on the demo model the parts add up to the estimate on every row (1e-9)", async () => {
  const { model } = await demoModel();
  const rows = readForModel(model, Deno.readFileSync(DEMO_PATH), "demo_company.csv");
  assert.equal(rows.rows, 2000);
  const session = openModel(model);
  let worst = 0;
  for (let r = 0; r < rows.rows; r++) {
    const profile = rowProfile(rows, r);
    const answer = contributionsOf(model, profile)!;
    const sum = answer.parts.reduce((s, p) => s + p.part, 0);
    // On the fitting scale: log(estimate) - log(base) is the parts' sum.
    worst = Math.max(worst, Math.abs(Math.log(answer.estimate / answer.base) - sum));
    if (r % 400 === 0) {
      close(answer.estimate, estimateProfile(session, profile).estimate);
    }
  }
  assert.ok(worst <= 1e-9, `worst ${worst}`);
  // The protected attribute is no feature, so it has no part.
  const answer = contributionsOf(model, rowProfile(rows, 0))!;
  assert.ok(answer.parts.every((p) => p.feature !== "gender"));
  assert.equal(answer.parts.length, model.features.length);
});
