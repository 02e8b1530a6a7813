// Trees grown in workers (through lib/ensemble/_fit_worker.ts over shared
// columns) give the very ensemble fitEnsemble grows in this thread, for
// every pruning mode and a class target; bad worker counts are refused and
// a worker's failure reaches the caller.
import assert from "node:assert/strict";
import { fitEnsemble, fitEnsembleParallel } from "../../../mod.ts";
import { smallLevels, smallPay } from "./_small_pay.ts";

Deno.test("two workers give the same trees, alphas and out-of-bag figures as one thread", async () => {
  const dataset = smallPay();
  for (
    const options of [
      { trees: 5, seed: 4, prune: "none" as const, grow: { minLeaf: 3 } },
      { trees: 5, seed: 4, prune: "oob" as const, grow: { minLeaf: 3 } },
      { trees: 4, seed: 9, prune: "alpha" as const, alpha: 0.002, grow: { minLeaf: 3 } },
    ]
  ) {
    const done: number[] = [];
    const parallel = await fitEnsembleParallel(dataset, {
      ...options,
      workers: 2,
      onProgress: (d, total) => done.push(d * 100 + total),
    });
    const serial = fitEnsemble(dataset, options);
    assert.deepEqual(parallel.trees, serial.trees, options.prune);
    assert.deepEqual(parallel.alphas, serial.alphas);
    assert.deepEqual(parallel.oob, serial.oob);
    assert.deepEqual(parallel.oobTrees, serial.oobTrees);
    assert.deepEqual(parallel.resamples, serial.resamples);
    // Progress once per tree, counting up to the total.
    const n = options.trees;
    assert.deepEqual(done, Array.from({ length: n }, (_, i) => (i + 1) * 100 + n));
  }
});

Deno.test("a class target in workers: class shares out of bag as in one thread", async () => {
  const dataset = smallLevels();
  const options = { trees: 4, seed: 2, prune: "none" as const, grow: { minLeaf: 2 } };
  const parallel = await fitEnsembleParallel(dataset, { ...options, workers: 2 });
  const serial = fitEnsemble(dataset, options);
  assert.equal(parallel.width, 2);
  assert.deepEqual(parallel.trees, serial.trees);
  assert.deepEqual(parallel.oob, serial.oob);
});

Deno.test("worker counts: more than trees is capped, one runs here, none is refused", async () => {
  const dataset = smallPay();
  const options = { trees: 2, seed: 1, prune: "none" as const };
  const capped = await fitEnsembleParallel(dataset, { ...options, workers: 16 });
  assert.deepEqual(capped.trees, fitEnsemble(dataset, options).trees);
  const here = await fitEnsembleParallel(dataset, { ...options, workers: 1 });
  assert.deepEqual(here.oob, capped.oob);
  for (const workers of [0, 1.5, -2]) {
    await assert.rejects(fitEnsembleParallel(dataset, { ...options, workers }), RangeError);
  }
  // Options are checked before any worker starts.
  await assert.rejects(fitEnsembleParallel(dataset, { trees: 0, workers: 2 }), RangeError);
  await assert.rejects(
    fitEnsembleParallel(dataset, { trees: 2, prune: "alpha", workers: 2 }),
    RangeError,
  );
});

Deno.test("a tree that fails in a worker rejects the fit with the worker's error", async () => {
  await assert.rejects(
    fitEnsembleParallel(smallPay(), {
      trees: 3,
      prune: "none",
      grow: { maxDepth: -1 },
      workers: 2,
    }),
    (error: Error) =>
      error.message.startsWith("a fitting worker failed") && /maxDepth/.test(error.message),
  );
});
