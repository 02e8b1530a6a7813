import assert from "node:assert/strict";
import { binFeatures } from "../../../lib/tree/bins.ts";
import {
  assignFolds,
  crossValidateGrown,
  crossValidateTree,
  FoldScores,
  scoreSubtrees,
} from "../../../lib/tree/cross_validate.ts";
import { leafCount, predictedClass, predictRows } from "../../../lib/tree/flat_tree.ts";
import { growTree } from "../../../lib/tree/grow_tree.ts";
import { pruneTree } from "../../../lib/tree/prune.ts";
import { classification, levels, numeric, regression } from "./_small.ts";

// Invented: pay steps at 10 years, a site effect and noise; 60 rows.
const n = 60;
const years = Array.from({ length: n }, (_, i) => (i * 7) % 20);
const site = Array.from({ length: n }, (_, i) => i % 3);
const pay = years.map((v, i) => (v < 10 ? 50 : 80) + (site[i] === 2 ? 6 : 0) + ((i * 37) % 11) - 5);
const data = regression([numeric("years", years), levels("site", site, 3)], pay);
const grow = { minLeaf: 2 };

Deno.test("each candidate's CV error is the mean held-out loss of the pruned fold trees", () => {
  const result = crossValidateTree(data, { folds: 5, seed: 3, grow });
  // Brute force: for every fold, grow on the other rows, prune at each scored alpha with
  // pruneTree, predict the held-out rows.
  const bins = binFeatures(data);
  const sums = result.candidates.map(() => 0);
  for (let k = 0; k < 5; k++) {
    const weights = Float64Array.from(result.fold, (f) => (f === k ? 0 : 1));
    const foldTree = growTree({ dataset: data, bins, weights }, grow);
    result.candidates.forEach((c, j) => {
      const predicted = predictRows(pruneTree(foldTree, c.scoredAt), data.features, n);
      for (let r = 0; r < n; r++) if (result.fold[r] === k) sums[j] += (pay[r] - predicted[r]) ** 2;
    });
  }
  result.candidates.forEach((c, j) => {
    assert.ok(Math.abs(c.cvError - sums[j] / n) < 1e-9 * Math.max(1, c.cvError), `candidate ${j}`);
    assert.ok(Math.abs(c.cvRmse - Math.sqrt(c.cvError)) < 1e-12);
  });
});

Deno.test("candidates grow in alpha and shrink in leaves; scored at the geometric mean", () => {
  const { candidates, fullTree } = crossValidateTree(data, { folds: 5, seed: 3, grow });
  assert.equal(candidates[0].alpha, 0);
  assert.equal(candidates[0].leaves, leafCount(fullTree));
  assert.equal(candidates.at(-1)!.leaves, 1);
  for (let j = 1; j < candidates.length; j++) {
    assert.ok(candidates[j].alpha > candidates[j - 1].alpha);
    assert.ok(candidates[j].leaves < candidates[j - 1].leaves);
    assert.ok(
      Math.abs(
        candidates[j - 1].scoredAt - Math.sqrt(candidates[j - 1].alpha * candidates[j].alpha),
      ) < 1e-12,
    );
  }
  assert.equal(candidates.at(-1)!.scoredAt, candidates.at(-1)!.alpha);
});

Deno.test("the 1-SE rule takes the smallest tree within one standard error of the best", () => {
  const result = crossValidateTree(data, { folds: 5, seed: 3, grow });
  const { candidates, best, chosen } = result;
  const errors = candidates.map((c) => c.cvError);
  assert.equal(errors[best], Math.min(...errors));
  const limit = errors[best] + candidates[best].cvSe;
  const expected = Math.max(
    ...candidates.map((c, j) => (j >= best && c.cvError <= limit ? j : -1)),
  );
  assert.equal(chosen, expected);
  assert.equal(leafCount(result.tree), candidates[chosen].leaves);
  // The pay step is found: the reference tree splits on years first, at 9.5.
  assert.equal(result.tree.feature[0], 0);
  assert.equal(result.tree.threshold[0], 9.5);
  const min = crossValidateTree(data, { folds: 5, seed: 3, grow, rule: "min" });
  assert.equal(min.chosen, min.best);
  assert.ok(min.candidates[min.chosen].leaves >= result.candidates[chosen].leaves);
});

Deno.test("the standard error is that of the per-row losses (sample SD over root n)", () => {
  // Two folds of a tiny table make the losses easy to list by brute force.
  const small = regression([numeric("x", [1, 2, 3, 4, 5, 6])], [1, 2, 3, 10, 11, 12]);
  const result = crossValidateTree(small, { folds: 2, seed: 1, grow: { minLeaf: 1 } });
  const bins = binFeatures(small);
  result.candidates.forEach((c) => {
    const losses: number[] = [];
    for (let k = 0; k < 2; k++) {
      const weights = Float64Array.from(result.fold, (f) => (f === k ? 0 : 1));
      const t = pruneTree(growTree({ dataset: small, bins, weights }, { minLeaf: 1 }), c.scoredAt);
      const p = predictRows(t, small.features, 6);
      for (let r = 0; r < 6; r++) {
        if (result.fold[r] === k) losses.push((small.target.values[r] - p[r]) ** 2);
      }
    }
    const mean = losses.reduce((a, b) => a + b, 0) / 6;
    const sd = Math.sqrt(losses.reduce((a, b) => a + (b - mean) ** 2, 0) / 5);
    assert.ok(Math.abs(c.cvSe - sd / Math.sqrt(6)) < 1e-9);
    assert.ok(c.cvError === 0 || Math.abs(c.cvRmseSe - c.cvSe / (2 * c.cvRmse)) < 1e-12);
  });
});

Deno.test("extra losses are averaged per candidate; progress counts the full tree and each fold", () => {
  const seen: [number, number][] = [];
  const result = crossValidateTree(data, {
    folds: 4,
    seed: 2,
    grow,
    extraLosses: [(a, p) => Math.abs(a - p), (a, p) => (a - p) ** 2],
    onProgress: (done, total) => seen.push([done, total]),
  });
  assert.deepEqual(seen, [[1, 5], [2, 5], [3, 5], [4, 5], [5, 5]]);
  for (const c of result.candidates) {
    assert.equal(c.cvExtra.length, 2);
    assert.ok(Math.abs(c.cvExtra[1] - c.cvError) < 1e-9);
    // Mean absolute error is at most the RMSE.
    assert.ok(c.cvExtra[0] <= c.cvRmse + 1e-12);
  }
});

Deno.test("fold counts outside 2..rows are refused", () => {
  for (const folds of [1, 0, 61, 2.5, NaN]) {
    assert.throws(() => crossValidateTree(data, { folds }), RangeError, String(folds));
  }
});

Deno.test("folds: every block of k rows by target holds each fold once; same seed, same folds", () => {
  const fold = assignFolds(data, 7, 11);
  const counts = new Array(7).fill(0);
  for (const f of fold) counts[f]++;
  // 60 rows in 7 folds: sizes 9 or 8 (60 = 4 x 9 + 3 x 8).
  assert.deepEqual(counts.slice().sort(), [8, 8, 8, 9, 9, 9, 9]);
  const order = [...Array(n).keys()].sort((a, b) => pay[a] - pay[b]);
  // Blocks of 7 consecutive rows by pay: all folds distinct within a block (up to ties).
  const sortedPay = order.map((r) => pay[r]);
  for (let start = 0; start + 7 <= n; start += 7) {
    const labels = new Set(order.slice(start, start + 7).map((r) => fold[r]));
    const tiedAtEdges = sortedPay[start] === sortedPay[start - 1] ||
      sortedPay[start + 6] === sortedPay[start + 7];
    if (!tiedAtEdges) assert.equal(labels.size, 7, `block at ${start}`);
  }
  assert.deepEqual(assignFolds(data, 7, 11), fold);
  assert.notDeepEqual(assignFolds(data, 7, 12), fold);
});

Deno.test("classification: CV error is the misclassification rate of the pruned fold trees", () => {
  const cls = years.map((v, i) => (v < 10 ? 0 : 1) ^ (i % 9 === 0 ? 1 : 0));
  const d = classification([numeric("years", years)], cls, 2);
  const result = crossValidateTree(d, { folds: 3, seed: 5, grow });
  const bins = binFeatures(d);
  const wrong = result.candidates.map(() => 0);
  for (let k = 0; k < 3; k++) {
    const weights = Float64Array.from(result.fold, (f) => (f === k ? 0 : 1));
    const foldTree = growTree({ dataset: d, bins, weights }, grow);
    result.candidates.forEach((c, j) => {
      const pruned = pruneTree(foldTree, c.scoredAt);
      for (let r = 0; r < n; r++) {
        if (result.fold[r] !== k) continue;
        let node = 0;
        while (pruned.left[node] !== -1) {
          node = years[r] <= pruned.threshold[node] ? pruned.left[node] : pruned.right[node];
        }
        if (predictedClass(pruned, node) !== cls[r]) wrong[j]++;
      }
    });
  }
  result.candidates.forEach((c, j) =>
    assert.ok(Math.abs(c.cvError - wrong[j] / n) < 1e-12, `candidate ${j}`)
  );
});

Deno.test("scoreSubtrees adds nothing when no row is held out", () => {
  const t = growTree({ dataset: data, bins: binFeatures(data) }, grow);
  const sum = new Float64Array(2);
  const sumSq = new Float64Array(2);
  scoreSubtrees(t, data, () => false, [0, 1], sum, sumSq);
  assert.deepEqual(Array.from(sum), [0, 0]);
});

Deno.test("fold trees scored in any order give the same candidates, number for number", () => {
  // Invented: fractional pay, so that adding the folds in another order
  // would move the sums' last bits (a reversed addition is caught).
  const rows = 300;
  const tenure = Array.from({ length: rows }, (_, i) => (i * 13) % 37);
  const office = Array.from({ length: rows }, (_, i) => (i * 7) % 4);
  const wage = tenure.map((t, i) => 41.3 + 1.7 * t + 4.1 * office[i] + 7.3 * Math.sin(i * 1.3));
  const table = regression([numeric("tenure", tenure), levels("office", office, 4)], wage);
  const bins = binFeatures(table);
  const folds = 10;
  const fold = assignFolds(table, folds, 3);
  const foldTrees = Array.from(
    { length: folds },
    (_, k) =>
      growTree(
        { dataset: table, bins, weights: Float64Array.from(fold, (f) => (f === k ? 0 : 1)) },
        grow,
      ),
  );
  const full = growTree({ dataset: table, bins }, grow);
  const options = { extraLosses: [(a: number, p: number) => Math.abs(a - p) ** 1.5] };
  const inOrder = crossValidateGrown(table, full, foldTrees, fold, options);
  const reversed = Array.from({ length: folds }, (_, k) => folds - 1 - k);
  const shuffled = [3, 7, 0, 9, 5, 1, 8, 2, 6, 4];
  for (const order of [reversed, shuffled]) {
    const scores = new FoldScores(table, full, fold, folds, options);
    for (const k of order) scores.add(k, foldTrees[k]);
    const result = scores.result();
    assert.deepEqual(result.candidates, inOrder.candidates);
    assert.equal(result.chosen, inOrder.chosen);
    assert.deepEqual(result.tree, inOrder.tree);
  }
  // The same as the one-call cross-validation on those folds.
  assert.deepEqual(
    inOrder.candidates,
    crossValidateTree(table, { folds, seed: 3, grow, ...options }).candidates,
  );
  const partial = new FoldScores(table, full, fold, folds);
  for (const k of shuffled.slice(1)) partial.add(k, foldTrees[k]);
  assert.throws(() => partial.result(), /fold 3 is not scored/);
  assert.throws(() => partial.add(folds, foldTrees[0]), /no fold 10 of 10/);
});
