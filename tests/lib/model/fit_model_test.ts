// fitModel's figures, each recomputed here by another route: the constant
// and linear baselines from the folds, the ensemble's out-of-bag accuracy
// from a separately fitted ensemble, the reference tree's log CV RMSE from
// crossValidateTree; and the privacy rules.
import assert from "node:assert/strict";
import {
  crossValidatedLinearPredictions,
  crossValidateTree,
  demoCompanyCsv,
  fitEnsembleParallel,
  fitModel,
  loadTable,
  loadTableFile,
  makeDataset,
  OptionError,
  shareTree,
} from "../../../mod.ts";
import { demoModel } from "./_demo_model.ts";

// Kept to 4 significant digits: equal to what the figure rounds to.
function sameTo4(kept: number, exact: number): boolean {
  return kept === Number(exact.toPrecision(4));
}

const { table, model } = await demoModel();
const { dataset } = makeDataset(table, { target: "base_pay_eur" });
if (dataset.target.kind !== "regression") throw new Error("regression expected");
const pay = dataset.target.values;
const logData = { ...dataset, target: { ...dataset.target, values: pay.map(Math.log) } };

function rmse(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += (a[i] - b[i]) ** 2;
  return Math.sqrt(s / a.length);
}

Deno.test("a money target is fitted on logs, protected and identifier columns left out", () => {
  assert.equal(model.target.scale, "log");
  assert.deepEqual(model.target.money, { currency: "EUR", period: "year" });
  assert.deepEqual(model.dropped.map((d) => d.name).sort(), ["employee_id", "gender"]);
  assert.equal(model.rows.used, 2000);
  assert.equal(model.read.identifier, "employee_id");
});

Deno.test("the baselines and the reference tree's figures match their own computations", () => {
  const cv = crossValidateTree(logData, { folds: 5, seed: 3, grow: { minLeaf: 5 } });
  const chosen = cv.candidates[cv.chosen];
  // Figures are kept to 4 significant digits (lib/model/shareable_figures.ts).
  assert.ok(sameTo4(model.quality.reference.log!.rmse, chosen.cvRmse));
  assert.equal(model.reference.leaves, chosen.leaves);
  // Constant: each fold predicted by the mean log pay of the other folds.
  const y = logData.target.values;
  const constant = Float64Array.from(y, (_, r) => {
    let s = 0;
    let n = 0;
    for (let i = 0; i < y.length; i++) {
      if (cv.fold[i] !== cv.fold[r]) {
        s += y[i];
        n++;
      }
    }
    return s / n;
  });
  assert.ok(sameTo4(model.quality.constant.log!.rmse, rmse(y, constant)));
  assert.ok(
    sameTo4(model.quality.constant.money!.rmse, rmse(pay, constant.map(Math.exp))),
  );
  const linear = crossValidatedLinearPredictions(logData, cv.fold);
  assert.ok(sameTo4(model.quality.linear!.money!.rmse, rmse(pay, linear.map(Math.exp))));
  // Money CV RMSE of the reference tree: the square root of the mean
  // squared money error, which cannot be below the money RMSE of the best
  // constant; and the trees beat the line on this table.
  assert.ok(model.quality.reference.money!.rmse < model.quality.constant.money!.rmse);
  assert.ok(model.quality.ensemble!.money!.rmse < model.quality.linear!.money!.rmse);
});

Deno.test("the ensemble's out-of-bag accuracy is that of the same ensemble fitted directly", async () => {
  const cv = crossValidateTree(logData, { folds: 5, seed: 3, grow: { minLeaf: 5 } });
  const ensemble = await fitEnsembleParallel(logData, {
    trees: 60,
    seed: 3,
    prune: "alpha",
    alpha: cv.candidates[cv.best].alpha,
    grow: { minLeaf: 5 },
    workers: 1,
  });
  assert.equal(model.ensemble!.alpha, Number(cv.candidates[cv.best].alpha.toPrecision(4)));
  for (let b = 0; b < 60; b++) {
    const kept = model.ensemble!.trees[b];
    const fitted = ensemble.trees[b];
    // Leaves as fitted; the rest is the shareable copy (covers of every row,
    // internal values their cover-weighted leaves).
    for (let n = 0; n < fitted.nodeCount; n++) {
      if (fitted.left[n] === -1) assert.equal(kept.value[n], fitted.value[n]);
    }
    assert.deepEqual(kept, shareTree(fitted, logData.features, logData.rows));
  }
  const rows: number[] = [];
  for (let r = 0; r < pay.length; r++) if (ensemble.oobTrees[r] > 0) rows.push(r);
  const expected = rmse(rows.map((r) => pay[r]), rows.map((r) => Math.exp(ensemble.oob[r])));
  assert.ok(sameTo4(model.quality.ensemble!.money!.rmse, expected));
});

Deno.test("no node of any tree holds fewer people than the privacy minimum", () => {
  for (const tree of [model.reference.tree, ...model.ensemble!.trees]) {
    for (let n = 0; n < tree.nodeCount; n++) assert.ok(tree.rows[n] >= model.settings.privacyMin);
  }
});

Deno.test("privacy and size options are checked before fitting", async () => {
  const small = loadTable("level,pay\nL1,50\nL2,60\nL1,52\nL2,61\nL1,49\nL2,63\n", {
    target: "pay",
  });
  await assert.rejects(
    () => fitModel(small, { target: "pay", minLeaf: 2 }),
    (e) => e instanceof OptionError && /minLeaf 2 is below the privacy minimum 5/.test(e.message),
  );
  await assert.rejects(
    () => fitModel(small, { target: "pay", privacyMin: 2, minLeaf: 2 }),
    (e) =>
      e instanceof OptionError &&
      /privacyMin must be a whole number of at least 3/.test(e.message),
  );
  // Fewer rows than folds: one fold per row (each fold needs at least one).
  const loo = await fitModel(small, { target: "pay", privacyMin: 3, minLeaf: 3, trees: 0 });
  assert.equal(loo.settings.folds, 6);
  await assert.rejects(
    () => fitModel(small, { target: "pay", privacyMin: 3, minLeaf: 4, folds: 2 }),
    (e) =>
      e instanceof OptionError &&
      e.message === 'only 6 rows have "pay"; at least 8 are needed for one split with minLeaf 4',
  );
});

Deno.test("--where keeps only the matching rows", async () => {
  const sub = await fitModel(table, {
    target: "base_pay_eur",
    trees: 5,
    folds: 3,
    workers: 1,
    where: { job_family: ["Engineering", "Sales"] },
  });
  const family = table.columns.find((c) => c.name === "job_family")!;
  if (family.type !== "categorical") throw new Error("categorical expected");
  const expected =
    Array.from(family.codes).filter((c) => ["Engineering", "Sales"].includes(family.levels[c]))
      .length;
  assert.equal(sub.rows.used, expected);
  assert.equal(sub.rows.dropped, 2000 - expected);
});

Deno.test("a class target's constant baseline is the majority class of the other folds", async () => {
  // CPS1985 (AER, fixtures/cps1985.csv): the most common occupation is
  // 29.2% of people; the constant row once read 35.4%, the accuracy of the
  // fold trees pruned at the root's alpha, which split.
  const cpsPath = new URL("../../../fixtures/cps1985.csv", import.meta.url).pathname;
  const cps = await loadTableFile(cpsPath, { target: "occupation" });
  const fitted = await fitModel(cps, { target: "occupation", trees: 0, folds: 10, seed: 1 });
  const { dataset: d } = makeDataset(cps, {
    target: "occupation",
    features: fitted.features.map((f) => f.name),
  });
  const y = d.target.values;
  const { fold } = crossValidateTree(d, { folds: 10, seed: 1, grow: { minLeaf: 5 } });
  // A hand count: per fold, the class most common among the other folds.
  let right = 0;
  for (let r = 0; r < y.length; r++) {
    const counts = new Map<number, number>();
    for (let i = 0; i < y.length; i++) {
      if (fold[i] !== fold[r]) counts.set(y[i], (counts.get(y[i]) ?? 0) + 1);
    }
    const top = Math.max(...counts.values());
    const guess = Math.min(...[...counts].filter(([, n]) => n === top).map(([c]) => c));
    if (y[r] === guess) right++;
  }
  const constant = fitted.quality.constant as { accuracy: number };
  assert.ok(sameTo4(constant.accuracy, right / y.length), `${constant.accuracy}`);
  assert.equal(constant.accuracy.toFixed(3), "0.292");
});

// The learner keeps working arrays from tree to tree in each thread
// (grow_rows.ts, importance.ts, fit_ensemble.ts): two fits in one thread
// at once, their awaits interleaved, must give the models each gives alone.
Deno.test("two fits at once in one thread give the models each gives alone", async () => {
  const now = () => "2026-01-01T00:00:00.000Z";
  const small = loadTable(demoCompanyCsv({ rows: 400, seed: 9 }), { target: "base_pay_eur" });
  const options = { target: "base_pay_eur", trees: 12, folds: 4, workers: 1, now };
  const strip = (m: Awaited<ReturnType<typeof fitModel>>) => ({ ...m, seconds: 0 });
  const alone = [
    strip(await fitModel(table, options)),
    strip(await fitModel(small, { ...options, seed: 3 })),
  ];
  const together = await Promise.all([
    fitModel(table, options),
    fitModel(small, { ...options, seed: 3 }),
  ]);
  assert.deepEqual(together.map(strip), alone);
  assert.notDeepEqual(alone[0].ensemble, alone[1].ensemble);
});
