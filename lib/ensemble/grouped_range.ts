/**
 * A range for one person's pay that adapts to unequal spread: out-of-bag
 * residual quantiles taken only among rows whose out-of-bag estimate is
 * close to the profile's (the same decile of estimates). Where spread grows
 * with pay (as it does with level), senior profiles get wider ranges than
 * junior ones, which one set of residuals for everyone cannot give.
 *
 * @module
 */

import { quantile } from "../table/quality.ts";
import type { Interval } from "./intervals.ts";

/** Residuals grouped by the size of the out-of-bag estimate. */
export interface ResidualGroups {
  /** Upper edges of the groups' estimates (the last is Infinity). */
  edges: Float64Array;
  /** Each group's residuals, sorted. */
  residuals: Float64Array[];
}

/**
 * Groups out-of-bag residuals into `groups` groups of equal size by the
 * out-of-bag estimate they belong to.
 *
 * @param estimates Out-of-bag estimate of each row (NaN rows are skipped).
 * @param actual The target of each row.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { groupResiduals } from "./grouped_range.ts";
 * const est = Float64Array.from({ length: 100 }, (_, i) => i);
 * const y = est.map((e, i) => e + (i % 2 ? 1 : -1) * (e < 50 ? 1 : 10));
 * const groups = groupResiduals(est, y, 2);
 * assert(groups.residuals[0].length === 50 && groups.residuals[1][49] === 10);
 * ```
 */
export function groupResiduals(
  estimates: ArrayLike<number>,
  actual: ArrayLike<number>,
  groups = 10,
): ResidualGroups {
  const rows: number[] = [];
  for (let r = 0; r < estimates.length; r++) if (!Number.isNaN(estimates[r])) rows.push(r);
  rows.sort((a, b) => estimates[a] - estimates[b]);
  if (rows.length < groups) throw new RangeError(`need at least ${groups} out-of-bag rows`);
  const edges = new Float64Array(groups);
  const residuals: Float64Array[] = [];
  for (let g = 0; g < groups; g++) {
    const from = Math.floor((g * rows.length) / groups);
    const to = Math.floor(((g + 1) * rows.length) / groups);
    const slice = rows.slice(from, to);
    residuals.push(Float64Array.from(slice, (r) => actual[r] - estimates[r]).sort());
    edges[g] = g === groups - 1 ? Infinity : estimates[rows[to - 1]];
  }
  return { edges, residuals };
}

/**
 * The range for a profile whose estimate is `estimate`: the estimate plus
 * the residual quantiles of its group.
 */
export function groupedRange(estimate: number, groups: ResidualGroups, coverage: number): Interval {
  if (!(coverage > 0 && coverage < 1)) {
    throw new RangeError(`coverage must lie strictly between 0 and 1, got ${coverage}`);
  }
  let g = 0;
  while (g < groups.edges.length - 1 && estimate > groups.edges[g]) g++;
  const tail = (1 - coverage) / 2;
  const residuals = groups.residuals[g];
  return {
    low: estimate + quantile(residuals, tail),
    high: estimate + quantile(residuals, 1 - tail),
    coverage,
  };
}

/**
 * The groups as a saved model keeps them: each group's sorted residuals cut
 * into consecutive blocks of at least `privacyMin` residuals (sizes differ
 * by at most one), each block kept as its mean placed at its middle rank,
 * and the quantiles at 0, 1/steps, ..., 1 read off the line through the
 * block means (flat beyond the first and last). No point of the grid is one
 * person's residual, nor a mix of fewer than `privacyMin` of them; where
 * the spread changes slowly the grid stays close to the residuals' own
 * quantiles (R's type 7), which `groupedRange` then interpolates.
 *
 * @param privacyMin Fewest residuals averaged into one kept figure.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { groupedRange, groupResiduals, summarizeResidualGroups } from "./grouped_range.ts";
 * const est = Float64Array.from({ length: 1000 }, (_, i) => i % 100);
 * const y = est.map((e, i) => e + Math.sin(i) * (1 + e / 10));
 * const full = groupResiduals(est, y, 4);
 * const kept = summarizeResidualGroups(full, 5);
 * assert(kept.residuals[0].length === 201);
 * // The ends are means of the five most extreme residuals, not one person's.
 * const lowest5 = full.residuals[0].slice(0, 5).reduce((a, b) => a + b) / 5;
 * assert(Math.abs(kept.residuals[0][0] - lowest5) < 1e-12);
 * // The 90% range stays within 3% of the one from every residual.
 * const a = groupedRange(80, full, 0.9);
 * const b = groupedRange(80, kept, 0.9);
 * assert(Math.abs((b.high - b.low) / (a.high - a.low) - 1) < 0.03);
 * ```
 */
export function summarizeResidualGroups(
  groups: ResidualGroups,
  privacyMin: number,
  steps = 200,
): ResidualGroups {
  if (!(Number.isInteger(privacyMin) && privacyMin >= 1)) {
    throw new RangeError(`privacyMin must be a whole number >= 1, got ${privacyMin}`);
  }
  return {
    edges: groups.edges,
    residuals: groups.residuals.map((sorted) => blockGrid(sorted, privacyMin, steps)),
  };
}

function blockGrid(sorted: Float64Array, size: number, steps: number): Float64Array {
  const m = sorted.length;
  const blocks = Math.max(1, Math.floor(m / size));
  const centers = new Float64Array(blocks);
  const means = new Float64Array(blocks);
  for (let j = 0; j < blocks; j++) {
    const from = Math.floor((j * m) / blocks);
    const to = Math.floor(((j + 1) * m) / blocks);
    let sum = 0;
    for (let i = from; i < to; i++) sum += sorted[i];
    means[j] = sum / (to - from);
    centers[j] = (from + to - 1) / 2;
  }
  const grid = new Float64Array(steps + 1);
  let j = 0;
  for (let k = 0; k <= steps; k++) {
    // The position of quantile k/steps among m sorted values (type 7).
    const h = (k / steps) * (m - 1);
    if (h <= centers[0]) grid[k] = means[0];
    else if (h >= centers[blocks - 1]) grid[k] = means[blocks - 1];
    else {
      while (centers[j + 1] < h) j++;
      const t = (h - centers[j]) / (centers[j + 1] - centers[j]);
      grid[k] = means[j] + t * (means[j + 1] - means[j]);
    }
  }
  return grid;
}
