// The model file: a saved and reloaded model answers exactly as the fitted
// one; it holds no one's pay; and damaged, edited, foreign or newer files
// are refused with a clear message (never a crash or a silent wrong answer).
import assert from "node:assert/strict";
import { createHash } from "node:crypto";
import {
  analystFromText,
  analystToText,
  applyValues,
  bootstrapCounts,
  DataError,
  demoCompanyCsv,
  estimateProfile,
  loadTable,
  makeDataset,
  modelFromText,
  modelToText,
  openModel,
  readAnalystFile,
  readForModel,
  readModelFile,
  typicalProfile,
  writeAnalystFile,
  writeModelFile,
} from "../../../mod.ts";
import { DEMO_PATH, demoModel } from "./_demo_model.ts";

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
    /written in model format 99 by a newer paygrove; this paygrove \(0\.1\.0\) reads format 2/,
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
    /out: .*m\.json already exists; add force/,
  );
  await writeModelFile(path, model, true);
  const back = await readModelFile(path);
  assert.equal(back.provenance.modelFile?.sha256, createHash("sha256").update(text).digest("hex"));
  assert.deepEqual([...Deno.readDirSync(dir)].map((e) => e.name), ["m.json"]);
  await Deno.remove(dir, { recursive: true });
});

Deno.test("the file holds neither the trees' resampling states nor the training rows' keys", () => {
  const doc = JSON.parse(text);
  assert.equal(doc.format, 2);
  assert.equal(doc.ensemble.seeds, undefined);
  assert.equal(doc.rowKeys, undefined);
  const states = model.analyst!.resamples;
  assert.equal(states.length, 4 * 60);
  // Not as base64 of the whole array, nor any one tree's state as text.
  const bytes = new Uint8Array(states.buffer, states.byteOffset, states.byteLength);
  assert.ok(!text.includes(btoa(String.fromCharCode(...bytes))));
  for (let b = 0; b < 60; b++) {
    assert.ok(!text.includes(btoa(String.fromCharCode(...bytes.subarray(16 * b, 16 * b + 12)))));
  }
  const keys = model.analyst!.rowKeys!;
  assert.equal(keys.length, 12 * model.rows.used);
  for (let r = 0; r < 50; r++) assert.ok(!text.includes(keys.slice(12 * r, 12 * r + 12)));
  // Node counts are every training row reaching the node, drawn or not: the
  // root of every ensemble tree counts them all.
  for (const tree of model.ensemble!.trees) assert.equal(tree.rows[0], model.rows.used);
  // No node variance is kept.
  assert.equal(doc.reference.tree.impurity, undefined);
});

// fixtures/legacy/format1_demo300.json: written by paygrove 0.1.0 (commit
// de79dc9) with `fit target base_pay_eur trees 20` on the invented demo
// table demoCompanyCsv({ rows: 300, seed: 11 }).
const LEGACY = new URL("../../../fixtures/legacy/format1_demo300.json", import.meta.url).pathname;

Deno.test("a format-1 file still reads, says it rebuilds pay, and cannot be saved again", async () => {
  const old = await readModelFile(LEGACY);
  assert.deepEqual(old.fileNotes, [{ kind: "rebuildsPay", format: 1 }]);
  assert.equal(old.analyst!.resamples.length, 4 * 20);
  assert.equal(old.analyst!.rowKeys!.length, 12 * 300);
  // Its seeds regenerate each tree's resample: the drawn rows reaching each
  // leaf are the count the file kept for it (format 1 kept drawn rows).
  const rows = readForModel(old, demoCompanyCsv({ rows: 300, seed: 11 }), "demo300.csv", true);
  const profiles = Array.from(
    { length: rows.rows },
    (_, r) => Float64Array.from(rows.features, (f) => f[r]),
  );
  old.ensemble!.trees.forEach((tree, b) => {
    const counts = bootstrapCounts(300, old.analyst!.resamples, b);
    const drawn = new Int32Array(tree.nodeCount);
    profiles.forEach((p, r) => {
      if (counts[r] > 0) drawn[applyValues(tree, p)]++;
    });
    for (let n = 0; n < tree.nodeCount; n++) {
      if (tree.left[n] === -1) assert.equal(drawn[n], tree.rows[n], `tree ${b + 1}, leaf ${n}`);
    }
  });
  assert.throws(() => modelToText(old), /format-1 file cannot be saved again/);
});

Deno.test("parts that contradict each other are refused", () => {
  refused(
    forged((doc) => (doc.ensemble.trees = [])),
    /it has 0 trees, its settings say 60/,
  );
  refused(
    forged((doc) => delete doc.features.find((f: Doc) => f.kind === "ordinal").levels),
    /feature level is ordinal but has no levels/,
  );
  // Hand-edited levels (an outside trial's finding): a typical level below
  // 0, and a level named twice.
  refused(
    forged((doc) => (doc.features.find((f: Doc) => f.kind === "ordinal").typical = -1)),
    /feature level has no level -1/,
  );
  refused(
    forged((doc) => {
      const level = doc.features.find((f: Doc) => f.kind === "ordinal");
      level.levels[1] = level.levels[0];
    }),
    /feature level names a level twice/,
  );
  refused(
    forged((doc) => (doc.support.peers.features = ["level", "shoe_size"])),
    /its support figures name shoe_size, not a level feature of the model/,
  );
  refused(
    forged((doc) => (doc.rows.used = 50_000_000)),
    /fitted on 50000000 rows with 0 left out, but its table had 2000/,
  );
  refused(
    forged((doc) => {
      // Far more rows than the table had, and trees claiming as many nodes.
      doc.rows.used = 10;
      doc.provenance.table.rows = 10;
    }),
    /has \d+ nodes; a tree of 10 rows with leaves of at least 5 has at most 3/,
  );
});

Deno.test("devices, folders and non-JSON files are refused at their first piece", async () => {
  const started = performance.now();
  await assert.rejects(
    () => readModelFile("/dev/zero"),
    /\/dev\/zero is not a paygrove model file/,
  );
  await assert.rejects(
    () => readModelFile("/dev/urandom"),
    /\/dev\/urandom is not a paygrove model file/,
  );
  await assert.rejects(() => readModelFile(DEMO_PATH), /is not a paygrove model file/);
  await assert.rejects(
    () => readModelFile(Deno.makeTempDirSync()),
    /is a folder, not a model file/,
  );
  // Each stops at its first megabyte: well under a second for all four.
  assert.ok(performance.now() - started < 5000);
});

Deno.test("the analyst's file joins its own model only, and is readable by its owner alone", async () => {
  const dir = await Deno.makeTempDir();
  const { sha256 } = await writeModelFile(`${dir}/m.json`, model);
  await writeAnalystFile(`${dir}/m.analyst.json`, model, sha256);
  assert.equal((await Deno.stat(`${dir}/m.analyst.json`)).mode! & 0o777, 0o600);
  const shared = await readModelFile(`${dir}/m.json`);
  assert.equal(shared.analyst, null);
  const joined = await readAnalystFile(`${dir}/m.analyst.json`, shared);
  assert.deepEqual(joined.analyst, model.analyst);
  assert.match(await Deno.readTextFile(`${dir}/m.analyst.json`), /never share it/);
  // Another model's file: refused.
  const other = await fitModel_(300);
  const { sha256: otherSha } = await writeModelFile(`${dir}/o.json`, other);
  await writeAnalystFile(`${dir}/o.analyst.json`, other, otherSha);
  await assert.rejects(
    () => readAnalystFile(`${dir}/o.analyst.json`, shared),
    /o\.analyst\.json belongs to another model file/,
  );
  const edited = (await Deno.readTextFile(`${dir}/m.analyst.json`)).replace(
    '"rows":2000',
    '"rows":20',
  );
  assert.throws(() => analystFromText(edited, "x", shared), /checksum does not match/);
  assert.equal(analystToText(model, sha256), await Deno.readTextFile(`${dir}/m.analyst.json`));
  await Deno.remove(dir, { recursive: true });
});

async function fitModel_(rows: number) {
  const { fitModel } = await import("../../../mod.ts");
  const small = loadTable(demoCompanyCsv({ rows, seed: 5 }), { target: "base_pay_eur" });
  return fitModel(small, { target: "base_pay_eur", trees: 5, folds: 3, workers: 1 });
}

Deno.test("the jackknife needs the analyst's file: withheld and said without it, equal with it", async () => {
  // As many trees as rows, so the jackknife is shown (DEFAULT_HOW_SURE).
  const { fitModel } = await import("../../../mod.ts");
  const small = loadTable(demoCompanyCsv({ rows: 80, seed: 8 }), { target: "base_pay_eur" });
  const fitted = await fitModel(small, { target: "base_pay_eur", trees: 80, folds: 3, workers: 1 });
  const profile = typicalProfile(fitted);
  const inMemory = estimateProfile(openModel(fitted), profile);
  assert.ok(inMemory.jackknife !== null);
  assert.equal(inMemory.jackknifeNeedsAnalystFile, false);
  const dir = await Deno.makeTempDir();
  const { sha256 } = await writeModelFile(`${dir}/m.json`, fitted);
  await writeAnalystFile(`${dir}/a.json`, fitted, sha256);
  const shared = await readModelFile(`${dir}/m.json`);
  const without = estimateProfile(openModel(shared), profile);
  assert.equal(without.jackknife, null);
  assert.equal(without.jackknifeNeedsAnalystFile, true);
  assert.equal(without.estimate, inMemory.estimate);
  const joined = estimateProfile(
    openModel(await readAnalystFile(`${dir}/a.json`, shared)),
    profile,
  );
  assert.deepEqual(joined.jackknife, inMemory.jackknife);
  await Deno.remove(dir, { recursive: true });
});
