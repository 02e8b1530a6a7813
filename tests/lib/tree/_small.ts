/**
 * Small invented datasets for learner tests (no real data).
 *
 * @module
 */

import type { Dataset, Feature } from "../../../mod.ts";

/** A numeric feature. */
export function numeric(name: string, values: number[]): Feature {
  return { name, kind: "numeric", values: Float64Array.from(values) };
}

/** A categorical (or ordinal) feature from level codes (NaN for missing). */
export function levels(
  name: string,
  codes: number[],
  count: number,
  kind: "categorical" | "ordinal" = "categorical",
): Feature {
  return {
    name,
    kind,
    levels: Array.from({ length: count }, (_, i) => `${name}${i}`),
    values: Float64Array.from(codes),
  };
}

/** A regression dataset. */
export function regression(features: Feature[], y: number[]): Dataset {
  return {
    rows: y.length,
    features,
    target: { kind: "regression", name: "y", values: Float64Array.from(y) },
  };
}

/** A classification dataset with classes c0, c1, ... */
export function classification(features: Feature[], y: number[], classes: number): Dataset {
  return {
    rows: y.length,
    features,
    target: {
      kind: "classification",
      name: "y",
      classes: Array.from({ length: classes }, (_, i) => `c${i}`),
      values: Int32Array.from(y),
    },
  };
}
