// What an ensemble says about one profile, on hand-written stumps whose
// every figure is worked out below: tree estimates, R's type-7 percentile
// intervals, out-of-bag residuals and accuracy, paired differences, and
// the infinitesimal jackknife (Wager, Hastie & Efron 2014, eq. 5 and 7) on
// in-bag counts written out by hand.
import assert from "node:assert/strict";
import {
  bootstrapCounts,
  inBagCounts,
  infinitesimalJackknife,
  mean,
  oobClassificationMetrics,
  oobRegressionMetrics,
  oobResiduals,
  pairedDifference,
  percentileInterval,
  resampleStates,
  residualRange,
  treeEstimates,
} from "../../../mod.ts";
import { handEnsemble, stump } from "./_hand_ensemble.ts";

const close = (a: number, b: number, tol = 1e-12) =>
  assert(Math.abs(a - b) <= tol, `${a} is not ${b}`);

// Three stumps at x <= 5: left leaves 10, 12, 11; right leaves 20, 22, 26.
const TREES = [stump(5, [10], [20]), stump(5, [12], [22]), stump(5, [11], [26])];

Deno.test("treeEstimates reads each tree's leaf, in tree order; a class ensemble is refused", () => {
  const ensemble = handEnsemble(TREES);
  assert.deepEqual(Array.from(treeEstimates(ensemble, [3])), [10, 12, 11]);
  assert.deepEqual(Array.from(treeEstimates(ensemble, [7])), [20, 22, 26]);
  assert.equal(mean([20, 22, 26]), 68 / 3);
  const classes = handEnsemble([stump(5, [0.5, 0.5], [1, 0])]);
  assert.throws(() => treeEstimates(classes, [3]), TypeError);
});

Deno.test("percentileInterval gives R's type-7 quantiles", () => {
  // R 4.2.2: quantile(c(3, 1, 4, 1, 5, 9, 2, 6), c(0.05, 0.95), type = 7)
  // gives 1 and 7.9499999999999984.
  const i = percentileInterval([3, 1, 4, 1, 5, 9, 2, 6], 0.9);
  close(i.low, 1);
  close(i.high, 7.95);
  assert.equal(i.coverage, 0.9);
  for (const coverage of [0, 1, NaN, 1.2]) {
    assert.throws(() => percentileInterval([1, 2], coverage), RangeError);
  }
});

Deno.test("out-of-bag residuals and accuracy use only rows some tree left out", () => {
  // Row 1 was drawn by every tree (no out-of-bag estimate).
  const ensemble = handEnsemble(TREES, [10, NaN, 30, 41], [2, 0, 1, 3]);
  const y = [12, 5, 27, 40];
  assert.deepEqual(Array.from(oobResiduals(ensemble, y)), [2, -3, -1]);
  // Errors 2, -3, -1: MSE 14/3, MAE 2; y over those rows has mean 79/3.
  const m = oobRegressionMetrics(ensemble, y);
  assert.equal(m.rows, 3);
  close(m.rmse, Math.sqrt(14 / 3));
  close(m.mae, 2);
  const ybar = 79 / 3;
  const sst = (12 - ybar) ** 2 + (27 - ybar) ** 2 + (40 - ybar) ** 2;
  close(m.r2, 1 - 14 / sst);
});

Deno.test("residualRange adds the residual quantiles to the estimate", () => {
  // R 4.2.2: quantile(c(-2, 0, 1), c(0.25, 0.75)) gives -1 and 0.5.
  const range = residualRange(100, [1, -2, 0], 0.5);
  assert.deepEqual(range, { low: 99, high: 100.5, coverage: 0.5 });
});

Deno.test("pairedDifference: the per-tree differences' mean and percentile interval", () => {
  // From x = 3 to x = 7 the trees move by 10, 10 and 15.
  const d = pairedDifference(handEnsemble(TREES), [3], [7], 0.9);
  close(d.estimate, 35 / 3);
  // Sorted 10, 10, 15: the 5% point at position 0.1 is 10, the 95% point at
  // 1.9 is 10 + 0.9 * 5.
  close(d.low, 10);
  close(d.high, 14.5);
  assert.equal(d.coverage, 0.9);
});

Deno.test("out-of-bag class accuracy takes each row's largest averaged share (ties low)", () => {
  const ensemble = handEnsemble(
    [stump(5, [0.5, 0.5], [0, 1])],
    // Rows: class 1 leads; a tie (class 0); no estimate; class 0 leads.
    [0.25, 0.75, 0.5, 0.5, NaN, NaN, 0.9, 0.1],
    [1, 1, 0, 1],
  );
  const m = oobClassificationMetrics(ensemble, [1, 1, 0, 0]);
  assert.equal(m.rows, 3);
  // Predicted 1, 0, 0 against 1, 1, 0.
  assert.deepEqual(m.confusion, [[1, 0], [1, 1]]);
  close(m.accuracy, 2 / 3);
});

Deno.test("inBagCounts regenerates every tree's counts, tree after tree", () => {
  const resamples = resampleStates(9, [1, 2, 3, 4, 5], 3);
  const bag = inBagCounts(handEnsemble(TREES, [], [], resamples), 5);
  assert.equal(bag.rows, 5);
  for (let b = 0; b < 3; b++) {
    assert.deepEqual(
      Array.from(bag.counts.subarray(5 * b, 5 * b + 5)),
      Array.from(bootstrapCounts(5, resamples, b)),
    );
  }
});

Deno.test("the infinitesimal jackknife on counts written out by hand", () => {
  const ensemble = handEnsemble(TREES);
  // Four rows; each tree's draws sum to 4.
  const counts = [[3, 0, 0, 1], [0, 1, 2, 1], [1, 1, 1, 1]];
  const bag = { rows: 4, counts: Uint8Array.from(counts.flat()) };
  // At x = 3 the trees say 10, 12, 11: deviations -1, 1, 0 from 11.
  // Cov_i = (1/3) sum_b (N_bi - 1) d_b: -1, 1/3, 2/3, 0; V = 14/9.
  // Correction n / B^2 * sum d^2 = 4/9 * 2 = 8/9; corrected 6/9.
  const ij = infinitesimalJackknife(ensemble, 4, [3], bag);
  close(ij.uncorrectedSe, Math.sqrt(14 / 9));
  close(ij.se, Math.sqrt(6 / 9));
  assert.equal(ij.clamped, false);
  // Every row drawn once by every tree: no covariance, the correction alone
  // is negative, and the error is set to 0.
  const flat = { rows: 4, counts: new Uint8Array(12).fill(1) };
  const none = infinitesimalJackknife(ensemble, 4, [7], flat);
  assert.deepEqual(none, { se: 0, clamped: true, uncorrectedSe: 0 });
  assert.throws(() => infinitesimalJackknife(ensemble, 5, [3], bag), RangeError);
});

Deno.test("the jackknife regenerates the counts from the resampling states when none are given", () => {
  const resamples = resampleStates(2, [1, 2, 3, 4, 5, 6], 3);
  const ensemble = handEnsemble(TREES, [], [], resamples);
  // The formula written out again over the regenerated counts.
  const t = [10, 12, 11];
  const d = t.map((v) => v - 11);
  let v = 0;
  for (let i = 0; i < 6; i++) {
    let cov = 0;
    for (let b = 0; b < 3; b++) cov += (bootstrapCounts(6, resamples, b)[i] - 1) * d[b];
    v += (cov / 3) ** 2;
  }
  const corrected = v - (6 / 9) * 2;
  const ij = infinitesimalJackknife(ensemble, 6, [3]);
  close(ij.uncorrectedSe, Math.sqrt(v));
  close(ij.se, Math.sqrt(Math.max(0, corrected)));
  assert.equal(ij.clamped, corrected < 0);
});
