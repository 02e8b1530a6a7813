// Coverage is measured, not assumed: on an invented table whose log-pay
// noise grows with level (sd 0.05 + 0.02 x level, levels 1-7; 300 training
// and 300 held-out rows per level), the default 90% range must cover 87-93%
// of held-out rows overall and 85-95% within every level, and a range whose
// width ignores the level must fail the per-level band.
import assert from "node:assert/strict";
import {
  crossValidateTree,
  DEFAULT_PRUNING,
  DEFAULT_RANGE,
  fitEnsembleParallel,
  groupedRange,
  groupResiduals,
  mean,
  oobResiduals,
  residualRange,
  treeEstimates,
} from "../../../mod.ts";
import { simulatePay } from "./_simulated_pay.ts";

const train = simulatePay(300, 101);
const test = simulatePay(300, 202);

async function coverage(scale: "log" | "raw", method: "grouped" | "one-set") {
  const forward = scale === "log" ? Math.log : (x: number) => x;
  const back = scale === "log" ? Math.exp : (x: number) => x;
  const dataset = {
    ...train.dataset,
    target: { kind: "regression" as const, name: "pay", values: train.pay.map(forward) },
  };
  const cv = crossValidateTree(dataset, { folds: 10, seed: 1, rule: DEFAULT_PRUNING.alphaRule });
  const ensemble = await fitEnsembleParallel(dataset, {
    trees: 200,
    seed: 3,
    prune: DEFAULT_PRUNING.mode,
    alpha: cv.candidates[cv.chosen].alpha,
    workers: 2,
  });
  const residuals = oobResiduals(ensemble, dataset.target.values);
  const groups = groupResiduals(ensemble.oob, dataset.target.values, 10);
  const hits = new Float64Array(8);
  const counts = new Float64Array(8);
  for (let r = 0; r < test.dataset.rows; r++) {
    const estimate = mean(treeEstimates(ensemble, test.dataset.features.map((f) => f.values[r])));
    const range = method === "grouped"
      ? groupedRange(estimate, groups, 0.9)
      : residualRange(estimate, residuals, 0.9);
    hits[test.level[r]] += test.pay[r] >= back(range.low) && test.pay[r] <= back(range.high)
      ? 1
      : 0;
    counts[test.level[r]]++;
  }
  return {
    overall: hits.reduce((a, b) => a + b, 0) / counts.reduce((a, b) => a + b, 0),
    perLevel: Array.from({ length: 7 }, (_, i) => hits[i + 1] / counts[i + 1]),
  };
}

Deno.test("the default 90% range covers 87-93% overall and 85-95% in every level", async () => {
  const c = await coverage(DEFAULT_RANGE.scale, DEFAULT_RANGE.method);
  assert.ok(c.overall >= 0.87 && c.overall <= 0.93, `overall ${c.overall}`);
  for (const [i, share] of c.perLevel.entries()) {
    assert.ok(share >= 0.85 && share <= 0.95, `level ${i + 1}: ${share}`);
  }
});

Deno.test("one set of residuals for every level fails the per-level band", async () => {
  const c = await coverage("raw", "one-set");
  assert.ok(c.overall >= 0.87 && c.overall <= 0.93, `overall ${c.overall}`);
  assert.ok(c.perLevel.some((share) => share < 0.85 || share > 0.95), `${c.perLevel}`);
});

Deno.test("the shipped range is the one the committed measurement chose", async () => {
  const results = JSON.parse(
    await Deno.readTextFile(new URL("../../results/range_coverage_sim.json", import.meta.url)),
  );
  assert.deepEqual(results.chosen, { scale: DEFAULT_RANGE.scale, method: DEFAULT_RANGE.method });
});
