// What a shared model keeps of figures computed over people: reference
// means rounded to steps of 4 RMSE / n, variances dropped, other figures to
// four significant digits; on a hand-written tree and hand-picked numbers.
import assert from "node:assert/strict";
import {
  FIGURE_DIGITS,
  MEAN_STEP_RMSE,
  roundedFigures,
  shareableReference,
} from "../../../lib/model/shareable_figures.ts";
import { handTree } from "../tree/_hand_tree.ts";

const TREE = handTree(
  [{ feature: 0, split: 5, left: 1, right: 2 }, null, null],
  [{ kind: "numeric" }],
  [10.73, 10.41, 11.2],
  [8, 5, 3],
);

Deno.test("each node's mean goes to the nearest step of 4 RMSE over its people", () => {
  assert.equal(MEAN_STEP_RMSE, 4);
  // RMSE 0.1: steps 0.05 (8 people), 0.08 (5), 0.4/3 (3).
  const kept = shareableReference(TREE, 0.1);
  // 10.73 / 0.05 = 214.6 -> 215 steps; 10.41 / 0.08 = 130.125 -> 130;
  // 11.2 / (0.4/3) = 84 -> 84.
  assert(Math.abs(kept.value[0] - 215 * 0.05) < 1e-12);
  assert(Math.abs(kept.value[1] - 130 * 0.08) < 1e-12);
  assert(Math.abs(kept.value[2] - 84 * (0.4 / 3)) < 1e-12);
  assert(kept.impurity.every(Number.isNaN));
  // The tree given is left as it was.
  assert.deepEqual(Array.from(TREE.value), [10.73, 10.41, 11.2]);
  assert.deepEqual(Array.from(kept.rows), [8, 5, 3]);
});

Deno.test("a node of no people counts as one; class shares and a zero RMSE keep the values", () => {
  const empty = handTree([null], [{ kind: "numeric" }], [10.73], [0]);
  // Step 4 * 0.1 / 1 = 0.4: 10.73 -> 27 steps = 10.8.
  assert(Math.abs(shareableReference(empty, 0.1).value[0] - 10.8) < 1e-12);
  assert.deepEqual(Array.from(shareableReference(TREE, 0).value), [10.73, 10.41, 11.2]);
  const classes = handTree([null], [{ kind: "numeric" }], [0.3, 0.7], [4], "classification");
  const kept = shareableReference(classes, 0.1);
  assert.deepEqual(Array.from(kept.value), [0.3, 0.7]);
  assert(Number.isNaN(kept.impurity[0]));
});

Deno.test("roundedFigures keeps four significant digits of every number, deep", () => {
  assert.equal(FIGURE_DIGITS, 4);
  assert.deepEqual(
    roundedFigures({
      a: 123456,
      b: [0.000123456, -9.87654],
      c: { d: 1.00005, e: "text 1.23456", f: true, g: null },
      h: [NaN, Infinity, -Infinity],
    }),
    {
      a: 123500,
      b: [0.0001235, -9.877],
      c: { d: 1, e: "text 1.23456", f: true, g: null },
      h: [NaN, Infinity, -Infinity],
    },
  );
  assert.equal(roundedFigures(2.71828), 2.718);
});
