/**
 * Contributions of many profiles (`batch --contributions`) worked out on the
 * fitting workers: each worker builds the trees' leaf paths once, then
 * takes blocks of profiles. The figures are those of
 * {@linkcode ContributionReader} in this thread, worked out by the same code
 * in the same order, so they are equal to the last bit.
 *
 * @module
 */

import type { FlatTree } from "../tree/flat_tree.ts";
import { ContributionReader, type Contributions } from "./contributions.ts";
import type { ToWorker } from "./_fit_worker.ts";
import { type FittingPool, onFittingWorkers } from "./_worker_pool.ts";

/** Profiles per task: enough work to outweigh a message's round trip. */
const BLOCK = 64;

/**
 * Below this many profiles, the work is done in this thread (starting
 * workers and sending them the trees costs more).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { ON_WORKERS_FROM } from "./contributions_parallel.ts";
 * assert(ON_WORKERS_FROM >= 64);
 * ```
 */
export const ON_WORKERS_FROM = 256;

/**
 * The contributions of each profile, over every tree or, where `only[i]`
 * lists them, over those trees (a training row's out-of-bag trees).
 *
 * @param profiles One value per feature each (NaN: missing).
 * @param only Per profile, the trees to use, or null for all of them.
 * @param workers Workers (1: this thread), or a pool.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { fitEnsemble } from "../../mod.ts";
 * import { ContributionReader } from "./contributions.ts";
 * import { contributionsOfMany } from "./contributions_parallel.ts";
 * const x = Float64Array.from({ length: 80 }, (_, i) => i % 8);
 * const z = Float64Array.from({ length: 80 }, (_, i) => (i >> 3) % 2);
 * const ensemble = fitEnsemble({
 *   rows: 80,
 *   features: [{ name: "x", kind: "numeric", values: x }, { name: "z", kind: "numeric", values: z }],
 *   target: { kind: "regression", name: "pay", values: x.map((v, i) => 50 + 3 * v + 10 * z[i]) },
 * }, { trees: 10, prune: "none", grow: { minLeaf: 1 } });
 * const profiles = Array.from({ length: 300 }, (_, i) => Float64Array.of(i % 9, i % 2));
 * const only = profiles.map((_, i) => (i % 3 === 0 ? Int32Array.of(1, 4, 7) : null));
 * const many = await contributionsOfMany(ensemble.trees, 2, profiles, only, 2);
 * const reader = new ContributionReader(ensemble.trees, 2);
 * for (const i of [0, 1, 299]) {
 *   assert.deepEqual(many[i], reader.profile(profiles[i], only[i] ?? undefined));
 * }
 * ```
 */
export async function contributionsOfMany(
  trees: readonly FlatTree[],
  features: number,
  profiles: readonly ArrayLike<number>[],
  only: readonly (Int32Array | null)[],
  workers: number | FittingPool,
): Promise<Contributions[]> {
  const count = profiles.length;
  const size = typeof workers === "number" ? workers : workers.size;
  if (size <= 1 || count < ON_WORKERS_FROM) {
    const reader = new ContributionReader(trees, features);
    return profiles.map((p, i) => reader.profile(p, only[i] ?? undefined));
  }
  const tasks: ToWorker[] = [];
  for (let start = 0, index = 0; start < count; start += BLOCK, index++) {
    const end = Math.min(count, start + BLOCK);
    const block = new Float64Array((end - start) * features);
    for (let i = start; i < end; i++) block.set(profiles[i], (i - start) * features);
    tasks.push({ kind: "parts", index, profiles: block, only: only.slice(start, end) });
  }
  const out: Contributions[] = new Array(count);
  await onFittingWorkers(
    workers,
    [{ kind: "partsTrees", trees: [...trees], features }],
    tasks,
    (reply) => {
      if (reply.kind !== "parts") return;
      const stride = features + 2;
      const start = reply.index * BLOCK;
      for (let i = 0; i * stride < reply.figures.length; i++) {
        const at = i * stride;
        out[start + i] = {
          base: reply.figures[at],
          prediction: reply.figures[at + 1],
          parts: reply.figures.slice(at + 2, at + stride),
        };
      }
    },
  );
  return out;
}
