// The proxy check sent aside to a pool's workers gives proxyFigureSets'
// figures and order exactly, whatever the pool's size; a whole fit that sends
// it aside names the same proxies as one that checks them in this thread.
import assert from "node:assert/strict";
import { fitModel, loadTable, makeRng, randomInt } from "../../../mod.ts";
import { FittingPool } from "../../../lib/ensemble/_worker_pool.ts";
import { proxyFigureSets, type ProxyQuestion } from "../../../lib/ensemble/proxies.ts";
import { proxyFigureSetsAside } from "../../../lib/ensemble/proxies_parallel.ts";
import { shiftTable } from "./_shift_table.ts";

// Invented questions: two attributes, five features of every kind, one of
// them a near copy of each attribute and one with missing values; two
// features of the same balanced accuracy (copies) to test the ties' order.
function questions(seed: number): ProxyQuestion[] {
  const rng = makeRng(seed);
  const n = 240;
  const sex = Int32Array.from({ length: n }, () => randomInt(rng, 0, 1));
  const band = Int32Array.from({ length: n }, () => randomInt(rng, 0, 2));
  const shift = Float64Array.from(sex, (s) => (randomInt(rng, 0, 9) < 8 ? s : 1 - s));
  const years = Float64Array.from(band, (b) => 4 * b + randomInt(rng, 0, 5));
  const site = Float64Array.from({ length: n }, () => randomInt(rng, 0, 3));
  const grade = Float64Array.from(
    { length: n },
    () => randomInt(rng, 0, 9) === 0 ? NaN : randomInt(rng, 0, 4),
  );
  const features = [
    { name: "shift", kind: "categorical" as const, levels: ["day", "night"], values: shift },
    { name: "years", kind: "numeric" as const, values: years },
    { name: "site", kind: "categorical" as const, levels: ["A", "B", "C", "D"], values: site },
    {
      name: "grade",
      kind: "ordinal" as const,
      levels: ["G1", "G2", "G3", "G4", "G5"],
      values: grade,
    },
    { name: "shift copy", kind: "categorical" as const, levels: ["day", "night"], values: shift },
  ];
  return [
    { features, attribute: sex, groups: ["F", "M"], attributeName: "sex" },
    { features, attribute: band, groups: ["<30", "30-50", ">50"], attributeName: "age band" },
  ];
}

Deno.test("proxies aside: the figures and order of proxyFigureSets, on 1, 2 and 3 workers", async () => {
  for (const seed of [1, 2]) {
    const asked = questions(seed);
    const here = proxyFigureSets(asked, { trees: 15, seed });
    // The copies tie; the first in feature order comes first.
    const names = here[0].map((f) => f.feature);
    assert(names.indexOf("shift") + 1 === names.indexOf("shift copy"));
    for (const size of [1, 2, 3]) {
      const pool = new FittingPool(size);
      try {
        assert.deepEqual(await proxyFigureSetsAside(pool, asked, { trees: 15, seed }), here);
      } finally {
        pool.close();
      }
    }
  }
});

Deno.test("proxies aside: a pool larger than the features, and no questions", async () => {
  const [first] = questions(3);
  const one = { ...first, features: first.features.slice(0, 1) };
  const pool = new FittingPool(3);
  try {
    assert.deepEqual(
      await proxyFigureSetsAside(pool, [one], { trees: 8 }),
      proxyFigureSets([one], { trees: 8 }),
    );
    assert.deepEqual(await proxyFigureSetsAside(pool, [], {}), []);
  } finally {
    pool.close();
  }
});

Deno.test("a fit on two workers (proxies aside) names the proxies a fit in this thread names", async () => {
  const table = loadTable(shiftTable(), { target: "pay", file: "shift.csv" });
  const stages: string[] = [];
  const fit = (workers: number) =>
    fitModel(table, {
      target: "pay",
      trees: 20,
      folds: 5,
      workers,
      onProgress: (stage, done, total) => stages.push(`${workers}:${stage}:${done}/${total}`),
    });
  // Counts the tasks sent aside.
  const send = FittingPool.prototype.aside;
  let sent = 0;
  FittingPool.prototype.aside = function (this: FittingPool, ...args) {
    sent++;
    return send.apply(this, args);
  };
  let alone, aside;
  try {
    alone = await fit(1);
    assert.equal(sent, 0);
    aside = await fit(2);
    // shift and level, one to each worker.
    assert.equal(sent, 2);
  } finally {
    FittingPool.prototype.aside = send;
  }
  assert.deepEqual(aside.proxies, alone.proxies);
  assert.deepEqual(aside.proxies!.map((p) => [p.feature, p.attribute]), [["shift", "sex"]]);
  // Both report the check's start and end.
  for (const workers of [1, 2]) {
    assert(stages.includes(`${workers}:proxies:0/1`) && stages.includes(`${workers}:proxies:1/1`));
  }
});
