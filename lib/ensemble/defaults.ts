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
