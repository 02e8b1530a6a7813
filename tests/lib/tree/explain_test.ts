// Decision paths in words, on a tree written out node by node: each step's
// condition for the side taken, the node reached with its rows and value,
// and the words for missing values, levels a node never saw, ordinal
// splits, splits on whether a value is known and class trees.
import assert from "node:assert/strict";
import type { Feature } from "../../../mod.ts";
import { describeCondition, explainPath } from "../../../lib/tree/explain.ts";
import { handTree } from "./_hand_tree.ts";

const FEATURES: Pick<Feature, "name" | "kind" | "levels">[] = [
  { name: "years", kind: "numeric" },
  { name: "site", kind: "categorical", levels: ["North", "South", "East", "West"] },
  { name: "grade", kind: "ordinal", levels: ["G1", "G2", "G3", "G4"] },
];

// 0: years <= 5.5 (missing right); 1: site {North, East} | {South}, West
// never seen there (missing right); 2: grade <= G2 (missing left).
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
  FEATURES,
  [50, 40, 60, 38, 45, 55, 70],
  [20, 12, 8, 7, 5, 5, 3],
);

Deno.test("each step names the side taken and the node reached, with its rows and mean", () => {
  assert.deepEqual(explainPath(TREE, FEATURES, [3, 2, 0]), [
    { feature: "years", condition: "years <= 5.5", node: 1, rows: 12, value: 40 },
    { feature: "site", condition: "site in {North, East}", node: 3, rows: 7, value: 38 },
  ]);
  assert.deepEqual(explainPath(TREE, FEATURES, [6, 0, 3]), [
    { feature: "years", condition: "years > 5.5", node: 2, rows: 8, value: 60 },
    { feature: "grade", condition: "grade >= G3", node: 6, rows: 3, value: 70 },
  ]);
  assert.deepEqual(
    explainPath(TREE, FEATURES, [6, 0, 1]).map((s) => s.condition),
    ["years > 5.5", "grade <= G2"],
  );
  assert.deepEqual(
    explainPath(TREE, FEATURES, [3, 1, 0]).map((s) => s.condition),
    ["years <= 5.5", "site in {South}"],
  );
});

Deno.test("missing values and levels a node never saw say which way they went", () => {
  assert.deepEqual(
    explainPath(TREE, FEATURES, [NaN, NaN, NaN]).map((s) => [s.condition, s.node]),
    [["years is missing -> right", 2], ["grade is missing -> left", 5]],
  );
  assert.deepEqual(
    explainPath(TREE, FEATURES, [1, NaN, 0]).map((s) => [s.condition, s.node]),
    [["years <= 5.5", 1], ["site is missing -> right", 4]],
  );
  // West (code 3) is in neither of node 1's masks.
  assert.deepEqual(
    explainPath(TREE, FEATURES, [1, 3, 0]).map((s) => [s.condition, s.node]),
    [["years <= 5.5", 1], ["site = West (not seen here) -> right", 4]],
  );
  // A code beyond the level names is named by its number.
  assert.equal(
    describeCondition(TREE, 1, FEATURES[1], 9, false),
    "site = 9 (not seen here) -> right",
  );
});

Deno.test("describeCondition: thresholds, ordinal ladders and splits on whether a value is known", () => {
  assert.equal(describeCondition(TREE, 0, FEATURES[0], 2, true), "years <= 5.5");
  assert.equal(describeCondition(TREE, 0, FEATURES[0], 9, false), "years > 5.5");
  // Ordinal without level names: the codes on each side of 1.5.
  const bare = { name: "grade", kind: "ordinal" as const };
  assert.equal(describeCondition(TREE, 2, bare, 0, true), "grade <= 1");
  assert.equal(describeCondition(TREE, 2, bare, 3, false), "grade >= 2");
  // Thresholds are shown to 6 significant digits: 1/3 as 0.333333.
  const third = handTree(
    [{ feature: 0, split: 1 / 3, left: 1, right: 2 }, null, null],
    [{ kind: "numeric" }],
    [0, 1, 2],
    [3, 1, 2],
  );
  assert.equal(describeCondition(third, 0, FEATURES[0], 0, true), "years <= 0.333333");
  // Threshold Infinity: every known value goes left, a missing one right.
  const known = handTree(
    [{ feature: 0, split: Infinity, left: 1, right: 2 }, null, null],
    [{ kind: "numeric" }],
    [0, 10, 20],
    [6, 4, 2],
  );
  assert.deepEqual(explainPath(known, FEATURES, [1e9]).map((s) => [s.condition, s.value]), [
    ["years is known", 10],
  ]);
  assert.deepEqual(explainPath(known, FEATURES, [NaN]).map((s) => s.condition), [
    "years is missing -> right",
  ]);
});

Deno.test("a class tree's steps carry the likeliest class of the node reached and its share", () => {
  const tree = handTree(
    [{ feature: 0, split: 5.5, left: 1, right: 2 }, null, null],
    [{ kind: "numeric" }],
    [0.5, 0.5, /* left */ 0.8, 0.2, /* right */ 0.3, 0.7],
    [10, 5, 5],
    "classification",
  );
  assert.deepEqual(explainPath(tree, FEATURES, [9], ["junior", "senior"]), [
    {
      feature: "years",
      condition: "years > 5.5",
      node: 2,
      rows: 5,
      value: 0.7,
      className: "senior",
    },
  ]);
  // Without class names, the class code.
  const [step] = explainPath(tree, FEATURES, [1]);
  assert.equal(step.className, "0");
  assert.equal(step.value, 0.8);
  // A root alone has no steps.
  assert.deepEqual(
    explainPath(handTree([null], [{ kind: "numeric" }], [1], [1]), FEATURES, [0]),
    [],
  );
});

Deno.test("a threshold of a large number is said as it is: the condition holds for the person", () => {
  // Split midway between 1,234,567 and 1,234,568. At 6 significant digits
  // it read "salary_code > 1234570", false for 1,234,569 who went right.
  const big = [{ name: "salary_code", kind: "numeric" as const }];
  const tree = handTree(
    [{ feature: 0, split: 1234567.5, left: 1, right: 2 }, null, null],
    big,
    [15, 10, 20],
    [10, 5, 5],
  );
  const steps = explainPath(tree, big, [1234569]);
  assert.equal(steps[0].condition, "salary_code > 1234567.5");
  const said = Number(steps[0].condition.split("> ")[1]);
  assert.ok(1234569 > said, "the condition is true of the person it describes");
});
