/**
 * Ranking each feature's values once among its distinct values, so that the
 * split search is a scan over bins with no sorting per node.
 *
 * Bins are exact: one per distinct value, except that values within 1e-7 of
 * their neighbour share a bin. That tolerance is scikit-learn's
 * `FEATURE_THRESHOLD` (sklearn/tree/_splitter.pyx), kept so that our trees
 * split where the reference library's do.
 *
 * @module
 */

import type { Dataset } from "../dataset/types.ts";

/**
 * Values closer than this to their sorted neighbour share a bin.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, FEATURE_TOLERANCE } from "./bins.ts";
 * const bins = (values: number[]) =>
 *   binFeatures({
 *     rows: values.length,
 *     features: [{ name: "x", kind: "numeric", values: Float64Array.from(values) }],
 *     target: { kind: "regression", name: "y", values: new Float64Array(values.length) },
 *   })[0].count;
 * assert.equal(bins([1, 1 + FEATURE_TOLERANCE / 2, 2]), 2); // one bin for the first two
 * assert.equal(bins([1, 1 + 2 * FEATURE_TOLERANCE, 2]), 3);
 * ```
 */
export const FEATURE_TOLERANCE = 1e-7;

/** One feature's bins. */
export interface FeatureBins {
  /** Bin of each row; `count` for a missing value. */
  ids: Uint16Array | Uint32Array;
  /** Number of value bins (the missing bin is extra, at index `count`). */
  count: number;
  /** Smallest value in each bin (numeric), or the level code. */
  lower: Float64Array;
  /** Largest value in each bin (numeric), or the level code. */
  upper: Float64Array;
}

/**
 * Bins every feature of a dataset. Ordinal and categorical features use
 * their level codes as bins.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures } from "./bins.ts";
 * const bins = binFeatures({
 *   rows: 4,
 *   features: [{ name: "x", kind: "numeric", values: new Float64Array([3, 1, NaN, 3]) }],
 *   target: { kind: "regression", name: "y", values: new Float64Array(4) },
 * });
 * assert(bins[0].count === 2 && [...bins[0].ids].join() === "1,0,2,1");
 * ```
 */
export function binFeatures(dataset: Dataset): FeatureBins[] {
  return dataset.features.map((feature) => {
    if (feature.kind !== "numeric") {
      const count = feature.levels!.length;
      const ids = narrowIds(dataset.rows, count + 1);
      for (let r = 0; r < dataset.rows; r++) {
        const v = feature.values[r];
        ids[r] = Number.isNaN(v) ? count : v;
      }
      const codes = Float64Array.from({ length: count }, (_, i) => i);
      return { ids, count, lower: codes, upper: codes.slice() };
    }
    return binNumeric(feature.values);
  });
}

function narrowIds(rows: number, distinct: number): Uint16Array | Uint32Array {
  return distinct <= 0xffff ? new Uint16Array(rows) : new Uint32Array(rows);
}

function binNumeric(values: Float64Array): FeatureBins {
  const sorted = values.filter((v) => !Number.isNaN(v)).sort();
  const lower: number[] = [];
  const upper: number[] = [];
  for (let i = 0; i < sorted.length; i++) {
    const v = sorted[i];
    if (i > 0 && v <= sorted[i - 1] + FEATURE_TOLERANCE) {
      upper[upper.length - 1] = v;
    } else {
      lower.push(v);
      upper.push(v);
    }
  }
  const count = lower.length;
  const ids = narrowIds(values.length, count + 1);
  for (let r = 0; r < values.length; r++) {
    const v = values[r];
    if (Number.isNaN(v)) {
      ids[r] = count;
      continue;
    }
    // The last bin whose lower bound is <= v.
    let lo = 0;
    let hi = count - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (lower[mid] <= v) lo = mid;
      else hi = mid - 1;
    }
    ids[r] = lo;
  }
  return { ids, count, lower: Float64Array.from(lower), upper: Float64Array.from(upper) };
}

const rowMajorCache = new WeakMap<FeatureBins[], BinIds>();

/**
 * Global bin ids of rows, in the narrowest array that holds them: a table
 * of few bins in all (most pay tables: levels, sites, years) reads a byte
 * per cell in the builder's loops instead of four.
 */
export type BinIds = Uint8Array | Uint16Array | Uint32Array;

/**
 * An array of `length` bin ids below `binCount`, as narrow as they allow.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binIdsFor } from "./bins.ts";
 * assert(binIdsFor(256, 3) instanceof Uint8Array);
 * assert(binIdsFor(257, 3) instanceof Uint16Array);
 * assert(binIdsFor(70_000, 3) instanceof Uint32Array);
 * ```
 */
export function binIdsFor(binCount: number, length: number): BinIds {
  if (binCount <= 0x100) return new Uint8Array(length);
  if (binCount <= 0x10000) return new Uint16Array(length);
  return new Uint32Array(length);
}

/**
 * Every row's bins for all features side by side (`rows x features`), each
 * shifted by its feature's offset into one flat histogram. Built once per
 * set of bins and cached, since every tree of an ensemble reads it.
 *
 * @param offsets `offsets[f]`: where feature f's bins start in the flat histogram.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, rowMajorBins } from "./bins.ts";
 * const bins = binFeatures({
 *   rows: 4,
 *   features: [
 *     { name: "x", kind: "numeric", values: new Float64Array([3, 1, NaN, 3]) },
 *     { name: "site", kind: "categorical", levels: ["A", "B"], values: new Float64Array([1, 0, 0, NaN]) },
 *   ],
 *   target: { kind: "regression", name: "y", values: new Float64Array(4) },
 * });
 * // x's bins: 1 below 3, 0 for 1, 2 for missing (3 bins, so site starts at 3);
 * // site's: its codes, 2 for missing, each shifted by 3.
 * const flat = rowMajorBins(bins, 4, Int32Array.of(0, 3));
 * assert.deepEqual([...flat], [1, 4, 0, 3, 2, 3, 1, 5]);
 * ```
 */
export function rowMajorBins(
  bins: FeatureBins[],
  rows: number,
  offsets: Int32Array,
): BinIds {
  const cached = rowMajorCache.get(bins);
  if (cached !== undefined && cached.length === rows * bins.length) return cached;
  const features = bins.length;
  // The last feature's last slot (its missing bin) is the largest id.
  const binCount = features === 0 ? 0 : offsets[features - 1] + bins[features - 1].count + 1;
  const out = binIdsFor(binCount, rows * features);
  for (let f = 0; f < features; f++) {
    const ids = bins[f].ids;
    const offset = offsets[f];
    for (let r = 0; r < rows; r++) out[r * features + f] = offset + ids[r];
  }
  rowMajorCache.set(bins, out);
  return out;
}
