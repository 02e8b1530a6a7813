// Possible proxies: a feature that alone predicts a protected attribute is
// named in the model with its out-of-bag balanced accuracy, which must equal
// the mean per-group recall of the out-of-bag class votes counted here.
import assert from "node:assert/strict";
import {
  fitEnsemble,
  fitModel,
  loadTable,
  loadTableFile,
  makeDataset,
  makeRng,
  modelFromText,
  modelToText,
  randomInt,
} from "../../../mod.ts";
import fc from "fast-check";
import type { Dataset, Feature } from "../../../lib/dataset/types.ts";
import {
  oneFeatureOutOfBag,
  proxyFigures,
  proxyFigureSets,
} from "../../../lib/ensemble/proxies.ts";
import { shiftTable } from "./_shift_table.ts";

Deno.test("a feature that carries a protected attribute is named, with its balanced accuracy", async () => {
  const table = loadTable(shiftTable(), { target: "pay", file: "shift.csv" });
  const model = await fitModel(table, { target: "pay", trees: 20, folds: 5, workers: 1 });
  assert.ok(model.features.every((f) => f.name !== "sex"));
  assert.deepEqual(model.proxies!.map((p) => [p.feature, p.attribute]), [["shift", "sex"]]);
  const figure = model.proxies![0].balancedAccuracy;

  // Recount: 50 trees on shift alone (the proxy check's settings), each
  // row's out-of-bag class is the larger averaged share; recall per sex.
  const sex = table.columns.find((c) => c.name === "sex")!;
  const shift = table.columns.find((c) => c.name === "shift")!;
  if (sex.type !== "categorical" || shift.type !== "categorical") {
    throw new Error("levels expected");
  }
  const ensemble = fitEnsemble({
    rows: table.rows,
    features: [{
      name: "shift",
      kind: "categorical",
      levels: shift.levels,
      values: Float64Array.from(shift.codes),
    }],
    target: { kind: "classification", name: "sex", classes: sex.levels, values: sex.codes },
  }, { trees: 50, seed: 1, prune: "none", grow: { minLeaf: 5 } });
  const right = [0, 0];
  const total = [0, 0];
  for (let r = 0; r < table.rows; r++) {
    if (ensemble.oobTrees[r] === 0) continue;
    const guess = ensemble.oob[2 * r + 1] > ensemble.oob[2 * r] ? 1 : 0;
    total[sex.codes[r]]++;
    if (guess === sex.codes[r]) right[sex.codes[r]]++;
  }
  const recount = (right[0] / total[0] + right[1] / total[1]) / 2;
  // Kept to 4 significant digits, as every figure over people (shareable_figures.ts).
  assert.equal(figure, Number(recount.toPrecision(4)), `${figure} vs ${recount}`);
  // 85% of people follow the pattern, the rest split evenly: about 0.92.
  assert.ok(figure > 0.85 && figure < 0.97, `${figure}`);

  // The figure survives the model file.
  const again = modelFromText(modelToText(model), "shift.model.json");
  assert.deepEqual(again.proxies, model.proxies);
});

Deno.test("a model without protected columns names no proxies", async () => {
  const table = loadTable(
    shiftTable().replace(/^id,sex,/, "id,team,"),
    { target: "pay", file: "shift.csv" },
  );
  const model = await fitModel(table, {
    target: "pay",
    drop: ["team"],
    trees: 10,
    folds: 5,
    workers: 1,
  });
  assert.deepEqual(model.proxies, []);
});

Deno.test("proxyFigureSets: each attribute's figures as proxyFigures gives them alone", () => {
  const rng = makeRng(5);
  const n = 300;
  const sex = Int32Array.from({ length: n }, () => randomInt(rng, 0, 1));
  const age = Int32Array.from({ length: n }, () => randomInt(rng, 0, 2));
  const shift = Float64Array.from(sex, (s) => (randomInt(rng, 0, 9) < 8 ? s : 1 - s));
  const years = Float64Array.from(age, (a) => 5 * a + randomInt(rng, 0, 6));
  const features = [
    { name: "shift", kind: "numeric" as const, values: shift },
    { name: "years", kind: "numeric" as const, values: years },
  ];
  const questions = [
    { features, attribute: sex, groups: ["F", "M"], attributeName: "sex" },
    { features, attribute: age, groups: ["young", "middle", "old"], attributeName: "age" },
  ];
  const together = proxyFigureSets(questions, { trees: 12, seed: 3 });
  for (const [i, q] of questions.entries()) {
    const alone = proxyFigures(q.features, q.attribute, q.groups, q.attributeName, {
      trees: 12,
      seed: 3,
    });
    assert.deepEqual(together[i], alone);
  }
  assert.equal(together[0][0].feature, "shift");
  assert.equal(together[1][0].feature, "years");
});

// The bins-grown ensemble against fitEnsemble's own: the out-of-bag shares
// of every row, bit for bit, and so every balanced accuracy.
function assertSameVotes(feature: Feature, groups: Int32Array, classes: number, trees: number) {
  const dataset: Dataset = {
    rows: groups.length,
    features: [feature],
    target: {
      kind: "classification",
      name: "g",
      classes: Array.from({ length: classes }, (_, i) => `g${i}`),
      values: groups,
    },
  };
  const expected = fitEnsemble(dataset, { trees, seed: 1, prune: "none", grow: { minLeaf: 5 } });
  const [actual] = oneFeatureOutOfBag([feature], groups, classes, trees, 1, 5);
  assert.deepEqual(actual.oobTrees, expected.oobTrees, feature.name);
  assert.deepEqual(actual.oob, expected.oob, feature.name);
}

Deno.test("one-feature ensembles from bins: fitEnsemble's out-of-bag votes on random tables", () => {
  fc.assert(
    fc.property(
      fc.integer({ min: 20, max: 200 }),
      fc.integer({ min: 2, max: 4 }),
      fc.constantFrom<Feature["kind"]>("numeric", "categorical", "ordinal"),
      fc.integer({ min: 1, max: 20 }),
      fc.integer(),
      (rows, classes, kind, levels, seed) => {
        const rng = makeRng(seed);
        const codes = Float64Array.from(
          { length: rows },
          () => (randomInt(rng, 0, 9) === 0 ? NaN : randomInt(rng, 0, levels - 1)),
        );
        // The group follows the value more often than not.
        const groups = Int32Array.from(
          codes,
          (v) =>
            randomInt(rng, 0, 2) === 0 || Number.isNaN(v)
              ? randomInt(rng, 0, classes - 1)
              : v % classes,
        );
        const names = Array.from({ length: levels }, (_, i) => `L${i}`);
        const values = kind === "numeric" ? codes.map((v) => v * 1.7 + 0.3) : codes;
        const feature: Feature = kind === "numeric"
          ? { name: "x", kind, values }
          : { name: "x", kind, levels: names, values };
        assertSameVotes(feature, groups, classes, 7);
      },
    ),
    { numRuns: 150, seed: 4122026 },
  );
});

Deno.test("one-feature ensembles from bins: fitEnsemble's votes on the demo and on CPS1988 (AER)", async () => {
  // The two tables whose proxy checks the JSON baseline and the README show;
  // the default 50 trees, every feature against the protected column.
  for (
    const [file, target, attribute] of [
      ["fixtures/demo_company.csv", "base_pay_eur", "gender"],
      ["fixtures/cps1988.csv", "wage", "ethnicity"],
    ]
  ) {
    const table = await loadTableFile(file, { target });
    const column = table.columns.find((c) => c.name === attribute)!;
    assert(column.type === "categorical");
    const groups = Int32Array.from(column.codes);
    assert(groups.every((g) => g >= 0));
    const { dataset } = makeDataset(table, { target });
    assert(dataset.rows === groups.length && dataset.features.length >= 5);
    for (const feature of dataset.features) {
      assertSameVotes(feature, groups, column.levels.length, 50);
    }
  }
});
