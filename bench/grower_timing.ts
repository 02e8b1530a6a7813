// The grower alone, on one thread: 200 unpruned bagged trees (minimum leaf
// 5, the ensemble's setting) on the demo table, CPS1988 and the generated
// table, and one fully grown tree (minimum leaf 1) on CPS1988 and the
// generated table, warm. Medians of 3 (ensembles) and 5 (one tree) runs;
// prints one JSON line. For comparing the grower before and after a change
// back to back on the same machine (bench/speed_goals.py is the comparison
// with scikit-learn).
// Usage: deno run -A bench/grower_timing.ts [ROWS of the generated table]
import {
  binFeatures,
  canonicalRowOrder,
  fitEnsemble,
  growTree,
  loadTableFile,
  makeDataset,
} from "../mod.ts";
import { benchmarkDataset } from "./forest_timing.ts";

const rows = Number(Deno.args[0] ?? "100000");
const median = (xs: number[]) => xs.sort((a, b) => a - b)[xs.length >> 1];
const demoTable = await loadTableFile(
  new URL("../fixtures/demo_company.csv", import.meta.url).pathname,
  {
    target: "base_pay_eur",
  },
);
const tables = {
  demo: makeDataset(demoTable, { target: "base_pay_eur" }).dataset,
  cps1988: await benchmarkDataset("cps1988", rows),
  generated: await benchmarkDataset("generated", rows),
};
const out: Record<string, number> = {};
for (const [name, dataset] of Object.entries(tables)) {
  const bins = binFeatures(dataset);
  const times: number[] = [];
  for (let i = 0; i < 3; i++) {
    const start = performance.now();
    fitEnsemble(dataset, { trees: name === "generated" ? 20 : 200, seed: 1, prune: "none" }, bins);
    times.push((performance.now() - start) / 1000);
  }
  out[`${name}EnsembleSeconds`] = median(times);
  if (name === "demo") continue;
  const order = canonicalRowOrder(dataset);
  const grow = () => growTree({ dataset, bins, order }, { minLeaf: 1, minSplit: 2 });
  grow();
  const tree: number[] = [];
  for (let i = 0; i < 5; i++) {
    const start = performance.now();
    grow();
    tree.push(performance.now() - start);
  }
  out[`${name}TreeMs`] = median(tree);
}
console.log(JSON.stringify(out));
