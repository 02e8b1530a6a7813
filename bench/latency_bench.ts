// Interactive latency (deno task bench): a 500-tree default model on
// CPS1988's log wage (trees pruned at the reference tree's minimum-CV alpha).
// One what-if = both profiles' estimates, "how sure" intervals and ranges,
// the paired difference, and the reference tree's decision path; a sweep =
// 50 readings. Targets: under 20 ms and under 200 ms. The second model has
// as many trees as half its rows, so the infinitesimal jackknife is computed
// too (1,000 rows of CPS1988, 500 trees).
import {
  compareProfiles,
  explainPath,
  fitDefaultEnsemble,
  profileReader,
  sweepGrid,
  sweepProfile,
} from "../mod.ts";
import { cps1988LogWage, subsetRows } from "../tests/lib/_cps1988.ts";

const full = await cps1988LogWage();
const small = subsetRows(full, Array.from({ length: 1000 }, (_, i) => i * 28));
const models = [];
for (const [name, dataset] of [["CPS1988", full], ["1,000 rows", small]] as const) {
  const model = await fitDefaultEnsemble(dataset, { trees: 500, seed: 1, workers: 2 });
  const reader = profileReader(model.ensemble!, dataset, "log");
  models.push({ name, dataset, model, reader });
}

for (const { name, dataset, model, reader } of models) {
  const base = dataset.features.map((f) => f.values[0]);
  const education = dataset.features.findIndex((f) => f.name === "education");
  const experience = dataset.features.findIndex((f) => f.name === "experience");
  const changed = base.slice();
  changed[education] += 2;
  const jackknife = reader.bag !== null ? " with jackknife" : "";
  Deno.bench(`${name}: one what-if, 500 trees${jackknife}`, () => {
    compareProfiles(reader, base, changed, 0.9);
    explainPath(model.reference!.tree, dataset.features, changed);
  });
  const grid = sweepGrid(dataset.features[experience], { steps: 50 });
  Deno.bench(`${name}: 50-point sweep, 500 trees${jackknife}`, () => {
    sweepProfile(reader, base, experience, grid, 0.9);
  });
}
