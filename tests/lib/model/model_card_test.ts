// The card's figures on the hand model (tests/lib/model/_hand_model.ts):
// the reference tree's outline in money, hidden below the privacy
// minimum; importance as the growth of the typical error; the error as a
// share of pay.
import assert from "node:assert/strict";
import { importanceGrowth, treeOutline, typicalErrorShare } from "../../../lib/model/model_card.ts";
import { classModel, handModel } from "./_hand_model.ts";
import { close } from "./_quantile.ts";

Deno.test("the outline: parents, depths, rows, pay in money, splits and children", () => {
  const nodes = treeOutline(handModel());
  assert.deepEqual(nodes.map((n) => [n.parent, n.depth, n.rows]), [
    [null, 0, 20],
    [0, 1, 4],
    [0, 1, 16],
    [2, 2, 10],
    [2, 2, 6],
  ]);
  close(nodes[0].value!, 50000, 1e-12);
  // Node 1 holds 4 people, below the privacy minimum of 5.
  assert.equal(nodes[1].value, null);
  close(nodes[4].value!, 60000, 1e-12);
  assert.deepEqual(nodes[0].split, { feature: "level", threshold: 0.5 });
  assert.deepEqual(nodes[2].split, { feature: "site", left: ["North"], right: ["South"] });
  assert.deepEqual(nodes[0].children, [1, 2]);
  assert.equal(nodes[3].children, undefined);
  assert.equal(nodes[3].split, undefined);
  assert.equal(nodes[0].predicted, undefined);
  // A raw-scale model shows the stored value itself.
  const raw = handModel();
  raw.target = { ...raw.target, scale: "raw" };
  assert.equal(treeOutline(raw)[3].value, Math.log(50000));
});

Deno.test("a class model's outline: the likeliest class and its share, hidden below the minimum", () => {
  const model = classModel();
  model.settings = { ...model.settings, privacyMin: 15 };
  const nodes = treeOutline(model);
  // Root: 0.5 / 0.5, a tie to the first class; leaves 10 people each, hidden.
  assert.deepEqual(nodes[0].predicted, { class: "junior", share: 0.5 });
  assert.equal(nodes[0].value, 0.5);
  assert.equal(nodes[1].predicted, null);
  assert.equal(nodes[1].value, null);
  model.settings = { ...model.settings, privacyMin: 5 };
  assert.deepEqual(treeOutline(model).map((n) => n.predicted), [
    { class: "junior", share: 0.5 },
    { class: "junior", share: 0.75 },
    { class: "senior", share: 0.75 },
  ]);
});

Deno.test("importance growth: sqrt(1 + rise / MSE) - 1, a fall counted as none", () => {
  // Out-of-bag log RMSE 0.1: MSE 0.01. level's rise 0.03: sqrt(4) - 1 = 1.
  const growth = importanceGrowth(handModel());
  assert.deepEqual(growth.map((g) => g.feature), ["level", "years", "site"]);
  close(growth[0].growth, 1);
  assert.equal(growth[1].growth, 0);
  assert(Number.isNaN(growth[2].growth));
  assert.deepEqual(growth.map((g) => g.impurity), [0.6, 0.3, 0.1]);
  // On the raw scale the money RMSE (5,000) is the measure: 0.03 is nothing.
  const raw = handModel();
  raw.target = { ...raw.target, scale: "raw" };
  close(importanceGrowth(raw)[0].growth, Math.sqrt(1 + 0.03 / 25e6) - 1);
  // No ensemble: no figure to grow from.
  assert(
    Number.isNaN(
      importanceGrowth({ ...handModel(), quality: { ...handModel().quality, ensemble: null } })[0]
        .growth,
    ),
  );
});

Deno.test("the typical error as a share of pay: exp(log RMSE) - 1, null without logs", () => {
  close(typicalErrorShare(handModel().quality.ensemble!)!, Math.exp(0.1) - 1);
  assert.equal(
    typicalErrorShare({ measuredBy: "out-of-bag", money: { rmse: 1, mae: 1, r2: 0 } }),
    null,
  );
});
