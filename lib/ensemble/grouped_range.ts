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
 * The groups with each group's residuals replaced by their quantiles at
 * 0, 1/steps, ..., 1 (R's type 7), the two ends clamped to the next grid
 * points so that no one row's residual is kept. Ranges at coverages on the
 * grid (0.9, 0.8, 0.95, ...) equal those of the full residuals; between grid
 * points they interpolate. This is what a saved model keeps.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { groupedRange, groupResiduals, summarizeResidualGroups } from "./grouped_range.ts";
 * const est = Float64Array.from({ length: 1000 }, (_, i) => i % 100);
 * const y = est.map((e, i) => e + Math.sin(i) * (1 + e / 10));
 * const full = groupResiduals(est, y, 4);
 * const kept = summarizeResidualGroups(full);
 * const a = groupedRange(80, full, 0.9);
 * const b = groupedRange(80, kept, 0.9);
 * assert(Math.abs(a.low - b.low) < 1e-9 && Math.abs(a.high - b.high) < 1e-9);
 * assert(kept.residuals[0].length === 201);
 * ```
 */
export function summarizeResidualGroups(groups: ResidualGroups, steps = 200): ResidualGroups {
  return {
    edges: groups.edges,
    residuals: groups.residuals.map((sorted) => {
      const grid = Float64Array.from({ length: steps + 1 }, (_, k) => quantile(sorted, k / steps));
      grid[0] = grid[1];
      grid[steps] = grid[steps - 1];
      return grid;
    }),
  };
}
