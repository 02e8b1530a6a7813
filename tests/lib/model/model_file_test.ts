// The model file: a saved and reloaded model answers exactly as the fitted
// one; it holds no one's pay; and damaged, edited, foreign or newer files
// are refused with a clear message (never a crash or a silent wrong answer).
import assert from "node:assert/strict";
import { createHash } from "node:crypto";
import {
  DataError,
  estimateProfile,
  makeDataset,
  modelFromText,
  modelToText,
  openModel,
  readModelFile,
  typicalProfile,
  writeModelFile,
} from "../../../mod.ts";
import { demoModel } from "./_demo_model.ts";

const { table, model } = await demoModel();
const text = modelToText(model);

function refused(doc: string, pattern: RegExp): void {
  assert.throws(
    () => modelFromText(doc, "m.json"),
    (e) => e instanceof DataError && pattern.test(e.message),
  );
}

// Edits the parsed document and writes it back with a fresh checksum, as a
// careful forger would: only the structural checks can catch it then.
// deno-lint-ignore no-explicit-any
type Doc = Record<string, any>;
function forged(edit: (doc: Doc) => void): string {
  const { checksum: _, ...doc } = JSON.parse(text) as Doc;
  edit(doc);
  const body = JSON.stringify(doc);
  return `${body.slice(0, -1)},"checksum":"${createHash("sha256").update(body).digest("hex")}"}`;
}

function int32(values: number[]): string {
  return btoa(String.fromCharCode(...new Uint8Array(Int32Array.from(values).buffer)));
}

Deno.test("a reloaded model gives the same answers, bit for bit", () => {
  const again = modelFromText(text, "m.json");
  const profile = typicalProfile(model);
  profile[model.features.findIndex((f) => f.name === "level")] = 4;
  const a = estimateProfile(openModel(model), profile, 0.9);
  const b = estimateProfile(openModel(again), profile, 0.9);
  assert.deepEqual(b, a);
  assert.deepEqual(again.importance, model.importance);
  // Compared without printing 600 kB on a failure.
  assert.ok(modelToText(again) === text, "the reloaded model saves to different text");
});

Deno.test("the model file holds no one's pay: only amounts shared by a group", () => {
  const { dataset } = makeDataset(table, { target: "base_pay_eur" });
  const numbers = new Set<string>();
  // Every number in the document, and every float64 in its base64 arrays.
  JSON.stringify(JSON.parse(text), (_k, v) => {
    if (typeof v === "number") numbers.add(String(v));
    if (
      typeof v === "string" && v.length > 16 && v.length % 4 === 0 && /^[A-Za-z0-9+/]+=*$/.test(v)
    ) {
      const bytes = Uint8Array.from(atob(v), (c) => c.charCodeAt(0));
      if (bytes.length % 8 === 0) {
        for (const x of new Float64Array(bytes.buffer)) numbers.add(String(x));
      }
    }
    return v;
  });
  // A node whose people all earn the same (held at a band's top) has that
  // pay as its mean: allowed only when at least the privacy minimum share it.
  const holders = new Map<number, number>();
  for (const pay of dataset.target.values) holders.set(pay, (holders.get(pay) ?? 0) + 1);
  const exposed = [...holders].filter(([pay, n]) =>
    (numbers.has(String(pay)) || numbers.has(String(Math.log(pay)))) &&
    n < model.settings.privacyMin
  );
  assert.deepEqual(exposed, []);
});

Deno.test("a truncated file is refused", () => {
  refused(
    text.slice(0, text.length / 2),
    /m\.json is not a complete paygrove model: it is not valid JSON/,
  );
});

Deno.test("a flipped bit is caught by the checksum", () => {
  const at = text.indexOf('"value":"') + 20;
  const flipped = text.slice(0, at) + (text[at] === "A" ? "B" : "A") + text.slice(at + 1);
  refused(flipped, /m\.json is damaged or was edited: its checksum does not match its contents/);
});

Deno.test("a foreign JSON file and a newer format are refused", () => {
  refused('{"name":"something else"}', /m\.json is not a paygrove model file/);
  refused(
    forged((doc) => (doc.format = 99)),
    /written in model format 99 by a newer paygrove; this paygrove \(0\.1\.0\) reads format 1/,
  );
});

Deno.test("an edited tree with a child out of range is refused", () => {
  refused(
    forged((doc) => {
      const tree = doc.reference.tree;
      const left = Array.from(
        new Int32Array(Uint8Array.from(atob(tree.left), (c) => c.charCodeAt(0)).buffer),
      );
      left[0] = tree.nodeCount + 5;
      tree.left = int32(left);
    }),
    /reference tree: node 0 has children \d+ and \d+, which are out of order or range/,
  );
});

Deno.test("an edited tree with a cycle is refused", () => {
  refused(
    forged((doc) => {
      const tree = doc.ensemble.trees[0];
      const right = Array.from(
        new Int32Array(Uint8Array.from(atob(tree.right), (c) => c.charCodeAt(0)).buffer),
      );
      // A child pointing back at the root would make a walk loop forever.
      const node = right.findIndex((r, i) => i > 0 && r > 0);
      right[node] = 0;
      tree.right = int32(right);
    }),
    /tree 1: node \d+ has children \d+ and 0, which are out of order or range/,
  );
});

Deno.test("an edited tree with a NaN threshold or a missing array is refused", () => {
  refused(
    forged((doc) => {
      const tree = doc.reference.tree;
      const t = new Float64Array(
        Uint8Array.from(atob(tree.threshold), (c) => c.charCodeAt(0)).buffer,
      );
      const node = Array.from(
        new Int32Array(Uint8Array.from(atob(tree.feature), (c) => c.charCodeAt(0)).buffer),
      )
        .findIndex((f, i) => f >= 0 && model.features[f].kind !== "categorical" && i >= 0);
      t[node] = NaN;
      tree.threshold = btoa(String.fromCharCode(...new Uint8Array(t.buffer)));
    }),
    /reference tree: node \d+ has no threshold/,
  );
  refused(
    forged((doc) => delete doc.reference.tree.value),
    /reference\.tree\.value: Invalid input/,
  );
  refused(
    forged((doc) => (doc.reference.tree.value = doc.reference.tree.value.slice(0, 40))),
    /reference tree\.value has \d+ bytes, expected \d+/,
  );
});

Deno.test("writing keeps an existing file unless forced, and leaves no temporary file", async () => {
  const dir = await Deno.makeTempDir();
  const path = `${dir}/m.json`;
  await writeModelFile(path, model);
  await assert.rejects(
    () => writeModelFile(path, model),
    /--out: .*m\.json already exists; add --force/,
  );
  await writeModelFile(path, model, true);
  const back = await readModelFile(path);
  assert.equal(back.provenance.modelFile?.sha256, createHash("sha256").update(text).digest("hex"));
  assert.deepEqual([...Deno.readDirSync(dir)].map((e) => e.name), ["m.json"]);
  await Deno.remove(dir, { recursive: true });
});
