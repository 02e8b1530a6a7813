import assert from "node:assert/strict";
import {
  fitEnsemble,
  groupedRange,
  groupResiduals,
  mean,
  partialDependence,
  percentileInterval,
  profileReader,
  summarizeResidualGroups,
  sweepGrid,
  sweepProfile,
  treeEstimates,
} from "../../../mod.ts";
import { levels, numeric, regression } from "../tree/_small.ts";

// Invented: pay rises with years up to 15, then flat; site adds 5,000 per step.
function invented() {
  const years = Array.from({ length: 300 }, (_, i) => (i * 7) % 30);
  const site = Array.from({ length: 300 }, (_, i) => i % 3);
  const pay = years.map((y, i) => 40000 + 1000 * Math.min(y, 15) + 5000 * site[i]);
  return regression([numeric("years", years), levels("site", site, 3)], pay);
}

Deno.test("a sweep walks one attribute and keeps the others fixed", () => {
  const dataset = invented();
  const ensemble = fitEnsemble(dataset, {
    trees: 30,
    seed: 2,
    prune: "none",
    grow: { minLeaf: 3 },
  });
  const reader = profileReader(ensemble, dataset, "raw");
  const groups = summarizeResidualGroups(groupResiduals(ensemble.oob, dataset.target.values, 6), 5);
  const grid = sweepGrid(dataset.features[0], { from: 0, to: 29, steps: 30 });
  const points = sweepProfile(reader, [10, 1], 0, grid, 0.9);
  assert.equal(points.length, 30);
  for (const p of points) {
    // Each point is the ensemble at that profile, with its intervals: the
    // trees' 5%-95% estimates, and the estimate plus its group's residual
    // quantiles.
    const estimates = treeEstimates(ensemble, [p.value, 1]);
    assert.equal(p.estimate, mean(estimates));
    assert.deepEqual(p.howSure, percentileInterval(estimates, 0.9));
    assert.deepEqual(p.range, groupedRange(p.estimate, groups, 0.9));
  }
  // The invented rule: +1,000 a year to 15, flat after.
  assert.ok(points[15].estimate - points[0].estimate > 12000);
  assert.ok(Math.abs(points[29].estimate - points[20].estimate) < 1500);
  // Categorical grid: every level.
  assert.deepEqual(sweepGrid(dataset.features[1]), [0, 1, 2]);
});

Deno.test("partial dependence averages the ensemble over the table's rows", () => {
  const dataset = invented();
  const ensemble = fitEnsemble(dataset, {
    trees: 20,
    seed: 2,
    prune: "none",
    grow: { minLeaf: 3 },
  });
  const curve = partialDependence(ensemble, dataset, 1, [0, 1, 2]);
  // Site adds about 5,000 per step in the invented rule.
  assert.ok(Math.abs(curve[1] - curve[0] - 5000) < 1000, `${curve}`);
  assert.ok(Math.abs(curve[2] - curve[1] - 5000) < 1000, `${curve}`);
  // Independent computation of one point.
  let sum = 0;
  for (let r = 0; r < dataset.rows; r++) {
    sum += mean(treeEstimates(ensemble, [dataset.features[0].values[r], 2]));
  }
  assert.ok(Math.abs(curve[2] - sum / dataset.rows) < 1e-9 * curve[2]);
});
