// Cross-validation with its trees grown on workers gives exactly what the
// one-thread cross-validation gives: the same full tree, fold trees,
// candidates, choice and reference tree, whatever the worker count.
import assert from "node:assert/strict";
import { crossValidateTree, crossValidateTreeParallel } from "../../../mod.ts";
import { smallPay } from "./_small_pay.ts";

const DATASET = smallPay();

Deno.test("trees grown on workers give the one-thread cross-validation exactly", async () => {
  // Extra losses too: each fold's sums are kept apart and added in fold
  // order, whatever order the workers' trees come back in.
  const options = {
    folds: 5,
    seed: 4,
    grow: { minLeaf: 3 },
    rule: "min" as const,
    extraLosses: [
      (a: number, p: number) => Math.abs(a - p),
      (a: number, p: number) => (a - p) ** 4,
    ],
  };
  const alone = crossValidateTree(DATASET, options);
  for (const workers of [2, 3]) {
    const progress: [number, number][] = [];
    let grownAt = -1;
    const parallel = await crossValidateTreeParallel(DATASET, {
      ...options,
      workers,
      onProgress: (done, total) => progress.push([done, total]),
      onTreesGrown: () => {
        assert.equal(grownAt, -1, "called once");
        grownAt = progress.length;
      },
    });
    // When every tree is back.
    assert.equal(grownAt, 6);
    assert.deepEqual(parallel.candidates, alone.candidates);
    assert.equal(parallel.chosen, alone.chosen);
    assert.equal(parallel.best, alone.best);
    assert.deepEqual(parallel.tree, alone.tree);
    assert.deepEqual(parallel.fold, alone.fold);
    // The tree of every row and five fold trees, each said once.
    assert.deepEqual(progress, [1, 2, 3, 4, 5, 6].map((d) => [d, 6]));
  }
  assert(alone.candidates.length > 2, "a path with several candidates");
});

Deno.test("options the one-thread cross-validation refuses are refused in its words", async () => {
  await assert.rejects(
    crossValidateTreeParallel(DATASET, { folds: 1, workers: 2 }),
    /folds must be a whole number from 2 to the row count, got 1/,
  );
});
