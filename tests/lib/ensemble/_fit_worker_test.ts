// The fitting worker on its own: given the shared data and a tree's number,
// it answers with the tree fitOneTree grows here, its out-of-bag values and
// its importance part.
import assert from "node:assert/strict";
import { binFeatures, canonicalRowOrder, resampleStates } from "../../../mod.ts";
import { fitOneTree } from "../../../lib/ensemble/fit_ensemble.ts";
import { shareData } from "../../../lib/ensemble/_shared_data.ts";
import type { FromWorker, ToWorker } from "../../../lib/ensemble/_fit_worker.ts";
import { smallPay } from "./_small_pay.ts";

Deno.test("the worker grows the tree it is asked for, as this thread would", async () => {
  const dataset = smallPay();
  const bins = binFeatures(dataset);
  const order = canonicalRowOrder(dataset);
  const states = resampleStates(3, dataset.target.values, 4);
  const options = {
    prune: "none" as const,
    grow: { minLeaf: 3 },
    importance: { repeats: 2, seed: 5 },
  };
  const worker = new Worker(new URL("../../../lib/ensemble/_fit_worker.ts", import.meta.url).href, {
    type: "module",
  });
  try {
    const reply = await new Promise<FromWorker>((resolve) => {
      worker.onmessage = (event: MessageEvent<FromWorker>) => resolve(event.data);
      const messages: ToWorker[] = [
        { kind: "data", data: shareData(dataset, bins, order), options, states },
        { kind: "tree", index: 2 },
      ];
      for (const message of messages) worker.postMessage(message);
    });
    assert.equal(reply.kind, "tree");
    const here = fitOneTree(dataset, bins, order, states, 2, options);
    if (reply.kind !== "tree") return;
    assert.equal(reply.index, 2);
    assert.deepEqual(reply.tree, here.tree);
    assert.deepEqual(reply.oob, here.oob);
    assert.deepEqual(reply.importance, here.importance);
  } finally {
    worker.terminate();
  }
});
