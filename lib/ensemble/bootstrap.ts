/**
 * Bootstrap resamples as integer weights, regenerated from a per-tree seed
 * so that a model need not store them.
 *
 * @module
 */

import { makeRng, randomInt } from "../random.ts";

/**
 * The seed of tree `index` of an ensemble seeded with `seed`: a 32-bit mix
 * (the finaliser of MurmurHash3, common practice) of the two, so that
 * neighbouring trees get unrelated streams and a tree's resample does not
 * depend on how many trees or workers there are.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { treeSeed } from "./bootstrap.ts";
 * assert(treeSeed(7, 0) !== treeSeed(7, 1) && treeSeed(7, 1) === treeSeed(7, 1));
 * ```
 */
export function treeSeed(seed: number, index: number): number {
  let h = (Math.imul(seed | 0, 0x9e3779b1) ^ Math.imul(index + 1, 0x85ebca6b)) >>> 0;
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b) >>> 0;
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35) >>> 0;
  h ^= h >>> 16;
  return h | 0;
}

/**
 * Bootstrap counts: `rows` draws with replacement from `rows` rows, as the
 * number of times each row was drawn.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { bootstrapCounts } from "./bootstrap.ts";
 * const counts = bootstrapCounts(100, 5);
 * assert(counts.reduce((a, b) => a + b, 0) === 100);
 * ```
 */
export function bootstrapCounts(rows: number, seed: number): Float64Array {
  const rng = makeRng(seed);
  const counts = new Float64Array(rows);
  for (let i = 0; i < rows; i++) counts[randomInt(rng, 0, rows - 1)]++;
  return counts;
}
