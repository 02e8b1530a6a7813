// paygrove's side of bench/scale_vs_sklearn.py: loads a generated CSV
// (bench/generated_table.ts) from disk, fits 100 unpruned trees (minimum
// leaf 5, categoricals as ordered integer codes, as scikit-learn takes
// them) with 2 workers, and puts one profile through every tree. Prints one
// JSON line: load and fit seconds, peak resident memory of each stage, the
// size of the trees as the model file stores them, one profile's time.
// Usage: deno run --allow-read bench/scale_timing.ts TABLE.csv
import {
  binFeatures,
  fitEnsembleParallel,
  loadTableFile,
  makeDataset,
  oobRegressionMetrics,
  treeEstimates,
} from "../mod.ts";
import { sampleMemory } from "./forest_timing.ts";

const TREES = 100;
const path = Deno.args[0];
const loadMemory = sampleMemory();
const started = performance.now();
const table = await loadTableFile(path, { target: "pay" });
const loadSeconds = (performance.now() - started) / 1000;
const loadPeakMiB = loadMemory.stop();
const dataset = makeDataset(table, { target: "pay", categoricalAsCodes: true }).dataset;
const fitMemory = sampleMemory();
const fitStart = performance.now();
const ensemble = await fitEnsembleParallel(dataset, {
  trees: TREES,
  seed: 1,
  prune: "none",
  grow: { minLeaf: 5 },
  workers: 2,
}, binFeatures(dataset));
const fitSeconds = (performance.now() - fitStart) / 1000;
const fitPeakMiB = fitMemory.stop();
// The model file keeps each node's arrays as base64 (4/3 of their bytes).
let treeBytes = 0;
for (const tree of ensemble.trees) {
  for (const value of Object.values(tree)) {
    if (ArrayBuffer.isView(value)) treeBytes += value.byteLength;
  }
}
const profile = dataset.features.map((f) => f.values[0]);
const repeats = 50;
const profileStart = performance.now();
for (let i = 0; i < repeats; i++) treeEstimates(ensemble, profile);
const profileMs = (performance.now() - profileStart) / repeats;
console.log(JSON.stringify({
  program: "paygrove",
  rows: dataset.rows,
  features: dataset.features.length,
  trees: TREES,
  loadSeconds,
  loadPeakMiB,
  fitSeconds,
  fitPeakMiB,
  modelMB: (treeBytes * 4) / 3 / 1e6,
  profileMs,
  oobR2: oobRegressionMetrics(ensemble, dataset.target.values).r2,
}));
