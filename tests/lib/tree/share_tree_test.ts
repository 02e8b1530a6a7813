import assert from "node:assert/strict";
import { binFeatures } from "../../../lib/tree/bins.ts";
import { applyRow, predictRows } from "../../../lib/tree/flat_tree.ts";
import { growTree } from "../../../lib/tree/grow_tree.ts";
import { shareableTree, shareTree } from "../../../lib/tree/share_tree.ts";
import { diverseLeaves } from "../../../lib/tree/diverse_leaves.ts";
import { bootstrapCounts, resampleStates } from "../../../lib/ensemble/bootstrap.ts";
import { classification, levels, numeric, regression } from "./_small.ts";

// Invented pay by years and site; a resample drew some rows twice and left others out.
const years = [1, 2, 3, 4, 8, 9, 10, 11, 1, 9];
const site = [0, 0, 1, 1, 0, 0, 1, 1, 1, 0];
const pay = [50, 52, 57, 59, 80, 82, 88, 90, 55, 81];
const data = regression([numeric("years", years), levels("site", site, 2)], pay);
const weights = Float64Array.of(2, 0, 1, 1, 0, 3, 1, 0, 1, 1);
const tree = growTree({ dataset: data, bins: binFeatures(data), weights }, { minLeaf: 2 });

Deno.test("covers count every training row, drawn or not, and add up to the root", () => {
  const shared = shareTree(tree, data.features, data.rows);
  const leafOf = years.map((_, r) => applyRow(tree, data.features, r));
  for (let k = 0; k < tree.nodeCount; k++) {
    if (tree.left[k] !== -1) {
      assert.equal(shared.rows[k], shared.rows[tree.left[k]] + shared.rows[tree.right[k]]);
    } else {
      assert.equal(shared.rows[k], leafOf.filter((leaf) => leaf === k).length, `leaf ${k}`);
    }
  }
  assert.equal(shared.rows[0], 10);
  assert.deepEqual(Array.from(shared.weight), Array.from(shared.rows));
});

Deno.test("an internal value is the cover-weighted mean of its leaves; leaves unchanged", () => {
  const shared = shareTree(tree, data.features, data.rows);
  // By a plain recursion over the tree: the sum of leaf values over the rows reaching each node.
  const leafOf = years.map((_, r) => applyRow(tree, data.features, r));
  const under = (k: number): number[] =>
    tree.left[k] === -1 ? [k] : [...under(tree.left[k]), ...under(tree.right[k])];
  for (let k = 0; k < tree.nodeCount; k++) {
    const leaves = new Set(under(k));
    const reached = leafOf.filter((leaf) => leaves.has(leaf));
    const mean = reached.reduce((s, leaf) => s + tree.value[leaf], 0) / reached.length;
    assert.ok(Math.abs(shared.value[k] - mean) < 1e-12, `node ${k}`);
    if (tree.left[k] === -1) assert.equal(shared.value[k], tree.value[k]);
  }
  assert.ok(Array.from(shared.impurity).every(Number.isNaN));
});

Deno.test("predictions, splits and thresholds are the same; the tree given is untouched", () => {
  const before = Float64Array.from(tree.value);
  const shared = shareTree(tree, data.features, data.rows);
  assert.deepEqual(
    predictRows(shared, data.features, data.rows),
    predictRows(tree, data.features, data.rows),
  );
  assert.deepEqual(shared.feature, tree.feature);
  assert.deepEqual(shared.threshold, tree.threshold);
  assert.deepEqual(tree.value, before);
  assert.ok(tree.nodeCount > 1, "the test tree has splits");
});

Deno.test("a root-only tree's value is its leaf value; a class tree's shares are averaged", () => {
  const stump = growTree({ dataset: data, bins: binFeatures(data) }, { maxDepth: 0 });
  const shared = shareTree(stump, data.features, data.rows);
  assert.equal(shared.nodeCount, 1);
  assert.equal(shared.value[0], stump.value[0]);
  assert.equal(shared.rows[0], 10);
  const classes = classification([numeric("years", years)], [0, 0, 0, 0, 1, 1, 1, 1, 0, 1], 2);
  const classTree = growTree({ dataset: classes, bins: binFeatures(classes) }, { minLeaf: 2 });
  const sharedClass = shareTree(classTree, classes.features, classes.rows);
  assert.equal(sharedClass.width, 2);
  // Shares still sum to 1 at every node.
  for (let k = 0; k < sharedClass.nodeCount; k++) {
    assert.ok(Math.abs(sharedClass.value[2 * k] + sharedClass.value[2 * k + 1] - 1) < 1e-12);
  }
});

Deno.test("shareableTree walks once and gives shareTree(diverseLeaves(...)) bit for bit", () => {
  // 400 invented people on a pay scale (grade x step paid exactly, so many
  // leaves hold people paid the same), a site with missing values, 30 resamples.
  const n = 400;
  const grade = Array.from({ length: n }, (_, i) => 1 + ((i * 7) % 5));
  const step = Array.from({ length: n }, (_, i) => (i * 3) % 4);
  const siteOf = Array.from({ length: n }, (_, i) => (i % 13 === 0 ? NaN : (i * 5) % 3));
  const money = grade.map((g, i) => 30000 + 8000 * g + 1500 * step[i] + (i % 9 === 0 ? i : 0));
  const dataset = regression(
    [numeric("grade", grade), numeric("step", step), levels("site", siteOf, 3)],
    money.map(Math.log),
  );
  const states = resampleStates(2, dataset.target.values, 30);
  let merged = 0;
  for (let b = 0; b < 30; b++) {
    const counts = bootstrapCounts(n, states, b);
    const grown = growTree({ dataset, bins: binFeatures(dataset), weights: counts }, {
      minLeaf: 5,
    });
    const diverse = diverseLeaves(grown, dataset.features, counts, money);
    if (diverse.nodeCount < grown.nodeCount) merged++;
    assert.deepEqual(
      shareableTree(grown, dataset.features, counts, money),
      shareTree(diverse, dataset.features, n),
    );
    // Without money (a class tree's way): covers only.
    assert.deepEqual(
      shareableTree(grown, dataset.features, counts),
      shareTree(grown, dataset.features, n),
    );
  }
  assert(merged >= 10, `only ${merged} trees had leaves merged`);
});
