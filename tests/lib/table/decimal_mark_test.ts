// The decimal mark read from the file where its cells settle it (issue 14,
// "Messy exports in every command").
import assert from "node:assert/strict";
import { loadTable } from "../../../mod.ts";
import { messyExport } from "../../_messy_export.ts";

Deno.test("a semicolon export with decimal commas and euro amounts reads as numbers without --decimal", () => {
  const messy = messyExport(120);
  const table = loadTable(messy.bytes, { encoding: "windows-1252", target: "annual_salary" });
  const byName = Object.fromEntries(table.columns.map((c) => [c.name, c]));
  const pay = byName.annual_salary;
  const years = byName.years_experience;
  assert.equal(pay.type, "numeric");
  assert.equal(years.type, "numeric");
  assert.ok(pay.type === "numeric" && years.type === "numeric");
  // Every row back to the demo company's own figures.
  assert.deepEqual([...pay.values], messy.rows.map((r) => r.pay));
  assert.deepEqual([...years.values], messy.rows.map((r) => r.years));
  assert.equal(pay.money?.currency, "EUR");
  // The first cell that settles it, in file order: years come before pay.
  assert.deepEqual(table.source.decimal, { mark: ",", how: "detected", example: "23,6" });
  // The site spelt in windows-1252 comes back as written.
  const site = byName.site;
  assert.ok(site.type === "categorical" && site.levels.includes("Müllerstraße"));
  assert.equal(table.warnings.filter((w) => w.kind === "decimal-mark").length, 0);
});

Deno.test("cells such as 0,1 settle a comma; cells such as 40.10 settle a point", () => {
  const comma = loadTable("grade;share;pay\nA;0,1;50\nB;0,25;61\nA;1,5;55\n");
  assert.deepEqual(comma.source.decimal, { mark: ",", how: "detected", example: "0,1" });
  const share = comma.columns[1];
  assert.ok(share.type === "numeric");
  assert.deepEqual([...share.values], [0.1, 0.25, 1.5]);
  const point = loadTable("grade;rate;pay\nA;40.10;50\nB;38.5;61\nA;41;55\n");
  assert.deepEqual(point.source.decimal, { mark: ".", how: "detected", example: "40.10" });
});

Deno.test("where the file does not settle the mark, today's point stays and the reading says so", () => {
  // "1.500" is 1.5 or 1500: nothing in the file says which.
  const table = loadTable("grade;bonus;pay\nA;1.500;50\nB;2.250;61\nA;3.000;55\n");
  assert.deepEqual(table.source.decimal, { mark: ".", how: "ambiguous", example: "1.500" });
  const bonus = table.columns[1];
  assert.ok(bonus.type === "numeric" && bonus.values[0] === 1.5);
  // Points and commas in one file: neither settles it.
  const mixed = loadTable("grade;rate;share;pay\nA;40.10;0,1;50\nB;38.5;0,2;61\n");
  assert.equal(mixed.source.decimal?.how, "ambiguous");
  assert.equal(mixed.source.decimal?.mark, ".");
  // A comma file is read with a point, as before, and "85,000" is grouping.
  const commaFile = loadTable('grade,pay\nA,"85,000"\nB,"61,500"\n');
  assert.deepEqual(commaFile.source.decimal, { mark: ".", how: "default" });
  // A mark given is kept, whatever the cells.
  const given = loadTable("grade;rate;pay\nA;40.10;50\nB;38,5;61\n", { decimal: "," });
  assert.deepEqual(given.source.decimal, { mark: ",", how: "given" });
});
