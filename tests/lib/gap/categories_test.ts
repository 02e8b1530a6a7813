// Categories of workers from within columns, out-of-bag R-squared and
// the table's provenance, on small invented tables worked out by hand.
import assert from "node:assert/strict";
import { loadTable, OptionError, UnknownNameError, VERSION } from "../../../mod.ts";
import {
  categoriesOf,
  oobRSquared,
  tableProvenance,
  withinColumns,
} from "../../../lib/gap/categories.ts";

const CSV = "family,level,years,pay\n" +
  "Lab,G2,1,50\nSales,G1,2,52\nLab,G1,3,54\n,G2,4,56\nSales,G2,5,58\nLab,,6,60\nLab,G2,7,62\n";

function table() {
  return loadTable(CSV, { target: "pay", orders: { level: ["G1", "G2"] } });
}

Deno.test("withinColumns returns the named level columns, in the order given", () => {
  const columns = withinColumns(table(), ["level", "family"], ["pay"]);
  assert.deepEqual(columns.map((c) => [c.name, c.type]), [["level", "ordinal"], [
    "family",
    "categorical",
  ]]);
});

Deno.test("withinColumns refuses numbers, excluded columns and unknown names, naming them", () => {
  const t = table();
  assert.throws(
    () => withinColumns(t, ["years"], ["pay"]),
    (e: Error) => e instanceof OptionError && e.message.includes('"years"'),
  );
  assert.throws(
    () => withinColumns(t, ["family"], ["pay", "family"]),
    (e: Error) => e instanceof OptionError && e.message.includes('"family"'),
  );
  assert.throws(
    () => withinColumns(t, ["famly"], ["pay"]),
    (e: Error) =>
      e instanceof UnknownNameError && e.asked === "famly" && e.nearest === "family" &&
      e.option === "within",
  );
});

Deno.test("categoriesOf: every combination that occurs, in level order, missing last", () => {
  const t = table();
  const [family, level] = withinColumns(t, ["family", "level"], ["pay"]);
  // Rows: Lab/G2, Sales/G1, Lab/G1, (missing)/G2, Sales/G2, Lab/(missing), Lab/G2.
  const all = categoriesOf([family, level], [0, 1, 2, 3, 4, 5, 6]);
  assert.deepEqual(all.names, [
    "Lab / G1",
    "Lab / G2",
    "Lab / (missing)",
    "Sales / G1",
    "Sales / G2",
    "(missing) / G2",
  ]);
  assert.deepEqual(all.members, [[2], [0, 6], [5], [1], [4], [3]]);
  // Items index a subset of the table's rows; members are item positions.
  const some = categoriesOf([level], [6, 1, 0, 5]);
  assert.deepEqual(some.names, ["G1", "G2", "(missing)"]);
  assert.deepEqual(some.members, [[1], [0, 2], [3]]);
  assert.deepEqual(categoriesOf([], [0, 1]), { names: [], members: [] });
});

Deno.test("oobRSquared over the rows with an out-of-bag estimate", () => {
  // Rows 0, 2, 3: y 1, 3, 4 (mean 8/3), errors -0.5, 0.5, 0: SSE 0.5,
  // SST 25/9 + 1/9 + 16/9 = 42/9.
  const r2 = oobRSquared([1, 2, 3, 4], [1.5, NaN, 2.5, 4]);
  assert(Math.abs(r2 - (1 - 0.5 / (42 / 9))) < 1e-15);
  assert.equal(oobRSquared([1, 2, 3], [2, 2, 2]), 1 - 2 / 2);
});

Deno.test("tableProvenance: file, SHA-256 of the bytes, rows read including those left out", async () => {
  // One row has no pay: read, then left out of the table.
  const csv = "family,pay\nLab,50\nSales,\nLab,54\n";
  const t = loadTable(csv, { target: "pay", file: "staff.csv" });
  assert.equal(t.rows, 2);
  const digest = new Uint8Array(
    await crypto.subtle.digest("SHA-256", new TextEncoder().encode(csv)),
  );
  const hex = Array.from(digest, (b) => b.toString(16).padStart(2, "0")).join("");
  assert.deepEqual(tableProvenance(t, 7), {
    paygrove: VERSION,
    table: { file: "staff.csv", sha256: hex, rows: 3 },
    seed: 7,
  });
  assert.equal(tableProvenance(loadTable(csv, { target: "pay" }), 1).table.file, "input");
});
