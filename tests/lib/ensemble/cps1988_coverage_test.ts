// Coverage on open data: a held-out 20% of CPS1988 (R package AER;
// fixtures/README.md), weekly wage on education, experience, smsa, region
// and parttime, the default model (log scale, trees pruned at the reference
// tree's minimum-CV alpha, ranges from residuals grouped by estimate). The
// 90% range must cover 87-93% of the held-out people; the figure is in the
// test name. The quantile regression forest range (used where the table is
// at hand) is held to the same band.
import assert from "node:assert/strict";
import {
  DEFAULT_RANGE,
  fitDefaultEnsemble,
  groupedRange,
  groupResiduals,
  leafMembers,
  mean,
  quantileForestRange,
  treeEstimates,
} from "../../../mod.ts";
import { cps1988LogWage, heldOutSplit } from "../_cps1988.ts";

const { train, test } = heldOutSplit(await cps1988LogWage(), 1988);
if (DEFAULT_RANGE.scale !== "log") throw new Error("this check assumes the log scale");
const ensemble = (await fitDefaultEnsemble(train, { trees: 200, seed: 5, workers: 2 })).ensemble!;
const groups = groupResiduals(ensemble.oob, train.target.values, 10);
const members = leafMembers(ensemble, train);
let inside = 0;
let insideForest = 0;
for (let r = 0; r < test.rows; r++) {
  const profile = test.features.map((f) => f.values[r]);
  const range = groupedRange(mean(treeEstimates(ensemble, profile)), groups, 0.9);
  const forest = quantileForestRange(ensemble, members, profile, 0.9);
  const y = test.target.values[r];
  if (y >= range.low && y <= range.high) inside++;
  if (y >= forest.low && y <= forest.high) insideForest++;
}
const share = inside / test.rows;
const shareForest = insideForest / test.rows;

Deno.test(`CPS1988 held-out 20%: the default 90% range covers ${(100 * share).toFixed(1)}%`, () => {
  assert.ok(share >= 0.87 && share <= 0.93, `${share}`);
});

Deno.test(
  `CPS1988 held-out 20%: the quantile forest 90% range covers ${(100 * shareForest).toFixed(1)}%`,
  () => {
    assert.ok(shareForest >= 0.87 && shareForest <= 0.93, `${shareForest}`);
  },
);
