// Where the whole default fit's time goes: seconds per stage of fitModel
// (cross-validation of the reference tree, the ensemble's trees, permutation
// importance, proxies, the rest) on one table (WORKERS=N to ask for N workers). Usage:
//   deno run -A bench/fit_phases.ts fixtures/cps1988.csv wage
import { fitModel, loadTableFile } from "../mod.ts";

const [file, target] = Deno.args;
const loadStart = performance.now();
const table = await loadTableFile(file, { target });
const loaded = performance.now();
const marks: Record<string, [number, number]> = {};
const model = await fitModel(table, {
  target,
  // WORKERS=N asks for N; unset, the library's default (defaultWorkers).
  workers: Deno.env.get("WORKERS") ? Number(Deno.env.get("WORKERS")) : undefined,
  onProgress: (stage) => {
    const now = performance.now();
    marks[stage] ??= [now, now];
    marks[stage][1] = now;
  },
});
const end = performance.now();
const out: Record<string, number> = { load: (loaded - loadStart) / 1000 };
let previous = loaded;
for (const [stage, [, last]] of Object.entries(marks)) {
  out[stage] = (last - previous) / 1000;
  previous = last;
}
out.rest = (end - previous) / 1000;
out.total = (end - loaded) / 1000;
console.log(
  JSON.stringify({ file, rows: table.rows, trees: model.ensemble?.trees.length, seconds: out }),
);
