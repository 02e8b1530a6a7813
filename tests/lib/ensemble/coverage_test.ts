// Coverage is measured, not assumed: on an invented table whose log-pay
// noise grows with level (sd 0.05 + 0.02 x level, levels 1-7; 300 training
// and 1,000 held-out rows per level), the default 90% range must cover
// 87-93% of held-out rows overall and 85-95% within every level, and a
// range whose width ignores the level must fail the per-level band. With
// 1,000 held-out rows a level's share has a binomial standard error of
// about 0.95 points at 90%, so the 5-point band is not left to chance (with
// 300 it was 1.7 points, and one resampling scheme's draw could fall out).
import assert from "node:assert/strict";
import { DEFAULT_RANGE } from "../../../mod.ts";
import { coverageByLevel, simulatePay } from "./_simulated_pay.ts";

const train = simulatePay(300, 101);
const test = simulatePay(1000, 202);
const coverage = (scale: "log" | "raw", method: "grouped" | "one-set") =>
  coverageByLevel(train, test, scale, method);

Deno.test("the default 90% range covers 87-93% overall and 85-95% in every level", async () => {
  const c = await coverage(DEFAULT_RANGE.scale, DEFAULT_RANGE.method);
  assert.ok(c.overall >= 0.87 && c.overall <= 0.93, `overall ${c.overall}`);
  for (const [i, share] of c.perLevel.entries()) {
    assert.ok(share >= 0.85 && share <= 0.95, `level ${i + 1}: ${share}`);
  }
});

Deno.test("one set of residuals for every level fails the per-level band", async () => {
  const c = await coverage("raw", "one-set");
  assert.ok(c.overall >= 0.87 && c.overall <= 0.93, `overall ${c.overall}`);
  assert.ok(c.perLevel.some((share) => share < 0.85 || share > 0.95), `${c.perLevel}`);
});

Deno.test("the shipped range is the one the committed measurement chose", async () => {
  const results = JSON.parse(
    await Deno.readTextFile(new URL("../../results/range_coverage_sim.json", import.meta.url)),
  );
  assert.deepEqual(results.chosen, { scale: DEFAULT_RANGE.scale, method: DEFAULT_RANGE.method });
});
