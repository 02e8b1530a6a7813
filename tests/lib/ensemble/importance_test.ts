import assert from "node:assert/strict";
import fc from "fast-check";
import {
  applyValues,
  binFeatures,
  type Dataset,
  featureImportance,
  fitEnsemble,
  fitEnsembleParallel,
  type FlatTree,
  growTree,
} from "../../../mod.ts";
import { importanceRng, treeImportanceIncrease } from "../../../lib/ensemble/importance.ts";
import { makeRng, randomBelow, type Rng, shuffle } from "../../../lib/random.ts";
import { levels, numeric, regression } from "../tree/_small.ts";

// Invented: pay by grade (strong) and years (weaker); "desk" is never split
// on when trees stop at depth 2 on this rule.
function invented() {
  const rows = 240;
  const grade = Array.from({ length: rows }, (_, i) => i % 4);
  const years = Array.from({ length: rows }, (_, i) => (i * 7) % 20);
  const desk = Array.from({ length: rows }, (_, i) => (i * 13) % 5);
  const pay = grade.map((g, i) => 40000 + 15000 * g + 300 * years[i]);
  return regression(
    [levels("grade", grade, 4, "ordinal"), numeric("years", years), levels("desk", desk, 5)],
    pay,
  );
}

Deno.test("a feature no tree splits on has zero importance; the strongest ranks first", () => {
  const dataset = invented();
  const ensemble = fitEnsemble(dataset, {
    trees: 25,
    seed: 3,
    prune: "none",
    grow: { minLeaf: 5, maxDepth: 2 },
  });
  const used = new Set(ensemble.trees.flatMap((t) => [...t.feature].filter((f) => f >= 0)));
  const importance = featureImportance(ensemble, dataset, { repeats: 4, seed: 9 });
  for (let f = 0; f < 3; f++) {
    if (used.has(f)) continue;
    assert.equal(importance[f].permutation, 0, importance[f].feature);
    assert.equal(importance[f].impurity, 0);
  }
  assert.ok(!used.has(2), "desk should never be split on here");
  assert.ok(importance[0].permutation > importance[1].permutation);
  const shares = importance.reduce((a, i) => a + i.impurity, 0);
  assert.ok(Math.abs(shares - 1) < 1e-12);
  assert.ok(importance.every((i) => i.permutationSd >= 0));
});

Deno.test("the same seed gives the same permutation importance", () => {
  const dataset = invented();
  const ensemble = fitEnsemble(dataset, { trees: 10, seed: 3, prune: "none" });
  assert.deepEqual(
    featureImportance(ensemble, dataset, { seed: 5 }),
    featureImportance(ensemble, dataset, { seed: 5 }),
  );
});

Deno.test("importance measured in the fitting workers equals the one measured after, whatever the worker count", async () => {
  const dataset = invented();
  const options = {
    trees: 12,
    seed: 4,
    prune: "none" as const,
    grow: { minLeaf: 5 },
    importance: { repeats: 3, seed: 7 },
  };
  const alone = fitEnsemble(dataset, options);
  const two = await fitEnsembleParallel(dataset, { ...options, workers: 2 });
  assert.equal(alone.importance!.parts.length, 12);
  assert.deepEqual(two.importance!.parts, alone.importance!.parts);
  const after = featureImportance(
    fitEnsemble(dataset, { ...options, importance: undefined }),
    dataset,
    {
      repeats: 3,
      seed: 7,
    },
  );
  assert.deepEqual(featureImportance(two, dataset, { repeats: 3, seed: 7 }), after);
  // Other settings than the parts': measured again, not taken from them.
  const other = featureImportance(two, dataset, { repeats: 3, seed: 8 });
  assert.notDeepEqual(other.map((x) => x.permutation), after.map((x) => x.permutation));
  assert(after[0].permutation > after[1].permutation, "grade matters more than years");
});

// The increase written the plain way: every out-of-bag row walked from the
// root with the donor's value of the shuffled feature, the same shuffles.
function walkedFromRoot(
  tree: FlatTree,
  dataset: Dataset,
  counts: Float64Array,
  repeats: number,
  rng: Rng,
): Float64Array {
  const features = dataset.features.length;
  const out = new Float64Array(features * repeats);
  const oob: number[] = [];
  for (let r = 0; r < dataset.rows; r++) if (counts[r] === 0) oob.push(r);
  const y = dataset.target.values;
  const sqError = (value: (g: number, r: number) => number, r: number) => {
    const e = y[r] - tree.value[applyValues(tree, dataset.features.map((_, g) => value(g, r)))];
    return e * e;
  };
  let base = 0;
  for (const r of oob) base += sqError((g, row) => dataset.features[g].values[row], r);
  for (let f = 0; f < features; f++) {
    for (let k = 0; k < repeats; k++) {
      const donor = shuffle(Int32Array.from(oob), rng);
      let sse = 0;
      oob.forEach((r, i) => {
        sse += sqError((g, row) => dataset.features[g].values[g === f ? donor[i] : row], r);
      });
      out[f * repeats + k] = tree.feature.includes(f) ? sse / oob.length - base / oob.length : 0;
    }
  }
  return out;
}

Deno.test("a tree's importance part equals walking every shuffled row from the root (missing values, masks of one and of two words, re-walks reused)", () => {
  fc.assert(
    fc.property(fc.integer({ min: 0, max: 2 ** 31 - 1 }), (seed) => {
      const rng = makeRng(seed);
      const rows = 160;
      const draw = (size: number) => randomBelow(rng, size);
      const gap = (v: number) => (draw(8) === 0 ? NaN : v);
      const years = Array.from({ length: rows }, () => gap(draw(25)));
      const grade = Array.from({ length: rows }, () => gap(draw(6)));
      const site = Array.from({ length: rows }, () => gap(draw(7)));
      const team = Array.from({ length: rows }, () => gap(draw(40)));
      // Two levels: a row's donor, when it differs, is always the same value,
      // so later repeats reuse the first re-walk.
      const shift = Array.from({ length: rows }, () => gap(draw(2)));
      const pay = years.map((v, i) =>
        1000 * (Number.isNaN(v) ? 3 : v) + 4000 * (grade[i] || 0) + 900 * ((site[i] || 0) % 3) +
        50 * ((team[i] || 0) % 11) + 3000 * (shift[i] || 0) + draw(500)
      );
      const dataset = regression([
        numeric("years", years),
        levels("grade", grade, 6, "ordinal"),
        levels("site", site, 7),
        levels("team", team, 40),
        levels("shift", shift, 2),
      ], pay);
      const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 + draw(4) });
      const counts = Float64Array.from({ length: rows }, () => draw(3));
      const stream = draw(1000);
      const fast = treeImportanceIncrease(tree, dataset, counts, 3, importanceRng(stream, 0));
      const plain = walkedFromRoot(tree, dataset, counts, 3, importanceRng(stream, 0));
      // The same squared errors summed in the same order: equal to the bit.
      assert.deepEqual([...fast], [...plain]);
    }),
    { numRuns: 60 },
  );
});
