// A cell's band at a coverage (lib/bands/cell_band.ts) on invented people:
// it holds about that share of them even when the cell mixes two sites paid
// differently, where the range of one typical profile holds far fewer; and
// its ends are where the people's mean share below is the targets.
import assert from "node:assert/strict";
import { makeRng, randomInt } from "../../../mod.ts";
import {
  groupedRange,
  groupedShareBelow,
  groupResiduals,
} from "../../../lib/ensemble/grouped_range.ts";
import { mixtureBand } from "../../../lib/bands/cell_band.ts";

function normals(seed: number) {
  const rng = makeRng(seed);
  const u = () => (randomInt(rng, 0, 2 ** 30 - 1) + 0.5) / 2 ** 30;
  return () => Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u());
}

// Residuals as the range has them: log pay less its estimate, sd 0.1.
const normal = normals(5);
const fitted = Float64Array.from({ length: 4000 }, (_, i) => 10 + (i % 100) / 100);
const groups = groupResiduals(fitted, fitted.map((e) => e + 0.1 * normal()), 10);

Deno.test("a cell of two sites: the band holds about 80% of its people, one profile's range far fewer", () => {
  const draw = normals(11);
  // 2,000 people of one level, half at a site paid 0.3 more in logs.
  const estimates = Float64Array.from({ length: 2000 }, (_, i) => (i % 2 ? 10.3 : 10.6));
  const pay = estimates.map((e) => e + 0.1 * draw());
  const band = mixtureBand(estimates, groups, 0.8);
  const inside = pay.filter((y) => y >= band.low && y <= band.high).length / pay.length;
  // Binomial sd at 2,000 people: 0.009; 0.035 is nearly four of them.
  assert(Math.abs(inside - 0.8) < 0.035, `inside ${inside}`);
  // The range of the typical profile (the middle estimate, 10.45): a band of
  // one person's spread centred between the sites holds few of either.
  const typical = groupedRange(10.45, groups, 0.8);
  const held = pay.filter((y) => y >= typical.low && y <= typical.high).length / pay.length;
  assert(held < 0.6, `one profile's range held ${held}`);
});

Deno.test("the band's ends are where the people's mean share below reaches 10% and 90%", () => {
  const estimates = [10.1, 10.2, 10.2, 10.5, 10.9];
  const band = mixtureBand(estimates, groups, 0.8);
  const share = (v: number) =>
    estimates.reduce((s, e) => s + groupedShareBelow(e, groups, v, 0.8), 0) / estimates.length;
  assert(Math.abs(share(band.low) - 0.1) < 1e-6, `${share(band.low)}`);
  assert(Math.abs(share(band.high) - 0.9) < 1e-6, `${share(band.high)}`);
  // A little lower, the share is below its target: each end is the smallest such amount.
  assert(share(band.low - 1e-4) < 0.1 && share(band.high - 1e-4) < 0.9);
  assert.throws(() => mixtureBand([], groups, 0.8), /at least one person/);
  assert.throws(() => mixtureBand([10], groups, 1), /strictly between 0 and 1/);
});
