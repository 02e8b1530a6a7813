// What paygrove writes cannot drive the reader's terminal, spreadsheet or
// Markdown viewer: every command is run through the real CLI on a table
// whose level names, identifiers and column names are attacks (see
// _hostile.ts), and what it prints or writes is searched for the raw
// characters and markup.
import assert from "node:assert/strict";
import { parse } from "csv-parse/sync";
// @ts-types="@types/markdown-it"
import MarkdownIt from "markdown-it";
import { paygrove } from "./_cli.ts";
import { ATTACK, field, HOSTILE_IDS, hostileCsv, hostileRows, rawControl } from "./_hostile.ts";

const dir = await Deno.makeTempDir();
const table = `${dir}/pay.csv`;
await Deno.writeTextFile(table, await hostileCsv());
// For batch: offers (some far below range, so that positions are negative)
// and an input column of signed numbers.
const offers = `${dir}/offers.csv`;
await Deno.writeTextFile(
  offers,
  await hostileCsv(40, {
    offer: (r, pay) => String(Math.round(pay * (r % 3 === 0 ? 0.5 : 1.02))),
    delta: (r) => String(r % 2 === 0 ? -3 : 2),
  }),
);
globalThis.addEventListener("unload", () => Deno.removeSync(dir, { recursive: true }));
const model = `${dir}/model.json`;
const TARGET = ["--target", "base_pay_eur"];
const FAST = ["--trees", "20", "--workers", "1"];

const fitted = await paygrove(["fit", table, ...TARGET, ...FAST, "--folds", "3", "--out", model]);

// Visible forms, as the reader should see them.
const SHOWN = {
  title: String.raw`\x1b]0;pwned\x07Cinder`,
  clear: String.raw`\x1b[2JEast`,
  c1: String.raw`\u009b31mSales`,
  rlo: String.raw`\u202eOps`,
};

function noRawControl(label: string, result: { stdout: string; stderr: string }) {
  const out = rawControl(result.stdout);
  assert.equal(out, null, `${label}: stdout has a raw control character: ${out}`);
  const err = rawControl(result.stderr);
  assert.equal(err, null, `${label}: stderr has a raw control character: ${err}`);
}

function strings(value: unknown, into: string[] = []): string[] {
  if (typeof value === "string") into.push(value);
  else if (Array.isArray(value)) value.forEach((v) => strings(v, into));
  else if (value !== null && typeof value === "object") {
    for (const [k, v] of Object.entries(value)) {
      into.push(k);
      strings(v, into);
    }
  }
  return into;
}

Deno.test("every command shows data text with its control characters made visible", async () => {
  assert.equal(fitted.code, 0, fitted.stderr);
  noRawControl("fit", fitted);
  assert.ok(fitted.stdout.includes(String.raw`years\x1b[8m_exp`), fitted.stdout);
  const runs: [string[], number][] = [
    [["schema", table, ...TARGET], 0],
    [["inspect", model, "--tree", "--importance"], 0],
    [["estimate", model, "--set", `site=${ATTACK.title}`], 0],
    [["estimate", model, "--table", table, "--row", HOSTILE_IDS[6]], 0],
    [["compare", model, "--change", `site=${ATTACK.clear}`], 0],
    [["sweep", model, "--vary", "site"], 0],
    [["sweep", model, "--vary", "job_family"], 0],
    [["batch", model, offers, "--offer", "offer"], 0],
    [["gap", table, ...TARGET, "--group", "gender", "--within", "site", ...FAST], 0],
    [["review", table, ...TARGET, "--within", "job_family", ...FAST], 0],
  ];
  for (const [args, code] of runs) {
    const result = await paygrove(args);
    assert.equal(result.code, code, `${args.join(" ")}: ${result.stderr}`);
    noRawControl(args.slice(0, 2).join(" "), result);
  }
  const schema = await paygrove(["schema", table]);
  for (const shown of Object.values(SHOWN)) assert.ok(schema.stdout.includes(shown), shown);
  const inspect = await paygrove(["inspect", model, "--tree"]);
  assert.ok(inspect.stdout.includes(SHOWN.c1), inspect.stdout);
});

Deno.test("messages that name data show its control characters visibly", async () => {
  const unseen = `${dir}/unseen.csv`;
  const rows = await hostileRows(20);
  const site = rows[0].indexOf("site");
  rows[3][site] = "\x1b]0;new\x07";
  await Deno.writeTextFile(unseen, rows.map((r) => r.map(field).join(",")).join("\n") + "\n");
  const twice = `${dir}/twice.csv`;
  await Deno.writeTextFile(twice, "id,\x1b[2Jx,\x1b[2Jx\n1,2,3\n");
  const cases: [string[], number, RegExp][] = [
    // A level the model does not know: the message lists the levels it knows.
    [["estimate", model, "--set", "site=\x1b]0;other\x07"], 2, /site/],
    // One row with a level the model never saw: the others are scored (status 3),
    // and the refused row's line names the level with its control characters visible.
    [
      ["batch", model, unseen],
      3,
      /line 4 .*: site "\\x1b\]0;new\\x07" is a level the model never saw/,
    ],
    [["schema", twice], 1, /twice/],
    [["sweep", model, "--vary", "\x1b[2Jnope"], 2, /vary/],
    [["estimate", model, "--table", table, "--row", "\x1b]0;nobody\x07"], 1, /row/],
  ];
  for (const [args, code, message] of cases) {
    const result = await paygrove(args);
    assert.equal(result.code, code, `${args.join(" ")}: ${result.stderr}`);
    assert.match(result.stderr, message);
    noRawControl(args.join(" "), result);
  }
});

Deno.test("--json keeps the exact text and writes control characters as \\u escapes", async () => {
  const runs = [
    ["schema", table, "--json"],
    ["inspect", model, "--json", "--tree"],
    ["estimate", model, "--set", `job_family=${ATTACK.c1}`, "--json"],
    ["compare", model, "--change", `job_family=${ATTACK.rlo}`, "--json"],
    ["sweep", model, "--vary", "job_family", "--json"],
    ["batch", model, offers, "--json"],
    ["gap", table, ...TARGET, "--group", "gender", "--within", "site", ...FAST, "--json"],
    ["review", table, ...TARGET, "--within", "job_family", ...FAST, "--json"],
    ["fit", table, ...TARGET, ...FAST, "--folds", "3", "--out", `${dir}/m2.json`, "--json"],
  ];
  for (const args of runs) {
    const result = await paygrove(args);
    assert.equal(result.code, 0, `${args.join(" ")}: ${result.stderr}`);
    noRawControl(args.slice(0, 2).join(" "), result);
    const texts = strings(JSON.parse(result.stdout));
    // The exact text comes back when the JSON is read.
    assert.ok(
      texts.some((t) =>
        t.includes(ATTACK.c1) || t.includes(ATTACK.rlo) || t.includes(ATTACK.title)
      ),
      `${args[0]}: no hostile name in its JSON`,
    );
  }
  const batch = JSON.parse((await paygrove(["batch", model, offers, "--json"])).stdout);
  assert.deepEqual(
    batch.rows.slice(0, HOSTILE_IDS.length).map((r: { input: Record<string, string> }) =>
      r.input.employee_id
    ),
    // As read: cells are trimmed, so the tab and carriage return go.
    HOSTILE_IDS.map((id) => id.trim()),
  );
});

// Formula-leading text as the CSV injection guidance describes it: =, +, -,
// @, tab, carriage return (OWASP, "CSV Injection"; common practice).
const FORMULA = /^[=+\-@\t\r]/;
const NUMBER = /^-?(\d[\d.,]*|[.,]\d[\d.,]*)([eE][+-]?\d+)?$/;

Deno.test("batch --out and review --out neutralise formulas and leave numbers alone", async () => {
  const scored = `${dir}/scored.csv`;
  const reviewed = `${dir}/review.csv`;
  const batch = await paygrove(["batch", model, offers, "--offer", "offer", "--out", scored]);
  assert.equal(batch.code, 0, batch.stderr);
  const review = await paygrove([
    "review",
    table,
    ...TARGET,
    ...FAST,
    "--out",
    reviewed,
  ]);
  assert.equal(review.code, 0, review.stderr);
  for (const path of [scored, reviewed]) {
    const text = await Deno.readTextFile(path);
    const records: string[][] = parse(text, { relax_column_count: false });
    let neutralised = 0;
    for (const record of records) {
      for (const cell of record) {
        // No cell a spreadsheet would run: text that starts like a formula
        // is preceded by an apostrophe, numbers stay numbers.
        if (FORMULA.test(cell)) assert.match(cell, NUMBER, `${path}: ${JSON.stringify(cell)}`);
        if (cell.startsWith("'")) neutralised++;
      }
    }
    assert.ok(neutralised >= 5, `${path}: ${neutralised} neutralised cells`);
    // The guidance's form: apostrophe inside a quoted field.
    assert.ok(text.includes(`"'=HYPERLINK(""http://x"",""y"")"`), path);
    assert.ok(text.includes(`"'+1"`) && text.includes(`"'-2+3"`), path);
    assert.ok(text.includes(`"'@SUM(A1)"`), path);
    assert.equal(rawControl(text), null, `${path}: ${rawControl(text)}`);
  }
  // Numbers untouched: the signed input column and negative range positions.
  const records: string[][] = parse(await Deno.readTextFile(scored));
  const header = records[0];
  const delta = records.slice(1).map((r) => r[header.indexOf("delta")]);
  assert.ok(delta.includes("-3"), delta.join(" "));
  const positions = records.slice(1).map((r) => r[header.indexOf("range_position")]);
  assert.ok(positions.some((p) => /^-\d/.test(p)), positions.join(" "));
  assert.ok(positions.filter((p) => p !== "").every((p) => NUMBER.test(p)), positions.join(" "));
  // Per-person pay: new files only their owner can read.
  if (Deno.build.os !== "windows") {
    assert.equal((await Deno.stat(scored)).mode! & 0o777, 0o600);
    assert.equal((await Deno.stat(reviewed)).mode! & 0o777, 0o600);
  }
});

Deno.test("Markdown reports escape HTML, links and table pipes in data text", async () => {
  const report = `${dir}/gap.md`;
  const result = await paygrove([
    "gap",
    table,
    ...TARGET,
    "--group",
    "gender",
    "--within",
    "job_family",
    "--privacy-min",
    "3",
    ...FAST,
    "--report",
    report,
  ]);
  assert.equal(result.code, 0, result.stderr);
  const text = await Deno.readTextFile(report);
  assert.equal(rawControl(text), null, rawControl(text) ?? "");
  // Rendered by markdown-it 15.0.3 (CommonMark with GFM tables; not ours).
  const html = new MarkdownIt({ html: true }).render(text);
  assert.doesNotMatch(html, /<script|<img/i, "HTML in a level name was rendered");
  assert.doesNotMatch(html, /href="http:\/\/evil"/, "a link in a level name was rendered");
  // Level names are still there, as text.
  assert.ok(html.includes("&lt;script&gt;alert(1)&lt;/script&gt;"), "the level name is shown");
  assert.ok(html.includes("[x](http://evil)"), "the link text is shown as typed");
  // Every table row has as many cells as its header: "a|b" did not split one.
  const tables = [...html.matchAll(/<table>([\s\S]*?)<\/table>/g)].map((m) => m[1]);
  assert.ok(tables.length >= 1);
  for (const t of tables) {
    const rows = [...t.matchAll(/<tr>([\s\S]*?)<\/tr>/g)].map((m) =>
      (m[1].match(/<t[hd][ >]/g) ?? []).length
    );
    assert.ok(rows.every((n) => n === rows[0]), rows.join(" "));
  }
  assert.ok(html.includes("a|b"), "the pipe shows as text");
});
