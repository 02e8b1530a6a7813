/**
 * The invented demo table (fixtures/demo_company.csv) as the learner sees
 * it by default: log base pay on every feature paygrove keeps (the
 * identifier and the protected gender column left out).
 *
 * @module
 */

import { loadTableFile, makeDataset } from "../../mod.ts";
import type { Dataset } from "../../mod.ts";

/** The demo dataset with log base pay as its target. */
export async function demoLogPay(): Promise<Dataset> {
  const table = await loadTableFile(
    new URL("../../fixtures/demo_company.csv", import.meta.url).pathname,
    { target: "base_pay_eur" },
  );
  const { dataset } = makeDataset(table, { target: "base_pay_eur" });
  if (dataset.target.kind !== "regression") throw new Error("regression expected");
  dataset.target.values = dataset.target.values.map(Math.log);
  return dataset;
}
