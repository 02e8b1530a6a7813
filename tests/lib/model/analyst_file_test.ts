// The analyst's file for the hand model (tests/lib/model/_hand_model.ts):
// written and read back, written 0600, and refused (DataError naming the
// file) when it is not one, was edited, or belongs to another model file.
import assert from "node:assert/strict";
import { DataError } from "../../../mod.ts";
import {
  ANALYST_FILE_WARNING,
  analystFromText,
  analystToText,
  readAnalystFile,
  writeAnalystFile,
} from "../../../lib/model/analyst_file.ts";
import { handModel } from "./_hand_model.ts";

const SHA = "ab".repeat(32);

function readModel() {
  const model = handModel();
  model.provenance = { ...model.provenance, modelFile: { path: "m.json", sha256: SHA } };
  return model;
}

const refused = (file: string, text?: string) => (e: Error) =>
  e instanceof DataError && e.location.file === file &&
  (text === undefined || e.message.includes(text));

Deno.test("the text holds the states and keys, the model's SHA-256 and the warning, and reads back", () => {
  const model = readModel();
  const text = analystToText(model, SHA);
  const doc = JSON.parse(text);
  assert.equal(doc.kind, "paygrove-analyst-file");
  assert.equal(doc.warning, ANALYST_FILE_WARNING);
  assert.deepEqual(doc.model, { sha256: SHA, trees: 3, rows: 20 });
  assert.equal(doc.rowKeys, model.analyst!.rowKeys);
  const back = analystFromText(text, "m.analyst", model);
  assert.deepEqual(back.resamples, model.analyst!.resamples);
  assert.equal(back.rowKeys, model.analyst!.rowKeys);
  // Without row keys (no identifier column).
  const noKeys = { ...model, analyst: { ...model.analyst!, rowKeys: null } };
  assert.equal(analystFromText(analystToText(noKeys, SHA), "m.analyst", noKeys).rowKeys, null);
});

Deno.test("a model read without its analyst's part has none to write", () => {
  assert.throws(() => analystToText({ ...readModel(), analyst: null }, SHA), DataError);
});

Deno.test("not an analyst's file, or edited: refused naming the file", () => {
  const model = readModel();
  const text = analystToText(model, SHA);
  assert.throws(() => analystFromText("{not json", "x.analyst", model), refused("x.analyst"));
  assert.throws(
    () => analystFromText('{"kind":"other"}', "x.analyst", model),
    refused("x.analyst"),
  );
  assert.throws(() => analystFromText("null", "x.analyst", model), refused("x.analyst"));
  // One character of the states changed: the checksum no longer matches.
  const doc = JSON.parse(text);
  const edited = text.replace(
    doc.resamples,
    (doc.resamples[0] === "A" ? "B" : "A") + doc.resamples.slice(1),
  );
  assert.throws(() => analystFromText(edited, "x.analyst", model), refused("x.analyst"));
});

Deno.test("another model file, other counts, or keys that do not fit: refused", () => {
  const model = readModel();
  const text = analystToText(model, SHA);
  // Written for another model file.
  const other = {
    ...model,
    provenance: { ...model.provenance, modelFile: { path: "n.json", sha256: "cd".repeat(32) } },
  };
  assert.throws(() => analystFromText(text, "x.analyst", other), refused("x.analyst", "n.json"));
  const unread = { ...model, provenance: { ...model.provenance, modelFile: undefined } };
  assert.throws(() => analystFromText(text, "x.analyst", unread), refused("x.analyst"));
  // The model has 21 rows now: the counts differ.
  const more = { ...model, rows: { used: 21, dropped: 0 } };
  assert.throws(() => analystFromText(text, "x.analyst", more), refused("x.analyst"));
  // Consistent counts, but 19 row keys for 20 rows (the checksum redone).
  const short = {
    ...model,
    analyst: { ...model.analyst!, rowKeys: model.analyst!.rowKeys!.slice(12) },
  };
  assert.throws(
    () => analystFromText(analystToText(short, SHA), "x.analyst", model),
    refused("x.analyst", "19"),
  );
  // States for two trees, the model has three.
  const fewer = {
    ...model,
    analyst: { ...model.analyst!, resamples: model.analyst!.resamples.subarray(0, 8) },
  };
  assert.throws(
    () => analystFromText(analystToText(fewer, SHA), "x.analyst", model),
    refused("x.analyst"),
  );
});

Deno.test("written with mode 0600, read back joined to the model", async () => {
  const dir = await Deno.makeTempDir();
  try {
    const path = `${dir}/m.analyst`;
    const model = readModel();
    await writeAnalystFile(path, model, SHA);
    assert.equal((await Deno.stat(path)).mode! & 0o777, 0o600);
    const joined = await readAnalystFile(path, { ...model, analyst: null });
    assert.deepEqual(joined.analyst!.resamples, model.analyst!.resamples);
    assert.equal(joined.analyst!.rowKeys, model.analyst!.rowKeys);
    // An existing file is kept without force.
    await assert.rejects(writeAnalystFile(path, model, SHA));
    await writeAnalystFile(path, model, SHA, { force: true });
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});
