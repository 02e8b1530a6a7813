import assert from "node:assert/strict";
import {
  applyRow,
  binFeatures,
  bootstrapCounts,
  fitEnsemble,
  fitEnsembleParallel,
  growTree,
  infinitesimalJackknife,
  oobClassificationMetrics,
  oobRegressionMetrics,
  pairedDifference,
  percentileInterval,
  pruneTree,
  resampleStates,
  treeEstimates,
} from "../../../mod.ts";
import { levels, numeric, regression } from "../tree/_small.ts";

// Invented table: pay by years and site, with noise from a fixed sequence.
function invented(rows: number) {
  const years = Array.from({ length: rows }, (_, i) => (i * 7) % 25);
  const site = Array.from({ length: rows }, (_, i) => i % 3);
  const pay = years.map((y, i) => 45000 + 1800 * y + 6000 * site[i] + ((i * 7919) % 4001) - 2000);
  return regression([numeric("years", years), levels("site", site, 3)], pay);
}

Deno.test("the same seed gives a bit-identical ensemble", () => {
  const dataset = invented(120);
  const a = fitEnsemble(dataset, { trees: 15, seed: 42, prune: "none" });
  const b = fitEnsemble(dataset, { trees: 15, seed: 42, prune: "none" });
  assert.deepEqual(a.resamples, b.resamples);
  assert.deepEqual(a.oob, b.oob);
  for (let t = 0; t < a.trees.length; t++) assert.deepEqual(a.trees[t], b.trees[t]);
  const c = fitEnsemble(dataset, { trees: 15, seed: 43, prune: "none" });
  assert.notDeepEqual(a.oob, c.oob);
});

Deno.test("each tree is the tree grown on its regenerated bootstrap counts", () => {
  const dataset = invented(90);
  const ensemble = fitEnsemble(dataset, { trees: 5, seed: 9, prune: "none", grow: { minLeaf: 3 } });
  // The states are keyed by the seed and the target, nothing else.
  assert.deepEqual(ensemble.resamples, resampleStates(9, dataset.target.values, 5));
  const bins = binFeatures(dataset);
  for (let t = 0; t < 5; t++) {
    const weights = bootstrapCounts(dataset.rows, ensemble.resamples, t);
    assert.equal(weights.reduce((x, y) => x + y, 0), dataset.rows);
    const alone = growTree({ dataset, bins, weights }, { minLeaf: 3 });
    assert.deepEqual(ensemble.trees[t].value, alone.value);
  }
});

Deno.test("out-of-bag predictions average only the trees that did not draw the row", () => {
  const dataset = invented(80);
  const ensemble = fitEnsemble(dataset, { trees: 12, seed: 5, prune: "none" });
  for (let r = 0; r < dataset.rows; r++) {
    let sum = 0;
    let n = 0;
    for (let t = 0; t < 12; t++) {
      if (bootstrapCounts(dataset.rows, ensemble.resamples, t)[r] !== 0) continue;
      const tree = ensemble.trees[t];
      sum += tree.value[applyRow(tree, dataset.features, r)];
      n++;
    }
    assert.equal(ensemble.oobTrees[r], n);
    if (n > 0) assert.ok(Math.abs(ensemble.oob[r] - sum / n) <= 1e-9 * Math.abs(sum / n));
    else assert.ok(Number.isNaN(ensemble.oob[r]));
  }
  // About (1 - 1/n)^n ~ 36.8% of draws leave a row out: 12 trees -> ~4.4 each.
  const mean = ensemble.oobTrees.reduce((a, b) => a + b, 0) / dataset.rows;
  assert.ok(mean > 3 && mean < 6, `mean out-of-bag trees ${mean}`);
});

Deno.test("pruning modes: one alpha for all, each tree's own out-of-bag alpha, none", () => {
  const dataset = invented(150);
  const none = fitEnsemble(dataset, { trees: 8, seed: 2, prune: "none" });
  const fixed = fitEnsemble(dataset, { trees: 8, seed: 2, prune: "alpha", alpha: 1e6 });
  const own = fitEnsemble(dataset, { trees: 8, seed: 2, prune: "oob" });
  for (let t = 0; t < 8; t++) {
    assert.equal(none.alphas[t], 0);
    assert.equal(fixed.alphas[t], 1e6);
    assert.ok(fixed.trees[t].nodeCount <= none.trees[t].nodeCount);
    assert.ok(own.trees[t].nodeCount <= none.trees[t].nodeCount);
  }
  assert.throws(() => fitEnsemble(dataset, { prune: "alpha" }), /needs an alpha/);
});

Deno.test("out-of-bag metrics are those of the out-of-bag predictions", () => {
  const dataset = invented(150);
  const ensemble = fitEnsemble(dataset, { trees: 30, seed: 4, prune: "none" });
  const y = dataset.target.values;
  const metrics = oobRegressionMetrics(ensemble, y);
  let sse = 0;
  let n = 0;
  for (let r = 0; r < dataset.rows; r++) {
    if (ensemble.oobTrees[r] === 0) continue;
    sse += (y[r] - ensemble.oob[r]) ** 2;
    n++;
  }
  assert.equal(metrics.rows, n);
  assert.ok(Math.abs(metrics.rmse - Math.sqrt(sse / n)) < 1e-9 * metrics.rmse);
  // Out of bag, the ensemble beats the constant model on this structured table.
  assert.ok(metrics.r2 > 0.5, `OOB R^2 ${metrics.r2}`);
});

Deno.test("a paired what-if difference is narrower than the gap between two intervals", () => {
  const dataset = invented(300);
  const ensemble = fitEnsemble(dataset, { trees: 60, seed: 8, prune: "none" });
  const base = [5, 0];
  const changed = [5, 2]; // same years, site 2 instead of 0: +12,000 in the invented rule
  const d = pairedDifference(ensemble, base, changed, 0.9);
  const a = percentileInterval(treeEstimates(ensemble, base), 0.9);
  const b = percentileInterval(treeEstimates(ensemble, changed), 0.9);
  assert.ok(d.high - d.low < (b.high - a.low) - (b.low - a.high));
  assert.ok(d.estimate > 9000 && d.estimate < 15000, `difference ${d.estimate}`);
  assert.ok(d.low <= d.estimate && d.estimate <= d.high);
});

Deno.test("the same seed gives a bit-identical model with 1, 2 or 3 workers", async () => {
  const dataset = invented(200);
  const options = { trees: 12, seed: 77, prune: "oob" as const };
  const progress: number[] = [];
  const results = [
    await fitEnsembleParallel(dataset, { ...options, workers: 1 }),
    await fitEnsembleParallel(dataset, {
      ...options,
      workers: 2,
      onProgress: (d) => progress.push(d),
    }),
    await fitEnsembleParallel(dataset, { ...options, workers: 3 }),
  ];
  for (const other of results.slice(1)) {
    assert.deepEqual(other.oob, results[0].oob);
    assert.deepEqual(other.alphas, results[0].alphas);
    for (let t = 0; t < 12; t++) assert.deepEqual(other.trees[t], results[0].trees[t]);
  }
  assert.deepEqual(progress, Array.from({ length: 12 }, (_, i) => i + 1));
});

Deno.test("classification: out-of-bag class shares and accuracy", () => {
  // Invented: level by years; one row in seven has the other level, spread
  // over every number of years, so it cannot be learnt.
  const years = Array.from({ length: 280 }, (_, i) => i % 20);
  const level = years.map((y, i) => (i % 7 === 0 ? (y < 10 ? 1 : 0) : y < 10 ? 0 : 1));
  const dataset = {
    rows: 280,
    features: [numeric("years", years)],
    target: {
      kind: "classification" as const,
      name: "level",
      classes: ["L1", "L2"],
      values: Int32Array.from(level),
    },
  };
  const ensemble = fitEnsemble(dataset, { trees: 20, seed: 6, prune: "none" });
  assert.equal(ensemble.width, 2);
  for (let r = 0; r < dataset.rows; r++) {
    if (ensemble.oobTrees[r] === 0) continue;
    assert.ok(Math.abs(ensemble.oob[2 * r] + ensemble.oob[2 * r + 1] - 1) < 1e-12);
  }
  const metrics = oobClassificationMetrics(ensemble, dataset.target.values);
  // The odd seventh cannot be predicted (accuracy at most 6/7); the rest is easy.
  assert.ok(
    metrics.accuracy > 0.8 && metrics.accuracy <= 6 / 7 + 1e-12,
    `accuracy ${metrics.accuracy}`,
  );
  assert.equal(metrics.confusion.flat().reduce((a, b) => a + b, 0), metrics.rows);
});

Deno.test("infinitesimal jackknife by its definition", () => {
  const dataset = invented(60);
  const ensemble = fitEnsemble(dataset, { trees: 40, seed: 12, prune: "none" });
  const profile = [7, 1];
  const ij = infinitesimalJackknife(ensemble, dataset.rows, profile);
  // Direct computation of V_IJ (Wager, Hastie & Efron 2014, eq. 5 and 7).
  const t = treeEstimates(ensemble, profile);
  const tbar = t.reduce((a, b) => a + b, 0) / t.length;
  let v = 0;
  for (let i = 0; i < dataset.rows; i++) {
    let c = 0;
    for (let b = 0; b < t.length; b++) {
      c += (bootstrapCounts(dataset.rows, ensemble.resamples, b)[i] - 1) * (t[b] - tbar);
    }
    v += (c / t.length) ** 2;
  }
  const bias = (dataset.rows / t.length ** 2) * t.reduce((a, x) => a + (x - tbar) ** 2, 0);
  assert.ok(Math.abs(ij.uncorrectedSe - Math.sqrt(v)) < 1e-9 * Math.sqrt(v));
  assert.equal(ij.clamped, v - bias < 0);
  assert.ok(Math.abs(ij.se - Math.sqrt(Math.max(0, v - bias))) < 1e-9 * Math.max(1, ij.se));
});

Deno.test("out-of-bag pruning gives the subtree pruneTree gives at the chosen alpha", () => {
  const dataset = invented(150);
  const own = fitEnsemble(dataset, { trees: 8, seed: 2, prune: "oob" });
  const bins = binFeatures(dataset);
  for (let t = 0; t < 8; t++) {
    const weights = bootstrapCounts(dataset.rows, own.resamples, t);
    const grown = growTree({ dataset, bins, weights });
    const expected = own.alphas[t] > 0 ? pruneTree(grown, own.alphas[t]) : grown;
    assert.deepEqual(own.trees[t].value, expected.value);
    assert.deepEqual(own.trees[t].left, expected.left);
  }
});
