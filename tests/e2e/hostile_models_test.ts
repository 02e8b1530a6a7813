// Model files made to break paygrove (edited with a fresh checksum, as a
// careful forger would): each is refused with status 1 and one sentence, or
// answered in bounded time; never status 70, never a hang. The model is
// fitted here on the invented demo generator's table.
import assert from "node:assert/strict";
import { createHash } from "node:crypto";
import { demoCompanyCsv, fitModel, loadTable, modelToText } from "../../mod.ts";
import { paygrove } from "./_cli.ts";

const dir = await Deno.makeTempDir({ prefix: "paygrove-hostile-models-" });
const table = loadTable(demoCompanyCsv({ rows: 300, seed: 2 }), { target: "base_pay_eur" });
const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
const text = modelToText(model);

// deno-lint-ignore no-explicit-any
type Doc = Record<string, any>;
async function forged(name: string, edit: (doc: Doc) => void): Promise<string> {
  const { checksum: _, ...doc } = JSON.parse(text) as Doc;
  edit(doc);
  const body = JSON.stringify(doc);
  const path = `${dir}/${name}.json`;
  await Deno.writeTextFile(
    path,
    `${body.slice(0, -1)},"checksum":"${createHash("sha256").update(body).digest("hex")}"}`,
  );
  return path;
}

function bytes(values: ArrayLike<number>, Ctor: typeof Int32Array | typeof Float64Array): string {
  const raw = new Uint8Array(Ctor.from(values as number[]).buffer);
  let binary = "";
  for (let i = 0; i < raw.length; i += 0x8000) {
    binary += String.fromCharCode(...raw.subarray(i, i + 0x8000));
  }
  return btoa(binary);
}

const CASES: [string, (doc: Doc) => void, RegExp][] = [
  ["empty-ensemble", (doc) => (doc.ensemble.trees = []), /it has 0 trees, its settings say 3/],
  [
    "ordinal-without-levels",
    (doc) => delete doc.features.find((f: Doc) => f.kind === "ordinal").levels,
    /feature level is ordinal but has no levels/,
  ],
  [
    "support-unknown-feature",
    (doc) => (doc.support.levelRanges[0].ranges[0].feature = "shoe_size"),
    /support figures name a numeric feature the model does not have/,
  ],
  [
    // The root's first child sends its right side to the root's right
    // child too: paths from the root would double at each such level (a
    // hang for the parts' walk).
    "node-with-two-parents",
    (doc) => {
      const t = doc.ensemble.trees.find((tree: Doc) => {
        const l = new Int32Array(Uint8Array.from(atob(tree.left), (c) => c.charCodeAt(0)).buffer);
        return l[0] !== -1 && l[l[0]] !== -1;
      });
      const decode = (b64: string) =>
        Array.from(new Int32Array(Uint8Array.from(atob(b64), (c) => c.charCodeAt(0)).buffer));
      const left = decode(t.left);
      const right = decode(t.right);
      right[left[0]] = right[0];
      t.right = bytes(right, Int32Array);
    },
    /is a child of two splits/,
  ],
  [
    "node-without-people",
    (doc) => {
      const t = doc.ensemble.trees[0];
      const rows = Array.from(
        new Int32Array(Uint8Array.from(atob(t.rows), (c) => c.charCodeAt(0)).buffer),
      );
      rows[rows.length - 1] = 0;
      t.rows = bytes(rows, Int32Array);
    },
    /node \d+ holds no people/,
  ],
  [
    "rows-used-50-million",
    (doc) => (doc.rows.used = 50_000_000),
    /fitted on 50000000 rows with 0 left out, but its table had 300/,
  ],
];

Deno.test("edited model files are refused with status 1 and one sentence", async () => {
  for (const [name, edit, message] of CASES) {
    const path = await forged(name, edit);
    for (const command of [["estimate", path], ["inspect", path, "--tree"]]) {
      const run = await paygrove(command);
      assert.equal(run.code, 1, `${name} ${command[0]}: ${run.stderr}`);
      assert.match(run.stderr, message, name);
      assert.doesNotMatch(run.stderr, /^\s+at /m, `${name}: a stack trace`);
    }
  }
});

// A chain of n nodes (n odd): each split's right child splits again, every
// real value goes right, down to the last leaf; the tree's fields as the
// model file holds them, with `rows` people per node.
function chainTree(n: number, rows: number[]): Doc {
  const f = model.features.findIndex((x) => x.kind === "numeric");
  const left = new Array(n).fill(-1);
  const right = new Array(n).fill(-1);
  const feature = new Array(n).fill(-1);
  const threshold = new Array(n).fill(NaN);
  for (let k = 0; k + 2 < n; k += 2) {
    feature[k] = f;
    threshold[k] = -1e9 + k;
    left[k] = k + 1;
    right[k] = k + 2;
  }
  return {
    nodeCount: n,
    feature: bytes(feature, Int32Array),
    threshold: bytes(threshold, Float64Array),
    maskOffset: bytes(new Array(n).fill(-1), Int32Array),
    masks: "",
    masksLength: 0,
    left: bytes(left, Int32Array),
    right: bytes(right, Int32Array),
    missingLeft: btoa("\0".repeat(n)),
    value: bytes(new Array(n).fill(11), Float64Array),
    rows: bytes(rows, Int32Array),
  };
}

Deno.test("a tree 20,000 levels deep is answered, its path drawn by its ends", async () => {
  const n = 40_001;
  const path = await forged("deep-chain", (doc) => {
    Object.assign(doc.reference.tree, chainTree(n, new Array(n).fill(5)));
    // As many rows as such a tree needs.
    doc.rows.used = 5 * n;
    doc.provenance.table.rows = 5 * n;
  });
  for (const command of [["estimate", path], ["inspect", path, "--tree"]]) {
    const run = await paygrove(command);
    assert.equal(run.code, 0, `${command[0]}: ${run.stderr.slice(0, 500)}`);
  }
  const run = await paygrove(["estimate", path]);
  // Every step tests the same attribute: the path is one condition, and
  // the JSON keeps the 20,000 splits.
  // The deepest threshold, -1e9 + 39,998, said in full (not rounded to 6 digits).
  assert.match(run.stdout, /1\. +years_experience above -999960002 /);
  assert.doesNotMatch(run.stdout, /^ +2\. /m);
  assert.ok(run.stdout.split("\n").length < 80);
  const json = JSON.parse((await paygrove(["estimate", path, "--json"])).stdout);
  assert.equal(json.path.length, 1);
  assert.equal(json.pathSplits.length, 20_000);
});

Deno.test("an ensemble tree 20,000 levels deep: the estimate answers, without the parts", async () => {
  const n = 40_001;
  // Covers that add up: each split's right side holds the rest of the chain.
  const rows = new Array(n).fill(1);
  for (let k = n - 3; k >= 0; k -= 2) rows[k] = 1 + rows[k + 2];
  const path = await forged("deep-ensemble-chain", (doc) => {
    Object.assign(doc.ensemble.trees[0], chainTree(n, rows), {
      weight: bytes(rows, Float64Array),
      impurity: bytes(new Array(n).fill(NaN), Float64Array),
    });
    doc.rows.used = 5 * n;
    doc.provenance.table.rows = 5 * n;
  });
  const started = performance.now();
  const run = await paygrove(["estimate", path, "--json"]);
  assert.equal(run.code, 0, run.stderr.slice(0, 500));
  // Its paths hold about 2 x 10^8 tests: refused for the parts, at once.
  assert.equal(JSON.parse(run.stdout).contributions, null);
  assert.ok(performance.now() - started < 60_000);
});
