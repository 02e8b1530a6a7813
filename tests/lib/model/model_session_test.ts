// A model opened for answers, on the hand model (tests/lib/model/_hand_model.ts).
import assert from "node:assert/strict";
import { OptionError, STATE_WORDS } from "../../../mod.ts";
import {
  checkCoverage,
  openModel,
  resamplesOf,
  shiftedMoney,
} from "../../../lib/model/model_session.ts";
import { classModel, handModel, SHIFT, treeOnlyModel } from "./_hand_model.ts";

Deno.test("openModel builds a reader for a pay model with an ensemble, none otherwise", () => {
  const model = handModel();
  const session = openModel(model);
  assert.equal(session.model, model);
  const reader = session.reader!;
  assert.equal(reader.ensemble.trees, model.ensemble!.trees);
  assert.equal(reader.scale, "log");
  assert.equal(reader.trainingRows, 20);
  assert.equal(reader.center, model.target.center);
  assert.equal(reader.groups, model.residuals);
  // Three trees for twenty rows: too few trees per row for the jackknife.
  assert.equal(reader.bag, null);
  assert.equal(reader.jackknifeWithheld, false);
  assert.equal(openModel(treeOnlyModel()).reader, null);
  assert.equal(openModel(classModel()).reader, null);
});

Deno.test("resamplesOf: the analyst's states when there is one per tree", () => {
  const model = handModel();
  assert.equal(resamplesOf(model), model.analyst!.resamples);
  assert.equal(model.analyst!.resamples.length, 3 * STATE_WORDS);
  assert.equal(resamplesOf({ ...model, analyst: null }), null);
  const short = { ...model, analyst: { resamples: new Int32Array(8), rowKeys: null } };
  assert.equal(resamplesOf(short), null);
  assert.equal(resamplesOf({ ...model, ensemble: null }), null);
});

Deno.test("checkCoverage accepts 0.5 to 0.99 and names a value outside", () => {
  for (const c of [0.5, 0.9, 0.99]) checkCoverage(c);
  for (const c of [0.49, 0.995, 1, NaN]) {
    assert.throws(
      () => checkCoverage(c),
      (e: Error) => e instanceof OptionError && e.message.includes(String(c)),
    );
  }
});

Deno.test("shiftedMoney: exp(value + shift) on logs, the value itself on the raw scale", () => {
  const model = handModel();
  assert(Math.abs(shiftedMoney(model, Math.log(50000)) - 50000 * Math.exp(SHIFT)) < 1e-6);
  const unshifted = { ...model, target: { ...model.target, center: undefined } };
  assert(Math.abs(shiftedMoney(unshifted, Math.log(50000)) - 50000) < 1e-6);
  const raw = { ...model, target: { ...model.target, scale: "raw" as const } };
  assert.equal(shiftedMoney(raw, 50000), 50000);
});
