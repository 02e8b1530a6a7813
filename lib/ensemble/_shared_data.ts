/**
 * A dataset and its bins copied once into SharedArrayBuffers, so that
 * workers read the columns without a copy per tree.
 *
 * @module
 */

import type { Dataset, Feature } from "../dataset/types.ts";
import type { FeatureBins } from "../tree/bins.ts";

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

/** Copies a dataset, its bins and its row order into shared memory. */
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

/** The dataset view of shared data (no copy). */
export function datasetOf(data: SharedData): Dataset {
  return { rows: data.rows, features: data.features, target: data.target };
}
