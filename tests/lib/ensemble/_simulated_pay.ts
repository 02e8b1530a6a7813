/**
 * An invented pay table for coverage checks: levels 1 to 7 whose log-pay
 * noise has standard deviation 0.05 + 0.02 x level, so spread grows with
 * level. The true mean of log pay is known for every row.
 *
 * @module
 */

import {
  fitDefaultEnsemble,
  groupedRange,
  groupResiduals,
  leafMembers,
  makeRng,
  mean,
  oobResiduals,
  quantileForestRange,
  randomInt,
  residualRange,
  treeEstimates,
} from "../../../mod.ts";
import type { Dataset } from "../../../mod.ts";

/** The simulated rows: dataset on the chosen scale, plus the truth. */
export interface SimulatedPay {
  dataset: Dataset;
  /** Level (1..7) of each row. */
  level: Int32Array;
  /** Pay in money. */
  pay: Float64Array;
  /** True mean of log pay of each row's profile. */
  meanLogPay: Float64Array;
}

/** `perLevel` rows for each of the 7 levels, seeded. */
export function simulatePay(perLevel: number, seed: number): SimulatedPay {
  const rng = makeRng(seed);
  const uniform = () => randomInt(rng, 1, 2 ** 30) / (2 ** 30 + 1);
  const normal = () => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform());
  const rows = 7 * perLevel;
  const level = new Int32Array(rows);
  const years = new Float64Array(rows);
  const site = new Float64Array(rows);
  const pay = new Float64Array(rows);
  const meanLogPay = new Float64Array(rows);
  for (let r = 0; r < rows; r++) {
    level[r] = 1 + (r % 7);
    years[r] = randomInt(rng, 0, 30);
    site[r] = randomInt(rng, 0, 2);
    meanLogPay[r] = 10.4 + 0.2 * level[r] + 0.015 * Math.min(years[r], 20) + 0.06 * site[r];
    pay[r] = Math.exp(meanLogPay[r] + (0.05 + 0.02 * level[r]) * normal());
  }
  const dataset: Dataset = {
    rows,
    features: [
      {
        name: "level",
        kind: "ordinal",
        levels: ["L1", "L2", "L3", "L4", "L5", "L6", "L7"],
        values: Float64Array.from(level, (l) => l - 1),
      },
      { name: "years", kind: "numeric", values: years },
      { name: "site", kind: "categorical", levels: ["North", "Harbor", "Ridge"], values: site },
    ],
    target: { kind: "regression", name: "pay", values: pay },
  };
  return { dataset, level, pay, meanLogPay };
}

/** Coverage of a 90% range overall and per level (index 0 = level 1). */
export interface LevelCoverage {
  overall: number;
  perLevel: number[];
}

/** The ranges compared: one residual set, grouped residuals, forest weights. */
export type RangeMethod = "one-set" | "grouped" | "quantile-forest";

/**
 * Fits the default ensemble (200 trees, seed 3, two workers) on `train`'s
 * pay on the given scale and measures how often the 90% range of `method`
 * holds `test`'s pay, overall and per level.
 */
export async function coverageByLevel(
  train: SimulatedPay,
  test: SimulatedPay,
  scale: "log" | "raw",
  method: RangeMethod,
): Promise<LevelCoverage> {
  const forward = scale === "log" ? Math.log : (x: number) => x;
  const back = scale === "log" ? Math.exp : (x: number) => x;
  const dataset: Dataset = {
    ...train.dataset,
    target: { kind: "regression", name: "pay", values: train.pay.map(forward) },
  };
  const ensemble = (await fitDefaultEnsemble(dataset, { trees: 200, seed: 3, workers: 2 }))
    .ensemble!;
  const residuals = oobResiduals(ensemble, dataset.target.values);
  const groups = groupResiduals(ensemble.oob, dataset.target.values, 10);
  const members = method === "quantile-forest" ? leafMembers(ensemble, dataset) : undefined;
  const hits = new Float64Array(8);
  const counts = new Float64Array(8);
  for (let r = 0; r < test.dataset.rows; r++) {
    const profile = test.dataset.features.map((f) => f.values[r]);
    const estimate = mean(treeEstimates(ensemble, profile));
    const range = method === "grouped"
      ? groupedRange(estimate, groups, 0.9)
      : method === "quantile-forest"
      ? quantileForestRange(ensemble, members!, profile, 0.9)
      : residualRange(estimate, residuals, 0.9);
    hits[test.level[r]] += test.pay[r] >= back(range.low) && test.pay[r] <= back(range.high)
      ? 1
      : 0;
    counts[test.level[r]]++;
  }
  return {
    overall: hits.reduce((a, b) => a + b, 0) / counts.reduce((a, b) => a + b, 0),
    perLevel: Array.from({ length: 7 }, (_, i) => hits[i + 1] / counts[i + 1]),
  };
}

/**
 * The simulated rows as a pay table's CSV (level L1..L7, years, site,
 * pay_eur), for checks that run the shipped path from a table.
 */
export function simulatedCsv(sim: SimulatedPay): string {
  const [level, years, site] = sim.dataset.features;
  const lines = ["level,years,site,pay_eur"];
  for (let r = 0; r < sim.dataset.rows; r++) {
    lines.push(
      `${level.levels![level.values[r]]},${years.values[r]},${site.levels![site.values[r]]},` +
        `${sim.pay[r].toFixed(2)}`,
    );
  }
  return lines.join("\n") + "\n";
}
