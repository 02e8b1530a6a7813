// Ranges from residuals grouped by the size of the estimate, the share
// below an amount read from the same quantiles, and the block-mean grid a
// saved model keeps, each on a handful of residuals worked out below (type-7
// quantiles as R 4.2.2's quantile() gives them, noted where used).
import assert from "node:assert/strict";
import {
  groupedRange,
  groupedShareBelow,
  groupResiduals,
  type ResidualGroups,
  summarizeResidualGroups,
} from "../../../lib/ensemble/grouped_range.ts";

const close = (a: number, b: number) => assert(Math.abs(a - b) < 1e-12, `${a} is not ${b}`);

// Rows by estimate: 1 (row 2), 2 (row 4), 3 (row 3), 4 (row 5), 5 (row 0);
// row 1 has no estimate.
const ESTIMATES = [5, NaN, 1, 3, 2, 4];
const ACTUAL = [6, 0, 0, 3, 4, 2];

Deno.test("groupResiduals: equal groups by estimate, sorted residuals, upper edges", () => {
  const groups = groupResiduals(ESTIMATES, ACTUAL, 2);
  // Group 0: rows 2 and 4 (residuals -1, 2); group 1: rows 3, 5, 0 (0, -2, 1).
  assert.deepEqual(groups.residuals.map((r) => Array.from(r)), [[-1, 2], [-2, 0, 1]]);
  assert.deepEqual(Array.from(groups.edges), [2, Infinity]);
  // One group per row: five groups of one.
  assert.deepEqual(groupResiduals(ESTIMATES, ACTUAL, 5).residuals.map((r) => r[0]), [
    -1,
    2,
    0,
    -2,
    1,
  ]);
  assert.throws(() => groupResiduals(ESTIMATES, ACTUAL, 6), RangeError);
});

Deno.test("groupedRange reads the quantiles of the estimate's group", () => {
  const groups = groupResiduals(ESTIMATES, ACTUAL, 2);
  // At or below the edge 2: group 0. R: quantile(c(-1, 2), c(.25, .75)) = -0.25, 1.25.
  assert.deepEqual(groupedRange(2, groups, 0.5), { low: 1.75, high: 3.25, coverage: 0.5 });
  assert.deepEqual(groupedRange(-50, groups, 0.5), { low: -50.25, high: -48.75, coverage: 0.5 });
  // Above it: group 1. R: quantile(c(-2, 0, 1), c(.25, .75)) = -1, 0.5.
  assert.deepEqual(groupedRange(2.5, groups, 0.5), { low: 1.5, high: 3, coverage: 0.5 });
  for (const coverage of [0, 1, NaN]) {
    assert.throws(() => groupedRange(2, groups, coverage), RangeError);
  }
});

Deno.test("groupedShareBelow inverts the same quantiles", () => {
  const groups = groupResiduals(ESTIMATES, ACTUAL, 2);
  // Group 1, residuals -2, 0, 1 at positions 0, 1, 2 (shares 0, 0.5, 1):
  // a residual of -1 lies halfway between the first two, at share 0.25.
  close(groupedShareBelow(10, groups, 9, 0.9), 0.25);
  // 0.5 lies halfway between 0 and 1: share 0.75.
  close(groupedShareBelow(10, groups, 10.5, 0.9), 0.75);
  assert.equal(groupedShareBelow(10, groups, 10, 0.9), 0.5);
  // Below the lowest residual 0, above the highest 1; NaN stays NaN.
  assert.equal(groupedShareBelow(10, groups, 7.9, 0.9), 0);
  assert.equal(groupedShareBelow(10, groups, 11.1, 0.9), 1);
  assert(Number.isNaN(groupedShareBelow(10, groups, NaN, 0.9)));
  // The range's ends read their nominal shares.
  const range = groupedRange(10, groups, 0.5);
  close(groupedShareBelow(10, groups, range.low, 0.5), 0.25);
  close(groupedShareBelow(10, groups, range.high, 0.5), 0.75);
  assert.throws(() => groupedShareBelow(10, groups, 10, 1), RangeError);
});

Deno.test("a flat stretch of quantiles reads the share nearest the range's nearer end", () => {
  const one = (residuals: number[]): ResidualGroups => ({
    edges: Float64Array.of(Infinity),
    residuals: [Float64Array.from(residuals)],
  });
  // 0, 0, 0, 1, 2: the quantile is 0 for every share from 0 to 0.5.
  const low = one([0, 0, 0, 1, 2]);
  close(groupedShareBelow(0, low, 0, 0.9), 0.05);
  close(groupedShareBelow(0, low, 0, 0.5), 0.25);
  // -2, -1, 0, 0, 0: 0 for every share from 0.5 to 1.
  const high = one([-2, -1, 0, 0, 0]);
  close(groupedShareBelow(0, high, 0, 0.9), 0.95);
  // A single residual: its own value is the middle.
  assert.equal(groupedShareBelow(0, one([3]), 3, 0.9), 0.5);
});

Deno.test("summarizeResidualGroups keeps block means on a type-7 grid", () => {
  const groups: ResidualGroups = {
    edges: Float64Array.of(4, Infinity),
    residuals: [Float64Array.of(1, 2, 3, 4, 5, 6, 7), Float64Array.of(1, 5)],
  };
  const kept = summarizeResidualGroups(groups, 3, 4);
  assert.equal(kept.edges, groups.edges);
  // Seven residuals in blocks of at least 3: 1-3 (mean 2, at rank 1) and
  // 4-7 (mean 5.5, at rank 4.5). The grid at positions 0, 1.5, 3, 4.5, 6:
  // 2, 2 + 3.5 * (0.5 / 3.5), 2 + 3.5 * (2 / 3.5), 5.5, 5.5.
  assert.deepEqual(Array.from(kept.residuals[0]), [2, 2.5, 4, 5.5, 5.5]);
  // Fewer residuals than a block: one block, its mean everywhere.
  assert.deepEqual(Array.from(kept.residuals[1]), [3, 3, 3, 3, 3]);
  // The default grid has 201 points.
  assert.equal(summarizeResidualGroups(groups, 3).residuals[0].length, 201);
  for (const privacyMin of [0, 1.5, NaN]) {
    assert.throws(() => summarizeResidualGroups(groups, privacyMin), RangeError);
  }
});
