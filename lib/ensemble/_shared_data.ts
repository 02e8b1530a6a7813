/**
 * A dataset and its bins copied once into SharedArrayBuffers, so that
 * workers read the columns without a copy per tree.
 *
 * @module
 */

import type { Dataset, Feature } from "../dataset/types.ts";
import type { FeatureBins } from "../tree/bins.ts";
import { canonicalRowOrder } from "../tree/grow_tree.ts";

/** What a worker receives: plain data with shared typed arrays. */
export interface SharedData {
  rows: number;
  features: { name: string; kind: Feature["kind"]; levels?: string[]; values: Float64Array }[];
  target:
    | { kind: "regression"; name: string; values: Float64Array }
    | { kind: "classification"; name: string; classes: string[]; values: Int32Array };
  bins: FeatureBins[];
  order: Int32Array;
}

function shared<T extends Float64Array | Int32Array | Uint16Array | Uint32Array>(array: T): T {
  const Ctor = array.constructor as { new (buffer: SharedArrayBuffer): T };
  const copy = new Ctor(new SharedArrayBuffer(array.byteLength));
  (copy as unknown as { set(a: T): void }).set(array);
  return copy;
}

/**
 * Copies a dataset, its bins and its row order into shared memory.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures } from "../tree/bins.ts";
 * import { shareData } from "./_shared_data.ts";
 * const dataset = {
 *   rows: 3,
 *   features: [{ name: "x", kind: "numeric" as const, values: Float64Array.of(1, 2, 3) }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.of(10, 20, 30) },
 * };
 * const data = shareData(dataset, binFeatures(dataset), Int32Array.of(2, 0, 1));
 * // Copies, in shared memory, of the same values.
 * assert(data.target.values.buffer instanceof SharedArrayBuffer);
 * assert(data.features[0].values.buffer instanceof SharedArrayBuffer);
 * assert.notEqual(data.features[0].values, dataset.features[0].values);
 * assert.deepEqual([...data.target.values], [10, 20, 30]);
 * assert.deepEqual([...data.order], [2, 0, 1]);
 * // x's three distinct values are bins 0, 1, 2.
 * assert.deepEqual([...data.bins[0].ids], [0, 1, 2]);
 * ```
 */
export function shareData(dataset: Dataset, bins: FeatureBins[], order: Int32Array): SharedData {
  const target = dataset.target.kind === "regression"
    ? {
      kind: "regression" as const,
      name: dataset.target.name,
      values: shared(dataset.target.values),
    }
    : {
      kind: "classification" as const,
      name: dataset.target.name,
      classes: dataset.target.classes,
      values: shared(dataset.target.values),
    };
  return {
    rows: dataset.rows,
    features: dataset.features.map((f) => ({ ...f, values: shared(f.values) })),
    target,
    bins: bins.map((b) => ({
      ids: shared(b.ids),
      count: b.count,
      lower: shared(b.lower),
      upper: shared(b.upper),
    })),
    order: shared(order),
  };
}

/**
 * The dataset view of shared data (no copy).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures } from "../tree/bins.ts";
 * import { datasetOf, shareData } from "./_shared_data.ts";
 * const dataset = {
 *   rows: 2,
 *   features: [{ name: "x", kind: "numeric" as const, values: Float64Array.of(5, 6) }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.of(7, 8) },
 * };
 * const data = shareData(dataset, binFeatures(dataset), Int32Array.of(0, 1));
 * const view = datasetOf(data);
 * assert.equal(view.rows, 2);
 * assert.equal(view.features, data.features); // the shared arrays themselves
 * assert.equal(view.target, data.target);
 * ```
 */
export function datasetOf(data: SharedData): Dataset {
  return { rows: data.rows, features: data.features, target: data.target };
}

/**
 * The shared copy of a dataset with these bins and its canonical row
 * order: what `FittingPool.shared` (lib/ensemble/_worker_pool.ts) keeps for the runs of one pool.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures } from "../tree/bins.ts";
 * import { canonicalRowOrder } from "../tree/grow_tree.ts";
 * import { sharedInOrder } from "./_shared_data.ts";
 * const dataset = {
 *   rows: 3,
 *   features: [{ name: "x", kind: "numeric" as const, values: Float64Array.of(3, 1, 2) }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.of(30, 10, 20) },
 * };
 * const data = sharedInOrder(dataset, binFeatures(dataset));
 * assert.deepEqual(data.order, canonicalRowOrder(dataset));
 * assert(data.order.buffer instanceof SharedArrayBuffer);
 * ```
 */
export function sharedInOrder(dataset: Dataset, bins: FeatureBins[]): SharedData {
  return shareData(dataset, bins, canonicalRowOrder(dataset));
}
