// A what-if on the hand model (tests/lib/model/_hand_model.ts): the change
// from the trees' paired changes in money, the relative change from their
// log changes, what changed and where the reference path first differs.
import assert from "node:assert/strict";
import { OptionError } from "../../../mod.ts";
import { openModel } from "../../../lib/model/model_session.ts";
import { compareAnswer } from "../../../lib/model/compare_answer.ts";
import { classModel, handModel, SHIFT, treeLogs, treeOnlyModel } from "./_hand_model.ts";
import { close, meanOf, type7 } from "./_quantile.ts";

const BASE = Float64Array.of(1, 5, 0); // G2, 5 years, North
const LATER = Float64Array.of(1, 15, 0); // the same with 15 years

Deno.test("from 5 to 15 years: paired changes in money and in share", () => {
  const answer = compareAnswer(openModel(handModel()), BASE, LATER, 0.9);
  const a = treeLogs(1, 5);
  const b = treeLogs(1, 15);
  const money = b.map((v, t) => Math.exp(v + SHIFT) - Math.exp(a[t] + SHIFT));
  // Tree by tree: 15,000 and 16,000 more (times e^0.01), the level tree 0.
  close(money[0], 15000 * Math.exp(SHIFT), 1e-9);
  close(
    answer.difference.estimate,
    Math.exp(meanOf(b) + SHIFT) - Math.exp(meanOf(a) + SHIFT),
    1e-9,
  );
  close(answer.difference.low!, type7(money, 0.05), 1e-9);
  close(answer.difference.high!, type7(money, 0.95), 1e-9);
  const logChange = b.map((v, t) => v - a[t]);
  close(answer.difference.relative.estimate, Math.expm1(meanOf(b) - meanOf(a)));
  close(answer.difference.relative.low!, Math.expm1(type7(logChange, 0.05)));
  close(answer.difference.relative.high!, Math.expm1(type7(logChange, 0.95)));
  assert.equal(answer.difference.coverage, 0.9);
  assert.deepEqual(answer.changes, [{ feature: "years", from: 5, to: 15 }]);
  // The reference tree does not split on years: the same path.
  assert.equal(answer.pathChange, null);
  close(answer.base.estimate, Math.exp(meanOf(a) + SHIFT));
  close(answer.changed.estimate, Math.exp(meanOf(b) + SHIFT));
});

Deno.test("a change of site changes the path's second step", () => {
  const south = Float64Array.of(1, 5, 1);
  const answer = compareAnswer(openModel(handModel()), BASE, south);
  assert.deepEqual(answer.changes, [{ feature: "site", from: "North", to: "South" }]);
  // The merged paths' second conditions (their wording is merge_path's).
  assert.deepEqual(answer.pathChange, {
    step: 2,
    base: answer.base.path[1].condition,
    changed: answer.changed.path[1].condition,
  });
  assert.notEqual(answer.base.path[1].condition, answer.changed.path[1].condition);
  assert.equal(answer.base.path[0].condition, answer.changed.path[0].condition);
  // No tree of the ensemble splits on site: no change at all.
  assert.equal(answer.difference.estimate, 0);
  // G1 to G2: the first step differs, and the G1 path is one step shorter.
  const promoted = compareAnswer(openModel(handModel()), Float64Array.of(0, 5, 0), BASE);
  assert.equal(promoted.base.path.length, 1);
  assert.deepEqual(promoted.pathChange, {
    step: 1,
    base: promoted.base.path[0].condition,
    changed: promoted.changed.path[0].condition,
  });
  // A missing value counts as a change from the number.
  const missing = compareAnswer(openModel(handModel()), BASE, Float64Array.of(1, NaN, 0));
  assert.deepEqual(missing.changes, [{ feature: "years", from: 5, to: null }]);
});

Deno.test("without an ensemble: the reference tree's change, no interval", () => {
  const answer = compareAnswer(openModel(treeOnlyModel()), BASE, Float64Array.of(1, 5, 1));
  close(answer.difference.estimate, 10000, 1e-9);
  close(answer.difference.relative.estimate, 0.2);
  assert.equal(answer.difference.low, null);
  assert.equal(answer.difference.relative.high, null);
});

Deno.test("a class model is refused, naming its target", () => {
  assert.throws(
    () => compareAnswer(openModel(classModel()), BASE, LATER),
    (e: Error) => e instanceof OptionError && e.message.includes('"grade"'),
  );
});
