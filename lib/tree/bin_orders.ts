/**
 * A node's rows in bin order, per feature, handed down the tree. A node
 * with far fewer rows than a feature has bins finds its split by going
 * through its rows bin by bin (splitter.ts) rather than through a histogram.
 * The order is sorted once, at the first node that needs it, and then each
 * split hands it to the children by a stable partition, in time by the rows,
 * where sorting again at every node below took time by rows x log(rows) and
 * a call into the runtime's sort per node and feature (a fifth of a tree's
 * growth on a table of many-valued features).
 *
 * Within a bin the rows keep the node's own order, the order a sort by (bin,
 * position) gives, and a stable partition keeps it: every bin's summary adds
 * the same rows in the same order, so the trees are the same bit for bit.
 *
 * @module
 */

/**
 * Features whose order can be handed down (one bit each in a 32-bit mask);
 * a feature beyond them is sorted afresh at every node that needs it.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { KEPT_FEATURES } from "./bin_orders.ts";
 * // The highest feature kept still has its own bit, below the sign bit.
 * assert.equal((1 << (KEPT_FEATURES - 1)) >>> (KEPT_FEATURES - 1), 1);
 * assert.equal(KEPT_FEATURES, 31);
 * ```
 */
export const KEPT_FEATURES = 31;

/**
 * Per feature, the rows of the nodes being grown in bin order: the node of
 * rows `[start, end)` of the builder's index has its rows at the same
 * positions of `order(f)`, where a mask of features says the order holds.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { BinOrders } from "./bin_orders.ts";
 * const orders = new BinOrders(6, 2);
 * // Feature 1's order of rows 0..5 (say bins 0, 0, 1, 2, 2, 3).
 * orders.order(1).set([4, 0, 2, 5, 1, 3]);
 * // A split sends rows 0, 1 and 3 left: the builder's index puts them first.
 * const index = Int32Array.of(0, 1, 3, 2, 4, 5);
 * orders.split(1 << 1, index, new Int32Array(6), 0, 3, 6);
 * // Each side keeps the bin order: left 0, 1, 3; right 4, 2, 5.
 * assert.deepEqual([...orders.order(1)], [0, 1, 3, 4, 2, 5]);
 * ```
 */
export class BinOrders {
  readonly #rows: number;
  readonly #orders: (Int32Array | null)[];
  // Rows sent left by the current split carry its stamp: no clearing.
  // Made on the first split, as most tables' trees never need an order.
  #leftStamp: Int32Array | null = null;
  #stamp = 0;

  constructor(rows: number, features: number) {
    this.#rows = rows;
    this.#orders = new Array(features).fill(null);
  }

  /** Feature `f`'s order (made on first use). */
  order(f: number): Int32Array {
    return this.#orders[f] ??= new Int32Array(this.#rows);
  }

  /**
   * Hands the orders of the features in `mask` down a split of the rows
   * `[start, end)`: its left rows are `index[start..mid)`, and each order
   * is stably partitioned into the left rows then the right, the right ones
   * passing through `scratch` (the builder's own, free between its splits).
   */
  split(
    mask: number,
    index: Int32Array,
    scratch: Int32Array,
    start: number,
    mid: number,
    end: number,
  ): void {
    const stamp = ++this.#stamp;
    const leftStamp = this.#leftStamp ??= new Int32Array(this.#rows);
    for (let i = start; i < mid; i++) leftStamp[index[i]] = stamp;
    // Each feature of the mask, lowest bit first.
    for (let rest = mask; rest !== 0; rest &= rest - 1) {
      const f = 31 - Math.clz32(rest & -rest);
      partitionOrder(this.#orders[f]!, leftStamp, stamp, scratch, start, end);
    }
  }
}

// Left rows (those stamped) to the front, right rows after, each in order.
function partitionOrder(
  order: Int32Array,
  leftStamp: Int32Array,
  stamp: number,
  scratch: Int32Array,
  start: number,
  end: number,
): void {
  let l = start;
  let r = 0;
  for (let i = start; i < end; i++) {
    const row = order[i];
    if (leftStamp[row] === stamp) order[l++] = row;
    else scratch[r++] = row;
  }
  order.set(scratch.subarray(0, r), l);
}
