/**
 * Bootstrap resamples as integer weights, regenerated from a per-tree
 * generator state so that a model need not store them.
 *
 * Each tree's state (128 bits, a xoroshiro128+ state of four 32-bit words)
 * is cut from a SHA-256 of the user's seed, the tree's index and every
 * training row's target value. The same table and seed give the same
 * resamples, so a fit is reproducible; but nobody can regenerate them
 * without every person's exact pay, which is what the resamples must keep
 * hidden: with a tree's in-bag weights known, each leaf mean is a linear
 * equation in the unknown pays, and enough of them give every pay back
 * (measured on format-1 files, which kept a 32-bit seed per tree: all
 * 2,000 demo pays to the cent). 128 bits also rule out trying every state.
 *
 * @module
 */

import { createHash } from "node:crypto";
import { xoroshiro128plusFromState } from "pure-rand/generator/xoroshiro128plus";
import { randomBelow } from "../random.ts";

/**
 * Words of one tree's generator state.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { resampleStates, STATE_WORDS } from "./bootstrap.ts";
 * const states = resampleStates(7, Float64Array.of(50, 52, 61), 3);
 * assert.equal(states.length, 3 * STATE_WORDS);
 * // Four 32-bit words: xoroshiro128+'s 128 bits of state per tree.
 * assert.equal(states.BYTES_PER_ELEMENT * 8 * STATE_WORDS, 128);
 * ```
 */
export const STATE_WORDS = 4;

/**
 * The generator states of `trees` trees (tree b's state is words
 * `4b .. 4b + 3`), keyed by the seed and the target values.
 *
 * @param target Every training row's target on the fitting scale (or class
 * code), in training order.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { resampleStates } from "./bootstrap.ts";
 * const pay = Float64Array.of(50, 52, 61);
 * const a = resampleStates(7, pay, 2);
 * assert.deepEqual(a, resampleStates(7, Float64Array.of(50, 52, 61), 2)); // reproducible
 * assert.notDeepEqual(a, resampleStates(7, Float64Array.of(50, 52, 62), 2)); // keyed by pay
 * assert.notDeepEqual(a.subarray(0, 4), a.subarray(4, 8)); // one state per tree
 * ```
 */
export function resampleStates(
  seed: number,
  target: ArrayLike<number>,
  trees: number,
): Int32Array {
  if (!Number.isInteger(trees) || trees < 0) {
    throw new RangeError(`trees must be a whole number >= 0, got ${trees}`);
  }
  const values = Float64Array.from(target);
  const key = createHash("sha256")
    .update("paygrove resample key 2\u0000")
    .update(String(seed))
    .update("\u0000")
    .update(new Uint8Array(values.buffer))
    .digest();
  const states = new Int32Array(trees * STATE_WORDS);
  const index = new Uint8Array(4);
  for (let b = 0; b < trees; b++) {
    new DataView(index.buffer).setUint32(0, b, true);
    const digest = createHash("sha256").update(key).update(index).digest();
    const words = new Int32Array(digest.buffer, digest.byteOffset, STATE_WORDS);
    // xoroshiro128+ is stuck at an all-zero state; SHA-256 gives one with
    // probability 2^-128, but the guard costs nothing.
    if (words.every((w) => w === 0)) words[0] = 1;
    states.set(words, b * STATE_WORDS);
  }
  return states;
}

/**
 * Bootstrap counts of tree `tree`: `rows` draws with replacement from
 * `rows` rows from the tree's generator state, as the number of times each
 * row was drawn; into `into` (zeroed first) when given.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { bootstrapCounts, resampleStates } from "./bootstrap.ts";
 * const states = resampleStates(5, Float64Array.of(1, 2, 3), 3);
 * const counts = bootstrapCounts(100, states, 2);
 * assert(counts.reduce((a, b) => a + b, 0) === 100);
 * assert.deepEqual(counts, bootstrapCounts(100, states, 2));
 * const kept = new Float64Array(100).fill(7);
 * assert.equal(bootstrapCounts(100, states, 2, kept), kept);
 * assert.deepEqual(kept, counts);
 * ```
 */
export function bootstrapCounts(
  rows: number,
  states: Int32Array,
  tree: number,
  into?: Float64Array,
): Float64Array {
  const at = tree * STATE_WORDS;
  if (!(tree >= 0 && at + STATE_WORDS <= states.length)) {
    throw new RangeError(`no generator state for tree ${tree}`);
  }
  const rng = xoroshiro128plusFromState(Array.from(states.subarray(at, at + STATE_WORDS)));
  const counts = into?.fill(0) ?? new Float64Array(rows);
  // pure-rand's uniformInt(rng, 0, rows - 1), draw for draw, without its
  // call chain (about 3% of a fit's tree work in a profile).
  for (let i = 0; i < rows; i++) counts[randomBelow(rng, rows)]++;
  return counts;
}

/**
 * The generator states of a format-1 model, which derived a 32-bit seed
 * per tree from its seed (the finaliser of MurmurHash3, common practice)
 * and started pure-rand's xoroshiro128+ from it; kept so that such files
 * still read, with the warning that they rebuild pay.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { legacyResampleStates } from "./bootstrap.ts";
 * const states = legacyResampleStates(Int32Array.of(42));
 * assert.deepEqual(Array.from(states), [-1, ~42, 42, 0]);
 * ```
 */
export function legacyResampleStates(seeds: Int32Array): Int32Array {
  const states = new Int32Array(seeds.length * STATE_WORDS);
  // pure-rand's xoroshiro128plus(seed) starts from the state (-1, ~seed, seed, 0).
  seeds.forEach((seed, b) => states.set([-1, ~seed, seed | 0, 0], b * STATE_WORDS));
  return states;
}
