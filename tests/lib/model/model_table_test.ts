// Reading another table for the hand model (tests/lib/model/_hand_model.ts):
// encoded to the model's codes, every schema difference listed, unseen
// levels refusing their rows only, and rows found by identifier.
import assert from "node:assert/strict";
import { DataError } from "../../../mod.ts";
import {
  findRow,
  isTrainingTable,
  readForModel,
  readSettingsWith,
  readTableFileForModel,
  rowProfile,
  RowsRefusedError,
} from "../../../lib/model/model_table.ts";
import { handModel } from "./_hand_model.ts";

const HEADER = "employee_id,level,years,site,pay_eur\n";

Deno.test("rows are encoded in the model's codes, levels matched by name and case", () => {
  // Columns in another order, a level in other case, a missing cell.
  const csv = "site,years,level,employee_id\nsouth,3,G3,a1\nNorth,,g1,a2\nNorth,12,G2,a3\n";
  const rows = readForModel(handModel(), csv, "other.csv");
  assert.equal(rows.rows, 3);
  assert.deepEqual(rows.features.map((f) => Array.from(f)), [[2, 0, 1], [3, NaN, 12], [1, 0, 0]]);
  assert.deepEqual(rows.ids, ["a1", "a2", "a3"]);
  assert.equal(rows.idColumn, "employee_id");
  assert.equal(rows.target, null);
  assert.deepEqual(rowProfile(rows, 1), Float64Array.of(0, NaN, 0));
  assert.deepEqual(rows.raw.header, ["site", "years", "level", "employee_id"]);
  assert.equal(rows.refused, undefined);
});

Deno.test("the target is read where present, required when asked", () => {
  const rows = readForModel(
    handModel(),
    HEADER + "a,G1,1,North,41000\nb,G2,2,South,\n",
    "t.csv",
    true,
  );
  assert.deepEqual(Array.from(rows.target!), [41000, NaN]);
  assert.throws(
    () => readForModel(handModel(), "employee_id,level,years,site\na,G1,1,North\n", "t.csv", true),
    (e: Error) => e instanceof DataError && e.message.includes('"pay_eur"'),
  );
});

Deno.test("missing columns and columns of another type refuse the table, naming them", () => {
  assert.throws(
    () => readForModel(handModel(), "employee_id,level\na,G1\n", "few.csv"),
    (e: Error) =>
      e instanceof DataError && !(e instanceof RowsRefusedError) && e.message.includes('"years"') &&
      e.message.includes('"site"') && (e as DataError).location.file === "few.csv",
  );
  // Text in a column declared numeric: the read names the column.
  assert.throws(
    () => readForModel(handModel(), HEADER + "a,G1,ten,North,1\nb,G2,eleven,South,2\n", "text.csv"),
    (e: Error) =>
      e instanceof DataError && e.message.includes("years") && e.message.includes('"ten"'),
  );
  // Without a declared type the column reads as levels: a difference listed.
  const undeclared = handModel();
  delete undeclared.read.types.years;
  assert.throws(
    () => readForModel(undeclared, HEADER + "a,G1,ten,North,1\nb,G2,eleven,South,2\n", "text.csv"),
    (e: Error) =>
      e instanceof DataError && !(e instanceof RowsRefusedError) && e.message.includes('"years"'),
  );
  // Numbers where the model has levels: declared ordinal, they are unseen
  // levels (rows refused); undeclared, a numeric column (the table refused).
  assert.throws(
    () => readForModel(handModel(), HEADER + "a,1,1,North,1\nb,2,2,South,2\n", "num.csv"),
    (e: Error) => e instanceof RowsRefusedError && e.rows.refused!.length === 2,
  );
  const numeric = handModel();
  delete numeric.read.types.level;
  assert.throws(
    () => readForModel(numeric, HEADER + "a,1,1,North,1\nb,2,2,South,2\n", "num.csv"),
    (e: Error) =>
      e instanceof DataError && !(e instanceof RowsRefusedError) && e.message.includes('"level"'),
  );
});

Deno.test("an unseen level refuses its rows only, with their lines", () => {
  const csv = HEADER + "a,G1,1,North,\nb,G2,2,West,\nc,G9,3,North,\nd,G2,4,South,\n";
  let error: unknown;
  try {
    readForModel(handModel(), csv, "new.csv");
  } catch (e) {
    error = e;
  }
  assert(error instanceof RowsRefusedError && error instanceof DataError);
  const rows = error.rows;
  assert.deepEqual(rows.refused!.map((r) => [r.row, r.line, r.reasons.length]), [[1, 3, 1], [
    2,
    4,
    1,
  ]]);
  assert.match(rows.refused![0].reasons[0], /\bWest\b/);
  assert.match(rows.refused![1].reasons[0], /\bG9\b/);
  // The refused rows' attributes are all NaN; the others are read.
  assert.deepEqual(Array.from(rowProfile(rows, 1)), [NaN, NaN, NaN]);
  assert.deepEqual(Array.from(rowProfile(rows, 3)), [1, 4, 1]);
});

Deno.test("a column of one level: known, it is that code; unknown, every row is refused", () => {
  const known = readForModel(handModel(), HEADER + "a,G1,1,North,\nb,G2,2,North,\n", "k.csv");
  assert.deepEqual(Array.from(known.features[2]), [0, 0]);
  assert.throws(
    () => readForModel(handModel(), HEADER + "a,G1,1,West,\nb,G2,2,West,\n", "w.csv"),
    (e: Error) => e instanceof RowsRefusedError && e.rows.refused!.length === 2,
  );
});

Deno.test("readSettingsWith puts the given overrides over the model's settings", () => {
  const read = handModel().read;
  const mixed = readSettingsWith(read, { delimiter: ";", decimal: ",", encoding: undefined });
  assert.equal(mixed.delimiter, ";");
  assert.equal(mixed.decimal, ",");
  assert.equal(mixed.encoding, "utf-8");
  assert.equal(mixed.identifier, "employee_id");
  assert.deepEqual(readSettingsWith(read), read);
  // Read with the overrides: semicolons and decimal commas.
  const rows = readForModel(
    handModel(),
    "employee_id;level;years;site\na;G1;2,5;North\n",
    "s.csv",
    false,
    [],
    {
      delimiter: ";",
      decimal: ",",
    },
  );
  assert.equal(rows.features[1][0], 2.5);
});

Deno.test("amount columns are read as numbers when present", () => {
  const rows = readForModel(
    handModel(),
    HEADER.replace("\n", ",offer\n") + 'a,G1,1,North,,"45,000"\n',
    "o.csv",
    false,
    [
      "offer",
      "absent",
    ],
  );
  const offer = rows.table.columns.find((c) => c.name === "offer")!;
  assert(offer.type === "numeric" && offer.values[0] === 45000);
});

Deno.test("findRow by the identifier column, else by a cell outside the attributes", () => {
  const model = handModel();
  const rows = readForModel(model, HEADER + "a,G1,1,North,\nb,G2,2,South,\n", "ids.csv");
  assert.equal(findRow(model, rows, "b", "ids.csv"), 1);
  assert.throws(
    () => findRow(model, rows, "zz", "ids.csv"),
    (e: Error) =>
      e instanceof DataError && e.message.includes('"zz"') &&
      (e as DataError).location.file === "ids.csv",
  );
  // Names repeat, so the column is not read as identifiers.
  const named = readForModel(
    model,
    "name,level,years,site\nAna,G1,1,North\nBo,G2,2,South\nBo,G3,3,North\n",
    "n.csv",
  );
  assert.equal(named.idColumn, undefined);
  const plain = named;
  assert.equal(findRow(model, plain, "Ana", "n.csv"), 0);
  assert.throws(
    () => findRow(model, plain, "Bo", "n.csv"),
    (e: Error) => e instanceof DataError && e.message.includes("2"),
  );
  // A value of an attribute is not a name.
  assert.throws(() => findRow(model, plain, "G1", "n.csv"), DataError);
});

Deno.test("isTrainingTable compares the table's SHA-256 with the model's", () => {
  const model = handModel();
  const rows = readForModel(model, HEADER + "a,G1,1,North,\n", "x.csv");
  assert.equal(isTrainingTable(model, rows), false);
  const same = {
    ...model,
    provenance: {
      ...model.provenance,
      table: { ...model.provenance.table, sha256: rows.table.source.sha256 },
    },
  };
  assert.equal(isTrainingTable(same, rows), true);
});

Deno.test("readTableFileForModel reads a file as readForModel reads its text", async () => {
  const path = await Deno.makeTempFile({ suffix: ".csv" });
  try {
    const csv = HEADER + "a,G1,1,North,41000\n";
    await Deno.writeTextFile(path, csv);
    const rows = await readTableFileForModel(handModel(), path, [], true);
    assert.deepEqual(rows.features, readForModel(handModel(), csv, path, true).features);
    assert.deepEqual(Array.from(rows.target!), [41000]);
  } finally {
    await Deno.remove(path);
  }
});
