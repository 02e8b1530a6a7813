// Permutation importance alone on CPS1988's default-size ensemble (200
// trees pruned at the CV alpha, as `paygrove fit` makes them; one thread):
// seconds of featureImportance, median of 3. Usage:
//   deno run -A bench/importance_timing.ts
import { featureImportance, fitDefaultEnsemble, loadTableFile, payRows } from "../mod.ts";

const root = new URL("../", import.meta.url).pathname;
const table = await loadTableFile(`${root}fixtures/cps1988.csv`, { target: "wage" });
const { dataset } = payRows(table, { target: "wage" });
const { ensemble } = await fitDefaultEnsemble(dataset, { workers: 2, grow: { minLeaf: 5 } });
const times: number[] = [];
let first = 0;
for (let i = 0; i < 3; i++) {
  const start = performance.now();
  const figures = featureImportance(ensemble!, dataset, { repeats: 3, seed: 1 + i });
  times.push((performance.now() - start) / 1000);
  if (i === 0) first = figures[0].permutation;
}
times.sort((a, b) => a - b);
console.log(JSON.stringify({ seconds: times[1], all: times, firstFeature: first }));
