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

Deno.test("bands --posting: the range for one role, its comparable people, and the refusals", async () => {
  const run = await paygrove([
    "bands",
    model,
    "--posting",
    "--set",
    "level=G3",
    "--set",
    "job_family=Sales",
    "--table",
    demo,
    "--json",
  ]);
  assert.equal(run.code, 0, run.stderr);
  const doc = JSON.parse(run.stdout);
  assert.equal(doc.profile.level, "G3");
  assert.deepEqual(doc.newHire, ["years_at_company"]);
  assert.ok(doc.low < doc.estimate && doc.estimate < doc.high);
  assert.deepEqual(doc.comparable.named, ["level", "job_family"]);
  assert.ok(doc.comparable.people >= 5 && doc.comparable.inside > 0);
  const text = await paygrove(["bands", model, "--posting", "--set", "level=G3"]);
  assert.equal(text.code, 0, text.stderr);
  assert.match(text.stdout, /^Range to post: €[\d,]+ to €[\d,]+/);
  assert.match(text.stdout, /needs --table/);
  const noRole = await paygrove(["bands", model, "--posting"]);
  assert.equal(noRole.code, 2);
  assert.match(noRole.stderr, /--posting needs the role/);
  // A model fitted with gender among its attributes: no posting range.
  const protectedModel = `${dir}/with_gender.model.json`;
  const fit = await paygrove([
    "fit",
    demo,
    "--target",
    "base_pay_eur",
    "--allow-protected",
    "--trees",
    "10",
    "--folds",
    "3",
    "--out",
    protectedModel,
  ]);
  assert.equal(fit.code, 0, fit.stderr);
  const refused = await paygrove(["bands", protectedModel, "--posting", "--set", "level=G3"]);
  assert.equal(refused.code, 2);
  assert.match(refused.stderr, /objective criteria/);
});

Deno.test("bands on a table that does not fit the model: said in one message, no stack trace", async () => {
  const lines = (await Deno.readTextFile(demo)).trim().split("\n");
  const header = lines[0].split(",");
  // A level the model never saw.
  const levelAt = header.indexOf("level");
  const odd = lines.slice(0, 30).map((line, i) => {
    if (i !== 29) return line;
    const cells = line.split(",");
    cells[levelAt] = "G9";
    return cells.join(",");
  });
  await Deno.writeTextFile(`${dir}/odd.csv`, odd.join("\n") + "\n");
  const unseen = await paygrove(["bands", model, "--table", `${dir}/odd.csv`]);
  assert.notEqual(unseen.code, 0);
  assert.match(unseen.stderr, /"G9" the model never saw/);
  // No pay column: the quartiles and who sits outside need current pay.
  const payAt = header.indexOf("base_pay_eur");
  const noPay = lines.slice(0, 30).map((line) =>
    line.split(",").filter((_, c) => c !== payAt).join(",")
  );
  await Deno.writeTextFile(`${dir}/no_pay.csv`, noPay.join("\n") + "\n");
  const withoutPay = await paygrove(["bands", model, "--table", `${dir}/no_pay.csv`]);
  assert.equal(withoutPay.code, 2);
  assert.match(withoutPay.stderr, /bands need current pay/);
  for (const run of [unseen, withoutPay]) assert.doesNotMatch(run.stderr, /\bat .*\.ts:\d+/);
});
