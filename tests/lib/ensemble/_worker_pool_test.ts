// The worker pool hands every task to a worker and every reply back: fold
// trees grown on two workers are the trees grown here.
import assert from "node:assert/strict";
import {
  assignFolds,
  binFeatures,
  canonicalRowOrder,
  type Dataset,
  growTree,
} from "../../../mod.ts";
import { shareData } from "../../../lib/ensemble/_shared_data.ts";
import { FittingPool, onFittingWorkers } from "../../../lib/ensemble/_worker_pool.ts";
import type { ToWorker } from "../../../lib/ensemble/_fit_worker.ts";
import { smallPay } from "./_small_pay.ts";

Deno.test("every task is answered once, with the tree grown here", async () => {
  const dataset = smallPay();
  const bins = binFeatures(dataset);
  const order = canonicalRowOrder(dataset);
  const fold = assignFolds(dataset, 3, 1);
  const grow = { minLeaf: 3 };
  const opening: ToWorker[] = [
    { kind: "data", data: shareData(dataset, bins, order), options: {}, states: new Int32Array(0) },
    { kind: "folds", fold, grow },
  ];
  const tasks: ToWorker[] = [-1, 0, 1, 2].map((index) => ({ kind: "foldTree", index }));
  const got = new Map<number, unknown>();
  await onFittingWorkers(2, opening, tasks, (reply) => {
    assert.equal(reply.kind, "foldTree");
    if (reply.kind === "foldTree") got.set(reply.index, reply.tree);
  });
  assert.deepEqual([...got.keys()].sort(), [-1, 0, 1, 2]);
  assert.deepEqual(got.get(-1), growTree({ dataset, bins, order }, grow));
  const weights = Float64Array.from(fold, (f) => (f === 1 ? 0 : 1));
  assert.deepEqual(got.get(1), growTree({ dataset, bins, weights, order }, grow));
});

Deno.test("a worker's failure rejects the run with its message", async () => {
  await assert.rejects(
    onFittingWorkers(2, [], [{ kind: "foldTree", index: 0 }], () => {}),
    /a fitting worker failed: .*tree requested before data/,
  );
});

Deno.test("a pool's second run sees only its own data: earlier data and folds are forgotten", async () => {
  const first = smallPay();
  // The same people paid otherwise.
  const second: Dataset = {
    ...first,
    target: {
      kind: "regression",
      name: "pay",
      values: Float64Array.from(first.target.values, (v, i) => v + (i % 5) / 10),
    },
  };
  assert.notDeepEqual(first.target.values, second.target.values);
  const pool = new FittingPool(2);
  try {
    const grow = { minLeaf: 3 };
    const treesOf = async (dataset: Dataset) => {
      const bins = binFeatures(dataset);
      const fold = assignFolds(dataset, 3, 1);
      const got = new Map<number, unknown>();
      await pool.run(
        [
          {
            kind: "data",
            data: pool.shared(dataset, bins),
            options: {},
            states: new Int32Array(0),
          },
          { kind: "folds", fold, grow },
        ],
        [-1, 0, 1, 2].map((index) => ({ kind: "foldTree", index })),
        (reply) => {
          if (reply.kind === "foldTree") got.set(reply.index, reply.tree);
        },
      );
      assert.deepEqual(
        got.get(-1),
        growTree({ dataset, bins, order: canonicalRowOrder(dataset) }, grow),
      );
    };
    await treesOf(first);
    await treesOf(second);
    // Without its own opening messages a run finds nothing left from before.
    await assert.rejects(
      pool.run([], [{ kind: "foldTree", index: 0 }], () => {}),
      /tree requested before data/,
    );
    // A failed run stops the workers and closes the pool.
    await assert.rejects(pool.run([], [{ kind: "tree", index: 0 }], () => {}), /closed/);
  } finally {
    pool.close();
  }
});
