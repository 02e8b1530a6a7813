// One lookup for every option that names a column or a level (issue 14,
// "Names and typos"): exact, then case-insensitive, else the nearest as data.
import assert from "node:assert/strict";
import { loadTable, matchLevel, matchName, UnknownNameError } from "../../../mod.ts";
import { columnNamed } from "../../../lib/table/column_named.ts";

const columns = ["annual_salary", "department", "Sex", "level"];

Deno.test("a name is matched exactly, then without case, else the nearest is given", () => {
  assert.deepEqual(matchName("level", columns), { kind: "exact", name: "level" });
  assert.deepEqual(matchName("sex", columns), { kind: "case", name: "Sex" });
  assert.deepEqual(matchName("anual_salary", columns), {
    kind: "unknown",
    nearest: "annual_salary",
  });
  assert.deepEqual(matchName("departmnt", columns), { kind: "unknown", nearest: "department" });
  assert.deepEqual(matchName("postcode", columns), { kind: "unknown" });
  // Two columns that differ only in case: the case-insensitive match is no answer.
  assert.deepEqual(matchName("site", ["Site", "SITE"]), { kind: "unknown", nearest: "Site" });
});

Deno.test("levels of a ladder are placed beyond its ends rather than matched to a near name", () => {
  const ladder = ["G1", "G2", "G3", "G4", "G5", "G6", "G7"];
  assert.deepEqual(matchLevel("G8", ladder), {
    kind: "unknown",
    beyond: { side: "above", level: "G7" },
  });
  assert.deepEqual(matchLevel("G0", ladder), {
    kind: "unknown",
    beyond: { side: "below", level: "G1" },
  });
  assert.deepEqual(matchLevel("g3", ladder), { kind: "case", name: "G3" });
  // A rung missing inside the ladder, and names that are not levels of it.
  assert.deepEqual(matchLevel("G5", ["G1", "G3", "G7"]), { kind: "unknown", nearest: "G3" });
  assert.deepEqual(matchLevel("Enginering", ["Engineering", "Sales"]), {
    kind: "unknown",
    nearest: "Engineering",
  });
});

Deno.test("columnNamed and loadTable carry the lookup as data on their error", () => {
  const table = loadTable("department,Sex,pay\nLab,F,50\nOps,M,60\nLab,M,61\n");
  assert.equal(columnNamed(table, "sex", "--group").name, "Sex");
  assert.throws(() => columnNamed(table, "departmnt", "--within"), (error: unknown) => {
    assert.ok(error instanceof UnknownNameError);
    assert.equal(error.option, "--within");
    assert.equal(error.asked, "departmnt");
    assert.equal(error.nearest, "department");
    assert.deepEqual(error.known, ["department", "Sex", "pay"]);
    return true;
  });
  assert.throws(
    () => loadTable("department,Sex,pay\nLab,F,50\nOps,M,60\n", { target: "Pya" }),
    (error: unknown) => error instanceof UnknownNameError && error.nearest === "pay",
  );
  // A name right but for its case is taken, and the table says which it took.
  const read = loadTable("department,Sex,Pay\nLab,F,50\nOps,M,60\nLab,M,61\n", {
    target: "pay",
    protected: ["sex"],
  });
  assert.equal(read.target, "Pay");
  assert.deepEqual(read.nameMatches, [
    { option: "target", asked: "pay", name: "Pay" },
    { option: "protected", asked: "sex", name: "Sex" },
  ]);
});
