// Sweeps on the hand model (tests/lib/model/_hand_model.ts): the grid,
// each point's estimate, the partial dependence averaged over rows worked
// out from the trees' splits, and the notes for values beyond the data.
import assert from "node:assert/strict";
import { OptionError } from "../../../mod.ts";
import { openModel } from "../../../lib/model/model_session.ts";
import { readForModel } from "../../../lib/model/model_table.ts";
import { sweepAnswer, sweepValues } from "../../../lib/model/sweep_answer.ts";
import {
  classModel,
  handModel,
  SHIFT,
  TRAINING,
  trainingCsv,
  treeLogs,
  treeOnlyModel,
} from "./_hand_model.ts";
import { close, meanOf } from "./_quantile.ts";

Deno.test("sweepValues: every level, or evenly spaced numbers from p01 to p99 by default", () => {
  const model = handModel();
  assert.deepEqual(sweepValues(model, 0), [0, 1, 2]);
  assert.deepEqual(sweepValues(model, 2), [0, 1]);
  // years: p01 1, p99 19, 10 steps of 2.
  assert.deepEqual(sweepValues(model, 1, { steps: 10 }), [1, 3, 5, 7, 9, 11, 13, 15, 17, 19]);
  assert.equal(sweepValues(model, 1).length, 20);
  // Rounded to 10 digits: 0 to 0.3 in 4 steps is 0, 0.1, 0.2, 0.3 exactly.
  assert.deepEqual(sweepValues(model, 1, { from: 0, to: 0.3, steps: 4 }), [0, 0.1, 0.2, 0.3]);
  for (const steps of [1, 501, 2.5]) {
    assert.throws(
      () => sweepValues(model, 1, { steps }),
      (e: Error) => e instanceof OptionError && e.message.includes(String(steps)),
    );
  }
  assert.throws(() => sweepValues(model, 1, { from: 5, to: 5 }), OptionError);
});

Deno.test("each point is the profile's estimate with the attribute set", () => {
  const session = openModel(handModel());
  const answer = sweepAnswer(session, Float64Array.of(1, 8, 0), 1, [5, 15], 0.9);
  assert.equal(answer.feature, "years");
  assert.deepEqual(answer.points.map((p) => p.value), [5, 15]);
  close(answer.points[0].estimate, Math.exp(meanOf(treeLogs(1, 5)) + SHIFT));
  close(answer.points[1].estimate, Math.exp(meanOf(treeLogs(1, 15)) + SHIFT));
  assert(answer.points.every((p) => p.range !== null && p.confidence !== null));
  assert.deepEqual(answer.points.map((p) => p.unusual), [false, true]); // 15 years is beyond G2's 12
  assert.deepEqual(answer.profile, { level: "G2", years: 8, site: "North" });
  // One note: unusual at 15.
  assert.equal(answer.warnings.length, 1);
  assert.deepEqual(answer.warnings[0], { kind: "sweepUnusual", feature: "years", values: [15] });
  // A level sweep names the levels.
  const levels = sweepAnswer(session, Float64Array.of(1, 5, 0), 0, [0, 1, 2]);
  assert.deepEqual(levels.points.map((p) => p.value), ["G1", "G2", "G3"]);
});

Deno.test("values beyond the data's range get a note", () => {
  const answer = sweepAnswer(openModel(handModel()), Float64Array.of(2, 8, 0), 1, [10, 25]);
  assert.deepEqual(answer.warnings.find((w) => w.kind === "sweepBeyondData"), {
    kind: "sweepBeyondData",
    feature: "years",
    min: 0,
    max: 20,
  });
  assert.deepEqual(answer.points.map((p) => p.unusual), [false, true]);
});

Deno.test("the average over a table's rows: partial dependence worked out from the splits", () => {
  const model = handModel();
  const rows = readForModel(model, trainingCsv(), "hand.csv");
  const answer = sweepAnswer(openModel(model), Float64Array.of(1, 8, 0), 1, [5, 15], 0.9, rows);
  for (const point of answer.points) {
    const years = point.value as number;
    const expected = meanOf(
      TRAINING.map(([, level]) => Math.exp(meanOf(treeLogs(level, years)) + SHIFT)),
    );
    close(point.average, expected, 1e-12);
  }
  // Without an ensemble: the reference tree's leaves averaged, not shifted
  // (years is not in the tree: the same at every point).
  const tree = treeOnlyModel();
  const flat = sweepAnswer(openModel(tree), Float64Array.of(1, 8, 0), 1, [5, 15], 0.9, rows);
  const leaf = (l: number, s: number) => (l === 0 ? 40000 : s === 0 ? 50000 : 60000);
  const expected = meanOf(TRAINING.map(([, l, , s]) => leaf(l, s)));
  close(flat.points[0].average, expected, 1e-12);
  close(flat.points[1].average, expected, 1e-12);
  assert.equal(flat.points[0].range, null);
});

Deno.test("a class model and a coverage outside 0.5 to 0.99 are refused", () => {
  assert.throws(
    () => sweepAnswer(openModel(classModel()), Float64Array.of(1, 5, 0), 1, [1, 2]),
    OptionError,
  );
  assert.throws(
    () => sweepAnswer(openModel(handModel()), Float64Array.of(1, 5, 0), 1, [1, 2], 1),
    OptionError,
  );
});
