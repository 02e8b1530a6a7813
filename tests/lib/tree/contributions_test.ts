// Each attribute's contribution to a tree's prediction (lib/tree/contributions.ts)
// against the definition it claims: the Shapley values of v(S), the tree's
// expected prediction when only the attributes in S are known and an
// unknown attribute splits the profile by the children's covers (Lundberg,
// Erion, Chen et al. 2020, Nature Machine Intelligence 2). The reference
// here enumerates every subset of attributes with the Shapley weights
// |S|! (M - |S| - 1)! / M! (Shapley 1953), written from the definition,
// not from the algorithm. Tables are small, invented and random.
import assert from "node:assert/strict";
import fc from "fast-check";
import {
  applyValues,
  binFeatures,
  type Dataset,
  type FlatTree,
  goesLeft,
  growTree,
} from "../../../mod.ts";
import { addContributions, ContributionSpace, coverMean } from "../../../lib/tree/contributions.ts";
import { shareTree } from "../../../lib/tree/share_tree.ts";
import { levels, numeric, regression } from "./_small.ts";

// v(S): the leaves' values weighted by cover shares where the split's
// attribute is unknown, following the profile where it is known.
function valueKnowing(tree: FlatTree, profile: ArrayLike<number>, known: Set<number>): number {
  const below = (node: number): number => {
    const left = tree.left[node];
    if (left === -1) return tree.value[node];
    const right = tree.right[node];
    const f = tree.feature[node];
    if (known.has(f)) return below(goesLeft(tree, node, profile[f]) ? left : right);
    const cover = tree.rows[node];
    return (tree.rows[left] / cover) * below(left) + (tree.rows[right] / cover) * below(right);
  };
  return below(0);
}

function factorial(n: number): number {
  return n <= 1 ? 1 : n * factorial(n - 1);
}

// Shapley values of v by enumerating every subset of the other attributes.
function shapleyByEnumeration(tree: FlatTree, profile: ArrayLike<number>, m: number): number[] {
  const phi = new Array<number>(m).fill(0);
  for (let i = 0; i < m; i++) {
    for (let mask = 0; mask < 1 << m; mask++) {
      if ((mask >> i) & 1) continue;
      const set = new Set<number>();
      for (let j = 0; j < m; j++) if ((mask >> j) & 1) set.add(j);
      const weight = (factorial(set.size) * factorial(m - set.size - 1)) / factorial(m);
      const withI = new Set(set).add(i);
      phi[i] += weight * (valueKnowing(tree, profile, withI) - valueKnowing(tree, profile, set));
    }
  }
  return phi;
}

function contributionsOf(tree: FlatTree, profile: ArrayLike<number>, m: number): Float64Array {
  const out = new Float64Array(m);
  addContributions(tree, profile, out, 1, new ContributionSpace(1, 1));
  return out;
}

const randomTable = fc.integer({ min: 8, max: 60 }).chain((rows) =>
  fc.record({
    x: fc.array(fc.oneof(fc.integer({ min: 0, max: 9 }), fc.constant(NaN)), {
      minLength: rows,
      maxLength: rows,
    }),
    w: fc.array(fc.integer({ min: 0, max: 20 }), { minLength: rows, maxLength: rows }),
    grade: fc.array(fc.integer({ min: -1, max: 4 }), { minLength: rows, maxLength: rows }),
    site: fc.array(fc.integer({ min: -1, max: 5 }), { minLength: rows, maxLength: rows }),
    y: fc.array(fc.integer({ min: 20000, max: 200000 }), { minLength: rows, maxLength: rows }),
    draws: fc.array(fc.integer({ min: 0, max: 3 }), { minLength: rows, maxLength: rows }),
    minLeaf: fc.integer({ min: 1, max: 4 }),
    profile: fc.tuple(
      fc.oneof(fc.integer({ min: -1, max: 10 }), fc.constant(NaN)),
      fc.integer({ min: -2, max: 22 }),
      fc.oneof(fc.integer({ min: 0, max: 4 }), fc.constant(NaN)),
      // Level 6 of site: a level no row has, which follows the missing side.
      fc.oneof(fc.integer({ min: 0, max: 6 }), fc.constant(NaN)),
    ),
  })
);

type RandomTable = {
  x: number[];
  w: number[];
  grade: number[];
  site: number[];
  y: number[];
};

function toDataset(t: RandomTable): Dataset {
  const code = (c: number) => (c < 0 ? NaN : c);
  return regression(
    [
      numeric("x", t.x),
      numeric("w", t.w),
      levels("grade", t.grade.map(code), 5, "ordinal"),
      levels("site", t.site.map(code), 7),
    ],
    t.y,
  );
}

Deno.test("contributions equal the Shapley values found by enumerating every subset", () => {
  let checked = 0;
  fc.assert(
    fc.property(randomTable, (t) => {
      const dataset = toDataset(t);
      const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: t.minLeaf });
      const got = contributionsOf(tree, t.profile, 4);
      const want = shapleyByEnumeration(tree, t.profile, 4);
      for (let j = 0; j < 4; j++) assert.ok(Math.abs(got[j] - want[j]) <= 1e-9 * 200000);
      if (tree.nodeCount >= 5) checked++;
    }),
    { numRuns: 120, seed: 17 },
  );
  // Most tables grow trees with several splits, often on one attribute twice.
  assert.ok(checked >= 60, `${checked} trees with 2 or more splits`);
});

Deno.test("a bagged tree's shared copy (covers of every row) against enumeration", () => {
  fc.assert(
    fc.property(randomTable, (t) => {
      const dataset = toDataset(t);
      const weights = Float64Array.from(t.draws);
      if (!weights.some((v) => v > 0)) return;
      const grown = growTree({ dataset, bins: binFeatures(dataset), weights }, {
        minLeaf: t.minLeaf,
      });
      const tree = shareTree(grown, dataset.features, dataset.rows);
      const got = contributionsOf(tree, t.profile, 4);
      const want = shapleyByEnumeration(tree, t.profile, 4);
      for (let j = 0; j < 4; j++) assert.ok(Math.abs(got[j] - want[j]) <= 1e-9 * 200000);
    }),
    { numRuns: 80, seed: 5 },
  );
});

Deno.test("contributions add up to the prediction minus the cover mean", () => {
  fc.assert(
    fc.property(randomTable, (t) => {
      const dataset = toDataset(t);
      const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: t.minLeaf });
      const parts = contributionsOf(tree, t.profile, 4);
      const prediction = tree.value[applyValues(tree, t.profile)];
      const sum = parts.reduce((a, b) => a + b, 0);
      assert.ok(Math.abs(coverMean(tree) + sum - prediction) <= 1e-9 * 200000);
      // The cover mean is the mean prediction over the training rows (every
      // row counted once: weights 1).
      let mean = 0;
      for (let r = 0; r < dataset.rows; r++) {
        mean += tree.value[applyValues(tree, dataset.features.map((f) => f.values[r]))];
      }
      assert.ok(Math.abs(coverMean(tree) - mean / dataset.rows) <= 1e-9 * 200000);
    }),
    { numRuns: 100, seed: 9 },
  );
});

Deno.test("an attribute no split tests contributes exactly 0 (dummy)", () => {
  fc.assert(
    fc.property(randomTable, (t) => {
      const dataset = toDataset(t);
      const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: t.minLeaf });
      const parts = contributionsOf(tree, t.profile, 4);
      const used = new Set(tree.feature.filter((f) => f >= 0));
      for (let j = 0; j < 4; j++) if (!used.has(j)) assert.equal(parts[j], 0);
    }),
    { numRuns: 100, seed: 3 },
  );
});

// A hand-made tree: the root splits on attribute 0 at 5, both children on
// attribute 1 at 5; leaves a (both low), b (one high), b, c (both high).
// (With attributes that are not independent the path-dependent values need
// not be symmetric: covers along the path stand in for the conditional
// distribution only approximately.)
function symmetricTree(a: number, b: number, c: number, low: number, high: number): FlatTree {
  const n = 7;
  // Rows per node: the two attributes independent with the same shares of
  // low and high (low x low rows at (low, low), and so on), so that they are
  // exchangeable.
  const all = low + high;
  const covers = [all * all, low * all, high * all, low * low, low * high, high * low, high * high];
  return {
    task: "regression",
    width: 1,
    nodeCount: n,
    feature: Int32Array.of(0, 1, 1, -1, -1, -1, -1),
    threshold: Float64Array.of(5, 5, 5, NaN, NaN, NaN, NaN),
    maskOffset: new Int32Array(n).fill(-1),
    masks: new Uint32Array(0),
    maskWords: Int32Array.of(0, 0, 0),
    left: Int32Array.of(1, 3, 5, -1, -1, -1, -1),
    right: Int32Array.of(2, 4, 6, -1, -1, -1, -1),
    missingLeft: new Uint8Array(n),
    value: Float64Array.of(0, 0, 0, a, b, b, c),
    rows: Int32Array.from(covers),
    weight: Float64Array.from(covers),
    impurity: new Float64Array(n),
  };
}

Deno.test("two exchangeable attributes get equal contributions (symmetry)", () => {
  fc.assert(
    fc.property(
      fc.double({ min: -1e5, max: 1e5, noNaN: true }),
      fc.double({ min: -1e5, max: 1e5, noNaN: true }),
      fc.double({ min: -1e5, max: 1e5, noNaN: true }),
      fc.integer({ min: 1, max: 50 }),
      fc.integer({ min: 1, max: 50 }),
      fc.constantFrom(1, 9),
      (a, b, c, low, high, value) => {
        const tree = symmetricTree(a, b, c, low, high);
        // Both attributes at the same value: the set function is symmetric.
        const parts = contributionsOf(tree, Float64Array.of(value, value, 0), 3);
        assert.ok(
          Math.abs(parts[0] - parts[1]) <= 1e-9 * (1 + Math.abs(a) + Math.abs(b) + Math.abs(c)),
        );
        assert.equal(parts[2], 0);
      },
    ),
    { numRuns: 200, seed: 11 },
  );
});

Deno.test("pay linear in independent attributes: each part is beta times its distance from the mean", () => {
  // Every combination of x0 in 0..3, x1 in 0..4, x2 in 0..2 once (independent,
  // uniform); pay = 1000 + 300 x0 - 120 x1 + 45 x2, grown to one row per leaf.
  const beta = [300, -120, 45];
  const grid: number[][] = [];
  for (let a = 0; a < 4; a++) {
    for (let b = 0; b < 5; b++) for (let c = 0; c < 3; c++) grid.push([a, b, c]);
  }
  const dataset = regression(
    [0, 1, 2].map((j) => numeric(`x${j}`, grid.map((g) => g[j]))),
    grid.map((g) => 1000 + beta[0] * g[0] + beta[1] * g[1] + beta[2] * g[2]),
  );
  const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
  const means = [1.5, 2, 1];
  for (const profile of grid) {
    const parts = contributionsOf(tree, profile, 3);
    for (let j = 0; j < 3; j++) {
      assert.ok(
        Math.abs(parts[j] - beta[j] * (profile[j] - means[j])) <= 1e-9,
        `${profile}: part ${j} ${parts[j]}`,
      );
    }
  }
});

Deno.test("paths testing up to nine attributes, against enumeration", () => {
  // Nine attributes that all matter a little, grown to small leaves, so that
  // paths test many of them (the polynomials' division is exercised at size).
  const nine = fc.integer({ min: 40, max: 90 }).chain((rows) =>
    fc.record({
      columns: fc.array(
        fc.array(fc.integer({ min: 0, max: 5 }), { minLength: rows, maxLength: rows }),
        { minLength: 9, maxLength: 9 },
      ),
      profile: fc.array(fc.integer({ min: 0, max: 5 }), { minLength: 9, maxLength: 9 }),
    })
  );
  let wide = 0;
  fc.assert(
    fc.property(nine, ({ columns, profile }) => {
      const y = columns[0].map((_, r) =>
        columns.reduce((sum, c, j) => sum + (j + 1) * 1000 * c[r], 30000)
      );
      const dataset = regression(columns.map((c, j) => numeric(`a${j}`, c)), y);
      const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
      const got = contributionsOf(tree, profile, 9);
      const want = shapleyByEnumeration(tree, profile, 9);
      for (let j = 0; j < 9; j++) assert.ok(Math.abs(got[j] - want[j]) <= 1e-9 * 200000);
      if (widestPath(tree) >= 6) wide++;
    }),
    { numRuns: 25, seed: 23 },
  );
  assert.ok(wide >= 10, `${wide} trees have a path testing 6 or more attributes`);
});

// The most distinct attributes any path from the root to a leaf tests.
function widestPath(tree: FlatTree, node = 0, seen: number[] = []): number {
  if (tree.left[node] === -1) return new Set(seen).size;
  const next = [...seen, tree.feature[node]];
  return Math.max(
    widestPath(tree, tree.left[node], next),
    widestPath(tree, tree.right[node], next),
  );
}
