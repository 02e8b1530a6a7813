/**
 * An invented pay table for coverage checks: levels 1 to 7 whose log-pay
 * noise has standard deviation 0.05 + 0.02 x level, so spread grows with
 * level. The true mean of log pay is known for every row.
 *
 * @module
 */

import { makeRng, randomInt } from "../../../mod.ts";
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
