/**
 * One small model of the invented demo table, fitted once and shared by the
 * model tests (60 trees, 5 folds: quick, and enough for every figure).
 *
 * @module
 */

import { fitModel, loadTableFile, type Model } from "../../../mod.ts";
import type { LoadTableOptions, Table } from "../../../mod.ts";

/** The demo table's path. */
export const DEMO_PATH = new URL("../../../fixtures/demo_company.csv", import.meta.url).pathname;

/** How the demo table is read. */
export const DEMO_LOAD: LoadTableOptions = {
  target: "base_pay_eur",
  currency: "EUR",
  periods: { base_pay_eur: "year" },
};

let cached: { table: Table; model: Model } | undefined;

/** The demo table and a model of it (fixed clock, so the model is reproducible). */
export async function demoModel(): Promise<{ table: Table; model: Model }> {
  if (cached) return cached;
  const table = await loadTableFile(DEMO_PATH, DEMO_LOAD);
  const model = await fitModel(table, {
    target: "base_pay_eur",
    trees: 60,
    folds: 5,
    seed: 3,
    workers: 2,
    loadOptions: DEMO_LOAD,
    now: () => "2026-12-02T00:00:00.000Z",
  });
  cached = { table, model };
  return cached;
}
