// Trees grown in workers (through lib/ensemble/_fit_worker.ts over shared
// columns) give the very ensemble fitEnsemble grows in this thread, for
// every pruning mode and a class target; bad worker counts are refused and
// a worker's failure reaches the caller.
import assert from "node:assert/strict";
import {
  bootstrapCounts,
  diverseLeaves,
  fitEnsemble,
  fitEnsembleParallel,
  shareTree,
} from "../../../mod.ts";
import { fitEnsemblesParallel } from "../../../lib/ensemble/fit_parallel.ts";
import { FittingPool } from "../../../lib/ensemble/_worker_pool.ts";
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

Deno.test("shareable copies made in workers: those of one thread, shareTree(diverseLeaves(...))", async () => {
  const dataset = smallPay();
  // Pay rounded to 1,000 so that some leaves hold people paid the same.
  const money = Float64Array.from(dataset.target.values, (v) => 1000 * Math.round(v / 1000));
  const options = { trees: 6, seed: 4, prune: "none" as const, grow: { minLeaf: 3 } };
  const share = { money };
  const parallel = await fitEnsembleParallel(dataset, { ...options, share, workers: 2 });
  const serial = fitEnsemble(dataset, { ...options, share });
  assert.deepEqual(parallel.shared, serial.shared);
  assert.deepEqual(parallel.trees, serial.trees);
  let merged = 0;
  serial.trees.forEach((tree, b) => {
    const counts = bootstrapCounts(dataset.rows, serial.resamples, b);
    const diverse = diverseLeaves(tree, dataset.features, counts, money);
    if (diverse.nodeCount < tree.nodeCount) merged++;
    assert.deepEqual(serial.shared![b], shareTree(diverse, dataset.features, dataset.rows));
  });
  assert(merged > 0);
  // Without the option no copies are made.
  assert.equal(fitEnsemble(dataset, options).shared, undefined);
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

Deno.test("several ensembles on one set of workers: each as fitEnsemble gives it", async () => {
  const pay = smallPay();
  const levels = smallLevels();
  const jobs = [
    { dataset: pay, options: { trees: 5, seed: 4, prune: "oob" as const, grow: { minLeaf: 3 } } },
    { dataset: levels, options: { trees: 3, seed: 2, prune: "none" as const } },
    { dataset: pay, options: { trees: 2, seed: 7, prune: "alpha" as const, alpha: 0.002 } },
  ];
  const progress: string[] = [];
  const ensembles = await fitEnsemblesParallel(
    jobs.map((job, j) => ({
      ...job,
      options: {
        ...job.options,
        onProgress: (d: number, n: number) => progress.push(`${j}:${d}/${n}`),
      },
    })),
    2,
  );
  jobs.forEach((job, j) => {
    const alone = fitEnsemble(job.dataset, job.options);
    assert.deepEqual(ensembles[j].trees, alone.trees, `job ${j}`);
    assert.deepEqual(ensembles[j].oob, alone.oob);
    assert.deepEqual(ensembles[j].alphas, alone.alphas);
  });
  // Each job's progress counts its own trees.
  for (const [j, n] of [[0, 5], [1, 3], [2, 2]]) {
    const own = progress.filter((p) => p.startsWith(`${j}:`));
    assert.deepEqual(own, Array.from({ length: n }, (_, i) => `${j}:${i + 1}/${n}`));
  }
  await assert.rejects(fitEnsemblesParallel(jobs, 0), RangeError);
});

Deno.test("a dataset changed in place between two fits on workers is read afresh, and a pool's runs agree with one thread", async () => {
  const dataset = smallPay();
  // Private copies of the columns, so that changing them touches no other test.
  const mine = {
    ...dataset,
    target: { ...dataset.target, values: Float64Array.from(dataset.target.values) },
  } as typeof dataset;
  const options = { trees: 4, seed: 2, prune: "none" as const, grow: { minLeaf: 3 } };
  await fitEnsembleParallel(mine, { ...options, workers: 2 });
  // The same object, other pay: a copy kept from the first fit would give
  // the first fit's trees.
  const values = mine.target.values as Float64Array;
  for (let r = 0; r < values.length; r++) values[r] += (r % 7) / 10;
  const again = await fitEnsembleParallel(mine, { ...options, workers: 2 });
  assert.deepEqual(again.trees, fitEnsemble(mine, options).trees);
  const pool = new FittingPool(2);
  try {
    const first = await fitEnsembleParallel(mine, { ...options, workers: pool });
    const second = await fitEnsembleParallel(mine, { ...options, seed: 3, workers: pool });
    assert.deepEqual(first.trees, again.trees);
    assert.deepEqual(second.trees, fitEnsemble(mine, { ...options, seed: 3 }).trees);
  } finally {
    pool.close();
  }
});
