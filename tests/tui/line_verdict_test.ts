// The sentence under the accuracy table follows from the table: the case
// that once said "the ensemble's typical error is 3.0% below the straight
// line's: the data has steps a line misses" while the line was better on
// MAE and on log RMSE now says the figures disagree; a model worse on every
// measure is never recommended. Figures are built here and run through the
// real renderer.
import assert from "node:assert/strict";
import type { Accuracy } from "../../mod.ts";
import { compareWithLine } from "../../mod.ts";
import { renderAccuracy } from "../../tui/render/model_view.ts";
import { makeStyle } from "../../tui/render/style.ts";
import { demoModel } from "../lib/model/_demo_model.ts";

const { model } = await demoModel();
const fig = (rmse: number, mae: number, r2 = 0.5) => ({ rmse, mae, r2 });
const acc = (money: ReturnType<typeof fig>, log: ReturnType<typeof fig>, by = "cross-validation") =>
  ({ measuredBy: by, money, log }) as Accuracy;

function sentence(ensemble: Accuracy, linear: Accuracy): string {
  const m = { ...model, quality: { ...model.quality, ensemble, linear } };
  const lines = renderAccuracy(m, { style: makeStyle(false), width: 200, numbers: {} });
  return lines.join(" ").replace(/\s+/g, " ");
}

Deno.test("money RMSE better but MAE and log RMSE worse: the figures disagree", () => {
  const ensemble = acc(fig(9700, 7900), fig(0.110, 0.0795), "out-of-bag");
  const linear = acc(fig(10000, 7600), fig(0.105, 0.079));
  assert.equal(compareWithLine(ensemble, null, linear)!.verdict, "mixed");
  const text = sentence(ensemble, linear);
  assert.match(
    text,
    /The figures disagree: the ensemble errs less on RMSE, the straight line on MAE, log RMSE; neither is clearly better/,
  );
  assert.doesNotMatch(text, /steps or interactions|prefer/);
});

Deno.test("worse on every measure: the line is said to fit as well, the trees not recommended", () => {
  const ensemble = acc(fig(10500, 8100), fig(0.12, 0.09), "out-of-bag");
  const linear = acc(fig(10000, 7600), fig(0.105, 0.079));
  const text = sentence(ensemble, linear);
  assert.match(
    text,
    /The straight line errs less than the ensemble on RMSE, MAE, log RMSE, log MAE/,
  );
  assert.doesNotMatch(text, /steps or interactions/);
});

Deno.test("better on every measure: the trees' verdict, with the RMSE gain", () => {
  const ensemble = acc(fig(9000, 7000), fig(0.09, 0.07), "out-of-bag");
  const linear = acc(fig(10000, 7600), fig(0.105, 0.079));
  const text = sentence(ensemble, linear);
  assert.match(
    text,
    /The ensemble errs less than the straight line on RMSE, MAE, log RMSE, log MAE \(RMSE 10\.0% lower/,
  );
});

Deno.test("the accuracy table names the scale of each figure", () => {
  const text = sentence(model.quality.ensemble!, model.quality.linear!);
  assert.match(text, /RMSE, MAE and R² on pay itself, in EUR; log RMSE and log MAE on log pay/);
});
