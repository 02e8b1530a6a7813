import assert from "node:assert/strict";
import {
  applyValues,
  compareProfiles,
  fitEnsemble,
  groupedRange,
  groupResiduals,
  infinitesimalJackknife,
  leafMembers,
  makeRng,
  percentileInterval,
  profileReader,
  quantileForestRange,
  randomInt,
  readProfile,
  summarizeResidualGroups,
} from "../../../mod.ts";
import { levels, numeric, regression } from "../tree/_small.ts";

// Invented: log pay rises 4% a year to 15 years, level adds 15% a step,
// with a spread that grows with level (sd 0.02 + 0.02 x level).
function invented(rows: number) {
  const rng = makeRng(rows);
  const uniform = () => (randomInt(rng, 0, 2 ** 30 - 1) + 0.5) / 2 ** 30;
  const normal = () => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform());
  const years = Array.from({ length: rows }, () => randomInt(rng, 0, 19));
  const level = Array.from({ length: rows }, () => randomInt(rng, 0, 3));
  const logPay = years.map((y, i) =>
    10.8 + 0.04 * Math.min(y, 15) + 0.15 * level[i] + (0.02 + 0.02 * level[i]) * normal()
  );
  return regression([numeric("years", years), levels("level", level, 4, "ordinal")], logPay);
}

Deno.test("a log-scale reading is the exp of the fitted-scale figures", () => {
  const dataset = invented(400);
  const ensemble = fitEnsemble(dataset, {
    trees: 40,
    seed: 3,
    prune: "none",
    grow: { minLeaf: 5 },
  });
  const reader = profileReader(ensemble, dataset, "log");
  const profile = [12, 2];
  const r = readProfile(reader, profile, 0.8);
  // Each tree's estimate by walking it, their mean and R's type-7 quantiles
  // written out here, not taken from the helpers under test.
  const t = ensemble.trees.map((tree) => tree.value[applyValues(tree, profile)]);
  const average = t.reduce((a, b) => a + b, 0) / t.length;
  const sorted = [...t].sort((a, b) => a - b);
  const type7 = (p: number) => {
    const h = (sorted.length - 1) * p;
    return sorted[Math.floor(h)] + (h % 1) * (sorted[Math.ceil(h)] - sorted[Math.floor(h)]);
  };
  // The estimate, how sure and the trees move by the median out-of-bag
  // residual (a median, not a geometric mean); the range does not.
  const residuals = Array.from(dataset.target.values, (y, i) => y - ensemble.oob[i])
    .filter(Number.isFinite).sort((a, b) => a - b);
  const h = (residuals.length - 1) / 2;
  const shift = residuals[Math.floor(h)] +
    (h % 1) * (residuals[Math.ceil(h)] - residuals[Math.floor(h)]);
  assert.ok(Math.abs(reader.center!.shift - shift) < 1e-15);
  assert.ok(Math.abs(r.estimate - Math.exp(average + shift)) < 1e-9);
  assert.ok(Math.abs(r.howSure.low - Math.exp(type7(0.1) + shift)) < 1e-9);
  assert.ok(Math.abs(r.howSure.high - Math.exp(type7(0.9) + shift)) < 1e-9);
  assert.equal(r.howSure.coverage, 0.8);
  const groups = summarizeResidualGroups(groupResiduals(ensemble.oob, dataset.target.values, 8), 5);
  // The range is read around the unshifted mean (groupedRange has its own tests).
  const g = groupedRange(average, groups, 0.8);
  assert.ok(Math.abs(r.range.low - Math.exp(g.low)) < 1e-9);
  assert.ok(Math.abs(r.range.high - Math.exp(g.high)) < 1e-9);
  assert.equal(r.rangeMethod, "grouped-residuals");
  r.trees.forEach((v, b) => assert.ok(Math.abs(v - Math.exp(t[b] + shift)) < 1e-9));
  // 40 trees for 400 rows is below the jackknife's one tree per row.
  assert.equal(r.jackknife, null);
});

Deno.test("the jackknife is shown from as many trees as rows, with the normal z", () => {
  const dataset = invented(120);
  const ensemble = fitEnsemble(dataset, {
    trees: 120,
    seed: 4,
    prune: "none",
    grow: { minLeaf: 5 },
  });
  const reader = profileReader(ensemble, dataset, "raw");
  const r = readProfile(reader, [20, 1], 0.9);
  const ij = infinitesimalJackknife(ensemble, 120, [20, 1]);
  assert.ok(r.jackknife !== null);
  assert.equal(r.jackknife.se, ij.se);
  // z = 1.6448536269514722: Python 3's statistics.NormalDist().inv_cdf(0.95).
  const z = 1.6448536269514722;
  assert.ok(Math.abs(r.jackknife.interval.low - (r.estimate - z * ij.se)) < 1e-12);
  assert.ok(Math.abs(r.jackknife.interval.high - (r.estimate + z * ij.se)) < 1e-12);
  const fewer = fitEnsemble(dataset, { trees: 119, seed: 4, prune: "none", grow: { minLeaf: 5 } });
  assert.equal(readProfile(profileReader(fewer, dataset, "raw"), [20, 1]).jackknife, null);
});

Deno.test("with the table at hand the range comes from forest weights", () => {
  const dataset = invented(3000);
  const ensemble = fitEnsemble(dataset, {
    trees: 30,
    seed: 5,
    prune: "none",
    grow: { minLeaf: 5 },
  });
  const reader = profileReader(ensemble, dataset, "log", { withTable: true });
  const r = readProfile(reader, [5, 3], 0.9);
  const q = quantileForestRange(ensemble, leafMembers(ensemble, dataset), [5, 3], 0.9);
  assert.equal(r.rangeMethod, "quantile-forest");
  assert.deepEqual(r.range, { low: Math.exp(q.low), high: Math.exp(q.high), coverage: 0.9 });
  // Level 3's spread (0.08) is four times level 0's (0.02): so is its range.
  const low = readProfile(reader, [5, 0], 0.9);
  const ratio = Math.log(r.range.high / r.range.low) / Math.log(low.range.high / low.range.low);
  assert.ok(ratio > 2.5, `${ratio}`);
});

Deno.test("a promotion's change comes from paired per-tree differences", () => {
  const dataset = invented(400);
  const ensemble = fitEnsemble(dataset, {
    trees: 50,
    seed: 6,
    prune: "none",
    grow: { minLeaf: 5 },
  });
  const reader = profileReader(ensemble, dataset, "log");
  const w = compareProfiles(reader, [8, 1], [8, 2], 0.9);
  // The invented rule: one level is +15% in log points, exp(0.15) - 1 = 16.2%.
  assert.ok(Math.abs(w.relative.estimate - Math.expm1(0.15)) < 0.03, `${w.relative.estimate}`);
  assert.equal(w.difference.estimate, w.changed.estimate - w.base.estimate);
  const perTree = w.changed.trees.map((v, t) => v - w.base.trees[t]);
  assert.deepEqual(
    { low: w.difference.low, high: w.difference.high },
    (({ low, high }) => ({ low, high }))(percentileInterval(perTree, 0.9)),
  );
  // A small change (one more year) shares most of each tree's path, so the
  // paired interval is narrower than that of the difference of two
  // unrelated readings (width about the root of the widths' squares): over
  // every one-year move of the grid the median is below 0.95 of that, and
  // no move's interval is as wide as the two intervals added.
  const ratios: number[] = [];
  for (let years = 0; years < 19; years++) {
    for (let level = 0; level < 4; level++) {
      const move = compareProfiles(reader, [years, level], [years + 1, level], 0.9);
      const a = move.base.howSure.high - move.base.howSure.low;
      const b = move.changed.howSure.high - move.changed.howSure.low;
      const paired = move.difference.high - move.difference.low;
      assert.ok(paired < a + b, `${years} years, level ${level}: ${paired} >= ${a + b}`);
      ratios.push(paired / Math.hypot(a, b));
    }
  }
  ratios.sort((x, y) => x - y);
  assert.ok(ratios[ratios.length >> 1] < 0.95, `median ${ratios[ratios.length >> 1]}`);
});
