// Properties every fitted tree must have, on random invented tables with
// numeric, ordinal and categorical features and missing values.
import assert from "node:assert/strict";
import fc from "fast-check";
import {
  applyRow,
  binFeatures,
  type Dataset,
  type FlatTree,
  growTree,
  pruningPath,
  subtreeAfter,
} from "../../../mod.ts";
import { levels, numeric, regression } from "./_small.ts";

const randomTable = fc.integer({ min: 6, max: 80 }).chain((rows) =>
  fc.record({
    x: fc.array(fc.oneof(fc.double({ min: -100, max: 100, noNaN: true }), fc.constant(NaN)), {
      minLength: rows,
      maxLength: rows,
    }),
    grade: fc.array(fc.integer({ min: -1, max: 4 }), { minLength: rows, maxLength: rows }),
    site: fc.array(fc.integer({ min: -1, max: 5 }), { minLength: rows, maxLength: rows }),
    y: fc.array(fc.double({ min: 1000, max: 200000, noNaN: true }), {
      minLength: rows,
      maxLength: rows,
    }),
    minLeaf: fc.integer({ min: 1, max: 6 }),
  })
);

function toDataset(t: { x: number[]; grade: number[]; site: number[]; y: number[] }): Dataset {
  const code = (c: number) => (c < 0 ? NaN : c);
  return regression(
    [
      numeric("x", t.x),
      levels("grade", t.grade.map(code), 5, "ordinal"),
      levels("site", t.site.map(code), 6),
    ],
    t.y,
  );
}

function leavesOf(tree: FlatTree, dataset: Dataset): Int32Array {
  return Int32Array.from({ length: dataset.rows }, (_, r) => applyRow(tree, dataset.features, r));
}

Deno.test("predictions lie within the range of the training targets", () => {
  fc.assert(
    fc.property(randomTable, (t) => {
      const dataset = toDataset(t);
      const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: t.minLeaf });
      const lo = Math.min(...t.y);
      const hi = Math.max(...t.y);
      for (let n = 0; n < tree.nodeCount; n++) {
        assert.ok(tree.value[n] >= lo - 1e-9 * hi && tree.value[n] <= hi * (1 + 1e-12));
      }
    }),
    { numRuns: 150, seed: 21 },
  );
});

Deno.test("every leaf holds at least the minimum number of distinct rows", () => {
  fc.assert(
    fc.property(randomTable, fc.array(fc.integer({ min: 0, max: 3 })), (t, counts) => {
      const dataset = toDataset(t);
      // Bootstrap-like integer weights: duplicates must not make small leaves.
      const weights = Float64Array.from({ length: dataset.rows }, (_, i) => counts[i] ?? 1);
      if (weights.every((w) => w === 0)) weights[0] = 1;
      const tree = growTree({ dataset, bins: binFeatures(dataset), weights }, {
        minLeaf: t.minLeaf,
      });
      const distinct = new Map<number, number>();
      for (let r = 0; r < dataset.rows; r++) {
        if (weights[r] === 0) continue;
        const leaf = applyRow(tree, dataset.features, r);
        distinct.set(leaf, (distinct.get(leaf) ?? 0) + 1);
      }
      const nonzero = weights.filter((w) => w > 0).length;
      for (let n = 0; n < tree.nodeCount; n++) {
        if (tree.left[n] !== -1) continue;
        assert.equal(distinct.get(n) ?? 0, tree.rows[n]);
        if (nonzero >= t.minLeaf) {
          assert.ok(tree.rows[n] >= t.minLeaf, `leaf ${n}: ${tree.rows[n]} rows`);
        }
      }
    }),
    { numRuns: 150, seed: 22 },
  );
});

Deno.test("along the pruning path leaves never grow and each tree is a subtree of the last", () => {
  fc.assert(
    fc.property(randomTable, (t) => {
      const dataset = toDataset(t);
      const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: t.minLeaf });
      const path = pruningPath(tree);
      let previous = leavesOf(tree, dataset);
      for (let s = 1; s < path.alphas.length; s++) {
        assert.ok(path.leaves[s] < path.leaves[s - 1]);
        assert.ok(path.alphas[s] >= path.alphas[s - 1] - 1e-12 * path.risks[0] - 1e-12);
        const current = leavesOf(subtreeAfter(tree, path, s), dataset);
        // Rows sharing a leaf before pruning share one after: a coarsening.
        const image = new Map<number, number>();
        for (let r = 0; r < dataset.rows; r++) {
          const seen = image.get(previous[r]);
          if (seen === undefined) image.set(previous[r], current[r]);
          else assert.equal(seen, current[r]);
        }
        previous = current;
      }
      assert.equal(path.leaves[path.leaves.length - 1], 1);
    }),
    { numRuns: 150, seed: 23 },
  );
});

Deno.test("a table with one distinct target value gives one leaf", () => {
  fc.assert(
    fc.property(randomTable, fc.double({ min: 1, max: 1e6, noNaN: true }), (t, pay) => {
      const dataset = toDataset({ ...t, y: t.y.map(() => pay) });
      const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
      assert.equal(tree.nodeCount, 1);
      assert.ok(Math.abs(tree.value[0] - pay) <= 1e-12 * pay); // a sum of equal values rounds
    }),
    { numRuns: 50, seed: 24 },
  );
});

Deno.test("shuffling the rows does not change the fitted tree", () => {
  fc.assert(
    fc.property(randomTable, fc.integer(), (t, seed) => {
      const dataset = toDataset(t);
      const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: t.minLeaf });
      const order = Array.from({ length: dataset.rows }, (_, i) => i);
      let state = seed >>> 0;
      for (let i = order.length - 1; i > 0; i--) {
        state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
        const j = state % (i + 1);
        [order[i], order[j]] = [order[j], order[i]];
      }
      const pick = <T>(a: T[]) => order.map((i) => a[i]);
      const shuffled = toDataset({
        x: pick(t.x),
        grade: pick(t.grade),
        site: pick(t.site),
        y: pick(t.y),
      });
      const other = growTree({ dataset: shuffled, bins: binFeatures(shuffled) }, {
        minLeaf: t.minLeaf,
      });
      assert.equal(other.nodeCount, tree.nodeCount);
      for (let n = 0; n < tree.nodeCount; n++) {
        assert.equal(other.feature[n], tree.feature[n]);
        assert.equal(other.left[n], tree.left[n]);
        assert.equal(other.missingLeft[n], tree.missingLeft[n]);
        assert.ok(
          Object.is(other.threshold[n], tree.threshold[n]) ||
            other.threshold[n] === tree.threshold[n],
        );
        assert.ok(Math.abs(other.value[n] - tree.value[n]) <= 1e-9 * Math.abs(tree.value[n]));
      }
    }),
    { numRuns: 150, seed: 25 },
  );
});
