import assert from "node:assert/strict";
import fc from "fast-check";
import { binFeatures } from "../../../lib/tree/bins.ts";
import { applyRow, type FlatTree, leafCount, predictRows } from "../../../lib/tree/flat_tree.ts";
import { growTree, growTreeLeaves } from "../../../lib/tree/grow_tree.ts";
import {
  collapsedWithin,
  collapseNodes,
  distinctSteps,
  PRUNE_TOLERANCE,
  pruneTree,
  pruningPath,
  SAME_ALPHA,
  sameAlpha,
  stepAt,
  subtreeAfter,
  subtreeNodeOf,
} from "../../../lib/tree/prune.ts";
import { tables } from "./_random_tables.ts";
import { levels, numeric, regression } from "./_small.ts";

// Invented: 30 rows, irregular pay so that no two links tie.
const n = 30;
const x = Array.from({ length: n }, (_, i) => (i * 17) % 31);
const s = Array.from({ length: n }, (_, i) => (i * 5) % 3);
const y = x.map((v, i) => 40 + v * 1.3 + s[i] * 7 + ((i * 7919) % 13) * 0.71);
const data = regression([numeric("x", x), levels("s", s, 3)], y);
const tree = growTree({ dataset: data, bins: binFeatures(data) }, { minLeaf: 1 });

// A second implementation, as in Breiman et al. (1984), ch. 3 (from memory): risk of a node
// R(t) = weight(t) x impurity(t) / weight(root); repeatedly collapse the internal node of
// least g(t) = (R(t) - R(leaves under t)) / (leaves under t - 1), by plain recursion.
function naivePath(t: FlatTree): { alphas: number[]; leaves: number[]; risks: number[] } {
  const risk = (k: number) => (t.weight[k] * t.impurity[k]) / t.weight[0];
  const collapsed = new Set<number>();
  const isLeaf = (k: number) => t.left[k] === -1 || collapsed.has(k);
  const leavesUnder = (k: number): number[] =>
    isLeaf(k) ? [k] : [...leavesUnder(t.left[k]), ...leavesUnder(t.right[k])];
  const reachable = (k: number): number[] =>
    isLeaf(k) ? [] : [k, ...reachable(t.left[k]), ...reachable(t.right[k])];
  const treeRisk = () => leavesUnder(0).reduce((a, k) => a + risk(k), 0);
  const alphas = [0];
  const leaves = [leavesUnder(0).length];
  const risks = [treeRisk()];
  while (!isLeaf(0)) {
    let best = -1;
    let bestG = Infinity;
    for (const k of reachable(0)) {
      const under = leavesUnder(k);
      const g = (risk(k) - under.reduce((a, l) => a + risk(l), 0)) / (under.length - 1);
      if (g < bestG) [best, bestG] = [k, g];
    }
    collapsed.add(best);
    alphas.push(Math.max(bestG, alphas[alphas.length - 1]));
    leaves.push(leavesUnder(0).length);
    risks.push(treeRisk());
  }
  return { alphas, leaves, risks };
}

Deno.test("the pruning path is the weakest-link sequence of a plain recursion", () => {
  assert.ok(leafCount(tree) >= 10, "a tree with many leaves");
  const path = pruningPath(tree);
  const naive = naivePath(tree);
  assert.deepEqual(Array.from(path.leaves), naive.leaves);
  assert.equal(path.nodes[0], -1);
  for (let i = 0; i < naive.alphas.length; i++) {
    assert.ok(Math.abs(path.alphas[i] - naive.alphas[i]) < 1e-9, `alpha ${i}`);
    assert.ok(Math.abs(path.risks[i] - naive.risks[i]) < 1e-9, `risk ${i}`);
  }
  // The last step leaves the root alone, whose risk is the population variance of y.
  const mean = y.reduce((a, b) => a + b, 0) / n;
  const variance = y.reduce((a, b) => a + (b - mean) ** 2, 0) / n;
  assert.ok(Math.abs(path.risks[path.risks.length - 1] - variance) < 1e-9);
});

// The weakest link found by a scan of every candidate in id order at each
// step, with the same running risks and leaf counts as pruningPath keeps:
// its heap must give this sequence bit for bit, ties to the lowest id.
function scannedPath(t: FlatTree): { alphas: number[]; nodes: number[] } {
  const n = t.nodeCount;
  const parent = new Int32Array(n).fill(-1);
  for (let i = 0; i < n; i++) {
    if (t.left[i] !== -1) [parent[t.left[i]], parent[t.right[i]]] = [i, i];
  }
  const rNode = Array.from({ length: n }, (_, i) => (t.weight[i] * t.impurity[i]) / t.weight[0]);
  const rBranch = new Float64Array(n);
  const leaves = new Int32Array(n);
  for (let i = n - 1; i >= 0; i--) {
    const leaf = t.left[i] === -1;
    rBranch[i] = leaf ? rNode[i] : rBranch[t.left[i]] + rBranch[t.right[i]];
    leaves[i] = leaf ? 1 : leaves[t.left[i]] + leaves[t.right[i]];
  }
  const live = Array.from({ length: n }, (_, i) => t.left[i] !== -1);
  const alphas = [0];
  const nodes = [-1];
  while (live[0]) {
    let weakest = -1;
    let effective = Infinity;
    for (let i = 0; i < n; i++) {
      if (!live[i]) continue;
      const g = (rNode[i] - rBranch[i]) / (leaves[i] - 1);
      if (g < effective) [weakest, effective] = [i, g];
    }
    const below = [weakest];
    while (below.length > 0) {
      const i = below.pop()!;
      live[i] = false;
      if (t.left[i] !== -1) below.push(t.left[i], t.right[i]);
    }
    const pruned = leaves[weakest] - 1;
    const rise = rNode[weakest] - rBranch[weakest];
    leaves[weakest] = 1;
    rBranch[weakest] = rNode[weakest];
    for (let a = parent[weakest]; a !== -1; a = parent[a]) {
      leaves[a] -= pruned;
      rBranch[a] += rise;
    }
    alphas.push(effective);
    nodes.push(weakest);
  }
  return { alphas, nodes };
}

Deno.test("the pruning path's heap gives a scan's weakest links bit for bit, ties included", () => {
  // Invented tables of small whole-number pay: many links tie exactly.
  const table = fc.integer({ min: 20, max: 160 }).chain((rows) =>
    fc.record({
      x: fc.array(fc.integer({ min: 0, max: 40 }), { minLength: rows, maxLength: rows }),
      s: fc.array(fc.integer({ min: 0, max: 4 }), { minLength: rows, maxLength: rows }),
      y: fc.array(fc.integer({ min: 1, max: 6 }), { minLength: rows, maxLength: rows }),
      minLeaf: fc.integer({ min: 1, max: 3 }),
    })
  );
  let ties = 0;
  fc.assert(
    fc.property(table, ({ x, s, y, minLeaf }) => {
      const d = regression([numeric("x", x), levels("s", s, 5)], y);
      const t = growTree({ dataset: d, bins: binFeatures(d) }, { minLeaf });
      const path = pruningPath(t);
      const scan = scannedPath(t);
      assert.deepEqual([...path.nodes], scan.nodes);
      assert.deepEqual([...path.alphas], scan.alphas);
      ties += scan.alphas.filter((g, i) => i > 0 && scan.alphas.indexOf(g) !== i).length;
    }),
    { numRuns: 150, seed: 7 },
  );
  assert.ok(ties > 100, `links tied ${ties} times`);
});

Deno.test("pruneTree at an alpha is the path's subtree at that alpha", () => {
  const path = pruningPath(tree);
  for (let i = 1; i < path.alphas.length; i++) {
    const alpha = path.alphas[i];
    const pruned = pruneTree(tree, alpha);
    assert.equal(leafCount(pruned), path.leaves[stepAt(path, alpha)], `alpha ${alpha}`);
    assert.deepEqual(
      predictRows(pruned, data.features, n),
      predictRows(subtreeAfter(tree, path, stepAt(path, alpha)), data.features, n),
    );
    // Just below the alpha, that link stays.
    const below = alpha * (1 - 1e-6);
    assert.ok(stepAt(path, below) < i);
    assert.equal(leafCount(pruneTree(tree, below)), path.leaves[stepAt(path, below)]);
  }
  assert.equal(leafCount(pruneTree(tree, 0)), leafCount(tree));
  assert.equal(leafCount(pruneTree(tree, 1e9)), 1);
  assert.equal(pruneTree(tree, 1e9).value[0], tree.value[0]);
});

Deno.test("subtreeAfter and pruneTree refuse steps and alphas out of range", () => {
  const path = pruningPath(tree);
  assert.throws(() => subtreeAfter(tree, path, -1), RangeError);
  assert.throws(() => subtreeAfter(tree, path, path.nodes.length), /steps must lie in \[0, /);
  assert.equal(leafCount(subtreeAfter(tree, path, 0)), leafCount(tree));
  assert.throws(() => pruneTree(tree, -0.1), /alpha must be >= 0, got -0.1/);
  assert.throws(() => pruneTree(tree, NaN), RangeError);
});

Deno.test("a root-only tree has a path of one step", () => {
  const stump = growTree({ dataset: data, bins: binFeatures(data) }, { maxDepth: 0 });
  const path = pruningPath(stump);
  assert.deepEqual(Array.from(path.alphas), [0]);
  assert.deepEqual(Array.from(path.leaves), [1]);
  assert.deepEqual(Array.from(path.nodes), [-1]);
  assert.equal(stepAt(path, 5), 0);
});

Deno.test("sameAlpha, collapsedWithin: relative tolerance plus a share of the root's risk", () => {
  assert.equal(SAME_ALPHA, 1e-12);
  assert.equal(PRUNE_TOLERANCE, 1e-9);
  assert.equal(sameAlpha(1, 1 + 1e-13, 0), true);
  assert.equal(sameAlpha(1, 1 + 1e-11, 0), false);
  // Near zero the root's risk sets the scale: 1e-12 x 100 = 1e-10.
  assert.equal(sameAlpha(0, 0.5e-10, 100), true);
  assert.equal(sameAlpha(0, 2e-10, 100), false);
  assert.equal(sameAlpha(1, 1 + 1e-10, 0, 1e-9), true);
  assert.equal(collapsedWithin(0.5, 1, 1), true);
  assert.equal(collapsedWithin(1 + 1e-10, 1, 0), true);
  assert.equal(collapsedWithin(1 + 1e-8, 1, 0), false);
});

Deno.test("distinctSteps keeps the last step of each run of equal alphas", () => {
  const path = {
    alphas: Float64Array.of(0, 1, 1 + 1e-14, 3, 7, 7),
    risks: Float64Array.of(0, 1, 2, 3, 4, 10),
    leaves: Int32Array.of(6, 5, 4, 3, 2, 1),
    nodes: Int32Array.of(-1, 5, 4, 3, 1, 0),
  };
  assert.deepEqual(distinctSteps(path), [0, 2, 3, 5]);
  assert.equal(stepAt(path, 1), 2);
  assert.equal(stepAt(path, 0.99), 0);
  assert.equal(stepAt(path, 100), 5);
});

Deno.test("collapseNodes makes leaves of the nodes given and renumbers the rest", () => {
  const path = pruningPath(tree);
  const last = path.nodes.length - 1;
  const root = collapseNodes(tree, [0]);
  assert.equal(root.nodeCount, 1);
  assert.equal(root.left[0], -1);
  // Collapsing the nodes of the first steps gives the path's subtree.
  const some = collapseNodes(tree, path.nodes.subarray(1, 4));
  assert.equal(leafCount(some), path.leaves[3]);
  assert.deepEqual(
    predictRows(some, data.features, n),
    predictRows(subtreeAfter(tree, path, 3), data.features, n),
  );
  assert.ok(last > 3);
  assert.equal(collapseNodes(tree, []).nodeCount, tree.nodeCount);
});

Deno.test("subtreeNodeOf: a row's leaf in the tree gives its leaf in any subtree", () => {
  let between = 0;
  fc.assert(
    fc.property(tables, fc.integer({ min: 1, max: 2 ** 30 }), (table, pick) => {
      const { dataset, weights, minLeaf, maxDepth } = table;
      const bins = binFeatures(dataset);
      const { tree, leafOf } = growTreeLeaves({ dataset, bins, weights }, { minLeaf, maxDepth });
      // Some internal nodes made leaves: a subtree of the tree (a pruned one
      // is one of these), nested collapses included.
      const collapsed = [...Array(tree.nodeCount).keys()]
        .filter((i) => tree.left[i] !== -1 && ((i + 1) * pick) % 7 === 0);
      const subtree = collapseNodes(tree, collapsed);
      const nodeOf = subtreeNodeOf(tree, subtree);
      for (let r = 0; r < dataset.rows; r++) {
        const leaf = leafOf[r] === -1 ? applyRow(tree, dataset.features, r) : leafOf[r];
        assert.equal(nodeOf[leaf], applyRow(subtree, dataset.features, r), `row ${r}`);
      }
      // The tree itself maps onto itself.
      assert.deepEqual([...subtreeNodeOf(tree, tree)], [...Array(tree.nodeCount).keys()]);
      if (subtree.nodeCount > 1 && subtree.nodeCount < tree.nodeCount) between++;
    }),
    { numRuns: 150, seed: 5 },
  );
  assert(between > 75, `${between} subtrees strictly between the tree and its root`);
});
