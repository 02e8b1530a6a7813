// Soak check: 10,000 random what-if questions (a base profile and one
// changed attribute, answered with intervals, ranges, the paired difference
// and the decision path) against one 500-tree model of the invented demo
// company, in one process. Resident memory and heap are read after a
// 1,000-question warm-up and every 1,000 questions after it; the growth from
// warm-up to the end is the figure (a leak would grow with the questions).
// Writes bench/results/soak.txt.
// Run: deno run --allow-read --allow-write=bench/results bench/soak_whatif.ts
import {
  compareAnswer,
  demoCompanyCsv,
  fitModel,
  loadTable,
  makeRng,
  openModel,
  randomInt,
  typicalProfile,
} from "../mod.ts";

const table = loadTable(demoCompanyCsv(), { target: "base_pay_eur" });
const model = await fitModel(table, { target: "base_pay_eur", trees: 500, seed: 3 });
const session = openModel(model);
const rng = makeRng(17);
const base = typicalProfile(model);

function question(): void {
  const profile = Float64Array.from(base);
  const changed = Float64Array.from(base);
  // A random base: each attribute a random level or a number in its range.
  model.features.forEach((f, i) => {
    profile[i] = f.levels
      ? randomInt(rng, 0, f.levels.length - 1)
      : f.range!.min + (f.range!.max - f.range!.min) * randomInt(rng, 0, 1000) / 1000;
    changed[i] = profile[i];
  });
  const i = randomInt(rng, 0, model.features.length - 1);
  const f = model.features[i];
  changed[i] = f.levels
    ? randomInt(rng, 0, f.levels.length - 1)
    : f.range!.min + (f.range!.max - f.range!.min) * randomInt(rng, 0, 1000) / 1000;
  compareAnswer(session, profile, changed, 0.9);
}

const mb = (x: number) => x / 2 ** 20;
for (let q = 0; q < 1000; q++) question();
const warm = Deno.memoryUsage();
const lines = [
  `soak: 10,000 what-ifs, 500 trees, demo table (${model.rows.used} rows), one process`,
  `after 1,000 warm-up: rss ${mb(warm.rss).toFixed(1)} MiB, heap used ${
    mb(warm.heapUsed).toFixed(1)
  } MiB`,
];
const started = performance.now();
let peakRss = warm.rss;
for (let block = 1; block <= 10; block++) {
  for (let q = 0; q < 1000; q++) question();
  const now = Deno.memoryUsage();
  peakRss = Math.max(peakRss, now.rss);
  lines.push(
    `after ${block * 1000} more: rss ${mb(now.rss).toFixed(1)} MiB, heap used ${
      mb(now.heapUsed).toFixed(1)
    } MiB`,
  );
}
const end = Deno.memoryUsage();
const seconds = (performance.now() - started) / 1000;
lines.push(
  `growth from warm-up to end: rss ${(100 * (end.rss / warm.rss - 1)).toFixed(1)}%, ` +
    `peak rss ${(100 * (peakRss / warm.rss - 1)).toFixed(1)}% (bar: 10%); ` +
    `${(1000 * seconds / 10000).toFixed(2)} ms per what-if`,
);
console.log(lines.join("\n"));
await Deno.writeTextFile("bench/results/soak.txt", lines.join("\n") + "\n");
