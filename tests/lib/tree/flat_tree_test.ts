// The walks over a flat tree, on trees written out node by node so that
// every leaf below is followed by hand: thresholds (a value equal to the
// threshold goes left), level masks (levels outside both masks and codes
// beyond the mask's words follow the missing direction), masks of more
// than one 32-bit word, class shares and their ties.
import assert from "node:assert/strict";
import type { Feature } from "../../../mod.ts";
import {
  applyRow,
  applyRows,
  applyValues,
  goesLeft,
  leafCount,
  pathOfRow,
  predictedClass,
  predictRows,
  splitLevels,
  treeDepth,
} from "../../../lib/tree/flat_tree.ts";
import { handTree } from "./_hand_tree.ts";

const KINDS: Pick<Feature, "kind" | "levels">[] = [
  { kind: "numeric" },
  { kind: "categorical", levels: ["A", "B", "C", "D"] },
  { kind: "ordinal", levels: ["G1", "G2", "G3", "G4"] },
];

// 0: years <= 5.5 (missing right); 1: site {A, C} left, {B} right, D never
// seen there (missing right); 2: grade <= G2 (missing left). Leaves 3-6.
const TREE = handTree(
  [
    { feature: 0, split: 5.5, left: 1, right: 2 },
    { feature: 1, split: { left: [0, 2], right: [1] }, left: 3, right: 4 },
    { feature: 2, split: 1.5, left: 5, right: 6, missingLeft: true },
    null,
    null,
    null,
    null,
  ],
  KINDS,
  [50, 40, 60, 38, 45, 55, 70],
  [20, 12, 8, 7, 5, 5, 3],
);

// [years, site, grade] -> the leaf, followed by hand through the three splits.
const CASES: [number[], number][] = [
  [[3, 0, 0], 3], // years <= 5.5, site A
  [[3, 2, 3], 3], // site C
  [[5.5, 0, 0], 3], // equal to the threshold: left
  [[3, 1, 0], 4], // site B
  [[3, 3, 0], 4], // site D, in neither mask: the missing direction (right)
  [[3, NaN, 0], 4], // missing site: right
  [[3, 40, 0], 4], // a code beyond the mask's 32 bits: right
  [[6, 0, 1], 5], // years > 5.5, grade G2
  [[6, 0, 2], 6], // grade G3
  [[6, 0, NaN], 5], // missing grade: left here
  [[NaN, 0, 3], 6], // missing years: right, then G4
];

Deno.test("applyValues follows thresholds, masks and missing directions to the hand-traced leaf", () => {
  for (const [profile, leaf] of CASES) assert.equal(applyValues(TREE, profile), leaf, `${profile}`);
});

Deno.test("applyRow, applyRows, predictRows and pathOfRow read the same rows from columns", () => {
  const features: Feature[] = KINDS.map((k, f) => ({
    name: `f${f}`,
    ...k,
    values: Float64Array.from(CASES, ([p]) => p[f]),
  }));
  const leaves = CASES.map(([, leaf]) => leaf);
  assert.deepEqual(CASES.map((_, r) => applyRow(TREE, features, r)), leaves);
  assert.deepEqual(Array.from(applyRows(TREE, features, CASES.length)), leaves);
  // Leaf values 38, 45, 55, 70 of nodes 3 to 6.
  const value = [0, 0, 0, 38, 45, 55, 70];
  assert.deepEqual(
    Array.from(predictRows(TREE, features, CASES.length)),
    leaves.map((l) => value[l]),
  );
  // The path is the root, the node of the first split's side, then the leaf.
  assert.deepEqual(
    CASES.map((_, r) => pathOfRow(TREE, features, r)),
    leaves.map((l) => [0, l <= 4 ? 1 : 2, l]),
  );
  // Predictions into a given array of the wrong size are refused.
  assert.throws(
    () => predictRows(TREE, features, CASES.length, new Float64Array(3)),
    RangeError,
  );
  const out = new Float64Array(CASES.length);
  assert.equal(predictRows(TREE, features, CASES.length, out), out);
});

Deno.test("goesLeft at each kind of node", () => {
  assert.equal(goesLeft(TREE, 0, 5.5), true);
  assert.equal(goesLeft(TREE, 0, 5.5000001), false);
  assert.equal(goesLeft(TREE, 0, NaN), false);
  assert.equal(goesLeft(TREE, 1, 2), true);
  assert.equal(goesLeft(TREE, 1, 1), false);
  assert.equal(goesLeft(TREE, 2, NaN), true);
  assert.equal(goesLeft(TREE, 2, 1), true);
  assert.equal(goesLeft(TREE, 2, 2), false);
});

Deno.test("splitLevels decodes each side's levels, none at a numeric node", () => {
  assert.deepEqual(splitLevels(TREE, 1, true, 4), [0, 2]);
  assert.deepEqual(splitLevels(TREE, 1, false, 4), [1]);
  // Only codes below the level count are read.
  assert.deepEqual(splitLevels(TREE, 1, true, 2), [0]);
  assert.deepEqual(splitLevels(TREE, 0, true, 4), []);
  assert.deepEqual(splitLevels(TREE, 2, false, 4), []);
});

Deno.test("a level mask of two words: codes 32 and beyond are read from the second word", () => {
  const levels = Array.from({ length: 40 }, (_, i) => `L${i}`);
  const wide = handTree(
    [
      {
        feature: 0,
        split: { left: [0, 33], right: [1, 39] },
        left: 1,
        right: 2,
        missingLeft: true,
      },
      null,
      null,
    ],
    [{ kind: "categorical", levels }],
    [0, 1, 2],
    [4, 2, 2],
  );
  assert.equal(wide.maskWords[0], 2);
  assert.deepEqual(splitLevels(wide, 0, true, 40), [0, 33]);
  assert.deepEqual(splitLevels(wide, 0, false, 40), [1, 39]);
  assert.equal(goesLeft(wide, 0, 33), true);
  assert.equal(goesLeft(wide, 0, 39), false);
  assert.equal(goesLeft(wide, 0, 1), false);
  // Unseen at this node (code 5), beyond both words (64): the missing side, left.
  assert.equal(goesLeft(wide, 0, 5), true);
  assert.equal(goesLeft(wide, 0, 64), true);
  assert.equal(applyValues(wide, [39]), 2);
});

Deno.test("leafCount and treeDepth by hand", () => {
  assert.equal(leafCount(TREE), 4);
  assert.equal(treeDepth(TREE), 2);
  // A chain: each split's right child splits again, three times.
  const chain = handTree(
    [
      { feature: 0, split: 1, left: 1, right: 2 },
      null,
      { feature: 0, split: 2, left: 3, right: 4 },
      null,
      { feature: 0, split: 3, left: 5, right: 6 },
      null,
      null,
    ],
    [{ kind: "numeric" }],
    [0, 0, 0, 0, 0, 0, 0],
    [7, 1, 6, 1, 5, 1, 4],
  );
  assert.equal(leafCount(chain), 4);
  assert.equal(treeDepth(chain), 3);
  assert.deepEqual(
    pathOfRow(chain, [{ name: "x", kind: "numeric", values: Float64Array.of(2.5) }], 0),
    [0, 2, 4, 5],
  );
  // The root alone: one leaf, depth 0.
  const root = handTree([null], [{ kind: "numeric" }], [9], [3]);
  assert.equal(leafCount(root), 1);
  assert.equal(treeDepth(root), 0);
  assert.equal(applyValues(root, [NaN]), 0);
});

Deno.test("class shares: predictRows gives each row its leaf's shares; predictedClass breaks ties low", () => {
  const shares = [
    [0.3, 0.45, 0.25], // root
    [0.2, 0.5, 0.3], // x <= 0.5
    [0.4, 0.4, 0.2], // x > 0.5: a tie between classes 0 and 1
  ];
  const tree = handTree(
    [{ feature: 0, split: 0.5, left: 1, right: 2 }, null, null],
    [{ kind: "numeric" }],
    shares.flat(),
    [10, 5, 5],
    "classification",
  );
  assert.equal(tree.width, 3);
  assert.equal(predictedClass(tree, 0), 1);
  assert.equal(predictedClass(tree, 1), 1);
  assert.equal(predictedClass(tree, 2), 0);
  const features: Feature[] = [{ name: "x", kind: "numeric", values: Float64Array.of(1, 0, 0.5) }];
  assert.deepEqual(Array.from(predictRows(tree, features, 3)), [
    ...shares[2],
    ...shares[1],
    ...shares[1],
  ]);
});
