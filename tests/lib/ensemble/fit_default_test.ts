// The one recipe of every ensemble: the reference tree is the one
// crossValidateTree gives with the same folds, the ensemble's trees are
// pruned at the alpha of the lowest cross-validated error (found again here
// by scanning the candidates), and are those fitEnsemble grows with that
// alpha; without pruning, no cross-validation unless asked, alpha 0.
import assert from "node:assert/strict";
import { crossValidateTree, fitDefaultEnsemble, fitEnsemble } from "../../../mod.ts";
import { smallPay } from "./_small_pay.ts";

const DATASET = smallPay();
const GROW = { minLeaf: 3 };

Deno.test("the ensemble is pruned at the alpha of the lowest CV error, the reference by the 1-SE rule", async () => {
  const cv: number[] = [];
  const trees: number[] = [];
  const fit = await fitDefaultEnsemble(DATASET, {
    trees: 6,
    folds: 4,
    foldSeed: 5,
    seed: 2,
    workers: 1,
    grow: GROW,
    onCrossValidation: (done) => cv.push(done),
    onProgress: (done) => trees.push(done),
  });
  const reference = crossValidateTree(DATASET, { folds: 4, seed: 5, rule: "one-se", grow: GROW });
  assert.deepEqual(fit.reference!.candidates, reference.candidates);
  assert.equal(fit.reference!.chosen, reference.chosen);
  assert.deepEqual(fit.reference!.tree, reference.tree);
  // The lowest CV error, by a plain scan (the first of equal ones).
  let min = 0;
  reference.candidates.forEach((c, j) => {
    if (c.cvError < reference.candidates[min].cvError) min = j;
  });
  assert.equal(fit.alpha, reference.candidates[min].alpha);
  assert(fit.alpha > 0, "this table's path has a best alpha above 0");
  const direct = fitEnsemble(DATASET, {
    trees: 6,
    seed: 2,
    prune: "alpha",
    alpha: fit.alpha,
    grow: GROW,
  });
  assert.deepEqual(fit.ensemble!.trees, direct.trees);
  assert.deepEqual(fit.ensemble!.oob, direct.oob);
  assert.deepEqual(Array.from(fit.ensemble!.alphas), new Array(6).fill(fit.alpha));
  assert.equal(fit.folds, 4);
  assert.deepEqual(cv, [1, 2, 3, 4, 5]);
  assert.deepEqual(trees, [1, 2, 3, 4, 5, 6]);
});

Deno.test("the reference tree's rule does not move the ensemble's alpha", async () => {
  const options = { trees: 2, folds: 4, foldSeed: 5, workers: 1, grow: GROW };
  const oneSe = await fitDefaultEnsemble(DATASET, options);
  const min = await fitDefaultEnsemble(DATASET, { ...options, rule: "min" });
  assert.equal(min.alpha, oneSe.alpha);
  // The rules do choose different reference trees on this table.
  assert.notEqual(oneSe.reference!.chosen, min.reference!.chosen);
  assert.equal(min.reference!.chosen, min.reference!.best);
});

Deno.test("unpruned: no cross-validation unless asked, alpha 0, trees as grown", async () => {
  const none = await fitDefaultEnsemble(DATASET, {
    trees: 3,
    prune: "none",
    workers: 1,
    grow: GROW,
  });
  assert.equal(none.reference, null);
  assert.equal(none.alpha, 0);
  const grown = fitEnsemble(DATASET, { trees: 3, seed: 1, prune: "none", grow: GROW });
  assert.deepEqual(none.ensemble!.trees, grown.trees);
  const asked = await fitDefaultEnsemble(DATASET, {
    trees: 3,
    prune: "none",
    crossValidate: true,
    folds: 3,
    workers: 1,
    grow: GROW,
  });
  assert.notEqual(asked.reference, null);
  assert.equal(asked.alpha, 0);
  assert.deepEqual(asked.ensemble!.trees, grown.trees);
});

Deno.test("no trees: the reference tree alone; folds never more than rows", async () => {
  const alone = await fitDefaultEnsemble(DATASET, { trees: 0, folds: 3, grow: GROW });
  assert.equal(alone.ensemble, null);
  assert.notEqual(alone.reference, null);
  const tiny = {
    rows: 4,
    features: [{ name: "x", kind: "numeric" as const, values: Float64Array.of(1, 2, 3, 4) }],
    target: { kind: "regression" as const, name: "y", values: Float64Array.of(1, 2, 5, 6) },
  };
  const fit = await fitDefaultEnsemble(tiny, { trees: 0, grow: { minLeaf: 1 } });
  assert.equal(fit.folds, 4);
  assert.equal(fit.reference!.fold.length, 4);
  assert.deepEqual([...new Set(fit.reference!.fold)].sort(), [0, 1, 2, 3]);
});
