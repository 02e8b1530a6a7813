import assert from "node:assert/strict";
import { featureImportance, fitEnsemble, fitEnsembleParallel } from "../../../mod.ts";
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
