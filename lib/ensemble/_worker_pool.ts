/**
 * Work spread over fitting workers (lib/ensemble/_fit_worker.ts): each
 * worker gets the same opening messages (the shared data), then tasks one
 * at a time as it finishes the last; replies are handed over as they come.
 * Workers are stopped when all replies are in or on the first failure.
 *
 * @module
 */

import type { FromWorker, ToWorker } from "./_fit_worker.ts";

/**
 * Runs `tasks` on `workers` fitting workers; `take` receives every reply
 * that is not an error.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { onFittingWorkers } from "./_worker_pool.ts";
 * // A task sent before the data is refused by the worker, and the run with it.
 * await assert.rejects(
 *   onFittingWorkers(1, [], [{ kind: "tree", index: 0 }], () => {}),
 *   /a fitting worker failed: .*tree requested before data/,
 * );
 * ```
 */
export async function onFittingWorkers(
  workers: number,
  opening: readonly ToWorker[],
  tasks: readonly ToWorker[],
  take: (reply: Exclude<FromWorker, { kind: "error" }>) => void,
): Promise<void> {
  let next = 0;
  let done = 0;
  const pool: Worker[] = [];
  try {
    await new Promise<void>((resolve, reject) => {
      if (tasks.length === 0) return resolve();
      const start = (worker: Worker) => {
        if (next < tasks.length) worker.postMessage(tasks[next++]);
      };
      for (let w = 0; w < Math.min(workers, tasks.length); w++) {
        const worker = new Worker(new URL("./_fit_worker.ts", import.meta.url).href, {
          type: "module",
        });
        pool.push(worker);
        worker.onerror = (event) => {
          event.preventDefault();
          reject(new Error(`a fitting worker failed: ${event.message}`));
        };
        worker.onmessage = (event: MessageEvent<FromWorker>) => {
          const reply = event.data;
          if (reply.kind === "error") {
            reject(new Error(`a fitting worker failed: ${reply.message}`));
            return;
          }
          take(reply);
          done++;
          if (done === tasks.length) resolve();
          else start(worker);
        };
        for (const message of opening) worker.postMessage(message);
        start(worker);
      }
    });
  } finally {
    for (const worker of pool) worker.terminate();
  }
}
