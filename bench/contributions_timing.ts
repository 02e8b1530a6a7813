// Each attribute's part of one estimate: the time for all the parts of one
// profile over the default model's 200 trees (goal: under 5 ms), on the demo
// table, for every row of it; and the same beside the plain estimate. Prints
// one JSON line. Usage: deno run -A bench/contributions_timing.ts [MODEL]
// (a model file of the demo table; without one, the default fit is made).
import {
  contributionsOf,
  estimateProfile,
  fitModel,
  loadTableFile,
  type Model,
  openModel,
  readForModel,
  readModelFile,
  rowProfile,
} from "../mod.ts";

const DEMO = new URL("../fixtures/demo_company.csv", import.meta.url).pathname;
const [file] = Deno.args;
const model: Model = file !== undefined
  ? await readModelFile(file)
  : await fitModel(await loadTableFile(DEMO, { target: "base_pay_eur" }), {
    target: "base_pay_eur",
  });
const rows = readForModel(model, Deno.readFileSync(DEMO), "demo_company.csv");
const profiles = Array.from({ length: rows.rows }, (_, r) => rowProfile(rows, r));
const session = openModel(model);

function timeEach(work: (p: Float64Array) => void): { median: number; p99: number } {
  // Two unmeasured passes first, so that the code is compiled and warm.
  for (let pass = 0; pass < 2; pass++) for (const p of profiles.slice(0, 200)) work(p);
  const times = profiles.map((p) => {
    const start = performance.now();
    work(p);
    return performance.now() - start;
  }).sort((a, b) => a - b);
  return {
    median: times[times.length >> 1],
    p99: times[Math.floor(times.length * 0.99)],
  };
}

const parts = timeEach((p) => contributionsOf(model, p));
const estimate = timeEach((p) => estimateProfile(session, p));
console.log(JSON.stringify({
  trees: model.ensemble?.trees.length,
  features: model.features.length,
  profiles: profiles.length,
  contributionsMs: parts,
  wholeEstimateMs: estimate,
}));
