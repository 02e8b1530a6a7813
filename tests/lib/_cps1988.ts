/**
 * CPS1988 (R package AER; fixtures/README.md) as the learner sees it by
 * default: log weekly wage on education, experience, smsa, region and
 * parttime (ethnicity, a protected attribute, left out), and seeded
 * train/held-out splits of it.
 *
 * @module
 */

import { loadTableFile, makeDataset, makeRng, shuffle } from "../../mod.ts";
import type { Dataset } from "../../mod.ts";

/** The dataset with log wage as its target. */
export async function cps1988LogWage(): Promise<Dataset> {
  const table = await loadTableFile(
    new URL("../../fixtures/cps1988.csv", import.meta.url).pathname,
    { target: "wage" },
  );
  const { dataset } = makeDataset(table, { target: "wage" });
  if (dataset.target.kind !== "regression") throw new Error("regression expected");
  dataset.target.values = dataset.target.values.map(Math.log);
  return dataset;
}

/** The rows of `dataset` at `rows`, in that order. */
export function subsetRows(dataset: Dataset, rows: readonly number[]): Dataset {
  const target = dataset.target;
  if (target.kind !== "regression") throw new Error("regression expected");
  return {
    rows: rows.length,
    features: dataset.features.map((f) => ({
      ...f,
      values: Float64Array.from(rows, (r) => f.values[r]),
    })),
    target: { ...target, values: Float64Array.from(rows, (r) => target.values[r]) },
  };
}

/** A seeded split: `share` of the rows (shuffled) to train, the rest held out. */
export function heldOutSplit(
  dataset: Dataset,
  seed: number,
  share = 0.8,
): { train: Dataset; test: Dataset } {
  const order = shuffle(Array.from({ length: dataset.rows }, (_, i) => i), makeRng(seed));
  const cut = Math.floor(dataset.rows * share);
  return {
    train: subsetRows(dataset, order.slice(0, cut)),
    test: subsetRows(dataset, order.slice(cut)),
  };
}
