import assert from "node:assert/strict";
import { OptionError } from "../../../lib/errors.ts";
import { filterRows, subsetRows } from "../../../lib/table/filter_rows.ts";
import { loadTable } from "../../../lib/table/load_table.ts";
import type { Column, Table } from "../../../lib/table/types.ts";

// Lines: the header is line 1, so row r is on line r + 2.
const csv = [
  "id,site,level,years,pay,country",
  "a1,North,L1,2,50000,DE",
  "a2,South,L2,5,61000,DE",
  "a3,North,L3,9,72000,DE",
  "a4,East,L2,5,60000,DE",
  "a5,South,L1,2,51000,DE",
  "a6,North,L2,NA,59000,DE",
].join("\n") + "\n";
const table = loadTable(csv, { target: "pay", types: { id: "identifier" } });

function column(t: Table, name: string): Column {
  return t.columns.find((c) => c.name === name)!;
}
function levelsOf(t: Table, name: string): string[] {
  const c = column(t, name);
  assert.ok(c.type === "categorical" || c.type === "ordinal");
  return Array.from(c.codes, (k) => k < 0 ? "?" : c.levels[k]);
}
function numbers(t: Table, name: string): number[] {
  const c = column(t, name);
  assert.equal(c.type, "numeric");
  return Array.from((c as { values: Float64Array }).values);
}
function refusal(run: () => unknown): OptionError {
  try {
    run();
  } catch (error) {
    assert.ok(error instanceof OptionError, String(error));
    return error;
  }
  assert.fail("no error");
}

Deno.test("the table is as the test expects", () => {
  assert.equal(table.rows, 6);
  assert.equal(column(table, "site").type, "categorical");
  assert.equal(column(table, "id").type, "identifier");
  assert.equal(column(table, "country").type, "constant");
  assert.deepEqual(Array.from(table.lines), [2, 3, 4, 5, 6, 7]);
});

Deno.test("one value of a level column keeps its rows, lines and all columns in step", () => {
  const north = filterRows(table, { site: ["North"] });
  // North rows by hand: a1 (line 2), a3 (line 4), a6 (line 7).
  assert.equal(north.rows, 3);
  assert.deepEqual(Array.from(north.lines), [2, 4, 7]);
  assert.deepEqual(levelsOf(north, "site"), ["North", "North", "North"]);
  assert.deepEqual(levelsOf(north, "level"), ["L1", "L3", "L2"]);
  assert.deepEqual(numbers(north, "pay"), [50000, 72000, 59000]);
  assert.deepEqual((column(north, "id") as { values: string[] }).values, ["a1", "a3", "a6"]);
  const years = numbers(north, "years");
  assert.deepEqual(years.slice(0, 2), [2, 9]);
  assert.ok(Number.isNaN(years[2]));
  assert.equal(north.notes.at(-1), "kept 3 of 6 rows where site=North");
  // Levels are kept whole (codes refer to the same list).
  assert.deepEqual((column(north, "site") as { levels: string[] }).levels, [
    "East",
    "North",
    "South",
  ]);
  // The original table is untouched.
  assert.equal(table.rows, 6);
  assert.equal(table.notes.includes("kept 3 of 6 rows where site=North"), false);
});

Deno.test("values of one column are alternatives; columns must all match", () => {
  const twoSites = filterRows(table, { site: ["North", "South"] });
  assert.deepEqual(Array.from(twoSites.lines), [2, 3, 4, 6, 7]);
  const both = filterRows(table, { site: ["North", "South"], level: ["L2"] });
  // L2 in North or South: a2 (line 3), a6 (line 7).
  assert.deepEqual(Array.from(both.lines), [3, 7]);
  assert.equal(both.notes.at(-1), "kept 2 of 6 rows where site=North|South, level=L2");
});

Deno.test("numeric columns compare by number; identifiers by text; missing never matches", () => {
  assert.deepEqual(Array.from(filterRows(table, { years: ["5"] }).lines), [3, 5]);
  assert.deepEqual(Array.from(filterRows(table, { years: ["5.0", "2"] }).lines), [2, 3, 5, 6]);
  assert.deepEqual(Array.from(filterRows(table, { id: ["a4", "a1"] }).lines), [2, 5]);
  const error = refusal(() => filterRows(table, { years: ["NA"] }));
  assert.equal(error.message, 'where: "years" is numeric, and "NA" is not a number');
});

Deno.test("a constant column keeps every row or none", () => {
  assert.equal(filterRows(table, { country: ["DE"] }).rows, 6);
  const none = refusal(() => filterRows(table, { country: ["FR"] }));
  assert.equal(none.message, "where: no row has country=FR");
});

Deno.test("no condition returns the same table", () => {
  assert.equal(filterRows(table, {}), table);
});

Deno.test("no matching row, an unknown column or level is an OptionError", () => {
  const none = refusal(() => filterRows(table, { site: ["East"], level: ["L3"] }));
  assert.equal(none.message, "where: no row has site=East and level=L3");
  assert.match(refusal(() => filterRows(table, { sight: ["North"] })).message, /where/);
  assert.match(refusal(() => filterRows(table, { site: ["West"] })).message, /West/);
});

Deno.test("a level named in another case is matched to the table's level", () => {
  assert.deepEqual(Array.from(filterRows(table, { site: ["north"] }).lines), [2, 4, 7]);
});

Deno.test("subsetRows keeps the rows in the order given, repeats included", () => {
  const picked = subsetRows(table, [4, 0, 4], "picked by hand");
  assert.equal(picked.rows, 3);
  assert.deepEqual(Array.from(picked.lines), [6, 2, 6]);
  assert.deepEqual(numbers(picked, "pay"), [51000, 50000, 51000]);
  assert.deepEqual(picked.notes, [...table.notes, "picked by hand"]);
  const empty = subsetRows(table, [], "none");
  assert.equal(empty.rows, 0);
  assert.deepEqual(numbers(empty, "pay"), []);
});
