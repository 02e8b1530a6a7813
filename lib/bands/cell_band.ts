/**
 * A band built to hold a share of a cell's people: the central interval of
 * the pay the model implies for them. Each person's pay is their estimate
 * plus a residual drawn from the residual quantiles the range uses for an
 * estimate of that size (lib/ensemble/grouped_range.ts); over the cell this
 * is a mixture, whose share below an amount is the mean of the people's
 * shares below it. The band's ends are where that mean share is
 * (1 - coverage) / 2 and (1 + coverage) / 2.
 *
 * A band from one typical profile's range would hold that share only of
 * people like that profile; where other attributes (family, site) move pay
 * inside the cell, the mixture is wider, as the cell's pay is.
 *
 * @module
 */

import { groupedRange, groupedShareBelow, type ResidualGroups } from "../ensemble/grouped_range.ts";

/**
 * The central interval, at `coverage`, of the mixture over a cell's people
 * of estimate plus residual, on the fitting scale (log pay for a log
 * model): each end the smallest amount at which the people's mean share
 * below reaches its target, found by halving the interval between the
 * lowest of their own ranges' low ends and the highest of their high ends.
 *
 * @param estimates Each person's estimate on the fitting scale.
 *
 * @throws {RangeError} for no people, or a coverage outside (0, 1).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { groupedRange } from "../ensemble/grouped_range.ts";
 * import { mixtureBand } from "./cell_band.ts";
 * const groups = {
 *   edges: Float64Array.of(Infinity),
 *   residuals: [Float64Array.from({ length: 101 }, (_, i) => (i - 50) / 100)],
 * };
 * // People who all have one estimate: their own range.
 * const alike = mixtureBand([10, 10, 10], groups, 0.8);
 * const own = groupedRange(10, groups, 0.8);
 * assert(Math.abs(alike.low - own.low) < 1e-9 && Math.abs(alike.high - own.high) < 1e-9);
 * // Estimates half a unit apart: the band is wider than either person's range.
 * const apart = mixtureBand([9.75, 10.25], groups, 0.8);
 * assert(apart.high - apart.low > own.high - own.low);
 * ```
 */
export function mixtureBand(
  estimates: ArrayLike<number>,
  groups: ResidualGroups,
  coverage: number,
): { low: number; high: number } {
  const n = estimates.length;
  if (n === 0) throw new RangeError("a band needs at least one person");
  if (!(coverage > 0 && coverage < 1)) {
    throw new RangeError(`coverage must lie strictly between 0 and 1, got ${coverage}`);
  }
  let from = Infinity;
  let to = -Infinity;
  for (let i = 0; i < n; i++) {
    const own = groupedRange(estimates[i], groups, coverage);
    from = Math.min(from, own.low);
    to = Math.max(to, own.high);
  }
  const reach = (target: number) => smallestReaching(estimates, groups, coverage, target, from, to);
  return { low: reach((1 - coverage) / 2), high: reach((1 + coverage) / 2) };
}

/**
 * The amount (fitting scale) below which the share `share` of the mixture
 * lies: at 0.5, the middle of the pay the model implies for the cell's
 * people. The residual quantiles are read as for a range of `coverage`.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { mixtureQuantile } from "./cell_band.ts";
 * const groups = {
 *   edges: Float64Array.of(Infinity),
 *   residuals: [Float64Array.from({ length: 101 }, (_, i) => (i - 50) / 100)],
 * };
 * // Two people placed symmetrically: the middle is halfway between them.
 * assert(Math.abs(mixtureQuantile([9.8, 10.2], groups, 0.5, 0.8) - 10) < 1e-9);
 * ```
 */
export function mixtureQuantile(
  estimates: ArrayLike<number>,
  groups: ResidualGroups,
  share: number,
  coverage: number,
): number {
  if (estimates.length === 0) throw new RangeError("a band needs at least one person");
  let from = Infinity;
  let to = -Infinity;
  for (let i = 0; i < estimates.length; i++) {
    // Every residual the groups hold lies within the widest range's ends.
    const wide = groupedRange(estimates[i], groups, 0.999999);
    from = Math.min(from, wide.low);
    to = Math.max(to, wide.high);
  }
  return smallestReaching(estimates, groups, coverage, share, from, to);
}

// The smallest amount in [from, to] whose mean share below reaches
// `target`, by halving (the mean share never falls as the amount grows).
function smallestReaching(
  estimates: ArrayLike<number>,
  groups: ResidualGroups,
  coverage: number,
  target: number,
  from: number,
  to: number,
): number {
  const n = estimates.length;
  const shareBelow = (value: number) => {
    let sum = 0;
    for (let i = 0; i < n; i++) sum += groupedShareBelow(estimates[i], groups, value, coverage);
    return sum / n;
  };
  let low = from;
  let high = to;
  for (let step = 0; step < 80 && high - low > 1e-12 * Math.max(1, Math.abs(high)); step++) {
    const middle = (low + high) / 2;
    if (shareBelow(middle) >= target - 1e-12) high = middle;
    else low = middle;
  }
  return high;
}
