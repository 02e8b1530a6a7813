// One absurd cell must not make a legal finding. A single pay of 1e308
// once made `gap` report "Woman: mean pay 100.0% below Man's", `review` a
// cost of 8.3e42 and `fit` an error "off by ∞", all with status 0, and only
// `schema` showed the data-quality warning. Now fit, gap and review stop at
// such a value with its line (status 1) unless --drop-implausible is given,
// the count left out is in every output, every command that reads a table
// shows its data-quality warnings briefly, and no figure shown is infinite
// or NaN.
//
// "Implausible" is paygrove's own rule (lib/table/implausible.ts): not
// finite, beyond 10^15 in size, or more than 10^4 times from the column's
// median either way (zero and negative pay included).
import assert from "node:assert/strict";
import { paygrove } from "./_cli.ts";

const dir = await Deno.makeTempDir({ prefix: "paygrove-implausible-" });

/**
 * 200 people, pay by level and years, women at row 3k; `odd` replaces the
 * pay of some rows. Returns the path; data line of row r is r + 2.
 */
async function payTable(name: string, odd: Record<number, string> = {}): Promise<string> {
  const lines = ["id,gender,level,years,pay"];
  for (let r = 0; r < 200; r++) {
    const level = 1 + (r % 5);
    const years = (r * 7) % 23;
    const pay = odd[r] ?? String(38000 + 9000 * level + 700 * years + (r % 4) * 300);
    lines.push(`E${r},${r % 3 === 0 ? "Woman" : "Man"},L${level},${years},${pay}`);
  }
  const path = `${dir}/${name}`;
  await Deno.writeTextFile(path, lines.join("\n") + "\n");
  return path;
}

const GAP = ["--target", "pay", "--group", "gender", "--trees", "20"];
const runs = (table: string): [string, string[]][] => [
  ["fit", ["fit", table, "--target", "pay", "--trees", "20", "--out", `${dir}/m.json`, "--force"]],
  ["gap", ["gap", table, ...GAP]],
  ["review", ["review", table, "--target", "pay", "--trees", "20"]],
];

/** No figure on screen or in JSON is infinite or NaN. */
function finiteFigures(text: string, what: string) {
  assert.doesNotMatch(text, /∞|Infinity|NaN|e\+\d{2,}/, what);
}

function noBug(result: { code: number; stderr: string }, what: string) {
  assert.doesNotMatch(result.stderr, /internal error|\.ts:\d+/, what);
}

Deno.test("one implausible pay stops fit, gap and review with its line", async () => {
  const cases: [string, Record<number, string>, RegExp][] = [
    ["huge.csv", { 10: "1e308" }, /line 12 has 1e\+308/],
    ["negative.csv", { 10: "-1e308" }, /line 12 has -1e\+308/],
    ["tiny.csv", { 10: "1e-300" }, /line 12 has 1e-300/],
    ["zero.csv", { 10: "0" }, /line 12 has 0/],
    ["far.csv", { 10: "1000000000", 20: "5" }, /lines 12 and 22 have 1000000000 and 5;/],
  ];
  for (const [name, odd, where] of cases) {
    const table = await payTable(name, odd);
    for (const [command, args] of runs(table)) {
      const result = await paygrove(args);
      noBug(result, `${command} ${name}`);
      assert.equal(result.code, 1, `${command} ${name}: ${result.stderr}`);
      assert.match(result.stderr, where, `${command} ${name}`);
      assert.match(
        result.stderr,
        /no plausible pay table holds such (a value|values) \(more than 10,000 times from the median [\d,.]+ either way, beyond 10\^15, or not finite\); correct the table, or pass --drop-implausible to leave such rows out/,
        `${command} ${name}`,
      );
      assert.equal(result.stderr.trim().split("\n").length, 1, result.stderr);
    }
  }
});

Deno.test("pay written as Infinity or beyond the number range is refused at reading, with its line", async () => {
  for (const text of ["Infinity", "-Infinity", "1e400"]) {
    const table = await payTable(`inf_${text}.csv`, { 10: text });
    for (const [command, args] of runs(table)) {
      const result = await paygrove(args);
      noBug(result, `${command} ${text}`);
      assert.equal(result.code, 1, `${command} ${text}: ${result.stderr}`);
      assert.match(result.stderr, new RegExp(`pay: line 12 has "${text}", not a number`));
    }
  }
});

Deno.test("--drop-implausible leaves the rows out and says how many in text and JSON", async () => {
  const table = await payTable("drop.csv", { 10: "1e308", 40: "-1e308", 70: "1e-300" });
  for (const [command, args] of runs(table)) {
    const text = await paygrove([...args, "--drop-implausible"]);
    noBug(text, command);
    assert.equal(text.code, 0, `${command}: ${text.stderr}`);
    finiteFigures(text.stdout, `${command} text`);
    assert.match(
      text.stdout.replace(/\s+/g, " "),
      /3 rows left out \(--drop-implausible\): their "pay" is more than 10,000 times from the median [\d,.]+ either way, beyond 10\^15, or not finite \(lines 12, 42 and 72\)/,
      command,
    );
    const json = await paygrove([...args, "--drop-implausible", "--json"]);
    assert.equal(json.code, 0, `${command} --json: ${json.stderr}`);
    finiteFigures(json.stdout, `${command} json`);
    const doc = JSON.parse(json.stdout);
    assert.deepEqual(doc.leftOutImplausible, [{ column: "pay", count: 3, lines: [12, 42, 72] }]);
  }
  // The figures are those of the table without the three rows.
  const clean = await payTable("drop_clean.csv", {});
  const without = (await Deno.readTextFile(clean)).split("\n")
    .filter((_, i) => ![11, 41, 71].includes(i)).join("\n");
  await Deno.writeTextFile(`${dir}/without.csv`, without);
  const a = JSON.parse(
    (await paygrove(["gap", table, ...GAP, "--drop-implausible", "--json"])).stdout,
  );
  const b = JSON.parse((await paygrove(["gap", `${dir}/without.csv`, ...GAP, "--json"])).stdout);
  assert.deepEqual(a.overall, b.overall);
  // Reading a table with them is still the whole table: nothing was lost silently.
  assert.equal(a.provenance.table.rows, 200);
});

Deno.test("every row implausible: refused even with --drop-implausible", async () => {
  const odd = Object.fromEntries(Array.from({ length: 200 }, (_, r) => [r, `${r + 1}e200`]));
  const table = await payTable("all_huge.csv", odd);
  for (const [command, args] of runs(table)) {
    const result = await paygrove([...args, "--drop-implausible"]);
    noBug(result, command);
    assert.equal(result.code, 1, `${command}: ${result.stderr}`);
    assert.match(result.stderr, /every row's "pay" is implausible/, command);
  }
});

Deno.test("fit, gap and review show the data-quality warnings briefly, naming schema for the rest", async () => {
  // Plausible but far out: 9 times the median, and a duplicated identifier.
  const table = await payTable("far_out.csv", { 5: "600000" });
  await Deno.writeTextFile(table, (await Deno.readTextFile(table)).replace("E7,", "E6,"));
  for (const [command, args] of runs(table)) {
    const text = await paygrove(args);
    assert.equal(text.code, 0, `${command}: ${text.stderr}`);
    const flat = text.stdout.replace(/\s+/g, " ");
    assert.match(flat, /! 2 data-quality warnings:/, command);
    assert.match(flat, /"pay": 1 value is far from the rest/, command);
    assert.match(flat, /"id": 1 identifier repeats an earlier row \(line 9\)/, command);
    assert.match(
      flat,
      new RegExp(`paygrove schema ${table} lists them with line numbers`),
      command,
    );
    const json = JSON.parse((await paygrove([...args, "--json"])).stdout);
    assert.deepEqual(
      json.dataWarnings.map((w: { kind: string }) => w.kind).sort(),
      ["duplicate-identifier", "outlier"],
      command,
    );
  }
});

Deno.test("a pay scale paid exactly: no range of zero width gives an infinite position", async () => {
  // Everyone at a level earns the same: out-of-bag residuals are all zero.
  const lines = ["id,gender,grade,pay"];
  for (let r = 0; r < 200; r++) {
    lines.push(
      `E${r},${r % 3 === 0 ? "Woman" : "Man"},G${1 + (r % 5)},${30000 + 5000 * (1 + (r % 5))}`,
    );
  }
  const table = `${dir}/scale.csv`;
  await Deno.writeTextFile(table, lines.join("\n") + "\n");
  const text = await paygrove(["review", table, "--target", "pay", "--trees", "20"]);
  assert.equal(text.code, 0, text.stderr);
  finiteFigures(text.stdout, "review text");
  assert.match(text.stdout.replace(/\s+/g, " "), /of 200 people, 0 are paid under their range/);
  const doc = JSON.parse(
    (await paygrove(["review", table, "--target", "pay", "--trees", "20", "--json"])).stdout,
  );
  for (const p of doc.people) {
    assert.equal(p.status, "within", JSON.stringify(p));
    assert.equal(p.shortfall, 0);
  }
});

Deno.test("a raw-scale target too large to compute with is refused, not shown as infinite", async () => {
  const lines = ["id,level,score"];
  for (let r = 0; r < 100; r++) lines.push(`E${r},L${1 + (r % 4)},${(1 + (r % 4)) * 1e200}`);
  const table = `${dir}/score.csv`;
  await Deno.writeTextFile(table, lines.join("\n") + "\n");
  const result = await paygrove([
    "fit",
    table,
    "--target",
    "score",
    "--trees",
    "10",
    "--out",
    `${dir}/score.json`,
  ]);
  noBug(result, "fit score");
  finiteFigures(result.stdout, "fit score");
  assert.equal(result.code, 1, result.stderr);
  assert.match(result.stderr, /a figure came out infinite or undefined/);
});

Deno.test("batch and --table read tables too, and show their warnings on stderr", async () => {
  const base = await payTable("base.csv");
  const model = `${dir}/base.json`;
  const fit = await paygrove(["fit", base, "--target", "pay", "--trees", "10", "--out", model]);
  assert.equal(fit.code, 0, fit.stderr);
  // A profiles table with a repeated row (and so a repeated identifier).
  const text = await Deno.readTextFile(base);
  const profiles = `${dir}/profiles.csv`;
  await Deno.writeTextFile(profiles, text + text.split("\n")[4] + "\n");
  const batch = await paygrove(["batch", model, profiles]);
  assert.equal(batch.code, 0, batch.stderr);
  assert.match(
    batch.stderr.replace(/\s+/g, " "),
    /! 2 data-quality warnings: "id": 1 identifier repeats an earlier row \(line 202\)/,
  );
  assert.match(
    batch.stderr.replace(/\s+/g, " "),
    new RegExp(`paygrove schema ${profiles} lists them`),
  );
  const json = await paygrove(["batch", model, profiles, "--json"]);
  assert.deepEqual(
    JSON.parse(json.stdout).dataWarnings.map((w: { kind: string }) => w.kind).sort(),
    ["duplicate-identifier", "duplicate-row"],
  );
  const estimate = await paygrove(["estimate", model, "--table", profiles, "--row", "E3"]);
  assert.equal(estimate.code, 0, estimate.stderr);
  assert.match(estimate.stderr, /! 2 data-quality warnings/);
});

Deno.test("gap screens variable pay too: not finite or beyond 10^15 (zero bonuses are ordinary)", async () => {
  const lines = ["id,gender,level,bonus,pay"];
  for (let r = 0; r < 200; r++) {
    const level = 1 + (r % 5);
    const bonus = r === 10 ? "1e308" : r % 4 === 0 ? "0" : String(1000 * level);
    lines.push(`E${r},${r % 3 === 0 ? "Woman" : "Man"},L${level},${bonus},${40000 + 9000 * level}`);
  }
  const table = `${dir}/bonus.csv`;
  await Deno.writeTextFile(table, lines.join("\n") + "\n");
  const args = ["gap", table, ...GAP, "--variable", "bonus"];
  const stopped = await paygrove(args);
  noBug(stopped, "gap --variable");
  assert.equal(stopped.code, 1, stopped.stderr);
  assert.match(
    stopped.stderr,
    /"bonus": line 12 has 1e\+308; no plausible pay table holds such a value \(beyond 10\^15, or not finite\)/,
  );
  const dropped = await paygrove([...args, "--drop-implausible", "--json"]);
  assert.equal(dropped.code, 0, dropped.stderr);
  finiteFigures(dropped.stdout, "gap --variable json");
  assert.deepEqual(JSON.parse(dropped.stdout).leftOutImplausible, [
    { column: "bonus", count: 1, lines: [12] },
  ]);
  const text = await paygrove([...args, "--drop-implausible"]);
  assert.match(
    text.stdout.replace(/\s+/g, " "),
    /1 row left out \(--drop-implausible\): its "bonus" is beyond 10\^15, or not finite \(line 12\)/,
  );
  finiteFigures(text.stdout, "gap --variable text");
});

Deno.test("a class never predicted has no precision: shown as -, null in JSON, and the fit goes on", async () => {
  // Band C has two people: no leaf of five predicts it, so its precision is 0/0.
  const lines = ["id,years,band"];
  for (let r = 0; r < 120; r++) {
    lines.push(`E${r},${r % 30},${r < 2 ? "C" : r % 30 < 15 ? "A" : "B"}`);
  }
  const table = `${dir}/bands.csv`;
  await Deno.writeTextFile(table, lines.join("\n") + "\n");
  const args = ["fit", table, "--target", "band", "--trees", "10", "--out", `${dir}/bands.json`];
  const text = await paygrove([...args, "--force"]);
  assert.equal(text.code, 0, text.stderr);
  finiteFigures(text.stdout, "fit band");
  assert.match(text.stdout, /│ precision │[^\n]*│ +- │/);
  const json = await paygrove([...args, "--force", "--json"]);
  assert.equal(json.code, 0, json.stderr);
  const classes = JSON.parse(json.stdout).ensemble;
  assert.ok(classes !== null);
  assert.equal(JSON.parse(json.stdout).quality.ensemble.classes.precision[2], null);
});
