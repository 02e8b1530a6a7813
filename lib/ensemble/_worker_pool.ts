/**
 * Work spread over fitting workers (lib/ensemble/_fit_worker.ts). A
 * {@linkcode FittingPool} keeps its workers from one run to the next, so a
 * whole fit (cross-validation, then the ensemble) starts them
 * once and later runs find them loaded and warm. In each run every worker
 * gets the same opening messages (the shared data), then tasks: two at
 * first and one more for each reply, so that a worker finds its next task
 * waiting instead of idling for a round trip through this thread; replies
 * are handed over as they come.
 *
 * @module
 */

import type { Dataset } from "../dataset/types.ts";
import type { FeatureBins } from "../tree/bins.ts";
import type { FromWorker, ToWorker } from "./_fit_worker.ts";
import { type SharedData, sharedInOrder } from "./_shared_data.ts";

/** Tasks a worker holds at once: the one it works on and the next. */
const IN_FLIGHT = 2;

/** A reply that is not an error. */
export type WorkerReply = Exclude<FromWorker, { kind: "error" }>;

// A task sent aside, waiting for its reply.
interface AsideTask {
  resolve: (reply: WorkerReply) => void;
  reject: (error: Error) => void;
}

/**
 * Fitting workers kept for several runs, one run at a time. Workers start
 * on the first run that needs them; a failure stops them all and closes the
 * pool (a worker may still hold the failed run's tasks).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { FittingPool } from "./_worker_pool.ts";
 * import { binFeatures } from "../tree/bins.ts";
 * const pool = new FittingPool(2);
 * assert.equal(pool.size, 2);
 * // One shared copy per dataset and bins for all of the pool's runs.
 * const dataset = {
 *   rows: 2,
 *   features: [{ name: "x", kind: "numeric" as const, values: Float64Array.of(2, 1) }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.of(20, 10) },
 * };
 * const bins = binFeatures(dataset);
 * assert.equal(pool.shared(dataset, bins), pool.shared(dataset, bins));
 * assert.notEqual(new FittingPool(2).shared(dataset, bins), pool.shared(dataset, bins));
 * pool.close();
 * await assert.rejects(pool.run([], [{ kind: "stop" }], () => {}), /closed/);
 * assert.throws(() => new FittingPool(0), /whole number >= 1/);
 * ```
 */
export class FittingPool {
  /** Most workers a run uses. */
  readonly size: number;
  #workers: Worker[] = [];
  // Per worker, the tasks aside it has not yet answered, oldest first: its
  // replies come in the order of its messages, so these come first.
  #asides: AsideTask[][] = [];
  // The running run's handlers (null between runs).
  #onReply: ((worker: Worker, reply: WorkerReply) => void) | null = null;
  #onFailure: ((error: Error) => void) | null = null;
  #running = false;
  #closed = false;
  // Shared copies made for this pool's runs, by dataset and bins: a fit's
  // cross-validation and ensemble send the same data. Kept no longer than
  // the pool, so a dataset changed in place between fits is copied afresh.
  #copies = new WeakMap<Dataset, { bins: FeatureBins[]; data: SharedData }>();

  constructor(size: number) {
    if (!Number.isInteger(size) || size < 1) {
      throw new RangeError(`workers must be a whole number >= 1, got ${size}`);
    }
    this.size = size;
  }

  /**
   * Runs `tasks` on up to `size` workers; `take` receives every reply that
   * is not an error. Each worker first forgets the data of earlier runs.
   */
  async run(
    opening: readonly ToWorker[],
    tasks: readonly ToWorker[],
    take: (reply: WorkerReply) => void,
  ): Promise<void> {
    if (this.#closed) throw new Error("the fitting pool is closed");
    if (this.#running) throw new Error("the fitting pool runs one job at a time");
    if (tasks.length === 0) return;
    this.#running = true;
    try {
      this.#startWorkers(Math.min(this.size, tasks.length));
      const used = this.#workers.slice(0, Math.min(this.size, tasks.length));
      let next = 0;
      let done = 0;
      await new Promise<void>((resolve, reject) => {
        const start = (worker: Worker) => {
          if (next < tasks.length) worker.postMessage(tasks[next++]);
        };
        this.#onFailure = reject;
        this.#onReply = (worker, reply) => {
          // The worker's next task goes first: it works on while this
          // thread handles the reply (cross-validation scores a fold tree).
          start(worker);
          take(reply);
          done++;
          if (done === tasks.length) resolve();
        };
        for (const worker of used) {
          worker.postMessage({ kind: "reset" } satisfies ToWorker);
          for (const message of opening) worker.postMessage(message);
          for (let k = 0; k < IN_FLIGHT; k++) start(worker);
        }
      });
    } catch (error) {
      this.close();
      throw error;
    } finally {
      this.#running = false;
      this.#onReply = null;
      this.#onFailure = null;
    }
  }

  /**
   * Sends one task that brings its own data to worker `index` between runs,
   * and returns its reply. A run started later queues behind it on that
   * worker (a worker takes its messages in order), so the task uses time a
   * worker would otherwise wait through, such as this thread scoring the
   * cross-validation's trees. A failure stops the pool as in a run.
   */
  aside(index: number, task: ToWorker): Promise<WorkerReply> {
    if (this.#closed) return Promise.reject(new Error("the fitting pool is closed"));
    if (this.#running) {
      // Its reply could not be told apart from the run's.
      return Promise.reject(new Error("a task aside is sent between runs only"));
    }
    if (!(Number.isInteger(index) && index >= 0 && index < this.size)) {
      return Promise.reject(new RangeError(`no worker ${index} in a pool of ${this.size}`));
    }
    this.#startWorkers(index + 1);
    return new Promise<WorkerReply>((resolve, reject) => {
      this.#asides[index].push({ resolve, reject });
      this.#workers[index].postMessage(task);
    });
  }

  /**
   * Starts every worker now, so that each loads its code while this thread
   * works on something else (a fit's cross-validation, on a small table)
   * and the first run finds them ready.
   */
  start(): void {
    if (this.#closed) throw new Error("the fitting pool is closed");
    this.#startWorkers(this.size);
  }

  #startWorkers(count: number): void {
    while (this.#workers.length < count) {
      const worker = new Worker(new URL("./_fit_worker.ts", import.meta.url).href, {
        type: "module",
      });
      const asides: AsideTask[] = [];
      this.#workers.push(worker);
      this.#asides.push(asides);
      worker.onerror = (event) => {
        event.preventDefault();
        this.#fail(new Error(`a fitting worker failed: ${event.message}`));
      };
      worker.onmessage = (event: MessageEvent<FromWorker>) => {
        const reply = event.data;
        if (reply.kind === "error") {
          this.#fail(new Error(`a fitting worker failed: ${reply.message}`));
          return;
        }
        const aside = asides.shift();
        if (aside !== undefined) aside.resolve(reply);
        else this.#onReply?.(worker, reply);
      };
    }
  }

  // A worker's failure ends the run and every task aside; the pool closes.
  #fail(error: Error): void {
    this.#onFailure?.(error);
    this.#shutDown(error);
  }

  /**
   * The shared copy of a dataset with these bins (and its canonical row
   * order), made once for all of this pool's runs.
   */
  shared(dataset: Dataset, bins: FeatureBins[]): SharedData {
    const known = this.#copies.get(dataset);
    if (known !== undefined && known.bins === bins) return known.data;
    const data = sharedInOrder(dataset, bins);
    this.#copies.set(dataset, { bins, data });
    return data;
  }

  /** Stops the workers; later runs are refused. */
  close(): void {
    this.#shutDown(new Error("the fitting pool was closed"));
  }

  // Stops the workers; a task aside still waiting gets `error`, as no reply
  // will come.
  #shutDown(error: Error): void {
    this.#closed = true;
    for (const worker of this.#workers) worker.terminate();
    this.#workers = [];
    const waiting = this.#asides.flat();
    this.#asides = [];
    for (const aside of waiting) aside.reject(error);
  }
}

/**
 * The shared copy of a dataset for a run on `workers`: the pool's, made
 * once for all its runs, or a fresh one for workers started for one run.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures } from "../tree/bins.ts";
 * import { FittingPool, sharedDataFor } from "./_worker_pool.ts";
 * const dataset = {
 *   rows: 2,
 *   features: [{ name: "x", kind: "numeric" as const, values: Float64Array.of(2, 1) }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.of(20, 10) },
 * };
 * const bins = binFeatures(dataset);
 * const pool = new FittingPool(2);
 * assert.equal(sharedDataFor(pool, dataset, bins), sharedDataFor(pool, dataset, bins));
 * assert.notEqual(sharedDataFor(2, dataset, bins), sharedDataFor(2, dataset, bins));
 * ```
 */
export function sharedDataFor(
  workers: number | FittingPool,
  dataset: Dataset,
  bins: FeatureBins[],
): SharedData {
  return workers instanceof FittingPool
    ? workers.shared(dataset, bins)
    : sharedInOrder(dataset, bins);
}

/**
 * Runs `tasks` on a pool, or on `workers` workers started for this run and
 * stopped after it; `take` receives every reply that is not an error.
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
  workers: number | FittingPool,
  opening: readonly ToWorker[],
  tasks: readonly ToWorker[],
  take: (reply: WorkerReply) => void,
): Promise<void> {
  if (workers instanceof FittingPool) return await workers.run(opening, tasks, take);
  const pool = new FittingPool(workers);
  try {
    await pool.run(opening, tasks, take);
  } finally {
    pool.close();
  }
}
