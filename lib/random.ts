/**
 * Seeded randomness. The library never calls `Math.random`: every random
 * choice comes from a generator made from a seed the user can state, so the
 * same seed gives the same result.
 *
 * @module
 */

import { uniformInt } from "pure-rand/distribution/uniformInt";
import { xoroshiro128plus } from "pure-rand/generator/xoroshiro128plus";

/** A seeded random generator (xoroshiro128+, from pure-rand). */
export type Rng = ReturnType<typeof xoroshiro128plus>;

/**
 * Makes a generator from an integer seed.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { makeRng, randomInt } from "./random.ts";
 * const a = makeRng(42);
 * const b = makeRng(42);
 * assert(randomInt(a, 0, 99) === randomInt(b, 0, 99));
 * ```
 */
export function makeRng(seed: number): Rng {
  if (!Number.isInteger(seed) || seed < -(2 ** 31) || seed >= 2 ** 31) {
    throw new RangeError(`a seed must be a whole number from -2^31 to 2^31 - 1, got ${seed}`);
  }
  return xoroshiro128plus(seed);
}

/**
 * A uniform integer in `[low, high]` (both included), advancing `rng`.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { makeRng, randomInt } from "./random.ts";
 * const rng = makeRng(7);
 * const seen = new Set<number>();
 * for (let i = 0; i < 200; i++) seen.add(randomInt(rng, 3, 5));
 * // 200 draws from three values: each of 3, 4, 5 turns up, nothing else does.
 * assert.deepEqual([...seen].sort(), [3, 4, 5]);
 * assert.equal(randomInt(makeRng(1), 9, 9), 9);
 * ```
 */
export function randomInt(rng: Rng, low: number, high: number): number {
  return uniformInt(rng, low, high);
}

/**
 * Shuffles an array in place (Fisher-Yates) and returns it.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { makeRng, shuffle } from "./random.ts";
 * const order = shuffle([0, 1, 2, 3], makeRng(1));
 * assert(order.slice().sort().join() === "0,1,2,3");
 * ```
 */
export function shuffle<T extends { length: number; [i: number]: unknown }>(array: T, rng: Rng): T {
  for (let i = array.length - 1; i > 0; i--) {
    const j = randomBelow(rng, i + 1);
    const t = array[i];
    array[i] = array[j];
    array[j] = t;
  }
  return array;
}

/**
 * {@linkcode shuffle} of a Float64Array: the same draws, the same order.
 * A function of its own for permutation importance's shuffles (4,800 in a
 * demo fit: 200 trees, 8 attributes, 3 repeats): the runtime optimises a
 * function for the kinds of array it has met, and `shuffle`, met first
 * with arrays of fold numbers, was optimised for those, then thrown away
 * inside importance's loop again and again (22 times in one demo fit).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { makeRng, shuffle, shuffleDoubles } from "./random.ts";
 * const doubles = Float64Array.of(0.5, 1.5, 2.5, 3.5, 4.5, 5.5);
 * const plain = [...doubles];
 * shuffleDoubles(doubles, makeRng(3));
 * shuffle(plain, makeRng(3));
 * assert.deepEqual([...doubles], plain);
 * ```
 */
export function shuffleDoubles(array: Float64Array, rng: Rng): Float64Array {
  for (let i = array.length - 1; i > 0; i--) {
    const j = randomBelow(rng, i + 1);
    const t = array[i];
    array[i] = array[j];
    array[j] = t;
  }
  return array;
}

/**
 * A whole number in [0, size) for size up to 2^32: `randomInt(rng, 0,
 * size - 1)` written out as pure-rand 8.4.2 draws it
 * (lib/esm/distribution/uniformInt.js, uniformIntInternal: 32-bit draws at
 * or above the largest multiple of size are drawn again). The library's call
 * chain took about a twentieth of a fit's tree work in a profile, inside
 * the importance shuffles; tests/lib/random_test.ts holds this to the
 * library draw for draw.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { makeRng, randomBelow, randomInt } from "./random.ts";
 * const a = makeRng(5);
 * const b = makeRng(5);
 * for (const size of [1, 2, 3, 10, 3 * 2 ** 30]) {
 *   assert.equal(randomBelow(a, size), randomInt(b, 0, size - 1));
 * }
 * ```
 */
export function randomBelow(rng: Rng, size: number): number {
  const limit = size > 2 ? ~~(4294967296 / size) * size : 4294967296;
  let v = rng.next() + 2147483648;
  while (v >= limit) v = rng.next() + 2147483648;
  // v % size without the floating-point remainder (2.2x slower in a 10,000-
  // element shuffle): for whole v < 2^32 and size <= 2^32 the quotient's
  // rounding error (below 2^-20 / size) is smaller than its distance to the
  // next whole number (at least 1 / size), so the floor is exact.
  return v - Math.floor(v / size) * size;
}
