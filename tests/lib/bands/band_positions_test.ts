// Each person's place in their band (lib/bands/band_positions.ts), on an
// invented demo table: compa-ratio and range position worked out again from
// pay and the band by hand, and the per-person places added up to the band
// table's own counts and cost, cell by cell.
import assert from "node:assert/strict";
import { demoCompanyCsv, fitModel, loadTable, openModel, readForModel } from "../../../mod.ts";
import { bandTable } from "../../../lib/bands/band_table.ts";
import { bandPositions } from "../../../lib/bands/band_positions.ts";

const csv = demoCompanyCsv({ rows: 700, seed: 12 });
const model = await fitModel(loadTable(csv, { target: "base_pay_eur" }), {
  target: "base_pay_eur",
  trees: 20,
  folds: 3,
  workers: 1,
});
const rows = readForModel(model, csv, "demo.csv");

Deno.test("compa-ratio and range position by hand; places add up to the table's counts and cost", () => {
  const table = bandTable(openModel(model), rows, { by: ["level", "site"] });
  const people = bandPositions(model, rows, table);
  assert.equal(people.length, 700);
  // The demo's identifiers, in table order.
  assert.deepEqual(people.slice(0, 3).map((p) => p.id), rows.ids.slice(0, 3));
  let checked = 0;
  for (const cell of table.cells) {
    const inCell = people.filter((p) => JSON.stringify(p.key) === JSON.stringify(cell.key));
    if (cell.suppressed) {
      // A hidden cell gives its people no band, so nothing of it shows.
      assert(inCell.length > 0 && inCell.every((p) => p.band === null && p.place === null));
      continue;
    }
    assert.equal(inCell.length, cell.people);
    let below = 0, above = 0, cost = 0;
    const { min, mid, max }: { min: number; mid: number; max: number } = cell.band;
    for (const p of inCell) {
      // 1,000 paid at a midpoint of 1,250 is a compa-ratio of 0.8, and so on.
      assert(Math.abs(p.compaRatio! - p.pay / mid) < 1e-12);
      assert(Math.abs(p.rangePosition! - (p.pay - min) / (max - min)) < 1e-12);
      if (p.pay < min) {
        below++;
        cost += min - p.pay;
        assert.equal(p.place, "below");
        assert(p.rangePosition! < 0);
      } else if (p.pay > max) {
        above++;
        assert.equal(p.place, "above");
        assert(p.rangePosition! > 1);
      } else assert.equal(p.place, "inside");
      checked++;
    }
    assert.equal(below, cell.outside.below);
    assert.equal(above, cell.outside.above);
    if (cell.outside.costToMinimum !== null) {
      assert(Math.abs(cost - cell.outside.costToMinimum) < 1e-6 * Math.max(1, cost));
    }
  }
  assert(checked > 500, `${checked} people placed`);
  assert(table.cells.some((c) => c.suppressed), "the level x site table has a hidden cell");
});

Deno.test("a table without pay places no one", () => {
  const noPay = readForModel(
    model,
    csv.split("\n").map((line) => line.split(",").slice(0, -1).join(",")).join("\n"),
    "no_pay.csv",
  );
  const table = bandTable(openModel(model), rows, { by: ["level"] });
  assert.deepEqual(bandPositions(model, noPay, table), []);
});
