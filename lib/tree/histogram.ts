/**
 * Per-bin summaries of a node's rows for every feature (histograms), the
 * grower's main memory traffic. One flat buffer per node holds all
 * features, `stride` numbers per bin in the criterion's summary layout
 * (lib/tree/criterion.ts), so that one row's update touches one cache line.
 * A feature's bins start at `offsets[f]`; its missing bin is its last.
 *
 * A feature with many more bins than the node has rows is not kept in the
 * histogram (it would be mostly empty): the splitter sorts the node's bin
 * ids instead. Of two children, the smaller one's histogram is filled from
 * its rows and the larger one's is the parent's minus it; buffers are
 * reused through a pool.
 *
 * @module
 */

import type { FeatureBins } from "./bins.ts";
import type { GrowRows } from "./grow_rows.ts";

// Sort a node's bin ids rather than fill a histogram when the feature has
// more than this many bins per row of the node.
const SPARSE_RATIO = 8;

/**
 * The histograms of one tree's nodes.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures } from "./bins.ts";
 * import { gatherRows } from "./grow_rows.ts";
 * import { Histograms } from "./histogram.ts";
 * const dataset = {
 *   rows: 3,
 *   features: [{ name: "x", kind: "numeric" as const, values: Float64Array.of(1, 1, 2) }],
 *   target: { kind: "regression" as const, name: "y", values: Float64Array.of(2, 4, 6) },
 * };
 * const rows = gatherRows(dataset, binFeatures(dataset), new Float64Array(3).fill(1), Int32Array.of(0, 1, 2));
 * const histograms = new Histograms(rows, binFeatures(dataset), 4);
 * const hist = histograms.acquire(3);
 * histograms.fill(hist, Int32Array.of(0, 1, 2), 0, 3, 3);
 * // Bin 0 (x = 1): 2 rows, weight 2, sum y 6, sum y^2 20; bin 1 (x = 2): 1, 1, 6, 36.
 * assert.deepEqual([...hist.subarray(0, 8)], [2, 2, 6, 20, 1, 1, 6, 36]);
 * ```
 */
export class Histograms {
  /** Numbers per bin. */
  readonly stride: number;
  private readonly rows: GrowRows;
  private readonly counts: Int32Array;
  private readonly length: number;
  private readonly pool: Float64Array[] = [];
  private readonly dense: Int32Array;

  constructor(rows: GrowRows, bins: FeatureBins[], stride: number) {
    this.rows = rows;
    this.stride = stride;
    this.counts = Int32Array.from(bins, (b) => b.count);
    this.length = rows.offsets[bins.length] * stride;
    this.dense = new Int32Array(bins.length);
  }

  /** Where feature `f`'s bin `b` starts in a buffer. */
  at(f: number, b: number): number {
    return (this.rows.offsets[f] + b) * this.stride;
  }

  /** Whether feature `f` is kept in the histogram of a node of `rows` rows. */
  isDense(f: number, rows: number): boolean {
    return this.counts[f] <= SPARSE_RATIO * rows;
  }

  /** Whether any feature is kept in the histogram of a node of `rows` rows. */
  anyDense(rows: number): boolean {
    for (let f = 0; f < this.counts.length; f++) if (this.isDense(f, rows)) return true;
    return false;
  }

  /** A buffer with the ranges of features dense at `rows` zeroed. */
  acquire(rows: number): Float64Array {
    const hist = this.pool.pop() ?? new Float64Array(this.length);
    for (let f = 0; f < this.counts.length; f++) {
      if (this.isDense(f, rows)) hist.fill(0, this.at(f, 0), this.at(f + 1, 0));
    }
    return hist;
  }

  /** Returns a buffer to the pool. */
  release(hist: Float64Array | null): void {
    if (hist !== null) this.pool.push(hist);
  }

  /**
   * Adds the rows `index[start..end)` to every feature dense at
   * `denseRows`: each row's bin ids and summary are read once.
   */
  fill(hist: Float64Array, index: Int32Array, start: number, end: number, denseRows: number): void {
    const features = this.counts.length;
    const dense = this.dense;
    let nd = 0;
    for (let f = 0; f < features; f++) if (this.isDense(f, denseRows)) dense[nd++] = f;
    const { bins, moments, weight, classOf } = this.rows;
    const stride = this.stride;
    if (moments.length > 0) {
      for (let i = start; i < end; i++) {
        const r = index[i];
        const wr = moments[3 * r];
        const wy = moments[3 * r + 1];
        const wyy = moments[3 * r + 2];
        const base = r * features;
        for (let j = 0; j < nd; j++) {
          const b = bins[base + dense[j]] * 4;
          hist[b]++;
          hist[b + 1] += wr;
          hist[b + 2] += wy;
          hist[b + 3] += wyy;
        }
      }
    } else {
      for (let i = start; i < end; i++) {
        const r = index[i];
        const wr = weight[r];
        const c = 2 + classOf[r];
        const base = r * features;
        for (let j = 0; j < nd; j++) {
          const b = bins[base + dense[j]] * stride;
          hist[b]++;
          hist[b + 1] += wr;
          hist[b + c] += wr;
        }
      }
    }
  }

  /**
   * The children's histograms from the parent's (null: not kept, when no
   * feature is dense at the larger child's size): the smaller child's is
   * filled from its rows, the larger's is the parent's minus it.
   */
  children(
    parent: Float64Array | null,
    index: Int32Array,
    start: number,
    mid: number,
    end: number,
  ): [Float64Array | null, Float64Array | null] {
    const leftRows = mid - start;
    const rightRows = end - mid;
    const largerRows = Math.max(leftRows, rightRows);
    if (parent === null || !this.anyDense(largerRows)) {
      this.release(parent);
      return [null, null];
    }
    const leftSmaller = leftRows <= rightRows;
    const small = this.acquire(largerRows);
    if (leftSmaller) this.fill(small, index, start, mid, largerRows);
    else this.fill(small, index, mid, end, largerRows);
    for (let f = 0; f < this.counts.length; f++) {
      if (!this.isDense(f, largerRows)) continue;
      const to = this.at(f + 1, 0);
      for (let i = this.at(f, 0); i < to; i++) parent[i] -= small[i];
    }
    return leftSmaller ? [small, parent] : [parent, small];
  }
}
