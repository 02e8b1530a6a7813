/**
 * Defaults of the ensemble chosen by measurement; each names the committed
 * results file it comes from, and a test checks the two agree.
 *
 * @module
 */

/**
 * How the ensemble's trees are pruned by default: every tree at the alpha
 * with the lowest cross-validated error of the reference tree (not the 1-SE
 * alpha, which prunes harder than an average of trees needs).
 * Source: tests/results/prune_modes_cps1988.json (held-out RMSE on CPS1988,
 * log wage: minimum-CV alpha 0.5279, own out-of-bag alpha 0.5281, 1-SE alpha
 * 0.5289, unpruned 0.5389).
 */
export const DEFAULT_PRUNING = { mode: "alpha", alphaRule: "min" } as const;

/**
 * The default range for one person's pay: out-of-bag residual quantiles
 * within groups of similar estimates, with money targets fitted on the log
 * scale. On an invented table whose spread grows with level, only this
 * combination kept the 90% range within 87-93% overall and 85-95% in every
 * level (overall 0.880, levels 0.853-0.910); one set of residuals for every
 * profile covered 0.57-1.00 by level on the raw scale and 0.74-0.99 on logs.
 * Source: tests/results/range_coverage_sim.json.
 */
export const DEFAULT_RANGE = { scale: "log", method: "grouped" } as const;
