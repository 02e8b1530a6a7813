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
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { groupedRange } from "./grouped_range.ts";
 * // Estimates up to 10 have residuals -1, 0, 1; larger ones -5..5.
 * const groups = {
 *   edges: Float64Array.of(10, Infinity),
 *   residuals: [Float64Array.of(-1, 0, 1), Float64Array.from({ length: 11 }, (_, i) => i - 5)],
 * };
 * // Coverage 0.5: quantiles 0.25 and 0.75 (type 7). Of -1, 0, 1: -0.5 and 0.5.
 * assert.deepEqual(groupedRange(10, groups, 0.5), { low: 9.5, high: 10.5, coverage: 0.5 });
 * // Of -5..5: h = 10 x 0.25 = 2.5, so -2.5 and 2.5.
 * assert.deepEqual(groupedRange(20, groups, 0.5), { low: 17.5, high: 22.5, coverage: 0.5 });
 * assert.throws(() => groupedRange(20, groups, 1), RangeError);
 * ```
 */
export function groupedRange(estimate: number, groups: ResidualGroups, coverage: number): Interval {
  if (!(coverage > 0 && coverage < 1)) {
    throw new RangeError(`coverage must lie strictly between 0 and 1, got ${coverage}`);
  }
  const tail = (1 - coverage) / 2;
  const residuals = groups.residuals[groupOf(estimate, groups)];
  return {
    low: estimate + quantile(residuals, tail),
    high: estimate + quantile(residuals, 1 - tail),
    coverage,
  };
}

// The group a profile's estimate falls in (the same for its range and its shares).
function groupOf(estimate: number, groups: ResidualGroups): number {
  let g = 0;
  while (g < groups.edges.length - 1 && estimate > groups.edges[g]) g++;
  return g;
}

/**
 * The share of comparable people paid less than `value`, read from the same
 * residual quantiles as {@linkcode groupedRange}: the p whose quantile
 * (R's type 7 over the group's sorted residuals or kept grid) puts
 * estimate + quantile(p) at `value`, so that the range's ends sit at the
 * shares (1 - coverage) / 2 and (1 + coverage) / 2. Below the lowest kept
 * residual it is 0, above the highest 1. Where the quantiles are flat (a
 * kept grid is, beyond its outermost block means) every p of the flat
 * stretch fits; the one nearest the range's nearer end share is taken, so
 * an end of the range reads its nominal share at every coverage.
 *
 * @param estimate The profile's estimate on the fitting scale.
 * @param value The amount to place, on the fitting scale.
 * @param coverage The range's coverage (it settles flat stretches only).
 *
 * @example The ends of the range sit at 5% and 95%
 * ```ts
 * import assert from "node:assert/strict";
 * import { groupedRange, groupedShareBelow, groupResiduals } from "./grouped_range.ts";
 * const est = Float64Array.from({ length: 101 }, () => 100);
 * const y = est.map((e, i) => e + i - 50);
 * const groups = groupResiduals(est, y, 1);
 * const range = groupedRange(100, groups, 0.9);
 * assert(Math.abs(groupedShareBelow(100, groups, range.low, 0.9) - 0.05) < 1e-12);
 * assert(Math.abs(groupedShareBelow(100, groups, range.high, 0.9) - 0.95) < 1e-12);
 * assert.equal(groupedShareBelow(100, groups, 100, 0.9), 0.5);
 * assert.equal(groupedShareBelow(100, groups, -1e9, 0.9), 0);
 * ```
 */
export function groupedShareBelow(
  estimate: number,
  groups: ResidualGroups,
  value: number,
  coverage: number,
): number {
  if (!(coverage > 0 && coverage < 1)) {
    throw new RangeError(`coverage must lie strictly between 0 and 1, got ${coverage}`);
  }
  if (Number.isNaN(value)) return NaN;
  const sorted = groups.residuals[groupOf(estimate, groups)];
  const m = sorted.length;
  const r = value - estimate;
  if (r < sorted[0]) return 0;
  if (r > sorted[m - 1]) return 1;
  if (m === 1) return 0.5;
  // The flat stretch [first, last] of positions h (0 to m - 1) where the
  // interpolated quantile equals r: first = inf{h : Q(h) >= r},
  // last = sup{h : Q(h) <= r}.
  let i = 0;
  while (i < m - 1 && sorted[i + 1] < r) i++;
  const first = sorted[i] >= r ? i : i + (r - sorted[i]) / (sorted[i + 1] - sorted[i]);
  let j = m - 1;
  while (j > 0 && sorted[j - 1] > r) j--;
  const last = sorted[j] <= r ? j : j - (sorted[j] - r) / (sorted[j] - sorted[j - 1]);
  const from = first / (m - 1);
  const to = last / (m - 1);
  if (from >= to) return from;
  const tail = (1 - coverage) / 2;
  const clamp = (p: number) => Math.min(to, Math.max(from, p));
  const low = clamp(tail);
  const high = clamp(1 - tail);
  return Math.abs(low - tail) <= Math.abs(high - (1 - tail)) ? low : high;
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
