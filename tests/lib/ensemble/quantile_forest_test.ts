// Quantile regression forest ranges (Meinshausen 2006, JMLR 7) on two
// hand-written stumps over six rows: the leaf members, the weights each
// row gets, and the weighted quantiles, all worked out below.
import assert from "node:assert/strict";
import type { Dataset } from "../../../mod.ts";
import { leafMembers, quantileForestRange } from "../../../lib/ensemble/quantile_forest.ts";
import { handEnsemble, stump } from "./_hand_ensemble.ts";

const DATASET: Dataset = {
  rows: 6,
  features: [{ name: "x", kind: "numeric", values: Float64Array.of(1, 2, 3, 4, 5, 6) }],
  target: { kind: "regression", name: "pay", values: Float64Array.of(10, 20, 30, 40, 50, 60) },
};
// Tree A: x <= 3.5 (rows 0-2 | 3-5); tree B: x <= 2.5 (rows 0-1 | 2-5).
const ENSEMBLE = handEnsemble([stump(3.5, [20], [50]), stump(2.5, [15], [45])]);

Deno.test("leafMembers groups every training row by the leaf it falls in", () => {
  const members = leafMembers(ENSEMBLE, DATASET);
  assert.deepEqual(members.rows.map((r) => Array.from(r)), [[0, 1, 2, 3, 4, 5], [
    0,
    1,
    2,
    3,
    4,
    5,
  ]]);
  // Node 0 (the root) holds no row as a leaf; node 1 the left rows, node 2 the right.
  assert.deepEqual(members.start.map((s) => Array.from(s)), [[0, 0, 3, 6], [0, 0, 2, 6]]);
  assert.deepEqual(Array.from(members.target), [10, 20, 30, 40, 50, 60]);
});

Deno.test("the range is the weighted quantiles of the training pay", () => {
  const members = leafMembers(ENSEMBLE, DATASET);
  // x = 3: tree A's left leaf (rows 0-2, 1/6 each), tree B's right leaf
  // (rows 2-5, 1/8 each). Cumulative weight by pay: 4/24, 8/24, 15/24,
  // 18/24, 21/24, 1.
  // 50%: the first pay reaching 0.25 is 20, reaching 0.75 is 40.
  assert.deepEqual(quantileForestRange(ENSEMBLE, members, [3], 0.5), {
    low: 20,
    high: 40,
    coverage: 0.5,
  });
  // 80%: 0.1 is reached at 10; 0.9 only at 60.
  assert.deepEqual(quantileForestRange(ENSEMBLE, members, [3], 0.8), {
    low: 10,
    high: 60,
    coverage: 0.8,
  });
  // x = 6: rows 3-5 (1/6 each) and 2-5 (1/8 each): 30 weighs 3/24, the others 7/24.
  // 0.25 is reached at 40 (10/24), 0.75 at 60.
  const high = quantileForestRange(ENSEMBLE, members, [6], 0.5);
  assert.deepEqual([high.low, high.high], [40, 60]);
});

Deno.test("a leaf with no rows of the given table is skipped", () => {
  // Only rows with x <= 3: tree A's right leaf is empty.
  const small: Dataset = {
    rows: 3,
    features: [{ name: "x", kind: "numeric", values: Float64Array.of(1, 2, 3) }],
    target: { kind: "regression", name: "pay", values: Float64Array.of(10, 20, 30) },
  };
  const members = leafMembers(ENSEMBLE, small);
  // x = 5: tree B's right leaf holds row 2 alone, so every quantile is 30.
  const range = quantileForestRange(ENSEMBLE, members, [5], 0.9);
  assert.deepEqual([range.low, range.high], [30, 30]);
  // Only rows with x <= 2: at x = 5 both trees' leaves are empty; no range
  // is made up (it was undefined before).
  const tiny: Dataset = {
    ...small,
    rows: 2,
    features: [{ name: "x", kind: "numeric", values: Float64Array.of(1, 2) }],
    target: { kind: "regression", name: "pay", values: Float64Array.of(10, 20) },
  };
  assert.throws(
    () => quantileForestRange(ENSEMBLE, leafMembers(ENSEMBLE, tiny), [5], 0.9),
    /no leaf the profile reaches holds a member row/,
  );
});

Deno.test("refusals: a class target, a coverage outside (0, 1)", () => {
  const classes: Dataset = {
    rows: 2,
    features: DATASET.features,
    target: {
      kind: "classification",
      name: "level",
      classes: ["a", "b"],
      values: Int32Array.of(0, 1),
    },
  };
  assert.throws(() => leafMembers(ENSEMBLE, classes), TypeError);
  const members = leafMembers(ENSEMBLE, DATASET);
  for (const coverage of [0, 1, NaN]) {
    assert.throws(() => quantileForestRange(ENSEMBLE, members, [3], coverage), RangeError);
  }
});
