// Everyday tables and options that once ended in status 70 (a bug) or a
// model the program then called damaged: tiny tables, empty lists, locale
// tags in the wrong form. Each case runs the real CLI on a table written
// here and must end in 0, 1 or 2 with one clear line, never 70 or a stack.
import assert from "node:assert/strict";
import { type FlatTree, readModelFile, writeModelFile } from "../../mod.ts";
import { paygrove, ROOT } from "./_cli.ts";

const dir = await Deno.makeTempDir({ prefix: "paygrove-everyday-" });
const demo = `${ROOT}fixtures/demo_company.csv`;
const model = `${dir}/demo.json`;
const fitted = await paygrove([
  "fit",
  demo,
  "--target",
  "base_pay_eur",
  "--trees",
  "5",
  "--folds",
  "3",
  "--out",
  model,
]);
if (fitted.code !== 0) throw new Error(`fit failed: ${fitted.stderr}`);

/** Asserts a run ended in `code` with one line and no trace of a bug. */
function clean(
  result: { code: number; stdout: string; stderr: string },
  code: number,
  what: string,
) {
  assert.equal(result.code, code, `${what}: ${result.stderr}`);
  assert.doesNotMatch(result.stderr, /internal error|\.ts:\d+| {4}at /, what);
  // One line; commander adds its usage hint under an option it refuses.
  const lines = result.stderr.trim().split("\n").filter((l) => l !== "(add --help for usage)");
  if (code !== 0) assert.equal(lines.length, 1, result.stderr);
}

Deno.test("a locale tag in the wrong form is refused the same way by every command", async () => {
  const runs: [string, string[]][] = [
    ["estimate", ["estimate", model]],
    ["compare", ["compare", model, "--change", "level=+1"]],
    ["sweep", ["sweep", model, "--vary", "level"]],
    ["inspect", ["inspect", model]],
    ["fit", ["fit", demo, "--target", "base_pay_eur", "--out", `${dir}/never.json`]],
    ["gap", ["gap", demo, "--target", "base_pay_eur", "--group", "gender"]],
    ["review", ["review", demo, "--target", "base_pay_eur"]],
    ["schema", ["schema", demo]],
  ];
  for (const [name, args] of runs) {
    for (const tag of ["en_US", "", "not a locale"]) {
      const result = await paygrove([...args, "--locale", tag]);
      clean(result, 2, `${name} --locale "${tag}"`);
      assert.match(
        result.stderr,
        new RegExp(`"${tag}" is not a locale tag such as en-US or de-DE`),
        `${name} --locale "${tag}"`,
      );
    }
  }
  // A good tag still works, and changes the figures' form.
  const german = await paygrove(["estimate", model, "--locale", "de-DE", "--json"]);
  clean(german, 0, "estimate --locale de-DE");
  const text = await paygrove(["estimate", model, "--locale", "de-DE"]);
  clean(text, 0, "estimate --locale de-DE");
  assert.match(text.stdout, /\d\.\d{3}/, "de-DE groups thousands with a point");
});

Deno.test("an empty --features list is refused before anything is fitted or written", async () => {
  for (
    const args of [
      ["fit", demo, "--target", "base_pay_eur", "--out", `${dir}/empty.json`],
      ["gap", demo, "--target", "base_pay_eur", "--group", "gender"],
      ["review", demo, "--target", "base_pay_eur"],
    ]
  ) {
    for (const list of ["", ",", " , "]) {
      const result = await paygrove([...args, "--features", list]);
      clean(result, 2, `${args[0]} --features "${list}"`);
      assert.match(result.stderr, /--features <columns>.*name at least one column/);
    }
  }
  assert.deepEqual([...Deno.readDirSync(dir)].map((e) => e.name).sort(), ["demo.json"]);
});

Deno.test("fit with every attribute dropped says so instead of writing a model without one", async () => {
  const table = `${dir}/ids_only.csv`;
  await Deno.writeTextFile(
    table,
    "id,pay\n" + Array.from({ length: 30 }, (_, i) => `E${i},${40000 + 700 * i}`).join("\n") + "\n",
  );
  const result = await paygrove(["fit", table, "--target", "pay", "--out", `${dir}/none.json`]);
  clean(result, 2, "fit with no attribute");
  assert.match(result.stderr, /no attributes are left to learn from/);
  await assert.rejects(Deno.stat(`${dir}/none.json`));
});

/** A small table of numbers only (so that every fit path applies), `rows` long. */
async function smallTable(name: string, rows: number): Promise<string> {
  const path = `${dir}/${name}`;
  const lines = ["id,years,rating,pay"];
  for (let i = 0; i < rows; i++) {
    lines.push(
      `E${i},${(i * 7) % 23},${1 + (i % 5)},${40000 + 1500 * ((i * 7) % 23) + 900 * (i % 5)}`,
    );
  }
  await Deno.writeTextFile(path, lines.join("\n") + "\n");
  return path;
}

Deno.test("review on a table too small to compare anyone says how many people it needs", async () => {
  const two = await smallTable("two.csv", 2);
  const nine = await smallTable("nine.csv", 9);
  for (const table of [two, nine]) {
    const result = await paygrove(["review", table, "--target", "pay", "--trees", "10"]);
    clean(result, 1, `review ${table}`);
    assert.match(
      result.stderr,
      /only \d people have pay; a review needs at least 10 \(two groups of the fewest people in a leaf, 5\)/,
    );
  }
  // Ten people: one split is possible, and the review runs (10 folds of one).
  const ten = await smallTable("ten.csv", 10);
  const result = await paygrove(["review", ten, "--target", "pay", "--trees", "10", "--json"]);
  clean(result, 0, "review of 10 people");
  assert.equal(JSON.parse(result.stdout).people.length, 10);
});

Deno.test("fit on fewer rows than folds uses one fold per row and says so", async () => {
  const eight = await smallTable("eight.csv", 8);
  const args = ["fit", eight, "--target", "pay", "--min-leaf", "3", "--privacy-min", "3"];
  const text = await paygrove([...args, "--trees", "10", "--out", `${dir}/eight.json`]);
  clean(text, 0, "fit of 8 rows, 10 folds asked");
  assert.match(
    text.stdout,
    /Cross-validation used 8 folds, not 10: the table has 8 rows, and each fold needs at least one\./,
  );
  assert.match(text.stdout, /8-fold CV/);
  const json = await paygrove([...args, "--folds", "20", "--out", `${dir}/eight20.json`, "--json"]);
  clean(json, 0, "fit of 8 rows, 20 folds asked");
  assert.deepEqual(JSON.parse(json.stdout).folds, { requested: 20, used: 8 });
  // Below two leaves of --min-leaf rows there is no split to choose: refused.
  const five = await smallTable("five.csv", 5);
  const refused = await paygrove(
    [...args, "--out", `${dir}/five.json`].map((a) => a === eight ? five : a),
  );
  clean(refused, 2, "fit of 5 rows");
  assert.match(refused.stderr, /only 5 rows have "pay"; at least 6 are needed for one split/);
});

/**
 * A chain of `splits` splits on years_experience (each peels off one leaf),
 * put in place of a fitted model's reference tree: a tree as deep as a file
 * can hold, which walking by recursion overflowed at 20,000 nodes.
 */
async function deepModel(splits: number): Promise<string> {
  const base = await readModelFile(model);
  const feature = base.features.findIndex((f) => f.name === "years_experience");
  const n = 2 * splits + 1;
  const tree: FlatTree = {
    task: "regression",
    width: 1,
    nodeCount: n,
    feature: new Int32Array(n).fill(-1),
    threshold: new Float64Array(n).fill(NaN),
    maskOffset: new Int32Array(n).fill(-1),
    masks: new Uint32Array(0),
    maskWords: base.reference.tree.maskWords,
    left: new Int32Array(n).fill(-1),
    right: new Int32Array(n).fill(-1),
    missingLeft: new Uint8Array(n),
    value: Float64Array.from({ length: n }, (_, i) => Math.log(40000 + i)),
    rows: Int32Array.from({ length: n }, (_, i) => 2000 - Math.floor(i / 2) % 1000),
    weight: Float64Array.from({ length: n }, (_, i) => 2000 - Math.floor(i / 2) % 1000),
    impurity: new Float64Array(n).fill(0.01),
  };
  for (let j = 0; j < splits; j++) {
    const node = 2 * j;
    tree.feature[node] = feature;
    tree.threshold[node] = j / 1000;
    tree.left[node] = node + 1;
    tree.right[node] = node + 2;
  }
  const path = `${dir}/deep_${splits}.json`;
  // As many rows as a tree with that many leaves of five needs, or the
  // reader refuses it as edited.
  const rows = 5 * (splits + 1);
  await writeModelFile(path, {
    ...base,
    rows: { used: rows, dropped: 0 },
    provenance: { ...base.provenance, table: { ...base.provenance.table, rows } },
    reference: { ...base.reference, tree, leaves: splits + 1, depth: splits },
  }, true);
  return path;
}

Deno.test("inspect --tree walks a 20,001-node tree without recursion", async () => {
  const deep = await deepModel(10000);
  const text = await paygrove(["inspect", deep, "--tree"]);
  clean(text, 0, "inspect --tree");
  const lines = text.stdout.split("\n");
  // Every node drawn once, indentation capped so the outline stays readable.
  assert.equal(lines.filter((l) => /years_experience <= /.test(l)).length, 10000);
  assert.ok(Math.max(...lines.map((l) => l.length)) <= 100, "no line wider than the screen");
  assert.match(text.stdout, /\(depth 10000\) years_experience > 9\.999/);
  const json = await paygrove(["inspect", deep, "--tree", "--json"]);
  clean(json, 0, "inspect --tree --json");
  const outline = JSON.parse(json.stdout).referenceTree.outline;
  assert.equal(outline.length, 20001);
  assert.deepEqual(outline[0].children, [1, 2]);
  assert.equal(outline[20000].depth, 10000);
  assert.equal(outline[20000].parent, 19998);
});

Deno.test("5,000 columns: schema, review and gap end with a result", async () => {
  const path = `${dir}/wide.csv`;
  const columns = 5000;
  const lines = [["id", ...Array.from({ length: columns }, (_, j) => `x${j}`), "gender", "pay"]
    .join(",")];
  for (let r = 0; r < 60; r++) {
    const xs = Array.from({ length: columns }, (_, j) => (r * 31 + j * 17) % 97);
    lines.push(
      [`E${r}`, ...xs, r % 2 === 0 ? "Woman" : "Man", 40000 + 300 * xs[0] + 50 * (r % 7)].join(","),
    );
  }
  await Deno.writeTextFile(path, lines.join("\n") + "\n");
  const schema = await paygrove(["schema", path, "--json"]);
  clean(schema, 0, "schema");
  assert.equal(JSON.parse(schema.stdout).columns.length, columns + 3);
  const review = await paygrove(["review", path, "--target", "pay", "--trees", "10", "--json"]);
  clean(review, 0, "review");
  assert.equal(JSON.parse(review.stdout).features.length, columns);
  const gap = await paygrove([
    "gap",
    path,
    "--target",
    "pay",
    "--group",
    "gender",
    "--trees",
    "10",
    "--json",
  ]);
  clean(gap, 0, "gap");
});

Deno.test("a 10 MB cell in one row: fit, review and schema end with a result", async () => {
  const path = `${dir}/big_cell.csv`;
  const big = "x".repeat(10_000_000);
  const lines = ["id,level,years,comment,pay"];
  for (let r = 0; r < 120; r++) {
    const id = r === 5 ? `E${big}` : `E${r}`;
    const comment = r === 7 ? big : `comment number ${r}`;
    lines.push(`${id},L${1 + (r % 4)},${r % 13},${comment},${40000 + 900 * (r % 13)}`);
  }
  await Deno.writeTextFile(path, lines.join("\n") + "\n");
  const schema = await paygrove(["schema", path]);
  clean(schema, 0, "schema");
  assert.ok(schema.stdout.length < 20_000, "the cell is not printed whole");
  const fit = await paygrove([
    "fit",
    path,
    "--target",
    "pay",
    "--trees",
    "10",
    "--out",
    `${dir}/big_cell.json`,
    "--json",
  ]);
  clean(fit, 0, "fit");
  const doc = JSON.parse(fit.stdout);
  assert.deepEqual(doc.features.map((f: { name: string }) => f.name), ["level", "years"]);
  // The model file holds neither the identifier nor the comment.
  assert.ok((await Deno.stat(`${dir}/big_cell.json`)).size < 1_000_000);
  clean(await paygrove(["review", path, "--target", "pay", "--trees", "10"]), 0, "review");
});

Deno.test("cells and headers built to make the readers backtrack are read in linear time", async () => {
  // Each of these took time quadratic in its length before (a header of
  // 50,000 capitals 8.5 s, a digit, 40,000 spaces and a letter 18 s, 40,000
  // digits and a letter 11 s): at 400,000 characters that is hours. A
  // linear reader takes well under a second; the kill at 120 s only keeps
  // a regression from hanging the suite.
  const n = 400_000;
  const hostile = ["1" + " ".repeat(n) + "x", "1".repeat(n) + "x", "1 ".repeat(n / 2) + "k"];
  const write = async (name: string, cell: (r: number) => string) => {
    const lines = [`id,level,years,${"A".repeat(n)},pay`];
    for (let r = 0; r < 60; r++) {
      lines.push(`E${r},L${1 + (r % 4)},${r % 13},${cell(r)},${40000 + 900 * (r % 13)}`);
    }
    await Deno.writeTextFile(`${dir}/${name}`, lines.join("\n") + "\n");
    return `${dir}/${name}`;
  };
  // A text column holding the hostile cells: read, and the long header kept.
  const text = await write("backtrack_text.csv", (r) => r < 3 ? hostile[r] : `note ${r}`);
  const schema = await paygrove(["schema", text, "--json"], {}, 120);
  clean(schema, 0, "schema");
  const columns = JSON.parse(schema.stdout).columns as { name: string; kind: string }[];
  assert.equal(columns.filter((c) => c.name.length === n).length, 1);
  // A numeric column with the hostile cells: refused in one short line that
  // names the column by its ends, not by 400,000 capitals.
  const mixed = await write("backtrack_mixed.csv", (r) => r < 3 ? hostile[r] : `${r}`);
  const refused = await paygrove(["schema", mixed], {}, 120);
  clean(refused, 1, "schema of a mixed column");
  assert.ok(refused.stderr.length < 1000, `${refused.stderr.length} characters`);
  assert.match(refused.stderr, /A{60}\.\.\.A+:? \(40000[01] characters\)/);
});
