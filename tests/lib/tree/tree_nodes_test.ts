// The node record both builders fill: a categorical split's two level
// masks (levels left, levels right, a level in neither follows the missing
// direction), read back through flat_tree's one decoder and its walk.
import assert from "node:assert/strict";
import { goesLeft, splitLevels } from "../../../lib/tree/flat_tree.ts";
import { maskWordsOf, TreeNodes } from "../../../lib/tree/tree_nodes.ts";

Deno.test("TreeNodes: a split on 40 levels keeps both masks over two words", () => {
  const levels = Array.from({ length: 40 }, (_, i) => `L${i}`);
  const words = maskWordsOf([
    { name: "years", kind: "numeric", values: new Float64Array() },
    { name: "site", kind: "categorical", levels, values: new Float64Array() },
  ]);
  assert.deepEqual([...words], [0, 2]);
  const nodes = new TreeNodes("classification", 2, words);
  const root = nodes.add([0.5, 0.5], 10, 12, 0.5);
  const left = nodes.add([1, 0], 5, 6, 0);
  const right = nodes.add([0, 1], 5, 6, 0);
  nodes.split(
    root,
    { feature: 1, threshold: NaN, leftBins: [0, 33, 39], rightBins: [1, 32] },
    false,
  );
  nodes.attach(root, "left", left);
  nodes.attach(root, "right", right);
  const tree = nodes.finish();
  assert.equal(tree.nodeCount, 3);
  assert.deepEqual([...tree.value], [0.5, 0.5, 1, 0, 0, 1]);
  assert.deepEqual([...tree.rows], [10, 5, 5]);
  assert.deepEqual([...tree.weight], [12, 6, 6]);
  assert.deepEqual(splitLevels(tree, 0, true, 40), [0, 33, 39]);
  assert.deepEqual(splitLevels(tree, 0, false, 40), [1, 32]);
  assert.equal(goesLeft(tree, 0, 33), true);
  assert.equal(goesLeft(tree, 0, 32), false);
  // Level 7 was in neither list: it follows the missing values, right.
  assert.equal(goesLeft(tree, 0, 7), false);
  assert.equal(goesLeft(tree, 0, NaN), false);
  assert(Number.isNaN(tree.threshold[0]));
});

Deno.test("TreeNodes: a numeric split keeps its threshold and missing direction", () => {
  const nodes = new TreeNodes("regression", 1, Int32Array.of(0));
  const root = nodes.add([3], 4, 4, 2);
  nodes.add([1], 2, 2, 0);
  nodes.add([5], 2, 2, 0);
  nodes.split(root, { feature: 0, threshold: 1.5, leftBins: [], rightBins: [] }, true);
  nodes.attach(root, "left", 1);
  nodes.attach(root, "right", 2);
  const tree = nodes.finish();
  assert.equal(tree.threshold[0], 1.5);
  assert.equal(tree.missingLeft[0], 1);
  assert.equal(goesLeft(tree, 0, NaN), true);
  assert.equal(goesLeft(tree, 0, 1.5), true);
  assert.equal(goesLeft(tree, 0, 1.6), false);
  assert.equal(nodes.weightOf(root), 4);
  assert.equal(nodes.impurityOf(root), 2);
});
