// Coverage on open data: a held-out 20% of CPS1988 (R package AER;
// fixtures/README.md), weekly wage on education, experience, smsa, region
// and parttime, the default model (log scale, trees pruned at the reference
// tree's minimum-CV alpha, ranges from residuals grouped by estimate). The
// 90% range must cover 87-93% of the held-out people; the figure is in the
// test name.
import assert from "node:assert/strict";
import {
  crossValidateTree,
  DEFAULT_PRUNING,
  DEFAULT_RANGE,
  fitEnsembleParallel,
  groupedRange,
  groupResiduals,
  loadTableFile,
  makeDataset,
  makeRng,
  mean,
  shuffle,
  treeEstimates,
} from "../../../mod.ts";
import type { Dataset } from "../../../mod.ts";

const table = await loadTableFile(
  new URL("../../../fixtures/cps1988.csv", import.meta.url).pathname,
  { target: "wage" },
);
const { dataset } = makeDataset(table, { target: "wage" });
const wage = dataset.target.values as Float64Array;
const order = shuffle(Array.from({ length: dataset.rows }, (_, i) => i), makeRng(1988));
const cut = Math.floor(0.8 * dataset.rows);
const subset = (rows: number[]): Dataset => ({
  rows: rows.length,
  features: dataset.features.map((f) => ({
    ...f,
    values: Float64Array.from(rows, (r) => f.values[r]),
  })),
  target: {
    kind: "regression",
    name: "log wage",
    values: Float64Array.from(rows, (r) => Math.log(wage[r])),
  },
});
const train = subset(order.slice(0, cut));
const test = subset(order.slice(cut));
if (DEFAULT_RANGE.scale !== "log") throw new Error("this check assumes the log scale");
const cv = crossValidateTree(train, { folds: 10, seed: 1, rule: DEFAULT_PRUNING.alphaRule });
const ensemble = await fitEnsembleParallel(train, {
  trees: 200,
  seed: 5,
  prune: DEFAULT_PRUNING.mode,
  alpha: cv.candidates[cv.chosen].alpha,
  workers: 2,
});
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
