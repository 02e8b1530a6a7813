// The one-feature class tree grown from bins must be growTree's tree, node
// for node and bit for bit, on any table: numeric features with ties and
// missing values, categorical ones with absent levels (up to 40, so both
// the exhaustive search and the ordering, and masks of two words),
// ordinal ones, two to four classes, whole weights with zeros as a
// bootstrap gives them, and every stopping rule.
import assert from "node:assert/strict";
import fc from "fast-check";
import type { Dataset, Feature } from "../../../lib/dataset/types.ts";
import { binFeatures } from "../../../lib/tree/bins.ts";
import { growOneFeatureTree } from "../../../lib/tree/grow_one_feature.ts";
import { growTree } from "../../../lib/tree/grow_tree.ts";

interface Case {
  kind: Feature["kind"];
  levels: number;
  values: number[];
  classes: number;
  classOf: number[];
  weights: number[];
  minLeaf: number;
  maxDepth: number;
  minDecrease: number;
}

const cases: fc.Arbitrary<Case> = fc.record({
  kind: fc.constantFrom<Feature["kind"]>("numeric", "categorical", "ordinal"),
  levels: fc.integer({ min: 1, max: 40 }),
  rows: fc.integer({ min: 1, max: 160 }),
  classes: fc.integer({ min: 2, max: 4 }),
  minLeaf: fc.integer({ min: 1, max: 6 }),
  maxDepth: fc.constantFrom(Infinity, 1, 3),
  minDecrease: fc.constantFrom(0, 0, 0.01),
  seed: fc.integer(),
}).chain((c) =>
  fc.record({
    kind: fc.constant(c.kind),
    levels: fc.constant(c.levels),
    // Codes (or small numbers with ties) with some missing.
    values: fc.array(
      fc.oneof(
        { weight: 9, arbitrary: fc.integer({ min: 0, max: c.levels - 1 }) },
        { weight: 1, arbitrary: fc.constant(NaN) },
      ),
      { minLength: c.rows, maxLength: c.rows },
    ),
    classes: fc.constant(c.classes),
    classOf: fc.array(fc.integer({ min: 0, max: c.classes - 1 }), {
      minLength: c.rows,
      maxLength: c.rows,
    }),
    weights: fc.array(fc.integer({ min: 0, max: 3 }), { minLength: c.rows, maxLength: c.rows }),
    minLeaf: fc.constant(c.minLeaf),
    maxDepth: fc.constant(c.maxDepth),
    minDecrease: fc.constant(c.minDecrease),
  })
);

function datasetOf(c: Case): Dataset {
  const numeric = c.kind === "numeric";
  // Numeric values spread unevenly so midpoints are not all halves.
  const values = Float64Array.from(c.values, (v) => (numeric ? v * v * 0.37 - 3 : v));
  const feature: Feature = numeric ? { name: "x", kind: "numeric", values } : {
    name: "x",
    kind: c.kind,
    levels: Array.from({ length: c.levels }, (_, i) => `L${i}`),
    values,
  };
  return {
    rows: c.values.length,
    features: [feature],
    target: {
      kind: "classification",
      name: "g",
      classes: Array.from({ length: c.classes }, (_, i) => `g${i}`),
      values: Int32Array.from(c.classOf),
    },
  };
}

Deno.test("growOneFeatureTree: growTree's tree, bit for bit, on random one-feature tables", () => {
  let compared = 0;
  fc.assert(
    fc.property(cases, (c) => {
      fc.pre(c.weights.some((w) => w > 0));
      const dataset = datasetOf(c);
      const bins = binFeatures(dataset);
      const weights = Float64Array.from(c.weights);
      const options = {
        minLeaf: c.minLeaf,
        maxDepth: c.maxDepth,
        minImpurityDecrease: c.minDecrease,
      };
      const expected = growTree({ dataset, bins, weights }, options);
      const actual = growOneFeatureTree({
        feature: dataset.features[0],
        bins: bins[0],
        classes: c.classes,
        classOf: dataset.target.values,
        weights,
      }, options);
      assert.deepEqual(actual, expected);
      compared += expected.nodeCount > 1 ? 1 : 0;
    }),
    { numRuns: 600, seed: 20261204 },
  );
  // Most cases split at least once (else the check would say little).
  assert(compared > 300, `only ${compared} cases split`);
});

Deno.test("growOneFeatureTree: refuses what growTree refuses, and weights that are not whole", () => {
  const feature: Feature = { name: "x", kind: "numeric", values: Float64Array.of(1, 2, 3) };
  const input = { feature, classes: 2, classOf: Int32Array.of(0, 1, 0) };
  const dataset = {
    rows: 3,
    features: [feature],
    target: {
      kind: "classification" as const,
      name: "g",
      classes: ["a", "b"],
      values: input.classOf,
    },
  };
  const bins = binFeatures(dataset)[0];
  const grow = (weights: number[], options = {}) =>
    growOneFeatureTree({ ...input, bins, weights: Float64Array.from(weights) }, options);
  assert.throws(() => grow([0, 0, 0]), /no rows with positive weight/);
  assert.throws(() => grow([1, 0.5, 1]), /weight of row 1 is 0.5/);
  assert.throws(() => grow([1, -1, 1]), /weight of row 1/);
  assert.throws(() => grow([1, 1, 1], { minLeaf: 0 }), RangeError);
  assert.throws(() => grow([1, 1, 1], { increasing: [0] }), /regression tree/);
  assert.throws(
    () =>
      growOneFeatureTree({
        ...input,
        classOf: Int32Array.of(0, 2, 0),
        bins,
        weights: Float64Array.of(1, 1, 1),
      }),
    /class of row 1 is 2/,
  );
});
