// The method on open data: CPS1988 (R package AER; fixtures/README.md),
// log weekly wage on education, experience, smsa, region and parttime
// (ethnicity, a protected attribute, left out as paygrove does by default).
// Cost-complexity pruning with 10-fold cross-validation must beat the
// constant model, and the unpruned trees must do worse than the pruned one
// (overfitting visible). The figures are in the test names.
import assert from "node:assert/strict";
import { constantBaseline, crossValidateLinear, crossValidateTree } from "../../../mod.ts";
import { cps1988LogWage } from "../_cps1988.ts";

const dataset = await cps1988LogWage();
const logWage = dataset.target.values as Float64Array;

const cv = crossValidateTree(dataset, { folds: 10, seed: 1988 });
const grown = crossValidateTree(dataset, {
  folds: 10,
  seed: 1988,
  grow: { minLeaf: 1, minSplit: 2 },
});
const chosen = cv.candidates[cv.chosen];
const unpruned = cv.candidates[0];
const fullyGrown = grown.candidates[0];

// The constant model on the same folds: each held-out row gets the mean of
// the other folds.
const sums = new Float64Array(10);
const counts = new Float64Array(10);
let total = 0;
for (let r = 0; r < dataset.rows; r++) {
  sums[cv.fold[r]] += logWage[r];
  counts[cv.fold[r]]++;
  total += logWage[r];
}
let constantSq = 0;
for (let r = 0; r < dataset.rows; r++) {
  const k = cv.fold[r];
  const mean = (total - sums[k]) / (dataset.rows - counts[k]);
  constantSq += (logWage[r] - mean) ** 2;
}
const constantCvRmse = Math.sqrt(constantSq / dataset.rows);
const rmse = (mse: number) => Math.sqrt(mse).toFixed(4);

Deno.test(
  `CPS1988 log wage: pruned tree (${chosen.leaves} leaves) CV RMSE ${rmse(chosen.cvError)} < ` +
    `constant ${constantCvRmse.toFixed(4)}`,
  () => {
    assert.ok(Math.sqrt(chosen.cvError) < constantCvRmse);
    // The constant's in-sample RMSE is the population SD of the target.
    const sd = constantBaseline(logWage).rmse;
    assert.ok(Math.abs(sd - Math.sqrt(cv.candidates[cv.candidates.length - 1].risk)) < 1e-12);
  },
);

Deno.test(
  `CPS1988 log wage: unpruned trees overfit: ${unpruned.leaves} leaves (min leaf 5) CV RMSE ` +
    `${rmse(unpruned.cvError)}, ${fullyGrown.leaves} leaves (min leaf 1) ${
      rmse(fullyGrown.cvError)
    }, ` +
    `both > pruned ${rmse(chosen.cvError)}`,
  () => {
    assert.ok(unpruned.cvError > chosen.cvError + chosen.cvSe);
    assert.ok(fullyGrown.cvError > unpruned.cvError);
    assert.ok(cv.chosen >= cv.best, "the 1-SE tree is no larger than the best one");
  },
);

const linearCvRmse = crossValidateLinear(dataset, cv.fold);

Deno.test(
  `CPS1988 log wage: the linear baseline's CV RMSE on the same folds is ${linearCvRmse.toFixed(4)}`,
  () => {
    // Trees beat a straight line here: experience acts on log wage as a
    // curve, which the linear baseline (no square term) cannot bend to.
    assert.ok(Math.sqrt(chosen.cvError) < linearCvRmse);
    assert.ok(linearCvRmse < constantCvRmse);
  },
);
