// Trees constrained to increase along some features (GrowOptions.increasing):
// on random invented tables with missing values, sweeping a constrained
// feature's known values, the others held fixed, never lowers a tree's
// prediction, nor a pruned subtree's, nor an ensemble's; unconstrained
// features and trees are as before.
import assert from "node:assert/strict";
import fc from "fast-check";
import {
  applyValues,
  binFeatures,
  type Dataset,
  fitEnsemble,
  type FlatTree,
  growTree,
  pruningPath,
  shareableReference,
  subtreeAfter,
} from "../../../mod.ts";
import { levels, numeric, regression } from "./_small.ts";

const randomTable = fc.integer({ min: 12, max: 90 }).chain((rows) =>
  fc.record({
    years: fc.array(fc.oneof(fc.integer({ min: 0, max: 30 }), fc.constant(NaN)), {
      minLength: rows,
      maxLength: rows,
    }),
    grade: fc.array(fc.integer({ min: -1, max: 5 }), { minLength: rows, maxLength: rows }),
    site: fc.array(fc.integer({ min: 0, max: 3 }), { minLength: rows, maxLength: rows }),
    // Pay that mostly rises with years and grade, with noise that can make
    // an unconstrained tree's estimate fall.
    noise: fc.array(fc.integer({ min: -30000, max: 30000 }), { minLength: rows, maxLength: rows }),
    minLeaf: fc.integer({ min: 1, max: 5 }),
    profile: fc.tuple(
      fc.oneof(fc.integer({ min: 0, max: 5 }), fc.constant(NaN)),
      fc.integer({ min: 0, max: 3 }),
    ),
  })
);

type RandomTable = { years: number[]; grade: number[]; site: number[]; noise: number[] };

function toDataset(t: RandomTable): Dataset {
  const y = t.years.map((v, i) =>
    50000 + 800 * (Number.isNaN(v) ? 10 : v) + 4000 * Math.max(0, t.grade[i]) + t.noise[i]
  );
  return regression(
    [
      numeric("years", t.years),
      levels("grade", t.grade.map((c) => (c < 0 ? NaN : c)), 6, "ordinal"),
      levels("site", t.site, 4),
    ],
    y,
  );
}

// The predictions along feature f's values 0..top, the others at `rest`.
function sweep(tree: FlatTree, f: number, top: number, rest: number[]): number[] {
  return Array.from({ length: top + 1 }, (_, v) => {
    const profile = [...rest];
    profile[f] = v;
    return tree.value[applyValues(tree, profile)];
  });
}

function assertNeverFalls(values: number[], what: string): void {
  for (let i = 1; i < values.length; i++) {
    assert.ok(values[i] >= values[i - 1], `${what}: ${values[i - 1]} then ${values[i]}`);
  }
}

Deno.test("sweeping a constrained feature never lowers a tree's or a pruned subtree's estimate", () => {
  let fell = 0;
  fc.assert(
    fc.property(randomTable, (t) => {
      const dataset = toDataset(t);
      const bins = binFeatures(dataset);
      const tree = growTree({ dataset, bins }, { minLeaf: t.minLeaf, increasing: [0, 1] });
      const [grade, site] = t.profile;
      assertNeverFalls(sweep(tree, 0, 31, [NaN, grade, site]), "years");
      const years = Number.isNaN(grade) ? 12 : 3 * grade;
      assertNeverFalls(sweep(tree, 1, 5, [years, NaN, site]), "grade");
      // Every subtree of the pruning path keeps the order.
      const path = pruningPath(tree);
      for (let step = 0; step < path.alphas.length; step++) {
        const sub = subtreeAfter(tree, path, step);
        assertNeverFalls(sweep(sub, 0, 31, [NaN, grade, site]), `years, step ${step}`);
      }
      // The same table unconstrained: how often its estimate falls somewhere.
      const free = growTree({ dataset, bins }, { minLeaf: t.minLeaf });
      const along = sweep(free, 0, 31, [NaN, grade, site]);
      if (along.some((v, i) => i > 0 && v < along[i - 1])) fell++;
    }),
    { numRuns: 150, seed: 29 },
  );
  // The attack the constraint answers: unconstrained trees do fall.
  assert.ok(fell >= 30, `${fell} unconstrained trees fell`);
});

Deno.test("an ensemble of constrained trees never falls either, over bootstrap weights", () => {
  fc.assert(
    fc.property(randomTable, (t) => {
      const dataset = toDataset(t);
      const ensemble = fitEnsemble(dataset, {
        trees: 8,
        prune: "none",
        grow: { minLeaf: t.minLeaf, increasing: [0] },
        share: { money: dataset.target.values as Float64Array },
      });
      const [grade, site] = t.profile;
      // The grown trees and the shareable copies a model file keeps (same-pay
      // leaves merged).
      for (const trees of [ensemble.trees, ensemble.shared!]) {
        const mean = Array.from({ length: 32 }, (_, v) => {
          const profile = [v, grade, site];
          return trees.reduce((s, tree) => s + tree.value[applyValues(tree, profile)], 0);
        });
        assertNeverFalls(mean, "ensemble along years");
      }
    }),
    { numRuns: 60, seed: 31 },
  );
});

Deno.test("a value clipped to its bounds carries its error in the impurity", () => {
  // years 1: pay 10 (site 0) and 58 (site 1); years 2: 60 and 62. The root
  // splits on years (means 34 and 61): the midpoint 47.5 caps everything
  // below years 1, so its site-1 leaf (58) is held at 47.5, and its error
  // about that value, (58 - 47.5)^2, is its impurity.
  const dataset = regression([numeric("years", [1, 1, 2, 2]), levels("site", [0, 1, 0, 1], 2)], [
    10,
    58,
    60,
    62,
  ]);
  const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1, increasing: [0] });
  assert.equal(tree.feature[0], 0);
  const leaf = applyValues(tree, [1, 1]);
  assert.equal(tree.value[leaf], 47.5);
  assert.equal(tree.impurity[leaf], (58 - 47.5) ** 2);
  // Unconstrained, the same leaf keeps its mean and no error.
  const free = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
  const own = applyValues(free, [1, 1]);
  assert.equal(free.value[own], 58);
  assert.equal(free.impurity[own], 0);
  assertNeverFalls(sweep(tree, 0, 3, [NaN, 1]), "years at site 1");
});

Deno.test("constraints are refused where there is no order or no pay", () => {
  const dataset = toDataset({
    years: [1, 2, 3, 4],
    grade: [0, 1, 2, 3],
    site: [0, 1, 2, 3],
    noise: [0, 0, 0, 0],
  });
  const bins = binFeatures(dataset);
  assert.throws(() => growTree({ dataset, bins }, { increasing: [2] }), /"site" is categorical/);
  assert.throws(() => growTree({ dataset, bins }, { increasing: [7] }), /no feature 7/);
  const classes: Dataset = {
    ...dataset,
    target: {
      kind: "classification",
      name: "band",
      classes: ["a", "b"],
      values: Int32Array.of(0, 1, 0, 1),
    },
  };
  assert.throws(
    () => growTree({ dataset: classes, bins }, { increasing: [0] }),
    /regression tree, not a class tree/,
  );
});

Deno.test("a split whose lower side is paid more is not chosen, with or without missing values", () => {
  // Years 1 paid 90, years 2 paid 10, years 3 and 4 paid 50: unconstrained,
  // the best first split is at 1.5 (90 against the rest), which falls.
  for (const extra of [[], [NaN]]) {
    const years = [1, 2, 3, 4, ...extra];
    const dataset = regression([numeric("years", years)], [90, 10, 50, 50, ...extra.map(() => 50)]);
    const bins = binFeatures(dataset);
    const free = growTree({ dataset, bins }, { minLeaf: 1 });
    assert.equal(free.threshold[0], 1.5);
    const kept = growTree({ dataset, bins }, { minLeaf: 1, increasing: [0] });
    // The first split allowed keeps the lower side's mean at most the higher's.
    assert.notEqual(kept.threshold[0], 1.5, `with ${extra.length} missing`);
    assert.ok(kept.value[kept.left[0]] <= kept.value[kept.right[0]]);
  }
});

Deno.test("the reference tree as the model file keeps it, rounded on one grid, never falls either", () => {
  // Rounding each node on its own grid (4 x RMSE / its people) can put two
  // neighbours clipped to the same bound the wrong way round; one grid cannot.
  let crossed = 0;
  fc.assert(
    fc.property(randomTable, fc.double({ min: 0.02, max: 0.3, noNaN: true }), (t, rmse) => {
      const dataset = toDataset(t);
      // Log pay, as a model of money is fitted.
      const logged = {
        ...dataset,
        target: { ...dataset.target, values: dataset.target.values.map(Math.log) },
      } as Dataset;
      const tree = growTree({ dataset: logged, bins: binFeatures(logged) }, {
        minLeaf: t.minLeaf,
        increasing: [0, 1],
      });
      const [grade, site] = t.profile;
      const kept = shareableReference(tree, rmse, true);
      assertNeverFalls(sweep(kept, 0, 31, [NaN, grade, site]), "years, one grid");
      assertNeverFalls(sweep(kept, 1, 5, [12, NaN, site]), "grade, one grid");
      const ownGrids = shareableReference(tree, rmse);
      const along = [
        ...sweep(ownGrids, 0, 31, [NaN, grade, site]),
        ...sweep(ownGrids, 1, 5, [12, NaN, site]),
      ];
      if (along.some((v, i) => i > 0 && i !== 32 && v < along[i - 1])) crossed++;
    }),
    { numRuns: 200, seed: 43 },
  );
  // Each node on its own grid does cross in some of these tables.
  assert.ok(crossed > 0, `${crossed} tables crossed on their own grids`);
});
