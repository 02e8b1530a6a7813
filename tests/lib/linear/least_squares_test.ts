// The linear baseline against R's lm() on the Mincer-type model of the
// example on AER's ?CPS1988 help page: log(wage) ~ experience +
// experience^2 + education + ethnicity. Fixture written by
// tests/reference/lm_cps1988.R (R 4.2.2, AER 1.2-10).
import assert from "node:assert/strict";
import {
  assignFolds,
  crossValidatedLinearPredictions,
  designOf,
  fitLeastSquares,
  loadTableFile,
} from "../../../mod.ts";
import { cps1988LogWage } from "../_cps1988.ts";

const reference = JSON.parse(
  await Deno.readTextFile(new URL("../../../fixtures/reference/lm_cps1988.json", import.meta.url)),
);

Deno.test("least squares on CPS1988 reproduces R's lm coefficients to 1e-10", async () => {
  const table = await loadTableFile(
    new URL("../../../fixtures/cps1988.csv", import.meta.url).pathname,
  );
  const column = (name: string) => table.columns.find((c) => c.name === name)!;
  const wage = column("wage");
  const experience = column("experience");
  const education = column("education");
  const ethnicity = column("ethnicity");
  assert.ok(wage.type === "numeric" && experience.type === "numeric");
  assert.ok(education.type === "numeric" && ethnicity.type === "categorical");
  const afam = ethnicity.levels.indexOf("afam");
  const fit = fitLeastSquares(
    {
      names: ["experience", "I(experience^2)", "education", "ethnicityafam"],
      columns: [
        experience.values,
        experience.values.map((x) => x * x),
        education.values,
        Float64Array.from(ethnicity.codes, (c) => (c === afam ? 1 : 0)),
      ],
    },
    wage.values.map(Math.log),
  );
  fit.names.forEach((name, j) => {
    const expected = reference.coefficients[name];
    assert.ok(expected, name);
    const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);
    assert.ok(
      rel(fit.coefficients[j], expected.estimate) < 1e-10,
      `${name} ${fit.coefficients[j]}`,
    );
    assert.ok(
      rel(fit.standardErrors[j], expected.se) < 1e-10,
      `${name} se ${fit.standardErrors[j]}`,
    );
  });
  assert.ok(Math.abs(fit.residualSd - reference.residualSd) / reference.residualSd < 1e-10);
});

Deno.test("the design dummy-codes levels against the most frequent one and marks missing numbers", () => {
  const design = designOf({
    rows: 5,
    features: [
      {
        name: "site",
        kind: "categorical",
        levels: ["A", "B", "C"],
        values: new Float64Array([0, 1, 1, 2, NaN]),
      },
      { name: "years", kind: "numeric", values: new Float64Array([1, NaN, 3, 5, 7]) },
    ],
    target: { kind: "regression", name: "pay", values: new Float64Array(5) },
  });
  assert.deepEqual(design.names, ["site=A", "site=C", "site=(missing)", "years", "years missing"]);
  assert.deepEqual(design.terms, [
    { feature: "site", kind: "level", level: "A" },
    { feature: "site", kind: "level", level: "C" },
    { feature: "site", kind: "level", level: null },
    { feature: "years", kind: "value" },
    { feature: "years", kind: "missing" },
  ]);
  assert.deepEqual([...design.columns[0]], [1, 0, 0, 0, 0]);
  assert.deepEqual([...design.columns[2]], [0, 0, 0, 0, 1]);
  assert.deepEqual([...design.columns[3]], [1, 4, 3, 5, 7]);
  assert.deepEqual([...design.columns[4]], [0, 1, 0, 0, 0]);
});

Deno.test("cross-validated predictions equal the least-squares fit of each fold's other rows", async () => {
  const dataset = await cps1988LogWage();
  const fold = assignFolds(dataset, 4, 11);
  const fast = crossValidatedLinearPredictions(dataset, fold);
  const design = designOf(dataset);
  const y = dataset.target.values;
  for (let k = 0; k < 4; k++) {
    const train: number[] = [];
    for (let r = 0; r < dataset.rows; r++) if (fold[r] !== k) train.push(r);
    // The fit checked against R's lm() above, on the other folds' rows.
    const fit = fitLeastSquares(
      {
        names: design.names,
        columns: design.columns.map((c) => Float64Array.from(train, (r) => c[r])),
      },
      Float64Array.from(train, (r) => y[r]),
    );
    for (let r = 0; r < dataset.rows; r++) {
      if (fold[r] !== k) continue;
      let expected = fit.coefficients[0];
      design.columns.forEach((c, j) => (expected += fit.coefficients[j + 1] * c[r]));
      assert.ok(Math.abs(fast[r] - expected) < 1e-9, `row ${r}: ${fast[r]} vs ${expected}`);
    }
  }
});
