// Missing values in splits, checked on hand-computed cases (the reference
// library of our other checks, scikit-learn 1.2.1, has no missing-value
// support in trees).
import assert from "node:assert/strict";
import { applyRow, binFeatures, explainPath, growTree } from "../../../mod.ts";
import { levels, numeric, regression } from "./_small.ts";

function fit(dataset: ReturnType<typeof regression>) {
  return growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1, maxDepth: 1 });
}

Deno.test("missing values go to the side that makes the better split", () => {
  // x <= 2.5 separates 10s from 20s; the rows with x missing have y = 20, so
  // sending them right leaves both children pure (SSE 0), left would not.
  const right = regression([numeric("x", [1, 2, 3, 4, NaN, NaN])], [10, 10, 20, 20, 20, 20]);
  const tree = fit(right);
  assert.equal(tree.threshold[0], 2.5);
  assert.equal(tree.missingLeft[0], 0);
  assert.equal(tree.rows[tree.right[0]], 4);
  assert.equal(tree.value[tree.right[0]], 20);
  assert.equal(tree.rows[0], 6, "rows with a missing value are not dropped");
  // Same table, missing rows with y = 10: they go left.
  const left = regression([numeric("x", [1, 2, 3, 4, NaN, NaN])], [10, 10, 20, 20, 10, 10]);
  const leftTree = fit(left);
  assert.equal(leftTree.missingLeft[0], 1);
  assert.equal(leftTree.rows[leftTree.left[0]], 4);
});

Deno.test("with no missing value in training, missing goes to the heavier child", () => {
  // Split at 2.5: left {1, 1} (2 rows), right {5, 5, 5} (3 rows).
  const dataset = regression([numeric("x", [1, 2, 3, 4, 5])], [1, 1, 5, 5, 5]);
  const tree = fit(dataset);
  assert.equal(tree.missingLeft[0], 0);
  const profile = regression([numeric("x", [NaN])], [0]);
  assert.equal(tree.value[applyRow(tree, profile.features, 0)], 5);
  assert.deepEqual(
    explainPath(tree, profile.features, [NaN]).map((s) => s.condition),
    ["x is missing -> right"],
  );
});

Deno.test("a level the split never saw follows the missing direction", () => {
  // Levels site0..site2; training has site0 (y 1) and site1 (y 9) only, site1
  // heavier, so an unseen site2 goes with the heavier side.
  const dataset = regression([levels("site", [0, 0, 1, 1, 1], 3)], [1, 1, 9, 9, 9]);
  const tree = fit(dataset);
  const heavierLeft = tree.weight[tree.left[0]] > tree.weight[tree.right[0]];
  assert.equal(tree.missingLeft[0], heavierLeft ? 1 : 0);
  const unseen = regression([levels("site", [2], 3)], [0]);
  assert.equal(tree.value[applyRow(tree, unseen.features, 0)], 9);
  const steps = explainPath(tree, unseen.features, [2]);
  assert.match(steps[0].condition, /site = site2 \(not seen here\) -> (left|right)/);
});

Deno.test("missing rows count towards the minimum leaf size", () => {
  // With minLeaf 3, x <= 1.5 leaves one row on the left; it is admissible
  // only with the 2 missing rows joining it, which also makes both sides pure.
  const dataset = regression([numeric("x", [1, 2, 3, 4, NaN, NaN])], [0, 10, 10, 10, 0, 0]);
  const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 3, maxDepth: 1 });
  assert.equal(tree.threshold[0], 1.5);
  assert.equal(tree.missingLeft[0], 1);
  assert.equal(tree.rows[tree.left[0]], 3);
  assert.equal(tree.value[tree.left[0]], 0);
});

Deno.test("a split on whether a value is known at all", () => {
  // Every known x is 1 and every row without x earns 9: the only useful split
  // is known | missing.
  const dataset = regression([numeric("x", [1, 1, 1, NaN, NaN, NaN])], [1, 1, 1, 9, 9, 9]);
  const tree = fit(dataset);
  assert.equal(tree.nodeCount, 3);
  assert.equal(tree.threshold[0], Infinity);
  assert.equal(tree.missingLeft[0], 0);
  assert.equal(tree.value[tree.left[0]], 1);
  assert.equal(tree.value[tree.right[0]], 9);
  assert.deepEqual(explainPath(tree, dataset.features, [3]).map((s) => s.condition), [
    "x is known",
  ]);
  assert.deepEqual(explainPath(tree, dataset.features, [NaN]).map((s) => s.condition), [
    "x is missing -> right",
  ]);
  // The same for a categorical feature, and for a three-class target.
  const site = regression([levels("site", [0, 0, 0, NaN, NaN, NaN], 2)], [1, 1, 1, 9, 9, 9]);
  const siteTree = fit(site);
  assert.equal(siteTree.value[siteTree.right[0]], 9);
});
