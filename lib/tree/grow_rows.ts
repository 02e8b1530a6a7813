/**
 * The rows one tree is grown on, gathered once per tree: only the rows of
 * positive weight (a bagged tree draws about 63% of the table), renumbered
 * 0, 1, ... in the table's canonical row order, with their target, weight
 * and every feature's bin id side by side. The grower then reads short
 * arrays in order instead of the whole table through an index, and sums
 * rows in canonical order as before, so trees are bit for bit the same.
 *
 * @module
 */

import type { Dataset } from "../dataset/types.ts";
import { type BinIds, binIdsFor, type FeatureBins, rowMajorBins } from "./bins.ts";

/** A tree's rows, renumbered: local row i is the i-th kept row in canonical order. */
export interface GrowRows {
  /** Rows kept (weight > 0). */
  count: number;
  /** Features. */
  features: number;
  /** Weight of each local row. */
  weight: Float64Array;
  /** Numeric target of each local row (empty for classes). */
  target: Float64Array;
  /** Class of each local row (empty for a numeric target). */
  classOf: Int32Array;
  /**
   * Global bin ids, row-major: local row i's feature f at `i * features + f`
   * is `offsets[f]` plus its bin (the missing bin is each feature's last).
   */
  bins: BinIds;
  /** First global bin of each feature (features + 1 entries). */
  offsets: Int32Array;
  /** Numeric target: each local row's w, w*y and w*y^2 side by side (else empty). */
  moments: Float64Array;
  /** Sum of the kept rows' weights, added in canonical order. */
  totalWeight: number;
}

/**
 * Arrays kept from one tree to the next for {@linkcode gatherRows} to fill,
 * grown when a tree needs more: a bagged tree's rows on CPS1988 are 0.8 MB,
 * which new arrays for every tree left to the system to zero and the
 * collector to free. A tree's rows are then views of them, good until the
 * next tree is gathered into the same buffers.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures } from "./bins.ts";
 * import { gatherRows, RowBuffers } from "./grow_rows.ts";
 * const dataset = {
 *   rows: 3,
 *   features: [{ name: "x", kind: "numeric" as const, values: Float64Array.of(7, 5, 6) }],
 *   target: { kind: "regression" as const, name: "y", values: Float64Array.of(30, 10, 20) },
 * };
 * const bins = binFeatures(dataset);
 * const buffers = new RowBuffers();
 * const order = Int32Array.of(1, 2, 0);
 * const first = gatherRows(dataset, bins, Float64Array.of(1, 1, 1), order, buffers);
 * assert.deepEqual([...first.target], [10, 20, 30]);
 * const second = gatherRows(dataset, bins, Float64Array.of(0, 2, 1), order, buffers);
 * assert.deepEqual([...second.target], [10, 20]);
 * // The same memory: the first tree's rows are gone.
 * assert.equal(second.target.buffer, first.target.buffer);
 * assert.deepEqual(second, gatherRows(dataset, bins, Float64Array.of(0, 2, 1), order));
 * ```
 */
export class RowBuffers {
  weight = new Float64Array(0);
  target = new Float64Array(0);
  classOf = new Int32Array(0);
  moments = new Float64Array(0);
  bins: BinIds = new Uint8Array(0);

  /** The arrays for `kept` rows of `features` features over `binCount` bins. */
  take(
    kept: number,
    features: number,
    binCount: number,
    regression: boolean,
  ): Pick<GrowRows, "weight" | "target" | "classOf" | "moments" | "bins"> {
    // Room to spare when grown: the next tree may draw a few more rows.
    const room = (need: number) => Math.ceil(need * 1.1);
    const rows = regression ? kept : 0;
    const classes = regression ? 0 : kept;
    if (this.weight.length < kept) this.weight = new Float64Array(room(kept));
    if (this.target.length < rows) this.target = new Float64Array(room(rows));
    if (this.classOf.length < classes) this.classOf = new Int32Array(room(classes));
    if (this.moments.length < 3 * rows) this.moments = new Float64Array(room(3 * rows));
    const cells = kept * features;
    const kind = binIdsFor(binCount, 0).constructor;
    if (this.bins.length < cells || this.bins.constructor !== kind) {
      this.bins = binIdsFor(binCount, Math.ceil(cells * 1.1));
    }
    return {
      weight: this.weight.subarray(0, kept),
      target: this.target.subarray(0, rows),
      classOf: this.classOf.subarray(0, classes),
      moments: this.moments.subarray(0, 3 * rows),
      bins: this.bins.subarray(0, cells),
    };
  }
}

/**
 * Gathers the rows of positive weight in `order` (the dataset's
 * canonical row order), after checking every weight and target; into
 * `buffers` when given (see {@linkcode RowBuffers}), else new arrays.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures } from "./bins.ts";
 * import { gatherRows } from "./grow_rows.ts";
 * const dataset = {
 *   rows: 3,
 *   features: [{ name: "x", kind: "numeric" as const, values: Float64Array.of(5, 6, 7) }],
 *   target: { kind: "regression" as const, name: "y", values: Float64Array.of(30, 10, 20) },
 * };
 * // Row 0 is not drawn; the canonical order sorts by target: rows 1, 2, 0.
 * const rows = gatherRows(dataset, binFeatures(dataset), Float64Array.of(0, 2, 1), Int32Array.of(1, 2, 0));
 * assert.deepEqual([...rows.target], [10, 20]);
 * assert.deepEqual([...rows.weight], [2, 1]);
 * assert.deepEqual([...rows.bins], [1, 2]); // x = 6 and 7: bins 1 and 2
 * assert.deepEqual([...rows.moments], [2, 20, 200, 1, 20, 400]);
 * assert.equal(rows.totalWeight, 3);
 * ```
 */
export function gatherRows(
  dataset: Dataset,
  bins: FeatureBins[],
  weights: Float64Array,
  order: Int32Array,
  buffers: RowBuffers = new RowBuffers(),
): GrowRows {
  const n = dataset.rows;
  if (weights.length !== n) {
    throw new RangeError(`weights has ${weights.length} entries for ${n} rows`);
  }
  let kept = 0;
  for (let r = 0; r < n; r++) {
    const wr = weights[r];
    if (!(wr >= 0) || wr === Infinity) throw new RangeError(`weight of row ${r} is ${wr}`);
    if (wr > 0) kept++;
    const target = dataset.target.values[r];
    if (!Number.isFinite(target)) throw new RangeError(`target of row ${r} is ${target}`);
  }
  if (order.length !== n) throw new RangeError(`order has ${order.length} entries for ${n} rows`);
  const features = bins.length;
  const offsets = new Int32Array(features + 1);
  for (let f = 0; f < features; f++) offsets[f + 1] = offsets[f] + bins[f].count + 1;
  // The whole table's row-major bins are built once per bins (and cached).
  const all = rowMajorBins(bins, n, offsets);
  const regression = dataset.target.kind === "regression";
  const { weight, target, classOf, moments, bins: local } = buffers.take(
    kept,
    features,
    offsets[features],
    regression,
  );
  let totalWeight = 0;
  for (let j = 0, i = 0; j < n; j++) {
    const r = order[j];
    const wr = weights[r];
    if (!(wr > 0)) continue;
    weight[i] = wr;
    totalWeight += wr;
    if (regression) target[i] = dataset.target.values[r];
    else classOf[i] = dataset.target.values[r];
    for (let f = 0, from = r * features, to = i * features; f < features; f++) {
      local[to + f] = all[from + f];
    }
    i++;
  }
  for (let i = 0; regression && i < kept; i++) {
    const wy = weight[i] * target[i];
    moments[3 * i] = weight[i];
    moments[3 * i + 1] = wy;
    moments[3 * i + 2] = wy * target[i];
  }
  return {
    count: kept,
    features,
    weight,
    target,
    classOf,
    bins: local,
    offsets,
    moments,
    totalWeight,
  };
}
