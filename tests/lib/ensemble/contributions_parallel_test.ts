// Many profiles' contributions on the fitting workers
// (lib/ensemble/contributions_parallel.ts) equal those worked out in this
// thread, bit for bit, for every profile, with and without tree subsets,
// whatever the number of workers; below the threshold no worker starts.
import assert from "node:assert/strict";
import {
  ContributionReader,
  contributionsOfMany,
  demoCompanyCsv,
  fitModel,
  loadTable,
  ON_WORKERS_FROM,
  readForModel,
  rowProfile,
} from "../../../mod.ts";

const csv = demoCompanyCsv({ rows: 700, seed: 6 });
const model = await fitModel(loadTable(csv, { target: "base_pay_eur" }), {
  target: "base_pay_eur",
  trees: 24,
  folds: 3,
  workers: 1,
});
const rows = readForModel(model, csv, "demo.csv");
const profiles = Array.from({ length: rows.rows }, (_, r) => rowProfile(rows, r));
const trees = model.ensemble!.trees;
const features = model.features.length;

Deno.test("on 2 workers, every profile's parts, base and prediction equal this thread's", async () => {
  assert(profiles.length >= ON_WORKERS_FROM);
  // A third of the rows over a subset of trees, as training rows read out of bag.
  const only = profiles.map((_, i) => (i % 3 === 0 ? Int32Array.of(0, 5, 7, 23) : null));
  const reader = new ContributionReader(trees, features);
  const here = profiles.map((p, i) => reader.profile(p, only[i] ?? undefined));
  const there = await contributionsOfMany(trees, features, profiles, only, 2);
  assert.equal(there.length, profiles.length);
  assert.deepEqual(there, here);
});

Deno.test("few profiles, or one worker: worked out in this thread, the same figures", async () => {
  const few = profiles.slice(0, 10);
  const only = few.map(() => null);
  const reader = new ContributionReader(trees, features);
  const expected = few.map((p) => reader.profile(p));
  assert.deepEqual(await contributionsOfMany(trees, features, few, only, 2), expected);
  assert.deepEqual(
    await contributionsOfMany(
      trees,
      features,
      profiles.slice(0, 300),
      profiles.slice(0, 300).map(() => null),
      1,
    ),
    profiles.slice(0, 300).map((p) => reader.profile(p)),
  );
});
