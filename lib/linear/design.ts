/**
 * The design matrix of the linear baseline: a dataset's features as
 * numeric columns, each naming the term it encodes so a left-out column
 * can be reported as data.
 *
 * @module
 */

import type { Dataset } from "../dataset/types.ts";

/**
 * What one design column encodes: a feature's value (numbers; ordinal
 * levels as their rank), whether a feature's value is missing (0/1), or
 * whether a categorical feature has one level (0/1; `level: null` for the
 * missing level).
 */
export type DesignTerm =
  | { feature: string; kind: "value" }
  | { feature: string; kind: "missing" }
  | { feature: string; kind: "level"; level: string | null };

/** A design matrix: named columns of equal length. */
export interface Design {
  /** Column names, as R would print them (`site=B`, `years missing`). */
  names: string[];
  /** Columns, one value per row (the intercept is added by the fit). */
  columns: Float64Array[];
  /** The term each column encodes. */
  terms: DesignTerm[];
}

/**
 * The design of a dataset for the linear baseline: numeric and ordinal
 * features as numbers (ordinal as their level rank), categorical features
 * as 0/1 columns for every level present but the most frequent. A numeric
 * feature with missing values gets its mean in their place plus a 0/1
 * column marking them; a missing level is a level of its own.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { designOf } from "./design.ts";
 * const design = designOf({
 *   rows: 3,
 *   features: [{ name: "site", kind: "categorical" as const, levels: ["A", "B"], values: new Float64Array([0, 0, 1]) }],
 *   target: { kind: "regression" as const, name: "pay", values: new Float64Array(3) },
 * });
 * assert.deepEqual(design.names, ["site=B"]);
 * assert.deepEqual(design.terms, [{ feature: "site", kind: "level", level: "B" }]);
 * ```
 */
export function designOf(dataset: Dataset): Design {
  const names: string[] = [];
  const columns: Float64Array[] = [];
  const terms: DesignTerm[] = [];
  for (const feature of dataset.features) {
    const values = feature.values;
    if (feature.kind !== "categorical") {
      let sum = 0;
      let known = 0;
      for (const v of values) {
        if (!Number.isNaN(v)) {
          sum += v;
          known++;
        }
      }
      const mean = known > 0 ? sum / known : 0;
      columns.push(values.map((v) => (Number.isNaN(v) ? mean : v)));
      names.push(feature.name);
      terms.push({ feature: feature.name, kind: "value" });
      if (known < values.length) {
        columns.push(values.map((v) => (Number.isNaN(v) ? 1 : 0)));
        names.push(`${feature.name} missing`);
        terms.push({ feature: feature.name, kind: "missing" });
      }
      continue;
    }
    const levels = feature.levels ?? [];
    const counts = new Array<number>(levels.length + 1).fill(0);
    for (const v of values) counts[Number.isNaN(v) ? levels.length : v]++;
    let base = 0;
    for (let c = 1; c < counts.length; c++) if (counts[c] > counts[base]) base = c;
    for (let c = 0; c < counts.length; c++) {
      if (c === base || counts[c] === 0) continue;
      const code = c === levels.length ? NaN : c;
      columns.push(
        values.map((v) => ((Number.isNaN(code) ? Number.isNaN(v) : v === code) ? 1 : 0)),
      );
      names.push(`${feature.name}=${c === levels.length ? "(missing)" : levels[c]}`);
      terms.push({
        feature: feature.name,
        kind: "level",
        level: c === levels.length ? null : levels[c],
      });
    }
  }
  return { names, columns, terms };
}
