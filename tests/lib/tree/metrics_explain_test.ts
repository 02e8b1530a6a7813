import assert from "node:assert/strict";
import {
  binFeatures,
  classificationMetrics,
  constantBaseline,
  explainPath,
  growTree,
  loadTable,
  makeDataset,
  makeRng,
  predictRows,
  regressionMetrics,
} from "../../../mod.ts";
import { levels, numeric, regression } from "./_small.ts";

Deno.test("the constant model's RMSE is the population standard deviation", () => {
  // Population SD of 2, 4, 4, 4, 5, 5, 7, 9 is exactly 2 (mean 5, squared
  // deviations sum to 32 over 8 values): a textbook worked example.
  assert.equal(constantBaseline([2, 4, 4, 4, 5, 5, 7, 9]).rmse, 2);
  assert.equal(constantBaseline([2, 4, 4, 4, 5, 5, 7, 9]).r2, 0);
});

Deno.test("regression metrics by hand", () => {
  const m = regressionMetrics([3, -0.5, 2, 7], [2.5, 0, 2, 8]);
  // Errors 0.5, -0.5, 0, -1: MSE 1.5/4, MAE 2/4; SST 29.1875.
  assert.equal(m.rmse, Math.sqrt(0.375));
  assert.equal(m.mae, 0.5);
  assert.ok(Math.abs(m.r2 - (1 - 1.5 / 29.1875)) < 1e-15);
});

Deno.test("classification metrics by hand", () => {
  const m = classificationMetrics([0, 0, 1, 1, 2, 2], [0, 1, 1, 1, 2, 0], 3);
  assert.deepEqual(m.confusion, [[1, 1, 0], [0, 2, 0], [1, 0, 1]]);
  assert.equal(m.accuracy, 4 / 6);
  assert.deepEqual(m.precision, [0.5, 2 / 3, 1]);
  assert.deepEqual(m.recall, [0.5, 1, 0.5]);
});

Deno.test("decision paths read as conditions on the profile's values", () => {
  // Invented: pay by years (numeric), grade (ordinal) and site (categorical).
  const years = [1, 2, 3, 8, 9, 10, 1, 2, 9, 10, 3, 8];
  const grade = [0, 0, 0, 0, 0, 0, 2, 2, 2, 2, 1, 1];
  const site = [0, 1, 2, 0, 1, 2, 0, 1, 2, 0, 1, 2];
  const pay = years.map((y, i) => 40 + 3 * y + 20 * grade[i] + (site[i] === 2 ? 5 : 0));
  const dataset = regression(
    [numeric("years", years), levels("grade", grade, 3, "ordinal"), levels("site", site, 3)],
    pay,
  );
  const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1, maxDepth: 2 });
  const steps = explainPath(tree, dataset.features, [9, 2, 0]);
  assert.equal(steps.length, 2);
  for (const step of steps) {
    assert.match(step.condition, /^(years [<>]=? [\d.]+|grade (<=|>=) grade\d|site in \{[^}]+\})$/);
  }
  // Every step's row count and mean are those of the node reached.
  const last = steps[steps.length - 1];
  assert.equal(last.rows, tree.rows[last.node]);
  assert.equal(last.value, tree.value[last.node]);
  // Worked by hand over every candidate split: grade0 | grade1-2 leaves a
  // squared error of 2168.33, the best (grade0-1 | grade2: 2350.63; years
  // <= 8: 3933.5), so a grade2 profile first takes "grade >= grade1".
  assert.equal(steps[0].condition, "grade >= grade1");
});

Deno.test("makeDataset keeps identifiers, constants and protected attributes out by default", () => {
  const table = loadTable(
    "emp_id,gender,country,level,years,pay\n" +
      "e1,F,Ruritania,L1,2,50\ne2,M,Ruritania,L2,5,60\ne3,F,Ruritania,L2,,61\ne4,M,Ruritania,L1,1,\n",
    { types: { emp_id: "identifier" } },
  );
  const { dataset, dropped, rowIndex } = makeDataset(table, { target: "pay" });
  assert.deepEqual(dataset.features.map((f) => `${f.name}:${f.kind}`), [
    "level:ordinal",
    "years:numeric",
  ]);
  assert.deepEqual(dropped, [
    { name: "emp_id", reason: "identifier" },
    { name: "gender", reason: "protected attribute" },
    { name: "country", reason: "constant" },
  ]);
  assert.deepEqual([...rowIndex], [0, 1, 2]); // the row with no pay is left out
  assert.ok(Number.isNaN(dataset.features[1].values[2]));
  const allowed = makeDataset(table, { target: "pay", allowProtected: true });
  assert.ok(allowed.dataset.features.some((f) => f.name === "gender"));
  assert.throws(
    () => makeDataset(table, { target: "pay", features: ["gender"] }),
    /"gender" is a protected attribute; it is kept out of pay estimates unless you pass allowProtected/,
  );
  const levelTarget = makeDataset(table, { target: "level" });
  assert.equal(levelTarget.dataset.target.kind, "classification");
});

Deno.test("bad arguments are refused with a RangeError", () => {
  assert.throws(
    () => classificationMetrics([0, 3], [0, 1], 3),
    /class code 3 at 1 is not in \[0, 3\)/,
  );
  assert.throws(() => classificationMetrics([], [], 2), /non-empty/);
  assert.throws(() => makeRng(1.5), /whole number/);
  assert.throws(() => makeRng(2 ** 31), /whole number/);
  const dataset = regression([numeric("x", [1, 2, 3])], [1, NaN, 3]);
  assert.throws(() => growTree({ dataset, bins: binFeatures(dataset) }), /target of row 1 is NaN/);
  const ok = regression([numeric("x", [1, 2, 3])], [1, 2, 3]);
  const bins = binFeatures(ok);
  assert.throws(
    () => growTree({ dataset: ok, bins, weights: new Float64Array([1, Infinity, 1]) }),
    /weight of row 1/,
  );
  assert.throws(
    () => growTree({ dataset: ok, bins }, { minLeaf: 1.5 }),
    /minLeaf must be a whole number/,
  );
  assert.throws(() => growTree({ dataset: ok, bins }, { maxDepth: -1 }), /maxDepth/);
});

Deno.test("batch predictions give class shares for a classification tree", () => {
  const dataset = {
    rows: 6,
    features: [numeric("years", [1, 2, 3, 8, 9, 10])],
    target: {
      kind: "classification" as const,
      name: "level",
      classes: ["L1", "L2"],
      values: Int32Array.from([0, 0, 1, 1, 1, 1]),
    },
  };
  const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 3 });
  // Split at 5.5: left {L1, L1, L2}, right {L2, L2, L2}.
  assert.deepEqual([...predictRows(tree, dataset.features, 6)], [
    2 / 3,
    1 / 3,
    2 / 3,
    1 / 3,
    2 / 3,
    1 / 3,
    0,
    1,
    0,
    1,
    0,
    1,
  ]);
});
