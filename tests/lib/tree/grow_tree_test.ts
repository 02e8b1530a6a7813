import assert from "node:assert/strict";
import fc from "fast-check";
import { makeRng, shuffle } from "../../../lib/random.ts";
import { binFeatures } from "../../../lib/tree/bins.ts";
import { applyRow, leafCount, predictRows, treeDepth } from "../../../lib/tree/flat_tree.ts";
import { canonicalRowOrder, growTree, growTreeLeaves } from "../../../lib/tree/grow_tree.ts";
import { classification, levels, numeric, regression } from "./_small.ts";
import { tables } from "./_random_tables.ts";

const grow = (d: ReturnType<typeof regression>, options = {}, weights?: Float64Array) =>
  growTree({ dataset: d, bins: binFeatures(d), weights }, options);

Deno.test("one split by hand: threshold at the midpoint, means and variances", () => {
  const d = regression([numeric("years", [1, 2, 3, 8, 9, 10])], [50, 52, 54, 80, 82, 84]);
  const t = grow(d, { minLeaf: 1, maxDepth: 1 });
  assert.equal(t.nodeCount, 3);
  assert.equal(t.feature[0], 0);
  assert.equal(t.threshold[0], 5.5); // (3 + 8) / 2, as scikit-learn places it
  assert.equal(t.value[0], 67);
  // Root: deviations 17, 15, 13 on each side: (289 + 225 + 169) x 2 / 6.
  assert.ok(Math.abs(t.impurity[0] - 1366 / 6) < 1e-12);
  const [l, r] = [t.left[0], t.right[0]];
  assert.deepEqual([t.value[l], t.value[r]], [52, 82]);
  assert.ok(Math.abs(t.impurity[l] - 8 / 3) < 1e-12);
  assert.deepEqual([t.rows[0], t.rows[l], t.rows[r]], [6, 3, 3]);
  assert.deepEqual([t.weight[0], t.weight[l], t.weight[r]], [6, 3, 3]);
});

Deno.test("a class tree holds class shares and Gini impurity", () => {
  const d = classification([numeric("x", [1, 2, 3, 4, 5, 6])], [0, 0, 1, 1, 1, 2], 3);
  const t = growTree({ dataset: d, bins: binFeatures(d) }, { maxDepth: 0 });
  assert.equal(t.task, "classification");
  assert.equal(t.width, 3);
  assert.deepEqual(Array.from(t.value.subarray(0, 3)), [2 / 6, 3 / 6, 1 / 6]);
  // Gini: 1 - (2^2 + 3^2 + 1^2) / 6^2.
  assert.ok(Math.abs(t.impurity[0] - (1 - 14 / 36)) < 1e-12);
  // Grown out with leaves of one row: every leaf is pure.
  const full = growTree({ dataset: d, bins: binFeatures(d) }, { minLeaf: 1 });
  for (let k = 0; k < full.nodeCount; k++) {
    if (full.left[k] === -1) assert.equal(full.impurity[k], 0);
  }
});

Deno.test("stopping rules: minimum leaf, depth, and impurity decrease", () => {
  const x = Array.from({ length: 40 }, (_, i) => i);
  const y = x.map((v) => v * v);
  const d = regression([numeric("x", x)], y);
  const t = grow(d, { minLeaf: 7 });
  for (let k = 0; k < t.nodeCount; k++) if (t.left[k] === -1) assert.ok(t.rows[k] >= 7);
  assert.ok(leafCount(t) <= Math.floor(40 / 7));
  assert.equal(treeDepth(grow(d, { minLeaf: 1, maxDepth: 2 })), 2);
  assert.equal(leafCount(grow(d, { minLeaf: 1, maxDepth: 2 })), 4);
  assert.equal(grow(d, { minImpurityDecrease: 1e12 }).nodeCount, 1);
  // minSplit: a node of 40 rows with minSplit 41 is not split.
  assert.equal(grow(d, { minLeaf: 1, minSplit: 41 }).nodeCount, 1);
});

Deno.test("weights count rows; a row of weight 0 is left out", () => {
  const d = regression([numeric("x", [1, 2, 3, 4])], [10, 20, 30, 1000]);
  const t = grow(d, { maxDepth: 0 }, Float64Array.of(1, 2, 1, 0));
  // (10 + 2 x 20 + 30) / 4
  assert.equal(t.value[0], 20);
  assert.equal(t.weight[0], 4);
  assert.equal(t.rows[0], 3);
});

Deno.test("the best of several features is taken; ties go to the lowest feature index", () => {
  const noise = [3, 1, 4, 1, 5, 9, 2, 6];
  const signal = [1, 2, 3, 4, 5, 6, 7, 8];
  const y = [10, 10, 10, 10, 90, 90, 90, 90];
  const t = grow(regression([numeric("noise", noise), numeric("signal", signal)], y), {
    minLeaf: 1,
  });
  assert.equal(t.feature[0], 1);
  assert.equal(t.threshold[0], 4.5);
  const twins = grow(regression([numeric("a", signal), numeric("b", signal)], y), { minLeaf: 1 });
  assert.equal(twins.feature[0], 0);
});

Deno.test("a categorical split groups levels by their means", () => {
  // Site means: s0 10, s1 50, s2 12: the split puts s1 alone.
  const site = [0, 0, 1, 1, 2, 2];
  const d = regression([levels("site", site, 3)], [9, 11, 49, 51, 11, 13]);
  const t = grow(d, { minLeaf: 1, maxDepth: 1 });
  const p = predictRows(t, d.features, 6);
  assert.deepEqual(Array.from(p), [11, 11, 50, 50, 11, 11]);
});

Deno.test("missing values go to the side that fits them better", () => {
  // Rows with x missing are paid like the high group.
  const x = [1, 2, 3, 8, 9, 10, NaN, NaN];
  const y = [50, 52, 54, 80, 82, 84, 81, 83];
  const d = regression([numeric("x", x)], y);
  const t = grow(d, { minLeaf: 1, maxDepth: 1 });
  assert.equal(t.threshold[0], 5.5);
  const leafOfMissing = applyRow(t, d.features, 6);
  assert.equal(leafOfMissing, applyRow(t, d.features, 3));
  assert.equal(t.missingLeft[0], 0);
  // The high leaf's mean includes them: (80 + 82 + 84 + 81 + 83) / 5.
  assert.equal(t.value[leafOfMissing], 82);
});

Deno.test("a constant target, one row, and no feature give the root alone", () => {
  assert.equal(
    grow(regression([numeric("x", [1, 2, 3, 4])], [5, 5, 5, 5]), { minLeaf: 1 }).nodeCount,
    1,
  );
  const one = grow(regression([numeric("x", [1])], [7]), { minLeaf: 1 });
  assert.equal(one.nodeCount, 1);
  assert.equal(one.value[0], 7);
  const none = grow(regression([], [1, 2, 3]), { minLeaf: 1 });
  assert.equal(none.nodeCount, 1);
  assert.equal(none.value[0], 2);
});

Deno.test("the tree does not depend on the order of the rows", () => {
  const n = 80;
  const x = Array.from({ length: n }, (_, i) => (i * 13) % 17);
  const s = Array.from({ length: n }, (_, i) => (i % 4 === 0 ? NaN : i % 3));
  const y = x.map((v, i) => 0.1 + v * 1.1 + (s[i] === 1 ? 3.3 : 0) + ((i * 7) % 5) * 0.3);
  const d = regression([numeric("x", x), levels("s", s, 3)], y);
  const t = grow(d, { minLeaf: 3 });
  const perm = shuffle([...Array(n).keys()], makeRng(4));
  const shuffled = regression(
    [numeric("x", perm.map((r) => x[r])), levels("s", perm.map((r) => s[r]), 3)],
    perm.map((r) => y[r]),
  );
  const u = grow(shuffled, { minLeaf: 3 });
  assert.deepEqual(u.value, t.value);
  assert.deepEqual(u.threshold, t.threshold);
  assert.deepEqual(u.feature, t.feature);
  assert.deepEqual(u.impurity, t.impurity);
});

Deno.test("canonicalRowOrder: by target, then by features (missing last), then position", () => {
  const d = regression([numeric("x", [3, NaN, 1, 3, 2])], [5, 1, 5, 5, 5]);
  // Row 1 has the lowest target; among target 5: x 1 (row 2), 2 (row 4), 3 (rows 0 and 3).
  assert.deepEqual(Array.from(canonicalRowOrder(d)), [1, 2, 4, 0, 3]);
  const missingLast = regression([numeric("x", [NaN, 2, 1])], [1, 1, 1]);
  assert.deepEqual(Array.from(canonicalRowOrder(missingLast)), [2, 1, 0]);
  assert.deepEqual(Array.from(canonicalRowOrder(regression([], []))), []);
});

Deno.test("growTreeLeaves: each drawn row's leaf is where a walk of its values ends", () => {
  let drawn = 0;
  let multiWord = 0;
  fc.assert(
    fc.property(tables, fc.boolean(), ({ dataset, weights, minLeaf, maxDepth }, bounded) => {
      const bins = binFeatures(dataset);
      // A bound along the first numeric feature moves values, never rows.
      const increasing = bounded && dataset.target.kind === "regression" ? [0] : [];
      const options = { minLeaf, maxDepth, increasing };
      const { tree, leafOf } = growTreeLeaves({ dataset, bins, weights }, options);
      assert.deepEqual(tree, growTree({ dataset, bins, weights }, options));
      for (let r = 0; r < dataset.rows; r++) {
        if (weights[r] === 0) assert.equal(leafOf[r], -1);
        else {
          assert.equal(leafOf[r], applyRow(tree, dataset.features, r), `row ${r}`);
          drawn++;
        }
      }
      if (tree.maskWords.some((w) => w > 1) && tree.maskOffset.some((o) => o >= 0)) multiWord++;
    }),
    { numRuns: 200, seed: 21 },
  );
  assert(drawn > 20000, `${drawn} rows checked`);
  // Categorical splits of more than 32 levels were among them.
  assert(multiWord > 20, `${multiWord} trees split a feature of many levels`);
});
