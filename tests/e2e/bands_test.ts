// `paygrove bands` as a user runs it: JSON, the CSV (read back by
// csv-parse), the Markdown report, and the refusals with their exit status.
import assert from "node:assert/strict";
import { parse } from "csv-parse/sync";
import { paygrove, ROOT } from "./_cli.ts";

const dir = await Deno.makeTempDir({ prefix: "paygrove-bands-" });
const demo = `${ROOT}fixtures/demo_company.csv`;
const model = `${dir}/demo.model.json`;
const fitted = await paygrove([
  "fit",
  demo,
  "--target",
  "base_pay_eur",
  "--currency",
  "EUR",
  "--trees",
  "30",
  "--folds",
  "3",
  "--out",
  model,
]);
if (fitted.code !== 0) throw new Error(fitted.stderr);

Deno.test("bands --json, --out and --report say the same bands", async () => {
  const out = `${dir}/bands.csv`;
  const report = `${dir}/bands.md`;
  const run = await paygrove([
    "bands",
    model,
    "--table",
    demo,
    "--by",
    "level,site",
    "--out",
    out,
    "--report",
    report,
    "--json",
  ]);
  assert.equal(run.code, 0, run.stderr);
  const doc = JSON.parse(run.stdout);
  assert.deepEqual(doc.by, ["level", "site"]);
  assert.deepEqual(doc.method, { kind: "coverage", coverage: 0.8 });
  const rows = parse(await Deno.readTextFile(out), { columns: true }) as Record<string, string>[];
  assert.equal(rows.length, doc.cells.length);
  rows.forEach((row, i) => {
    const cell = doc.cells[i];
    assert.deepEqual([row.level, row.site], cell.key);
    assert.equal(row.suppressed, String(cell.suppressed));
    if (!cell.suppressed) {
      assert.equal(Number(row.band_mid), Number(cell.band.mid.toFixed(2)));
      assert.equal(Number(row.people), cell.people);
    } else assert.equal(row.people, "");
  });
  const md = await Deno.readTextFile(report);
  assert.match(md, /^# Pay bands by level x site/);
  assert.match(md, /paygrove gap/);
  const first = doc.cells.find((c: { suppressed: boolean }) => !c.suppressed);
  assert.ok(md.includes(`| ${first.key.join(" / ")} | ${first.people.toLocaleString("en-US")} |`));
});

Deno.test("bands refuses, with status 2: no table, both ways of building, a numeric --by", async () => {
  const noTable = await paygrove(["bands", model]);
  assert.equal(noTable.code, 2);
  assert.match(noTable.stderr, /--table FILE: the model file holds no one's pay/);
  const both = await paygrove([
    "bands",
    model,
    "--table",
    demo,
    "--coverage",
    "0.8",
    "--spread",
    "40%",
  ]);
  assert.equal(both.code, 2);
  assert.match(both.stderr, /give one/);
  const numeric = await paygrove(["bands", model, "--table", demo, "--by", "years_experience"]);
  assert.equal(numeric.code, 2);
  assert.match(numeric.stderr, /numeric; cells need levels/);
});

Deno.test("bands never writes over a file without --force", async () => {
  const out = `${dir}/kept.csv`;
  await Deno.writeTextFile(out, "keep me\n");
  const run = await paygrove(["bands", model, "--table", demo, "--out", out]);
  assert.notEqual(run.code, 0);
  assert.equal(await Deno.readTextFile(out), "keep me\n");
});
