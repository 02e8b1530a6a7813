// The ensemble's parts (lib/ensemble/contributions.ts): the trees' parts
// averaged, starting from the mean of the ensemble's predictions over the
// training table when the trees are shared copies (covers of every row);
// over a list of trees, from those trees' own base. Invented data.
import assert from "node:assert/strict";
import { applyValues, type Dataset, fitEnsemble } from "../../../mod.ts";
import { ContributionReader } from "../../../lib/ensemble/contributions.ts";
import { addContributions, ContributionSpace } from "../../../lib/tree/contributions.ts";

function table(rows: number): Dataset {
  const years = Float64Array.from({ length: rows }, (_, i) => (i * 7) % 23);
  const level = Float64Array.from({ length: rows }, (_, i) => (i * 5) % 4);
  const site = Float64Array.from({ length: rows }, (_, i) => (i * 3) % 3);
  return {
    rows,
    features: [
      { name: "years", kind: "numeric", values: years },
      { name: "level", kind: "ordinal", levels: ["L1", "L2", "L3", "L4"], values: level },
      { name: "site", kind: "categorical", levels: ["A", "B", "C"], values: site },
    ],
    target: {
      kind: "regression",
      name: "log_pay",
      values: years.map((y, i) => 10.5 + 0.02 * y + 0.15 * level[i] + (site[i] === 1 ? 0.05 : 0)),
    },
  };
}

Deno.test("shared trees: the base is the mean prediction over the training table", () => {
  const dataset = table(240);
  const ensemble = fitEnsemble(dataset, { trees: 12, prune: "none", share: {} });
  const reader = new ContributionReader(ensemble.shared!, 3);
  let mean = 0;
  for (let r = 0; r < dataset.rows; r++) {
    const profile = dataset.features.map((f) => f.values[r]);
    let sum = 0;
    for (const tree of ensemble.shared!) sum += tree.value[applyValues(tree, profile)];
    mean += sum / ensemble.shared!.length;
  }
  mean /= dataset.rows;
  assert.ok(Math.abs(reader.base - mean) <= 1e-12 * Math.abs(mean));
  // The grown trees' covers count only drawn rows: their base differs.
  const grown = new ContributionReader(ensemble.trees, 3);
  assert.ok(Math.abs(grown.base - mean) > 1e-6);
});

Deno.test("parts are the trees' parts averaged and add up to the prediction", () => {
  const dataset = table(200);
  const trees = fitEnsemble(dataset, { trees: 8, prune: "none", share: {} }).shared!;
  const reader = new ContributionReader(trees, 3);
  const profile = Float64Array.of(17, 3, 1);
  const { base, prediction, parts } = reader.profile(profile);
  const byHand = new Float64Array(3);
  const space = new ContributionSpace();
  for (const tree of trees) addContributions(tree, profile, byHand, 1 / trees.length, space);
  for (let j = 0; j < 3; j++) assert.ok(Math.abs(parts[j] - byHand[j]) <= 1e-12);
  assert.ok(Math.abs(base + parts[0] + parts[1] + parts[2] - prediction) <= 1e-12);
  // Level L4 and 17 years are above the table's average: positive parts.
  assert.ok(parts[0] > 0 && parts[1] > 0);
  // Over trees 1 and 6 alone: their mean prediction, from their own base.
  const two = reader.profile(profile, [1, 6]);
  const mean = (trees[1].value[applyValues(trees[1], profile)] +
    trees[6].value[applyValues(trees[6], profile)]) / 2;
  assert.ok(Math.abs(two.prediction - mean) <= 1e-12);
  assert.ok(Math.abs(two.base + two.parts.reduce((a, b) => a + b, 0) - mean) <= 1e-12);
  assert.throws(() => reader.profile(profile, []), /at least one tree/);
  assert.throws(() => new ContributionReader([], 3), /at least one tree/);
});
