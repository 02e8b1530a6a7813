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
 * Gathers the rows of positive weight in `order` (the dataset's
 * canonical row order), after checking every weight and target.
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
  const weight = new Float64Array(kept);
  const target = new Float64Array(regression ? kept : 0);
  const classOf = new Int32Array(regression ? 0 : kept);
  const local = binIdsFor(offsets[features], kept * features);
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
  const moments = new Float64Array(regression ? 3 * kept : 0);
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
