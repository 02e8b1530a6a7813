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
import { proxyFigureSets } from "../../../lib/ensemble/proxies.ts";
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

Deno.test("a task aside is answered before a run sent after it, each reply to its own caller", async () => {
  const dataset = smallPay();
  const bins = binFeatures(dataset);
  const fold = assignFolds(dataset, 3, 1);
  const grow = { minLeaf: 3 };
  // A proxy check of the site from years: its own data in the message.
  const attribute = Int32Array.from(dataset.features[1].values);
  const question = {
    features: [dataset.features[0]],
    attribute,
    groups: ["North", "South", "East"],
    attributeName: "site",
  };
  const pool = new FittingPool(2);
  try {
    const aside = pool.aside(0, { kind: "proxies", questions: [question], options: { trees: 5 } });
    // The run's messages queue behind the task on worker 0.
    const kinds: string[] = [];
    await pool.run(
      [
        { kind: "data", data: pool.shared(dataset, bins), options: {}, states: new Int32Array(0) },
        { kind: "folds", fold, grow },
      ],
      [-1, 0, 1, 2].map((index) => ({ kind: "foldTree", index })),
      (reply) => kinds.push(reply.kind),
    );
    assert.deepEqual(kinds, ["foldTree", "foldTree", "foldTree", "foldTree"]);
    const reply = await aside;
    assert.equal(reply.kind, "proxies");
    if (reply.kind === "proxies") {
      assert.deepEqual(reply.figures, proxyFigureSets([question], { trees: 5 }));
    }
    // During a run a task aside is refused: its reply could not be told apart.
    const running = pool.run([], [{ kind: "foldTree", index: 0 }], () => {});
    await assert.rejects(
      pool.aside(1, { kind: "proxies", questions: [], options: {} }),
      /between runs only/,
    );
    await assert.rejects(running, /tree requested before data/);
  } finally {
    pool.close();
  }
});

Deno.test("a failed task aside rejects with the worker's message and closes the pool", async () => {
  const pool = new FittingPool(2);
  try {
    // Features whose values are not an array: the check fails in the worker.
    const broken = {
      features: [{ name: "x", kind: "numeric" as const, values: null as unknown as Float64Array }],
      attribute: Int32Array.of(0, 1),
      groups: ["a", "b"],
      attributeName: "g",
    };
    await assert.rejects(
      pool.aside(1, { kind: "proxies", questions: [broken], options: {} }),
      /a fitting worker failed/,
    );
    await assert.rejects(pool.aside(0, { kind: "proxies", questions: [], options: {} }), /closed/);
    await assert.rejects(pool.run([], [{ kind: "foldTree", index: 0 }], () => {}), /closed/);
  } finally {
    pool.close();
  }
});

Deno.test("closing a pool rejects a task aside still waiting", async () => {
  const pool = new FittingPool(1);
  const dataset = smallPay();
  const waiting = pool.aside(0, {
    kind: "proxies",
    questions: [{
      features: dataset.features,
      attribute: Int32Array.from(dataset.features[1].values),
      groups: ["North", "South", "East"],
      attributeName: "site",
    }],
    options: { trees: 50 },
  });
  pool.close();
  await assert.rejects(waiting, /the fitting pool was closed/);
  await assert.rejects(pool.aside(0, { kind: "proxies", questions: [], options: {} }), /closed/);
  await assert.rejects(pool.aside(3, { kind: "proxies", questions: [], options: {} }), /closed/);
  const other = new FittingPool(2);
  await assert.rejects(
    other.aside(2, { kind: "proxies", questions: [], options: {} }),
    /no worker 2 in a pool of 2/,
  );
  other.close();
});
