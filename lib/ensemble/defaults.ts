/**
 * Defaults of the ensemble chosen by measurement; each names the committed
 * results file it comes from, and a test checks the two agree.
 *
 * @module
 */

/**
 * How the ensemble's trees are pruned by default: every tree at the alpha
 * with the lowest cross-validated error of the reference tree (not the 1-SE
 * alpha, which prunes harder than an average of trees needs). Chosen by the
 * lowest held-out RMSE relative to each table's best, averaged over two
 * tables. CPS1988, log wage: minimum-CV alpha 0.5279, own out-of-bag alpha
 * 0.5281, 1-SE alpha 0.5288, unpruned 0.5388. The invented demo table, log
 * base pay: unpruned 0.0639, minimum-CV alpha 0.0641, own out-of-bag alpha
 * 0.0655, 1-SE alpha 0.0666.
 * Sources: tests/results/prune_modes_cps1988.json, prune_modes_demo.json.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { fitDefaultEnsemble } from "./fit_default.ts";
 * import { DEFAULT_PRUNING } from "./defaults.ts";
 * const years = Array.from({ length: 60 }, (_, i) => i % 30);
 * const dataset = {
 *   rows: 60,
 *   features: [{ name: "years", kind: "numeric" as const, values: Float64Array.from(years) }],
 *   target: {
 *     kind: "regression" as const, name: "pay",
 *     values: Float64Array.from(years, (y, i) => 40 + y + (i % 7) / 2),
 *   },
 * };
 * const fitted = await fitDefaultEnsemble(dataset, { trees: 5, folds: 5, workers: 1 });
 * // Every tree pruned at the alpha of the reference tree's lowest cross-validated error.
 * const lowest = fitted.reference!.candidates.reduce((a, c) => (c.cvError < a.cvError ? c : a));
 * assert.equal(DEFAULT_PRUNING.alphaRule, "min");
 * assert(fitted.ensemble!.alphas.every((alpha) => alpha === lowest.alpha));
 * ```
 */
export const DEFAULT_PRUNING = { mode: "alpha", alphaRule: "min" } as const;

/**
 * The default range for one person's pay: out-of-bag residual quantiles
 * within groups of similar estimates, with money targets fitted on the log
 * scale. On an invented table whose spread grows with level, only this
 * combination kept the 90% range within 87-93% overall and 85-95% in every
 * level (three training draws averaged, 1,000 held-out rows per level:
 * overall 0.891, levels 0.861-0.911); one set of residuals for every
 * profile covered 0.59-1.00 by level on the raw scale and 0.72-0.99 on logs;
 * quantile regression forest weights covered 0.889 overall but 0.841 in the
 * top level on the raw scale (0.886 and 0.852 on logs), and they need the
 * training pay, which a model file does not keep.
 * Source: tests/results/range_coverage_sim.json.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import {
 *   demoCompanyCsv, estimateProfile, fitModel, loadTable, openModel, typicalProfile,
 * } from "../../mod.ts";
 * import { DEFAULT_RANGE } from "./defaults.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }));
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * assert.equal(model.target.scale, DEFAULT_RANGE.scale); // money: fitted on logs
 * const { range } = estimateProfile(openModel(model), typicalProfile(model));
 * assert.equal(range!.method, "out-of-bag residual quantiles of people with similar estimates");
 * ```
 */
export const DEFAULT_RANGE = { scale: "log", method: "grouped" } as const;

/**
 * Which "how sure" interval the estimate shows. On an invented table whose
 * true mean pay is known (700 held-out profiles, three training draws each
 * of 700 and 2,100 rows), the percentile interval of the trees' estimates
 * covered the true mean log pay in 89.9-99.0% of profiles at 200 trees
 * (nominal 90%: it measures one tree's variability, so it is wide, but the
 * ensemble's bias eats part of that); the infinitesimal jackknife interval
 * (estimate +/- 1.645 SE) covered only 72-80% there, and 77-91% even with
 * as many trees as rows, because it measures variance and not the bias of
 * averaging neighbours. So the percentile interval is shown; the jackknife
 * standard error is shown beside it only from `jackknifeFromTreesPerRow`
 * trees per training row, the first ratio at which its bias correction
 * overshot (variance below 0) for at most 1% of profiles in every draw
 * (at half a tree per row: up to 1.1%).
 * Source: tests/results/how_sure_sim.json.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import {
 *   demoCompanyCsv, estimateProfile, fitModel, loadTable, openModel, typicalProfile,
 * } from "../../mod.ts";
 * import { DEFAULT_HOW_SURE } from "./defaults.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 40, seed: 1 }));
 * const answer = async (trees: number) => {
 *   const model = await fitModel(table, { target: "base_pay_eur", trees, folds: 3, workers: 1 });
 *   return estimateProfile(openModel(model), typicalProfile(model));
 * };
 * const perRow = DEFAULT_HOW_SURE.jackknifeFromTreesPerRow;
 * const fewer = await answer(40 * perRow - 1);
 * assert.match(fewer.confidence!.method, /^percentile interval of the trees' estimates/);
 * assert.equal(fewer.jackknife, null);
 * assert.match((await answer(40 * perRow)).jackknife!.method, /infinitesimal jackknife/);
 * ```
 */
export const DEFAULT_HOW_SURE = { interval: "percentile", jackknifeFromTreesPerRow: 1 } as const;

/**
 * Whether the estimate is constrained by default to never fall along the
 * table's ordinal ladder (fit's `increasing`): no. Measured on held-out
 * rows (20%, three split seeds, the default recipe with and without): on
 * the demo table, along level, the unconstrained ensemble never fell for
 * any of 3 x 400 held-out people and the constraint raised held-out RMSE
 * of log pay by 3.1% (0.0681 -> 0.0701); on CPS1988, along education, the
 * unconstrained estimate fell somewhere for 73-90% of held-out people, and
 * the constraint cost 1.03% (0.5307 -> 0.5361). The rule set before the
 * runs, constrain by default only where it costs at most 1% on both
 * tables, is not met on either; a what-if or sweep whose estimate falls
 * says so and names the option instead.
 * Sources: tests/results/increasing_demo.json, increasing_cps1988.json.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { DEFAULT_INCREASING } from "./defaults.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 2 }), { target: "base_pay_eur" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 2, folds: 3, workers: 1 });
 * assert.equal(DEFAULT_INCREASING.ladder, false);
 * assert.deepEqual(model.settings.increasing, []);
 * ```
 */
export const DEFAULT_INCREASING = { ladder: false, maxCost: 0.01 } as const;

/**
 * Rows times trees from which a fit uses the machine's cores by default;
 * below, one thread. Starting two workers and warming their compiled code
 * costs more than they save on a small table. The whole default fit (200
 * trees) on one thread against two workers: the demo table (2,000 rows)
 * 0.78 against 1.00 s; the first 5,000 rows of CPS1988 0.94 against 1.06
 * s; its first 10,000 rows 1.82 against 1.63 s; all 28,155 4.92 against
 * 3.60 s. Source: bench/results/workers_by_rows.json (2 cores).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { defaultWorkers, WORKERS_FROM_ROW_TREES } from "./defaults.ts";
 * assert.equal(WORKERS_FROM_ROW_TREES, 2_000_000);
 * assert.equal(defaultWorkers(2_000, 200, 2), 1);
 * assert.equal(defaultWorkers(28_155, 200, 2), 2);
 * assert.equal(defaultWorkers(28_155, 200, 1), 1);
 * ```
 */
export const WORKERS_FROM_ROW_TREES = 2_000_000;

/**
 * The workers a fit uses when none are asked for: one per core from
 * {@linkcode WORKERS_FROM_ROW_TREES}, else 1 (this thread).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { defaultWorkers } from "./defaults.ts";
 * assert.equal(defaultWorkers(10_000, 200, 4), 4);
 * assert.equal(defaultWorkers(9_999, 200, 4), 1);
 * ```
 */
export function defaultWorkers(
  rows: number,
  trees: number,
  cores: number = navigator.hardwareConcurrency ?? 1,
): number {
  return rows * trees >= WORKERS_FROM_ROW_TREES ? Math.max(1, cores) : 1;
}
