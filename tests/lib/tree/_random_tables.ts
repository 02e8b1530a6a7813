/**
 * Invented tables for property tests of the learner: numeric features of
 * many distinct values (ties and missing values among them), a categorical
 * one of up to 300 levels, an ordinal one; pay or a class; whole
 * bootstrap-like weights with zeros.
 *
 * @module
 */
import fc from "fast-check";
import type { Dataset, Feature } from "../../../lib/dataset/types.ts";

/** A table, the weights of one tree's draw, and its stopping rules. */
export interface Table {
  dataset: Dataset;
  weights: Float64Array;
  minLeaf: number;
  maxDepth: number;
}

/** Arbitrary tables (see the module's note). */
export const tables: fc.Arbitrary<Table> = fc.record({
  rows: fc.integer({ min: 20, max: 400 }),
  features: fc.integer({ min: 1, max: 4 }),
  levels: fc.integer({ min: 2, max: 300 }),
  classes: fc.constantFrom(0, 0, 2, 3),
  minLeaf: fc.integer({ min: 1, max: 5 }),
  maxDepth: fc.constantFrom(Infinity, Infinity, 4),
  seed: fc.integer({ min: 1, max: 2 ** 30 }),
}).map((c) => {
  let state = c.seed;
  const next = () => {
    state = (state * 1103515245 + 12345) % 2147483648;
    return state / 2147483648;
  };
  const features: Feature[] = [];
  for (let f = 0; f < c.features; f++) {
    features.push({
      name: `x${f}`,
      kind: "numeric",
      values: Float64Array.from(
        { length: c.rows },
        () => (next() < 0.05 ? NaN : Math.floor(next() * c.rows * (f + 1))),
      ),
    });
  }
  const levels = Array.from({ length: c.levels }, (_, i) => `L${i}`);
  features.push({
    name: "site",
    kind: "categorical",
    levels,
    values: Float64Array.from(
      { length: c.rows },
      () => (next() < 0.03 ? NaN : Math.floor(next() * c.levels)),
    ),
  });
  features.push({
    name: "grade",
    kind: "ordinal",
    levels: levels.slice(0, Math.min(40, c.levels)),
    values: Float64Array.from(
      { length: c.rows },
      () => Math.floor(next() * Math.min(40, c.levels)),
    ),
  });
  const pay = Float64Array.from(
    { length: c.rows },
    (_, r) =>
      10 + (Number.isNaN(features[0].values[r]) ? 0 : features[0].values[r] / c.rows) +
      ((features.at(-2)!.values[r] || 0) % 7) / 10 + next(),
  );
  const target: Dataset["target"] = c.classes === 0
    ? { kind: "regression", name: "pay", values: pay }
    : {
      kind: "classification",
      name: "band",
      classes: Array.from({ length: c.classes }, (_, k) => `b${k}`),
      values: Int32Array.from(
        pay,
        (v) => Math.min(c.classes - 1, Math.floor((v - 10) * c.classes / 3)),
      ),
    };
  const weights = Float64Array.from({ length: c.rows }, () => Math.floor(next() * 3));
  weights[0] = 1;
  return {
    dataset: { rows: c.rows, features, target },
    weights,
    minLeaf: c.minLeaf,
    maxDepth: c.maxDepth,
  };
});
