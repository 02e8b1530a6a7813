// paygrove's side of bench/forest_vs_sklearn.py: fits 200 unpruned trees
// (minimum leaf 5, categoricals as ordered integer codes) on CPS1988 or on
// the generated table, and puts one profile through every tree. Prints one
// JSON line: seconds, trees per second, peak resident memory.
// Usage: deno run --allow-read bench/forest_timing.ts cps1988|generated [ROWS] [WORKERS]
import {
  binFeatures,
  type Dataset,
  fitEnsembleParallel,
  loadTable,
  makeDataset,
  oobRegressionMetrics,
  treeEstimates,
} from "../mod.ts";
import { readReference, referenceDataset } from "../tests/lib/tree/_reference.ts";
import { generatedTableCsv } from "./generated_table.ts";

const TREES = 200;

/**
 * Peak resident memory of this process (workers are threads of it), sampled
 * every 50 ms while work runs (Deno's permissions keep /proc/self from a
 * script without every permission, so the kernel's own peak is not read).
 */
export function sampleMemory(): { stop: () => number } {
  let peak = Deno.memoryUsage().rss;
  const timer = setInterval(() => {
    peak = Math.max(peak, Deno.memoryUsage().rss);
  }, 50);
  return {
    stop: () => {
      clearInterval(timer);
      return Math.max(peak, Deno.memoryUsage().rss) / 2 ** 20;
    },
  };
}

/** The benchmark's tables, as both programs see them. */
export async function benchmarkDataset(name: string, rows: number): Promise<Dataset> {
  if (name === "cps1988") return referenceDataset(await readReference("cps1988"));
  const table = loadTable(generatedTableCsv(rows, 1), { target: "pay" });
  return makeDataset(table, { target: "pay", categoricalAsCodes: true }).dataset;
}

if (import.meta.main) {
  const [name = "cps1988", rowsArg = "100000", workersArg = "2"] = Deno.args;
  const memory = sampleMemory();
  const started = performance.now();
  const dataset = await benchmarkDataset(name, Number(rowsArg));
  const loadSeconds = (performance.now() - started) / 1000;
  const bins = binFeatures(dataset);
  const fitStart = performance.now();
  const ensemble = await fitEnsembleParallel(dataset, {
    trees: TREES,
    seed: 1,
    prune: "none",
    grow: { minLeaf: 5 },
    workers: Number(workersArg),
  }, bins);
  const fitSeconds = (performance.now() - fitStart) / 1000;
  const profile = dataset.features.map((f) => f.values[0]);
  const repeats = 200;
  const profileStart = performance.now();
  for (let i = 0; i < repeats; i++) treeEstimates(ensemble, profile);
  const profileMs = (performance.now() - profileStart) / repeats;
  const oob = oobRegressionMetrics(ensemble, dataset.target.values);
  console.log(JSON.stringify({
    program: "paygrove",
    table: name,
    rows: dataset.rows,
    features: dataset.features.length,
    trees: TREES,
    workers: Number(workersArg),
    loadSeconds,
    fitSeconds,
    treesPerSecond: TREES / fitSeconds,
    profileMs,
    oobR2: oob.r2,
    peakMiB: memory.stop(),
  }));
}
