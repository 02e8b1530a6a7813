// Categorical subset splits against brute force: for random small tables,
// the ordering shortcut (Fisher 1958; Breiman et al. 1984, Thm 4.5) and the
// exhaustive search must find the same best impurity decrease as trying
// every subset of levels, computed here by independent code.
import assert from "node:assert/strict";
import fc from "fast-check";
import { applyRow, binFeatures, growTree } from "../../../mod.ts";
import { classification, levels, regression } from "./_small.ts";

// Weighted impurity sums, written directly from the definitions.
function sse(ys: number[]): number {
  const mean = ys.reduce((a, b) => a + b, 0) / ys.length;
  return ys.reduce((a, y) => a + (y - mean) ** 2, 0);
}
function giniMass(ys: number[], classes: number): number {
  const counts = new Array(classes).fill(0);
  for (const y of ys) counts[y]++;
  return ys.length * (1 - counts.reduce((a, c) => a + (c / ys.length) ** 2, 0));
}

function bruteForce(codes: number[], ys: number[], impurity: (ys: number[]) => number): number {
  const present = [...new Set(codes)].sort((a, b) => a - b);
  const parent = impurity(ys);
  let best = -Infinity;
  for (let mask = 1; mask < 1 << (present.length - 1); mask++) {
    const left = new Set(present.filter((_, i) => (mask >>> i) & 1));
    const l = ys.filter((_, r) => left.has(codes[r]));
    const r = ys.filter((_, r) => !left.has(codes[r]));
    best = Math.max(best, parent - impurity(l) - impurity(r));
  }
  return best;
}

// The decrease of the tree's root split, from the node arrays.
function rootDecrease(tree: ReturnType<typeof growTree>): number {
  if (tree.left[0] === -1) return 0;
  const mass = (n: number) => tree.weight[n] * tree.impurity[n];
  return mass(0) - mass(tree.left[0]) - mass(tree.right[0]);
}

const table = (maxLevels: number, maxClass?: number) =>
  fc.integer({ min: 2, max: maxLevels }).chain((count) =>
    fc.record({
      count: fc.constant(count),
      rows: fc.array(
        fc.tuple(
          fc.integer({ min: 0, max: count - 1 }),
          maxClass === undefined
            ? fc.integer({ min: 0, max: 50 })
            : fc.integer({ min: 0, max: maxClass }),
        ),
        { minLength: 4, maxLength: 60 },
      ),
    })
  );

Deno.test("numeric target: ordering levels by mean finds the best subset", () => {
  fc.assert(
    fc.property(table(8), ({ count, rows }) => {
      const codes = rows.map((r) => r[0]);
      const ys = rows.map((r) => r[1]);
      if (new Set(codes).size < 2) return;
      const dataset = regression([levels("site", codes, count)], ys);
      const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1, maxDepth: 1 });
      const expected = bruteForce(codes, ys, sse);
      assert.ok(Math.abs(rootDecrease(tree) - expected) <= 1e-9 * Math.max(1, expected));
    }),
    { numRuns: 300, seed: 11 },
  );
});

Deno.test("two classes: ordering levels by class share finds the best subset", () => {
  fc.assert(
    fc.property(table(8, 1), ({ count, rows }) => {
      const codes = rows.map((r) => r[0]);
      const ys = rows.map((r) => r[1]);
      if (new Set(codes).size < 2 || new Set(ys).size < 2) return;
      const dataset = classification([levels("site", codes, count)], ys, 2);
      const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1, maxDepth: 1 });
      const expected = bruteForce(codes, ys, (y) => giniMass(y, 2));
      assert.ok(Math.abs(rootDecrease(tree) - expected) <= 1e-9 * Math.max(1, expected));
    }),
    { numRuns: 300, seed: 12 },
  );
});

Deno.test("three classes, up to 12 levels: the exhaustive search finds the best subset", () => {
  fc.assert(
    fc.property(table(12, 2), ({ count, rows }) => {
      const codes = rows.map((r) => r[0]);
      const ys = rows.map((r) => r[1]);
      if (new Set(codes).size < 2 || new Set(ys).size < 2) return;
      const dataset = classification([levels("site", codes, count)], ys, 3);
      const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1, maxDepth: 1 });
      const expected = bruteForce(codes, ys, (y) => giniMass(y, 3));
      assert.ok(Math.abs(rootDecrease(tree) - expected) <= 1e-9 * Math.max(1, expected));
    }),
    { numRuns: 200, seed: 13 },
  );
});

Deno.test("many levels: masks over several words route rows as the split said", () => {
  // 70 levels (three 32-bit mask words), numeric target; every leaf's value
  // must be the mean of the rows that land in it, computed independently.
  fc.assert(
    fc.property(
      fc.array(fc.tuple(fc.integer({ min: 0, max: 69 }), fc.integer({ min: 0, max: 1000 })), {
        minLength: 30,
        maxLength: 200,
      }),
      (rows) => {
        const codes = rows.map((r) => r[0]);
        const ys = rows.map((r) => r[1]);
        const dataset = regression([levels("site", codes, 70)], ys);
        const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 2 });
        const sums = new Map<number, [number, number]>();
        for (let r = 0; r < dataset.rows; r++) {
          const leaf = applyRow(tree, dataset.features, r);
          const [s, n] = sums.get(leaf) ?? [0, 0];
          sums.set(leaf, [s + ys[r], n + 1]);
        }
        for (const [leaf, [s, n]] of sums) {
          assert.ok(Math.abs(tree.value[leaf] - s / n) <= 1e-9 * Math.max(1, s / n));
          assert.equal(tree.rows[leaf], n);
        }
      },
    ),
    { numRuns: 100, seed: 14 },
  );
});
