// The road from a table to the figures: the privacy minimum's floor, rows
// kept, encoded and put on their fitting scale, and the out-of-bag figures
// (residual groups and centre) on residuals written out by hand.
import assert from "node:assert/strict";
import { DataError, loadTable, OptionError } from "../../../mod.ts";
import {
  checkedPrivacyMin,
  DEFAULT_PRIVACY_MIN,
  outOfBagFigures,
  payRows,
  PRIVACY_FLOOR,
} from "../../../lib/model/pay_pipeline.ts";

const CSV = "site,level,years,pay_eur,score\n" +
  "N,L1,1,40000,2.5\nS,L2,2,50000,1.5\nN,L2,3,60000,4.5\nE,L1,4,45000,3.5\n";

Deno.test("checkedPrivacyMin: 5 by default, whole numbers from 3", () => {
  assert.equal(PRIVACY_FLOOR, 3);
  assert.equal(DEFAULT_PRIVACY_MIN, 5);
  assert.equal(checkedPrivacyMin(undefined), 5);
  assert.equal(checkedPrivacyMin(3), 3);
  for (const bad of [2, 3.5, NaN, -5]) {
    assert.throws(
      () => checkedPrivacyMin(bad),
      (e: Error) => e instanceof OptionError && e.message.includes(String(bad)),
    );
  }
});

Deno.test("money is fitted on logs; rows kept by where, with their table rows", () => {
  const table = loadTable(CSV, { target: "pay_eur", currency: "EUR" });
  const rows = payRows(table, { target: "pay_eur", where: { site: ["N", "E"] } });
  assert.equal(rows.scale, "log");
  assert.equal(rows.table.rows, 3);
  assert.deepEqual(Array.from(rows.rowIndex), [0, 1, 2]);
  assert.deepEqual(Array.from(rows.encoded.target.values), [40000, 60000, 45000]);
  assert.deepEqual(Array.from(rows.dataset.target.values), [40000, 60000, 45000].map(Math.log));
  assert.equal(rows.money?.currency, "EUR");
  assert.deepEqual(rows.dataset.features.map((f) => f.name), ["site", "level", "years", "score"]);
});

Deno.test("a target that is not pay stays raw unless asked; features and drop are passed on", () => {
  const table = loadTable(CSV, { target: "score" });
  const rows = payRows(table, { target: "score", drop: ["site"] });
  assert.equal(rows.scale, "raw");
  assert.equal(rows.money, undefined);
  assert.equal(rows.dataset, rows.encoded);
  // Pay is never an attribute.
  assert.deepEqual(rows.dataset.features.map((f) => f.name), ["level", "years"]);
  const logged = payRows(table, { target: "score", scale: "log", features: ["years"] });
  assert.deepEqual(Array.from(logged.dataset.target.values), [2.5, 1.5, 4.5, 3.5].map(Math.log));
  assert.deepEqual(logged.dataset.features.map((f) => f.name), ["years"]);
  // A pay name without a currency is still money: logs.
  const unitless = loadTable(CSV, { target: "pay_eur" });
  assert.equal(payRows(unitless, { target: "pay_eur" }).scale, "log");
  assert.equal(payRows(unitless, { target: "pay_eur", scale: "raw" }).scale, "raw");
});

Deno.test("logs of pay at or below zero, and logs of a class, are refused", () => {
  const zero = loadTable("years,pay_eur\n1,40000\n2,0\n3,50000\n", { target: "pay_eur" });
  assert.throws(() => payRows(zero, { target: "pay_eur" }), DataError);
  const table = loadTable(CSV, { target: "level" });
  assert.equal(payRows(table, { target: "level" }).scale, "raw");
  assert.throws(
    () => payRows(table, { target: "level", scale: "log" }),
    (e: Error) => e instanceof OptionError && e.message.includes('"level"'),
  );
});

Deno.test("out-of-bag figures: the grid of each group and the shift to the median", () => {
  // 100 rows: floor(100 / 50) = 2 residual groups.
  const y = Float64Array.from({ length: 100 }, (_, i) => 10 + i / 100);
  // Residuals -0.02, -0.01, 0, 0.01, 0.02 in turn; their median is 0.
  const oob = y.map((v, i) => v - ((i % 5) - 2) / 100);
  const figures = outOfBagFigures(oob, y, 5);
  assert.equal(figures.residuals.residuals.length, 2);
  assert.deepEqual(figures.residuals.residuals.map((r) => r.length), [201, 201]);
  assert.equal(figures.residuals.edges[1], Infinity);
  // The lower half's estimates end at the 50th smallest.
  const sorted = Array.from(oob).sort((a, b) => a - b);
  assert.equal(figures.residuals.edges[0], sorted[49]);
  assert(Math.abs(figures.center.shift) < 1e-12);
  // Each grid runs from the mean of its five lowest residuals to that of its five highest.
  for (const grid of figures.residuals.residuals) {
    assert(Math.abs(grid[0] - -0.02) < 1e-12 && Math.abs(grid[200] - 0.02) < 1e-12);
  }
  assert.equal(figures.center.rows, 100);
});
