// A tree with one attribute held at a value (lib/tree/fix_attribute.ts):
// for every profile, the copy predicts what the tree predicts with that
// attribute set to the value; no split on it is left; children still follow
// their parent; and, with covers counted again, the attribute takes no part
// in the contributions (the dummy property of Shapley values).
import assert from "node:assert/strict";
import fc from "fast-check";
import { applyValues, binFeatures, fixAttribute, growTree, shareTree } from "../../../mod.ts";
import { addContributions, ContributionSpace } from "../../../lib/tree/contributions.ts";
import { levels, numeric, regression } from "./_small.ts";

// Random small tables: a numeric attribute, a categorical one with missing
// values, and a three-level group; pay depends on all three.
const tables = fc.integer({ min: 12, max: 60 }).chain((n) =>
  fc.record({
    x: fc.array(fc.integer({ min: 0, max: 9 }), { minLength: n, maxLength: n }),
    site: fc.array(fc.oneof(fc.integer({ min: 0, max: 3 }), fc.constant(NaN)), {
      minLength: n,
      maxLength: n,
    }),
    group: fc.array(fc.integer({ min: 0, max: 2 }), { minLength: n, maxLength: n }),
    noise: fc.array(fc.integer({ min: -3, max: 3 }), { minLength: n, maxLength: n }),
    held: fc.integer({ min: 0, max: 2 }),
    minLeaf: fc.integer({ min: 1, max: 3 }),
  })
);

Deno.test("a tree held at a group predicts as the tree does with that group, for every profile", () => {
  fc.assert(
    fc.property(tables, ({ x, site, group, noise, held, minLeaf }) => {
      const pay = x.map((v, i) => 50 + 3 * v + (site[i] === 1 ? 5 : 0) - 4 * group[i] + noise[i]);
      const dataset = regression(
        [numeric("x", x), levels("site", site, 4), levels("group", group, 3)],
        pay,
      );
      const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf });
      const fixed = fixAttribute(tree, 2, held);
      assert(!fixed.feature.includes(2), "a split on the held attribute is left");
      for (let node = 0; node < fixed.nodeCount; node++) {
        if (fixed.left[node] === -1) continue;
        assert(fixed.left[node] > node && fixed.right[node] > node, "a child before its parent");
      }
      for (let r = 0; r < dataset.rows; r++) {
        for (const g of [0, 1, 2, NaN]) {
          const profile = [x[r], site[r], g];
          const asHeld = [x[r], site[r], held];
          assert.equal(
            fixed.value[applyValues(fixed, profile)],
            tree.value[applyValues(tree, asHeld)],
          );
        }
      }
      // Covers counted again: the held attribute takes no part.
      const shared = shareTree(fixed, dataset.features, dataset.rows);
      const parts = new Float64Array(3);
      addContributions(shared, [x[0], site[0], group[0]], parts, 1, new ContributionSpace());
      assert.equal(parts[2], 0);
    }),
    { numRuns: 150, seed: 17 },
  );
});

Deno.test("holding an attribute the tree never splits on gives the same tree", () => {
  const dataset = regression(
    [numeric("x", [1, 2, 3, 4, 5, 6]), levels("group", [0, 0, 0, 0, 0, 0], 2)],
    [10, 11, 12, 30, 31, 32],
  );
  const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
  assert.deepEqual(fixAttribute(tree, 1, 1), tree);
});
