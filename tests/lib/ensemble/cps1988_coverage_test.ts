// Coverage on open data: a held-out 20% of CPS1988 (R package AER;
// fixtures/README.md), weekly wage on education, experience, smsa, region
// and parttime, the default model (log scale, trees pruned at the reference
// tree's minimum-CV alpha, ranges from residuals grouped by estimate). The
// 90% range must cover 87-93% of the held-out people; the figure is in the
// test name.
import assert from "node:assert/strict";
import {
  DEFAULT_RANGE,
  fitDefaultEnsemble,
  groupedRange,
  groupResiduals,
  mean,
  treeEstimates,
} from "../../../mod.ts";
import { cps1988LogWage, heldOutSplit } from "../_cps1988.ts";

const { train, test } = heldOutSplit(await cps1988LogWage(), 1988);
if (DEFAULT_RANGE.scale !== "log") throw new Error("this check assumes the log scale");
const { ensemble } = await fitDefaultEnsemble(train, { trees: 200, seed: 5, workers: 2 });
const groups = groupResiduals(ensemble.oob, train.target.values, 10);
let inside = 0;
for (let r = 0; r < test.rows; r++) {
  const estimate = mean(treeEstimates(ensemble, test.features.map((f) => f.values[r])));
  const range = groupedRange(estimate, groups, 0.9);
  const y = test.target.values[r];
  if (y >= range.low && y <= range.high) inside++;
}
const share = inside / test.rows;

Deno.test(`CPS1988 held-out 20%: the default 90% range covers ${(100 * share).toFixed(1)}%`, () => {
  assert.ok(share >= 0.87 && share <= 0.93, `${share}`);
});
