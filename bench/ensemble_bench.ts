// deno task bench: a bagged ensemble of 200 unpruned trees (minimum leaf 5)
// with categorical columns as ordered integer codes, the setting of
// bench/forest_vs_sklearn.py's RandomForestRegressor(max_features=1.0), on
// CPS1988 (one thread and two workers, timed by deno bench) and on the
// generated 100,000-row table of bench/generated_table.ts (two workers, fitted
// once; seconds, trees per second and peak memory printed). The comparison
// with scikit-learn in the same run is bench/forest_vs_sklearn.py; results
// are committed under bench/results/.
import {
  binFeatures,
  fitEnsemble,
  fitEnsembleParallel,
  oobRegressionMetrics,
  treeEstimates,
} from "../mod.ts";
import { benchmarkDataset, sampleMemory } from "./forest_timing.ts";

const generated = await benchmarkDataset("generated", 100000);
{
  const memory = sampleMemory();
  const start = performance.now();
  const model = await fitEnsembleParallel(generated, {
    trees: 200,
    seed: 1,
    prune: "none",
    grow: { minLeaf: 5 },
    workers: 2,
  });
  const seconds = (performance.now() - start) / 1000;
  const oob = oobRegressionMetrics(model, generated.target.values);
  console.log(
    `generated table, ${generated.rows} rows x ${generated.features.length} features: ` +
      `200 trees in ${seconds.toFixed(1)} s with 2 workers (${(200 / seconds).toFixed(1)} ` +
      `trees/s), peak memory ${memory.stop().toFixed(0)} MiB, OOB R^2 ${oob.r2.toFixed(4)}`,
  );
}

const dataset = await benchmarkDataset("cps1988", 0);
const bins = binFeatures(dataset);
const ensemble = fitEnsemble(dataset, { trees: 200, seed: 1, prune: "none" }, bins);
const profile = dataset.features.map((f) => f.values[0]);
const oob = oobRegressionMetrics(ensemble, dataset.target.values);
console.log(`CPS1988: paygrove out-of-bag R^2 ${oob.r2.toFixed(4)} on ${oob.rows} rows`);

Deno.bench("CPS1988: fit 200 trees, min leaf 5, unpruned (one thread)", { n: 1, warmup: 0 }, () => {
  fitEnsemble(dataset, { trees: 200, seed: 1, prune: "none" }, bins);
});
Deno.bench("CPS1988: fit 200 trees, min leaf 5, unpruned (2 workers)", {
  n: 1,
  warmup: 0,
}, async () => {
  await fitEnsembleParallel(dataset, { trees: 200, seed: 1, prune: "none", workers: 2 }, bins);
});
Deno.bench("CPS1988: one profile through 200 trees", () => {
  treeEstimates(ensemble, profile);
});
