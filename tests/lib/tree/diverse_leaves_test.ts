import assert from "node:assert/strict";
import { binFeatures } from "../../../lib/tree/bins.ts";
import { diverseLeaves, SAME_PAY_SHARE } from "../../../lib/tree/diverse_leaves.ts";
import { applyRow, leafCount } from "../../../lib/tree/flat_tree.ts";
import { growTree } from "../../../lib/tree/grow_tree.ts";
import { classification, numeric, regression } from "./_small.ts";

const ones = (n: number) => new Float64Array(n).fill(1);

// A plain check of the property: no leaf's drawn members' pay spans <= tolerance.
function revealing(
  tree: ReturnType<typeof growTree>,
  data: ReturnType<typeof regression>,
  counts: ArrayLike<number>,
  money: number[],
  tolerance = SAME_PAY_SHARE,
): number[] {
  const byLeaf = new Map<number, number[]>();
  for (let r = 0; r < money.length; r++) {
    if (!(counts[r] > 0)) continue;
    const leaf = applyRow(tree, data.features, r);
    byLeaf.set(leaf, [...(byLeaf.get(leaf) ?? []), money[r]]);
  }
  return [...byLeaf].filter(([, pays]) =>
    Math.max(...pays) - Math.min(...pays) <= tolerance * Math.abs(Math.max(...pays))
  ).map(([leaf]) => leaf);
}

Deno.test("the tolerance is 0.05%", () => {
  assert.equal(SAME_PAY_SHARE, 0.0005);
});

Deno.test("a leaf of people paid the same is merged; the merged value is the parent's mean", () => {
  // Years 1-3 paid 50,000 each (a pay scale), years 8-10 paid differently.
  const x = [1, 2, 3, 8, 9, 10];
  const pay = [50000, 50000, 50000, 61000, 70000, 83000];
  const data = regression([numeric("years", x)], pay);
  const tree = growTree({ dataset: data, bins: binFeatures(data) }, { minLeaf: 3 });
  assert.equal(tree.nodeCount, 3);
  assert.equal(tree.value[tree.left[0]], 50000);
  const shared = diverseLeaves(tree, data.features, ones(6), pay);
  assert.equal(shared.nodeCount, 1);
  // (3 x 50,000 + 61,000 + 70,000 + 83,000) / 6
  assert.ok(Math.abs(shared.value[0] - 364000 / 6) < 1e-9);
});

Deno.test("merging goes on until no leaf reveals pay, in a deeper tree", () => {
  const x = Array.from({ length: 12 }, (_, i) => i + 1);
  const pay = [50000, 50000, 50000, 50000, 64000, 71000, 66000, 79000, 85000, 91000, 77000, 99000];
  const data = regression([numeric("years", x)], pay);
  const tree = growTree({ dataset: data, bins: binFeatures(data) }, { minLeaf: 3 });
  assert.ok(revealing(tree, data, ones(12), pay).length > 0, "the grown tree has such a leaf");
  const shared = diverseLeaves(tree, data.features, ones(12), pay);
  assert.deepEqual(revealing(shared, data, ones(12), pay), []);
  assert.ok(leafCount(shared) < leafCount(tree));
  assert.ok(shared.nodeCount > 1, "the other splits stay");
  // Each leaf's value is the mean of its members (every row drawn once).
  for (let k = 0; k < shared.nodeCount; k++) {
    if (shared.left[k] !== -1) continue;
    const members = x.map((_, r) => r).filter((r) => applyRow(shared, data.features, r) === k);
    const mean = members.reduce((s, r) => s + pay[r], 0) / members.length;
    assert.ok(Math.abs(shared.value[k] - mean) < 1e-9, `leaf ${k}`);
  }
});

Deno.test("pay within the tolerance counts as the same; just beyond it does not", () => {
  const x = [1, 2, 3, 8, 9, 10];
  // 0.05% of 100,000 is 50: a spread of 40 is the same pay, a spread of 60 is not.
  const within = [100000, 99960, 100000, 60000, 70000, 80000];
  const beyond = [100000, 99940, 100000, 60000, 70000, 80000];
  for (const [pay, merged] of [[within, true], [beyond, false]] as const) {
    const data = regression([numeric("years", x)], [...pay]);
    const tree = growTree({ dataset: data, bins: binFeatures(data) }, { minLeaf: 3 });
    assert.equal(tree.nodeCount, 3);
    const shared = diverseLeaves(tree, data.features, ones(6), [...pay]);
    assert.equal(shared.nodeCount, merged ? 1 : 3, JSON.stringify(pay));
  }
});

Deno.test("only drawn members count: a leaf whose undrawn row differs is merged", () => {
  const x = [1, 2, 3, 8, 9, 10];
  const pay = [50000, 50000, 72000, 61000, 70000, 83000];
  const data = regression([numeric("years", x)], pay);
  const tree = growTree({ dataset: data, bins: binFeatures(data) }, { minLeaf: 3 });
  assert.equal(tree.nodeCount, 3);
  // All drawn: the low leaf spans 50,000 to 72,000 and stays.
  assert.equal(diverseLeaves(tree, data.features, ones(6), pay), tree);
  // Row 2 not drawn: the low leaf's drawn members are both paid 50,000.
  const counts = Float64Array.of(1, 2, 0, 1, 1, 1);
  assert.equal(diverseLeaves(tree, data.features, counts, pay).nodeCount, 1);
});

Deno.test("a tree with no such leaf, a root-only tree and a class tree are returned as they are", () => {
  const x = [1, 2, 3, 8, 9, 10];
  const pay = [50000, 52000, 54000, 80000, 82000, 84000];
  const data = regression([numeric("years", x)], pay);
  const tree = growTree({ dataset: data, bins: binFeatures(data) }, { minLeaf: 3 });
  assert.equal(diverseLeaves(tree, data.features, ones(6), pay), tree);
  // Everyone paid the same: the root alone reveals it, and nothing coarser is left.
  const same = regression([numeric("years", x)], new Array(6).fill(50000));
  const stump = growTree({ dataset: same, bins: binFeatures(same) }, { minLeaf: 3 });
  assert.equal(stump.nodeCount, 1);
  assert.equal(diverseLeaves(stump, same.features, ones(6), new Array(6).fill(50000)), stump);
  const classes = classification([numeric("years", x)], [0, 0, 0, 1, 1, 1], 2);
  const classTree = growTree({ dataset: classes, bins: binFeatures(classes) }, { minLeaf: 3 });
  assert.equal(diverseLeaves(classTree, classes.features, ones(6), [1, 1, 1, 2, 2, 2]), classTree);
});

Deno.test("a larger tolerance merges more", () => {
  const x = [1, 2, 3, 8, 9, 10];
  const pay = [50000, 50400, 50200, 60000, 70000, 80000];
  const data = regression([numeric("years", x)], pay);
  const tree = growTree({ dataset: data, bins: binFeatures(data) }, { minLeaf: 3 });
  // Spread 400 of 50,400 is 0.79%: kept at 0.05%, merged at 1%.
  assert.equal(diverseLeaves(tree, data.features, ones(6), pay).nodeCount, 3);
  assert.equal(diverseLeaves(tree, data.features, ones(6), pay, 0.01).nodeCount, 1);
});
