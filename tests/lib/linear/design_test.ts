import assert from "node:assert/strict";
import type { Dataset, Feature } from "../../../lib/dataset/types.ts";
import { designOf } from "../../../lib/linear/design.ts";

function dataset(features: Feature[]): Dataset {
  const rows = features[0]?.values.length ?? 0;
  return {
    rows,
    features,
    target: { kind: "regression", name: "pay", values: new Float64Array(rows) },
  };
}

Deno.test("a numeric feature without missing values is one column, as given", () => {
  const design = designOf(
    dataset([{ name: "years", kind: "numeric", values: Float64Array.of(1, 5, 2) }]),
  );
  assert.deepEqual(design.names, ["years"]);
  assert.deepEqual(design.terms, [{ feature: "years", kind: "value" }]);
  assert.deepEqual(Array.from(design.columns[0]), [1, 5, 2]);
});

Deno.test("missing numbers take the mean of the others and get a 0/1 marker column", () => {
  const values = Float64Array.of(2, NaN, 6, NaN, 10);
  const design = designOf(dataset([{ name: "years", kind: "numeric", values }]));
  // Mean of 2, 6 and 10 is 6.
  assert.deepEqual(design.names, ["years", "years missing"]);
  assert.deepEqual(Array.from(design.columns[0]), [2, 6, 6, 6, 10]);
  assert.deepEqual(Array.from(design.columns[1]), [0, 1, 0, 1, 0]);
  assert.deepEqual(design.terms, [
    { feature: "years", kind: "value" },
    { feature: "years", kind: "missing" },
  ]);
  // The feature's own values are not changed.
  assert.ok(Number.isNaN(values[1]));
});

Deno.test("a feature with every value missing is 0 with a marker of ones", () => {
  const design = designOf(
    dataset([{ name: "rating", kind: "numeric", values: Float64Array.of(NaN, NaN) }]),
  );
  assert.deepEqual(Array.from(design.columns[0]), [0, 0]);
  assert.deepEqual(Array.from(design.columns[1]), [1, 1]);
});

Deno.test("an ordinal feature is its level rank", () => {
  const design = designOf(dataset([
    {
      name: "level",
      kind: "ordinal",
      levels: ["L1", "L2", "L3"],
      values: Float64Array.of(2, 0, 1),
    },
  ]));
  assert.deepEqual(design.names, ["level"]);
  assert.deepEqual(Array.from(design.columns[0]), [2, 0, 1]);
});

Deno.test("a categorical feature is a 0/1 column per level present but the most frequent", () => {
  // Levels A, B, C, D; counts A 1, B 3, C 2, D 0: B is the base, D has nobody.
  const values = Float64Array.of(1, 0, 2, 1, 2, 1);
  const design = designOf(dataset([
    { name: "site", kind: "categorical", levels: ["A", "B", "C", "D"], values },
  ]));
  assert.deepEqual(design.names, ["site=A", "site=C"]);
  assert.deepEqual(Array.from(design.columns[0]), [0, 1, 0, 0, 0, 0]);
  assert.deepEqual(Array.from(design.columns[1]), [0, 0, 1, 0, 1, 0]);
  assert.deepEqual(design.terms, [
    { feature: "site", kind: "level", level: "A" },
    { feature: "site", kind: "level", level: "C" },
  ]);
});

Deno.test("a missing level is a level of its own, and a tie goes to the first level", () => {
  // A 2, B 2, missing 1: A and B tie, A (first) is the base.
  const values = Float64Array.of(0, 1, NaN, 1, 0);
  const design = designOf(
    dataset([{ name: "site", kind: "categorical", levels: ["A", "B"], values }]),
  );
  assert.deepEqual(design.names, ["site=B", "site=(missing)"]);
  assert.deepEqual(Array.from(design.columns[1]), [0, 0, 1, 0, 0]);
  assert.deepEqual(design.terms[1], { feature: "site", kind: "level", level: null });
  // Missing as the most frequent: it is the base, and every level gets a column.
  const mostlyMissing = designOf(dataset([
    {
      name: "site",
      kind: "categorical",
      levels: ["A", "B"],
      values: Float64Array.of(NaN, NaN, 0, 1),
    },
  ]));
  assert.deepEqual(mostlyMissing.names, ["site=A", "site=B"]);
});

Deno.test("features keep their order; an empty dataset has no columns", () => {
  const design = designOf(dataset([
    { name: "site", kind: "categorical", levels: ["A", "B"], values: Float64Array.of(0, 1, 0) },
    { name: "years", kind: "numeric", values: Float64Array.of(1, NaN, 3) },
  ]));
  assert.deepEqual(design.names, ["site=B", "years", "years missing"]);
  assert.ok(design.columns.every((c) => c.length === 3));
  assert.deepEqual(designOf(dataset([])), { names: [], columns: [], terms: [] });
  // One row: a categorical feature with one level has no column.
  const one = designOf(
    dataset([{ name: "site", kind: "categorical", levels: ["A"], values: Float64Array.of(0) }]),
  );
  assert.deepEqual(one.names, []);
});

Deno.test("hostile level names are kept in the names as data", () => {
  const design = designOf(dataset([
    {
      name: "=cmd",
      kind: "categorical",
      levels: ["\u001b[2J", "x"],
      values: Float64Array.of(1, 1, 0),
    },
  ]));
  assert.deepEqual(design.names, ["=cmd=\u001b[2J"]);
});
