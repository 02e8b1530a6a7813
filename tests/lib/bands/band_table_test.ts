// The band table (lib/bands/band_table.ts) on invented demo tables: its
// figures recomputed from the table and the bands by hand, its privacy
// rules attacked, midpoints that dip along the ladder smoothed.
import assert from "node:assert/strict";
import {
  demoCompanyCsv,
  fitModel,
  loadTable,
  type Model,
  type ModelRows,
  openModel,
  readForModel,
} from "../../../mod.ts";
import { type BandCell, bandTable } from "../../../lib/bands/band_table.ts";

type Shown = Extract<BandCell, { suppressed: false }>;
const shown = (cells: BandCell[]) => cells.filter((c): c is Shown => !c.suppressed);

const csv = demoCompanyCsv({ rows: 900, seed: 8 });
const model: Model = await fitModel(loadTable(csv, { target: "base_pay_eur" }), {
  target: "base_pay_eur",
  trees: 30,
  folds: 3,
  workers: 1,
});
const rows: ModelRows = readForModel(model, csv, "demo.csv");
const level = model.features.findIndex((f) => f.name === "level");
const family = model.features.findIndex((f) => f.name === "job_family");

// The pay of the people of a cell (level, and family when given), sorted.
function payOf(levelName: string, familyName?: string): number[] {
  const out: number[] = [];
  for (let r = 0; r < rows.rows; r++) {
    if (model.features[level].levels![rows.features[level][r]] !== levelName) continue;
    if (
      familyName !== undefined &&
      model.features[family].levels![rows.features[family][r]] !== familyName
    ) continue;
    out.push(rows.target![r]);
  }
  return out.sort((a, b) => a - b);
}

Deno.test("people, current-pay quartiles and who sits outside, recomputed from the table", () => {
  const table = bandTable(openModel(model), rows, { by: ["level"] });
  assert.deepEqual(table.by, ["level"]);
  for (const cell of shown(table.cells)) {
    const pay = payOf(cell.key[0]);
    assert.equal(cell.people, pay.length);
    // Each quartile: the mean of the 5 sorted pays nearest its position
    // (p (n - 1), type 7), never one person's pay on its own.
    const nearest = (p: number) => {
      const from = Math.max(0, Math.min(pay.length - 5, Math.round(p * (pay.length - 1) - 2)));
      return pay.slice(from, from + 5).reduce((a, b) => a + b, 0) / 5;
    };
    assert(Math.abs(cell.currentPay.p25 - nearest(0.25)) < 1e-9, `${cell.key}`);
    assert(Math.abs(cell.currentPay.median - nearest(0.5)) < 1e-9, `${cell.key}`);
    assert(Math.abs(cell.currentPay.p75 - nearest(0.75)) < 1e-9, `${cell.key}`);
    const below = pay.filter((p) => p < cell.band.min);
    assert.equal(cell.outside.below, below.length);
    assert.equal(cell.outside.above, pay.filter((p) => p > cell.band.max).length);
    const cost = below.reduce((s, p) => s + cell.band.min - p, 0);
    if (below.length >= 5) assert(Math.abs(cell.outside.costToMinimum! - cost) <= 1e-9 * cost);
    else assert.equal(cell.outside.costToMinimum, null);
  }
});

Deno.test("progression and overlap along the ladder, recomputed from the bands", () => {
  const table = bandTable(openModel(model), rows, { by: ["level"] });
  const cells = shown(table.cells);
  const [ladder] = table.ladders;
  assert.deepEqual(ladder.levels, cells.map((c) => c.key[0]));
  cells.slice(1).forEach((c, k) => {
    const before = cells[k].band;
    assert(Math.abs(ladder.progression[k] - (c.band.mid / before.mid - 1)) < 1e-12);
    const overlap = Math.max(0, before.max - c.band.min) / (before.max - before.min);
    assert(Math.abs(ladder.overlap[k] - overlap) < 1e-12);
  });
});

Deno.test("at a coverage, the bands hold about that share of the table's people; a spread gives max / min - 1", () => {
  const table = bandTable(openModel(model), rows, { by: ["level"], coverage: 0.8 });
  let inside = 0;
  let people = 0;
  for (const cell of shown(table.cells)) {
    people += cell.people;
    inside += cell.people - cell.outside.below - cell.outside.above;
  }
  // In-sample, the trees know these people: somewhat more than 80% inside.
  assert(inside / people > 0.75 && inside / people < 0.97, `${inside / people}`);
  const fixed = bandTable(openModel(model), rows, { by: ["level"], spread: 0.4 });
  for (const cell of shown(fixed.cells)) {
    assert(Math.abs(cell.band.max / cell.band.min - 1 - 0.4) < 1e-12);
    assert(Math.abs((cell.band.min + cell.band.max) / 2 - cell.band.mid) < 1e-6);
  }
  assert.deepEqual(fixed.method, { kind: "spread", spread: 0.4 });
});

Deno.test("attack: a cell of fewer than five people shows nothing, nor can it be worked out from the others", () => {
  // Level by family: several cells are small in a 900-person table.
  const table = bandTable(openModel(model), rows, { by: ["level", "job_family"] });
  const hidden = table.cells.filter((c) => c.suppressed);
  assert(hidden.length >= 2, "some cells are small");
  for (const cell of hidden) {
    // Only its name: no count, no pay figure.
    assert.deepEqual(Object.keys(cell).sort(), ["key", "suppressed"]);
  }
  // Every cell under five people is hidden, and the hidden ones hold at
  // least five together (their count cannot be one person's).
  let hiddenPeople = 0;
  for (const cell of table.cells) {
    const pay = payOf(cell.key[0], cell.key[1]);
    if (pay.length < 5) assert(cell.suppressed, `${cell.key} has ${pay.length} people`);
    if (cell.suppressed) hiddenPeople += pay.length;
  }
  assert(hiddenPeople >= 5);
  // Differencing: change the pay of everyone in the hidden cells and read
  // the table again (the same model): no shown figure moves, so none carries
  // anything of their pay.
  const hiddenKeys = new Set(hidden.map((c) => c.key.join("\u0000")));
  const changed = Float64Array.from(rows.target!, (pay, r) => {
    const key = [
      model.features[level].levels![rows.features[level][r]],
      model.features[family].levels![rows.features[family][r]],
    ].join("\u0000");
    return hiddenKeys.has(key) ? pay * 1.5 + 1234 : pay;
  });
  const again = bandTable(openModel(model), { ...rows, target: changed }, {
    by: ["level", "job_family"],
  });
  assert.deepEqual(again, table);
});

Deno.test("midpoints that dip along the ladder are smoothed upwards, the raw ones kept", async () => {
  // The demo with G4's pay cut by a quarter: G4's midpoint falls below G3's.
  const lines = csv.trim().split("\n");
  const header = lines[0].split(",");
  const payAt = header.indexOf("base_pay_eur");
  const levelAt = header.indexOf("level");
  const cut = [
    lines[0],
    ...lines.slice(1).map((line) => {
      const cells = line.split(",");
      if (cells[levelAt] === "G4") cells[payAt] = String(Math.round(Number(cells[payAt]) * 0.75));
      return cells.join(",");
    }),
  ].join("\n") + "\n";
  const dipped = await fitModel(loadTable(cut, { target: "base_pay_eur" }), {
    target: "base_pay_eur",
    trees: 30,
    folds: 3,
    workers: 1,
  });
  const table = bandTable(openModel(dipped), readForModel(dipped, cut, "cut.csv"), {
    by: ["level"],
  });
  assert(table.smoothed);
  const cells = shown(table.cells);
  const g3 = cells.find((c) => c.key[0] === "G3")!;
  const g4 = cells.find((c) => c.key[0] === "G4")!;
  assert(g4.rawMid < g3.rawMid, "the raw midpoints dip");
  for (let i = 1; i < cells.length; i++) assert(cells[i].band.mid >= cells[i - 1].band.mid - 1e-6);
  // Pooled: G3 and G4 share one midpoint, their people-weighted mean on logs.
  assert(Math.abs(g3.band.mid - g4.band.mid) < 1e-6);
  const pooled = Math.exp(
    (g3.people * Math.log(g3.rawMid) + g4.people * Math.log(g4.rawMid)) / (g3.people + g4.people),
  );
  // (Other levels may join the pool: then it is their mean.)
  if (cells.filter((c) => Math.abs(c.band.mid - g3.band.mid) < 1e-6).length === 2) {
    assert(Math.abs(g3.band.mid - pooled) < 1e-6 * pooled);
  }
});

Deno.test("bands refuse what they cannot do: a numeric attribute as cells, no pay, a bad coverage", () => {
  assert.throws(() => bandTable(openModel(model), rows, { by: ["years_experience"] }), /numeric/);
  assert.throws(
    () => bandTable(openModel(model), { ...rows, target: null }, { by: ["level"] }),
    /current pay/,
  );
  assert.throws(
    () => bandTable(openModel(model), rows, { by: ["level"], coverage: 1 }),
    /coverage/,
  );
  assert.throws(() => bandTable(openModel(model), rows, { by: ["levl"] }), /did you mean "level"/);
});

Deno.test("--new-hire: each cell's typical profile has tenure at its entry value, and only the typical estimate moves", () => {
  const plain = bandTable(openModel(model), rows, { by: ["level"] });
  const hire = bandTable(openModel(model), rows, { by: ["level"], newHire: true });
  assert.equal(hire.newHire, true);
  const entry = model.features.find((f) => f.name === "years_at_company")!.range!.min;
  const a = shown(plain.cells);
  const b = shown(hire.cells);
  for (let i = 0; i < a.length; i++) {
    assert.equal(b[i].typicalProfile.years_at_company, entry);
    assert.deepEqual(b[i].band, a[i].band);
    assert.deepEqual(b[i].currentPay, a[i].currentPay);
  }
  // Where the trees split on tenure, some typical estimate moves; where
  // none does, none can.
  const tenure = model.features.findIndex((f) => f.name === "years_at_company");
  const used = model.ensemble!.trees.some((t) => t.feature.includes(tenure));
  assert.equal(b.some((c, i) => c.typicalEstimate !== a[i].typicalEstimate), used);
});
