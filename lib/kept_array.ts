/**
 * Typed arrays a thread keeps from one tree to the next. The learner fits
 * trees one at a time in each thread, and a new set of large arrays per
 * tree left the system to zero and the collector to free hundreds of
 * megabytes a fit (on CPS1988 a kept set made a tree's work 0.83-0.95 of
 * before, measured in bench/results and the README's performance section).
 *
 * @module
 */

/** The typed arrays kept. */
export type KeptKind = Float64Array | Int32Array | Uint32Array | Uint16Array | Uint8Array;

/**
 * One typed array kept for reuse: `view(n)` gives its first `n` entries,
 * growing it (with a tenth to spare, as the next tree may need a little
 * more) when it is shorter. A view is good until the next call that grows
 * it; its entries are whatever the last user left, so a user sets every
 * entry it reads.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { KeptArray } from "./kept_array.ts";
 * const kept = new KeptArray((n) => new Float64Array(n));
 * const first = kept.view(100);
 * first.fill(7);
 * const second = kept.view(50);
 * assert.equal(second.length, 50);
 * assert.equal(second.buffer, first.buffer); // the same memory, not zeroed
 * assert.equal(second[0], 7);
 * assert.equal(kept.view(200).length, 200); // grown: a new array
 * assert.notEqual(kept.view(200).buffer, first.buffer);
 * ```
 */
export class KeptArray<T extends KeptKind> {
  #array: T;
  readonly #make: (length: number) => T;

  /** @param make A new array of the given length. */
  constructor(make: (length: number) => T) {
    this.#make = make;
    this.#array = make(0);
  }

  /** The first `length` entries, the array grown first if it is shorter. */
  view(length: number): T {
    if (this.#array.length < length) this.#array = this.#make(Math.ceil(length * 1.1));
    return this.#array.subarray(0, length) as T;
  }
}
