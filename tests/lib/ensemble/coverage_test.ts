// Coverage is measured, not assumed: on an invented table whose log-pay
// noise grows with level (sd 0.05 + 0.02 x level, levels 1-7; 300 training
// and 1,000 held-out rows per level), the default 90% range must cover
// 87-93% of held-out rows overall and 85-95% within every level, and a
// range whose width ignores the level must fail the per-level band. With
// 1,000 held-out rows a level's share has a binomial standard error of
// about 0.95 points at 90%, so the 5-point band is not left to chance (with
// 300 it was 1.7 points, and one resampling scheme's draw could fall out).
//
// The first check runs the shipped path: the table as CSV, `fitModel` as
// `paygrove fit` calls it (shared trees, grouped residuals summarised for
// the model file, the median shift), then `batchAnswer` on the held-out
// rows as `paygrove batch` gives their ranges.
import assert from "node:assert/strict";
import { batchAnswer, fitModel, loadTable, openModel, readForModel } from "../../../mod.ts";
import { coverageByLevel, simulatedCsv, simulatePay } from "./_simulated_pay.ts";

const train = simulatePay(300, 101);
const test = simulatePay(1000, 202);
const coverage = (scale: "log" | "raw", method: "grouped" | "one-set") =>
  coverageByLevel(train, test, scale, method);

Deno.test("the shipped 90% range covers 87-93% overall and 85-95% in every level", async () => {
  const table = loadTable(simulatedCsv(train), { target: "pay_eur" });
  const model = await fitModel(table, { target: "pay_eur", trees: 200, seed: 3, workers: 2 });
  const rows = readForModel(model, simulatedCsv(test), "held_out.csv", true);
  const answers = batchAnswer(openModel(model), rows, 0.9);
  const hits = new Float64Array(8);
  const counts = new Float64Array(8);
  answers.forEach((a, r) => {
    const level = test.level[r];
    // The CSV holds pay to the cent, as the table does.
    const pay = Number(test.pay[r].toFixed(2));
    hits[level] += pay >= a.rangeLow! && pay <= a.rangeHigh! ? 1 : 0;
    counts[level]++;
  });
  const overall = hits.reduce((x, y) => x + y, 0) / test.dataset.rows;
  assert.ok(overall >= 0.87 && overall <= 0.93, `overall ${overall}`);
  for (let level = 1; level <= 7; level++) {
    const share = hits[level] / counts[level];
    assert.ok(share >= 0.85 && share <= 0.95, `level ${level}: ${share}`);
  }
});

Deno.test("one set of residuals for every level fails the per-level band", async () => {
  const c = await coverage("raw", "one-set");
  assert.ok(c.overall >= 0.87 && c.overall <= 0.93, `overall ${c.overall}`);
  assert.ok(c.perLevel.some((share) => share < 0.85 || share > 0.95), `${c.perLevel}`);
});
