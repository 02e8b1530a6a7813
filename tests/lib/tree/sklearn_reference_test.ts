// The tree learner against scikit-learn 1.2.1 (Debian python3-sklearn):
// DecisionTreeRegressor / DecisionTreeClassifier predictions and leaf counts,
// and cost_complexity_pruning_path, on diabetes and iris (bundled with
// scikit-learn) and CPS1988 (R package AER). Fixtures written by
// tests/reference/sklearn_trees.py; see fixtures/reference/README.md.
import assert from "node:assert/strict";
import {
  applyRow,
  binFeatures,
  type FlatTree,
  growTree,
  leafCount,
  PRUNE_TOLERANCE,
  pruneTree,
  pruningPath,
  sameAlpha,
} from "../../../mod.ts";
import {
  readReference,
  type ReferenceCase,
  referenceDataset,
  type ReferenceFile,
} from "./_reference.ts";

const RELATIVE = 1e-9;

function close(a: number, b: number, scale = 0): boolean {
  return Math.abs(a - b) <= RELATIVE * Math.max(Math.abs(a), Math.abs(b)) + scale;
}

function grow(file: ReferenceFile, c: ReferenceCase): FlatTree {
  const dataset = referenceDataset(file);
  return growTree(
    {
      dataset,
      bins: binFeatures(dataset),
      weights: c.sample_weight ? Float64Array.from(c.sample_weight) : undefined,
    },
    {
      minLeaf: c.min_samples_leaf,
      minSplit: c.min_samples_split,
      maxDepth: c.max_depth ?? Infinity,
    },
  );
}

// Equal alphas are one alpha: the reference prunes one node per step and can
// repeat an alpha, and splits that only rounding made have alphas of about
// 1e-17. "Equal" is to 1e-9 relative (the precision the alphas are compared
// to) plus 1e-12 of the root's risk: on CPS1988 the two
// implementations' rounding alone moves alphas by up to 5e-11, so a 1e-12
// merge splits or joins runs differently on each side. Of a run, the last
// step is kept.
function distinct(alphas: ArrayLike<number>, risks: ArrayLike<number>) {
  const rootRisk = risks[risks.length - 1];
  const out: { alpha: number; risk: number }[] = [];
  for (let i = 0; i < alphas.length; i++) {
    const next = alphas[i + 1];
    if (next !== undefined && sameAlpha(next, alphas[i], rootRisk, PRUNE_TOLERANCE)) continue;
    out.push({ alpha: alphas[i], risk: risks[i] });
  }
  return out;
}

/**
 * Matches our distinct path alphas with the reference's. Returns how many
 * are unmatched, the largest unmatched alpha (the tie region; -Infinity when
 * all match) and how many matched alphas lie above it, each with equal risk.
 */
function comparePaths(file: ReferenceFile, c: ReferenceCase) {
  const tree = grow(file, c);
  const ours = pruningPath(tree);
  const rootRisk = c.path.impurities[c.path.impurities.length - 1];
  const theirs = distinct(c.path.ccp_alphas, c.path.impurities);
  const mine = distinct(ours.alphas, ours.risks);
  const pairs: [number, number][] = [];
  let tieRegion = -Infinity;
  let i = 0;
  let j = 0;
  let unmatched = 0;
  while (i < mine.length || j < theirs.length) {
    if (
      i < mine.length && j < theirs.length &&
      sameAlpha(mine[i].alpha, theirs[j].alpha, rootRisk, PRUNE_TOLERANCE)
    ) {
      pairs.push([i++, j++]);
    } else if (j >= theirs.length || (i < mine.length && mine[i].alpha < theirs[j].alpha)) {
      tieRegion = Math.max(tieRegion, mine[i++].alpha);
      unmatched++;
    } else {
      tieRegion = Math.max(tieRegion, theirs[j++].alpha);
      unmatched++;
    }
  }
  let matchedAbove = 0;
  for (const [a, b] of pairs) {
    if (theirs[b].alpha <= tieRegion) continue;
    assert.ok(
      close(mine[a].risk, theirs[b].risk, 1e-12 * rootRisk),
      `risk at alpha ${theirs[b].alpha}: ${mine[a].risk} vs ${theirs[b].risk}`,
    );
    matchedAbove++;
  }
  return { unmatched, tieRegion, matchedAbove, theirs };
}

for (const name of ["diabetes", "iris", "cps1988"]) {
  const file = await readReference(name);
  const dataset = referenceDataset(file);
  for (const c of file.cases) {
    Deno.test(`${name} ${c.name}: predictions and leaves equal scikit-learn ${file.sklearn_version}'s`, () => {
      const tree = grow(file, c);
      const unstable = new Set(c.unstable_rows);
      assert.ok(unstable.size <= 0.01 * dataset.rows, `${unstable.size} unstable rows`);
      let compared = 0;
      for (let r = 0; r < dataset.rows; r++) {
        if (unstable.has(r)) continue;
        const leaf = applyRow(tree, dataset.features, r);
        if (file.task === "regression") {
          const expected = (c.predict as number[])[r];
          assert.ok(
            close(tree.value[leaf], expected),
            `row ${r}: ${tree.value[leaf]} vs ${expected}`,
          );
        } else {
          const expected = (c.predict as number[][])[r];
          for (let k = 0; k < expected.length; k++) {
            assert.ok(
              close(tree.value[leaf * tree.width + k], expected[k], 1e-12),
              `row ${r}, class ${k}`,
            );
          }
        }
        compared++;
      }
      assert.equal(compared, dataset.rows - unstable.size);
      // The reference splits nodes whose targets are all equal when rounding
      // leaves their impurity just above machine epsilon (pure_splits); such a
      // split adds a leaf and changes no prediction. paygrove does not make it.
      const [fewest, most] = c.seed_spread.n_leaves;
      const leaves = leafCount(tree);
      assert.ok(
        leaves >= fewest - c.pure_splits && leaves <= most - c.pure_splits,
        `${leaves} leaves, reference ${fewest}-${most} with ${c.pure_splits} pure splits`,
      );
      if (fewest === most) assert.equal(leaves, c.n_leaves - c.pure_splits);
    });

    // The reference breaks exact ties between features at random, and a tie
    // can change which internal node separates rows without changing any
    // leaf (e.g. CPS1988, fully grown: two features each split one of two
    // equal wages off a 4-row node). Its own path then moves by up to
    // `path_seed_difference` distinct alphas between random states; ours may
    // differ from random state 0's by no more than that, and only among small
    // alphas: above the largest alpha that is not matched, every alpha, risk
    // and subtree leaf count must agree.
    Deno.test(`${name} ${c.name}: pruning path equals cost_complexity_pruning_path`, () => {
      const { unmatched, tieRegion, matchedAbove, theirs } = comparePaths(file, c);
      assert.ok(
        unmatched <= c.path_seed_difference,
        `${unmatched} alphas unmatched (of ${theirs.length}); the reference's own random states ` +
          `differ by ${c.path_seed_difference}`,
      );
      if (c.path_seed_difference === 0) {
        assert.equal(tieRegion, -Infinity);
        assert.equal(matchedAbove, theirs.length);
      }
      // At most path_seed_difference alphas of theirs lack a partner in ours,
      // and most of the path lies above the tie region (CPS1988 fully grown:
      // 3,838 of 4,352; diabetes fully grown: all 394 match, none above a tie).
      assert.ok(matchedAbove >= 0.85 * theirs.length || tieRegion === -Infinity);
    });

    Deno.test(`${name} ${c.name}: the subtree at each path alpha has the reference's leaf count`, () => {
      const tree = grow(file, c);
      const { tieRegion } = comparePaths(file, c);
      const alphas = c.path.ccp_alphas;
      const rootRisk = c.path.impurities[c.path.impurities.length - 1];
      const indices = c.pruned_index ?? alphas.map((_, i) => i);
      assert.equal(indices.length, c.pruned_leaves.length);
      const refitLeaves = new Map(indices.map((k, i) => [k, c.pruned_leaves[i]]));
      let previous = Infinity;
      let compared = 0;
      for (const k of indices) {
        const alpha = alphas[k];
        // Alphas that are zero but for rounding are the pure splits and other
        // zero-gain links being pruned one by one; they are compared at 0 only,
        // where the reference still holds its pure splits.
        if (alpha !== 0 && sameAlpha(alpha, 0, rootRisk, PRUNE_TOLERANCE)) continue;
        const leaves = leafCount(pruneTree(tree, alpha));
        assert.ok(leaves <= previous);
        previous = leaves;
        if (alpha <= tieRegion) continue;
        // A run of equal alphas (ties such as 1.5/442 on integer targets): the
        // reference's refit at one of them prunes those whose last bits fall
        // below it. The subtree at the alpha prunes the whole run, so it is
        // compared with the run's smallest refit, when every step of the run
        // was refitted.
        let first = k;
        while (first > 0 && sameAlpha(alphas[first - 1], alpha, rootRisk, PRUNE_TOLERANCE)) first--;
        let last = k;
        while (
          last + 1 < alphas.length && sameAlpha(alphas[last + 1], alpha, rootRisk, PRUNE_TOLERANCE)
        ) {
          last++;
        }
        let expected = Infinity;
        for (let step = first; step <= last && expected >= 0; step++) {
          const refit = refitLeaves.get(step);
          expected = refit === undefined ? -1 : Math.min(expected, refit);
        }
        if (expected < 0) continue;
        if (alpha === 0) expected -= c.pure_splits;
        assert.equal(leaves, expected, `alpha ${alpha} (ties below ${tieRegion})`);
        compared++;
      }
      assert.ok(compared >= 0.5 * indices.length, `${compared} of ${indices.length} compared`);
    });
  }
}
