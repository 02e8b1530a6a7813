/**
 * The invented tables of the gap decomposition's check (issue 17): log pay
 * linear in level, years and site, a planted group effect, and the group
 * concentrated in the lower levels, so that group and level go together.
 *
 * The pay rule (log pay): 10.4 + 0.12 (level - 1) + 0.01 years + the site's
 * premium (North 0, South 0.05, East -0.03) - 0.06 for group Q + noise with
 * standard deviation 0.10. Group Q's share is 0.75 at L1 and 0.10 less per
 * level up to 0.25 at L6; years and site do not depend on the group.
 *
 * @module
 */

import { loadTable, makeRng, randomInt } from "../../../mod.ts";
import { payRows } from "../../../lib/model/pay_pipeline.ts";
import { designOf } from "../../../lib/linear/design.ts";
import { fitLeastSquares } from "../../../lib/linear/least_squares.ts";
import { decomposeGap, type GapDecomposition } from "../../../lib/gap/decompose_gap.ts";

/** The planted group effect on log pay (Q earns exp(-0.06), about 5.8%, less). */
export const PLANTED_EFFECT = 0.06;
const SITES = ["North", "South", "East"];
const SITE_PREMIUM = [0, 0.05, -0.03];

/**
 * One table as CSV text (columns person, level, years, site, group, pay).
 *
 * @param seed The table's seed.
 * @param people How many people.
 */
export function linearGapCsv(seed: number, people = 2000): string {
  const rng = makeRng(seed);
  const u = () => (randomInt(rng, 0, 2 ** 30 - 1) + 0.5) / 2 ** 30;
  const normal = () => Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u());
  const lines = ["person,level,years,site,group,pay"];
  for (let i = 0; i < people; i++) {
    const level = 1 + Math.floor(u() * 6);
    const q = u() < 0.75 - 0.1 * (level - 1);
    const years = Math.round(u() * 300) / 10;
    const site = Math.floor(u() * 3);
    const logPay = 10.4 + 0.12 * (level - 1) + 0.01 * years + SITE_PREMIUM[site] -
      (q ? PLANTED_EFFECT : 0) + 0.1 * normal();
    lines.push(
      `P${String(i + 1).padStart(5, "0")},L${level},${years},${SITES[site]},${q ? "Q" : "P"},` +
        Math.exp(logPay).toFixed(2),
    );
  }
  return lines.join("\n") + "\n";
}

/** One table's decomposition beside the pooled linear one. */
export interface LinearGapRun {
  /** The table's seed. */
  seed: number;
  /** The trees' decomposition of Q's gap against P. */
  trees: GapDecomposition;
  /** Per attribute: pooled least-squares coefficients times the difference of the groups' means. */
  linear: Record<string, number>;
  /** The pooled least-squares coefficient of group Q, negated (the gap it plants). */
  linearUnexplained: number;
}

/**
 * Decomposes one table's gap with the trees and with pooled least squares
 * (log pay on level as its number, years, site and the group).
 */
export async function linearGapRun(
  seed: number,
  trees = 200,
  chanceMinLeaf?: number,
  more: { contributionTrees?: number; prune?: "none" | "alpha-min" } = {},
): Promise<LinearGapRun> {
  const table = loadTable(linearGapCsv(seed), { target: "pay" });
  const { dataset } = payRows(table, {
    target: "pay",
    drop: ["person", "group"],
    scale: "log",
  });
  const groupColumn = table.columns.find((c) => c.name === "group");
  if (groupColumn?.type !== "categorical") throw new Error("group is not categorical");
  const groups = ["P", "Q"];
  const groupCode = Int32Array.from(
    groupColumn.codes,
    (c) => groups.indexOf(groupColumn.levels[c]),
  );
  const report = await decomposeGap({
    dataset,
    group: "group",
    groups,
    groupCode,
    trees,
    seed: 1,
    workers: 2,
    chanceMinLeaf,
    ...more,
  });

  // Pooled least squares; the design takes the ordinal level as its rank.
  const design = designOf({
    ...dataset,
    features: [...dataset.features, {
      name: "group",
      kind: "categorical",
      levels: groups,
      values: Float64Array.from(groupCode),
    }],
  });
  const fit = fitLeastSquares(design, dataset.target.values);
  const linear: Record<string, number> = {};
  let unexplained = NaN;
  design.terms.forEach((term, k) => {
    const count = [0, 0];
    const sum = [0, 0];
    for (let r = 0; r < dataset.rows; r++) {
      count[groupCode[r]]++;
      sum[groupCode[r]] += design.columns[k][r];
    }
    const difference = sum[0] / count[0] - sum[1] / count[1];
    const coefficient = fit.coefficients[k + 1]; // after the intercept
    if (term.feature === "group") unexplained = coefficient * difference;
    else linear[term.feature] = (linear[term.feature] ?? 0) + coefficient * difference;
  });
  return { seed, trees: report.groups[0], linear, linearUnexplained: unexplained };
}

/** What the 20 tables say together. */
export interface LinearGapSummary {
  /** Intervals of the unexplained part that hold the planted effect. */
  covered: number;
  /** Mean and standard deviation of the unexplained part over the tables. */
  meanUnexplained: number;
  sdUnexplained: number;
  /** Mean of the group's difference before the correction. */
  meanPlugIn: number;
  /** The largest difference, over tables and attributes, of a tree part from least squares'. */
  largestLinearGap: number;
}

/** Sums up runs of {@linkcode linearGapRun}. */
export function summarise(runs: LinearGapRun[]): LinearGapSummary {
  const values = runs.map((r) => r.trees.unexplained.value);
  const mean = values.reduce((a, b) => a + b, 0) / values.length;
  const sd = Math.sqrt(values.reduce((a, v) => a + (v - mean) ** 2, 0) / (values.length - 1));
  let largest = 0;
  for (const run of runs) {
    for (const { attribute, part } of run.trees.explained) {
      largest = Math.max(largest, Math.abs(part - run.linear[attribute]));
    }
  }
  return {
    covered:
      runs.filter((r) =>
        r.trees.unexplained.low <= PLANTED_EFFECT && PLANTED_EFFECT <= r.trees.unexplained.high
      ).length,
    meanUnexplained: mean,
    sdUnexplained: sd,
    meanPlugIn: runs.reduce((a, r) => a + r.trees.unexplained.plugIn, 0) / runs.length,
    largestLinearGap: largest,
  };
}
