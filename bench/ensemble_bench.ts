// deno task bench: a bagged ensemble of 200 unpruned trees (minimum leaf 5)
// on CPS1988 with categorical columns as ordered integer codes, the setting
// of bench/sklearn_forest_bench.py's RandomForestRegressor(max_features=1.0).
// One thread and two workers; results are committed under bench/results/.
import {
  binFeatures,
  fitEnsemble,
  fitEnsembleParallel,
  oobRegressionMetrics,
  treeEstimates,
} from "../mod.ts";
import { readReference, referenceDataset } from "../tests/lib/tree/_reference.ts";

const file = await readReference("cps1988");
const dataset = referenceDataset(file);
const bins = binFeatures(dataset);
const ensemble = fitEnsemble(dataset, { trees: 200, seed: 1, prune: "none" }, bins);
const profile = dataset.features.map((f) => f.values[0]);
const oob = oobRegressionMetrics(ensemble, dataset.target.values);
console.log(`paygrove out-of-bag R^2 ${oob.r2.toFixed(4)} on ${oob.rows} rows`);

Deno.bench("fit 200 trees, min leaf 5, unpruned (one thread)", { n: 1, warmup: 0 }, () => {
  fitEnsemble(dataset, { trees: 200, seed: 1, prune: "none" }, bins);
});
Deno.bench("fit 200 trees, min leaf 5, unpruned (2 workers)", { n: 1, warmup: 0 }, async () => {
  await fitEnsembleParallel(dataset, { trees: 200, seed: 1, prune: "none", workers: 2 }, bins);
});
Deno.bench("one profile through 200 trees", () => {
  treeEstimates(ensemble, profile);
});
