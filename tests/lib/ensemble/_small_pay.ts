/**
 * A small invented pay table as a dataset (72 rows: years, a site and pay
 * with a step at 10 years, a site premium and a fixed wobble), quick to fit
 * for the ensemble tests; and a class version of it.
 *
 * @module
 */

import type { Dataset } from "../../../mod.ts";

const ROWS = 72;
const years = Float64Array.from({ length: ROWS }, (_, i) => i % 24);
const site = Float64Array.from({ length: ROWS }, (_, i) => (i * 7) % 3);

/** Pay on the log scale by years and site. */
export function smallPay(): Dataset {
  return {
    rows: ROWS,
    features: [
      { name: "years", kind: "numeric", values: years },
      { name: "site", kind: "categorical", levels: ["North", "South", "East"], values: site },
    ],
    target: {
      kind: "regression",
      name: "pay",
      values: Float64Array.from(
        years,
        (y, i) =>
          10.5 + (y >= 10 ? 0.3 : 0) + 0.02 * y + (site[i] === 2 ? 0.1 : 0) +
          (((i * 37) % 11) - 5) / 25,
      ),
    },
  };
}

/** The same rows with a class target: senior from 12 years (a few exceptions). */
export function smallLevels(): Dataset {
  return {
    ...smallPay(),
    target: {
      kind: "classification",
      name: "level",
      classes: ["junior", "senior"],
      values: Int32Array.from(years, (y, i) => (y >= 12 !== (i % 13 === 0) ? 1 : 0)),
    },
  };
}
