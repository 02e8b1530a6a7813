import assert from "node:assert/strict";
import { describeSchema } from "../../../lib/table/describe_schema.ts";
import { loadTable } from "../../../lib/table/load_table.ts";

Deno.test("each column is summarised by its type, in file order", () => {
  const csv = [
    "id,level,site,gender,country,years,pay",
    "a1,L2,North,F,DE,3,€50000",
    "a2,L1,South,M,DE,NA,€48000",
    "a3,L10,North,F,DE,12,€72000",
    "a4,L2,East,M,DE,-1,NA",
  ].join("\n");
  const summary = describeSchema(
    loadTable(csv, { target: "pay", types: { id: "identifier" }, protected: ["gender"] }),
  );
  // The row with pay missing (line 5) is left out of the rows kept.
  assert.equal(summary.rows, 3);
  assert.equal(summary.rowsExcluded, 1);
  assert.equal(summary.target, "pay");
  assert.deepEqual(summary.columns.map((c) => [c.name, c.type]), [
    ["id", "identifier"],
    ["level", "ordinal"],
    ["site", "categorical"],
    ["gender", "categorical"],
    ["country", "constant"],
    ["years", "numeric"],
    ["pay", "numeric"],
  ]);
  const [id, level, site, gender, country, years, pay] = summary.columns;
  assert.equal(id.levels, undefined);
  assert.equal(id.min, undefined);
  assert.deepEqual(level.levels, ["L1", "L2", "L10"]);
  assert.deepEqual(site.levels, ["North", "South"]);
  assert.equal(gender.protected, true);
  assert.equal(site.protected, false);
  assert.equal(country.value, "DE");
  // Among the rows kept, years are 3, NA, 12: min 3, max 12, one missing.
  assert.deepEqual([years.min, years.max, years.missing], [3, 12, 1]);
  assert.equal(years.unit, undefined);
  assert.deepEqual([pay.min, pay.max, pay.missing], [48000, 72000, 0]);
  assert.equal(pay.unit?.currency, "EUR");
});

Deno.test("negative values and a numeric column with every kept value missing", () => {
  const csv = "bonus,rating,pay\n-500,NA,50000\n-20,NA,60000\n";
  const summary = describeSchema(loadTable(csv, { target: "pay", types: { rating: "numeric" } }));
  const [bonus, rating] = summary.columns;
  assert.deepEqual([bonus.min, bonus.max], [-500, -20]);
  assert.equal(rating.type, "numeric");
  assert.equal(rating.missing, 2);
  // No value: no min or max rather than Infinity and -Infinity.
  assert.ok(!("min" in rating) && !("max" in rating));
});

Deno.test("without a target no target is named; warnings and notes are passed on", () => {
  const table = loadTable("site,years\nNorth,1\nSouth,2\nNorth,1\n");
  const summary = describeSchema(table);
  assert.ok(!("target" in summary));
  assert.equal(summary.rowsExcluded, 0);
  assert.equal(summary.warnings, table.warnings);
  assert.equal(summary.notes, table.notes);
  // The summary is JSON-ready: it survives a round trip unchanged.
  assert.deepEqual(JSON.parse(JSON.stringify(summary)), summary);
});

Deno.test("a level column that names rows carries identifierLike", () => {
  const rows = Array.from({ length: 100 }, (_, i) => `c${i % 60},${50000 + i}`);
  const summary = describeSchema(loadTable(["comment,pay", ...rows].join("\n"), { target: "pay" }));
  assert.deepEqual(summary.columns[0].identifierLike, { levels: 60, rows: 100 });
  assert.equal(summary.columns[0].levels?.length, 60);
});

Deno.test("hostile names and levels are passed on as data, unchanged", () => {
  const name = '=HYPERLINK("x")';
  const csv = `"${name.replaceAll('"', '""')}",pay\n"\u001b[31mred",1\nplain,2\n`;
  const summary = describeSchema(loadTable(csv, { target: "pay" }));
  assert.equal(summary.columns[0].name, name);
  assert.deepEqual(summary.columns[0].levels?.slice().sort(), ["\u001b[31mred", "plain"].sort());
});
