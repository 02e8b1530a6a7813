// Everyday tables whose straight-line baseline has aliased columns, fitted
// by the real CLI: one site with a single person, experience in both years
// and months, 20 rows, and the demo filtered to one level. Each must fit
// (status 0, never 70 with a stack trace), and the fit must say which term
// the straight line left out, in words and in --json. The tables are
// fixtures/aliased/*.csv, cut from the invented demo by
// tests/reference/lm_aliased.R (see fixtures/README.md); R's lm() fits of
// the same designs are checked in tests/lib/linear/aliased_reference_test.ts.
import assert from "node:assert/strict";
import { paygrove, ROOT } from "./_cli.ts";

const dir = await Deno.makeTempDir({ prefix: "paygrove-aliased-" });
const demo = `${ROOT}fixtures/demo_company.csv`;
const table = (name: string) => `${ROOT}fixtures/aliased/${name}`;

interface Aliased {
  term: { feature: string; kind: string; level?: string | null };
  folds: number;
}

async function fitJson(name: string, args: string[]) {
  const result = await paygrove([
    "fit",
    ...args,
    "--target",
    "base_pay_eur",
    "--trees",
    "20",
    "--out",
    `${dir}/${name}.json`,
    "--json",
  ]);
  assert.equal(result.code, 0, `${name}: status ${result.code}\n${result.stderr}`);
  assert.doesNotMatch(result.stderr, /internal error|\.ts:\d+/, name);
  const doc = JSON.parse(result.stdout);
  assert.equal(typeof doc.baselines.linearCvRmse, "number", name);
  assert.ok(Number.isFinite(doc.baselines.linearCvRmse), name);
  return doc.quality.linear.aliased as Aliased[];
}

const folds = (aliased: Aliased[], feature: string, level?: string) =>
  aliased.find((a) => a.term.feature === feature && (level === undefined || a.term.level === level))
    ?.folds;

Deno.test("a site with a single person: the fit goes on without that site's column in the fold that holds them out", async () => {
  const aliased = await fitJson("one-person", [table("one_person_site.csv")]);
  // The one person at Cinder Hill sits in exactly one of the 10 folds.
  assert.equal(folds(aliased, "site", "Cinder Hill"), 1, JSON.stringify(aliased));
});

Deno.test("experience in months and in years: months (the later column) is left out of every fold", async () => {
  const aliased = await fitJson("months", [table("months_and_years.csv")]);
  assert.equal(folds(aliased, "months_experience"), 10, JSON.stringify(aliased));
  assert.equal(folds(aliased, "years_experience"), undefined);
});

Deno.test("a 20-row table fits, with more coefficients than rows in every fold", async () => {
  const aliased = await fitJson("twenty", [table("twenty_rows.csv")]);
  // 19 coefficients, 18 rows per fold: at least one term out of every fold.
  assert.ok(aliased.length > 0, JSON.stringify(aliased));
  assert.ok(aliased.reduce((s, a) => s + a.folds, 0) >= 10, JSON.stringify(aliased));
});

Deno.test("the demo filtered to level G1: the constant level column is left out of every fold", async () => {
  const aliased = await fitJson("g1", [demo, "--where", "level=G1"]);
  assert.equal(folds(aliased, "level"), 10, JSON.stringify(aliased));
});

Deno.test("the fit's text names the term the straight line left out", async () => {
  const result = await paygrove([
    "fit",
    table("months_and_years.csv"),
    "--target",
    "base_pay_eur",
    "--trees",
    "20",
    "--out",
    `${dir}/months-text.json`,
  ], { COLUMNS: "100" });
  assert.equal(result.code, 0, result.stderr);
  const text = result.stdout.replace(/\s+/g, " ");
  assert.match(text, /straight line leaves out months_experience in all 10 folds/, text);
});

Deno.test("the gap check's linear version goes on without the constant level column", async () => {
  const result = await paygrove([
    "gap",
    demo,
    "--target",
    "base_pay_eur",
    "--group",
    "gender",
    "--groups",
    "Woman",
    "--where",
    "level=G1",
    "--trees",
    "20",
    "--json",
  ]);
  assert.equal(result.code, 0, result.stderr);
  const doc = JSON.parse(result.stdout);
  assert.ok(Array.isArray(doc.linear) && doc.linear.length > 0, JSON.stringify(doc.notes));
  for (const g of doc.linear) assert.ok(Number.isFinite(g.coefficient), JSON.stringify(g));
  assert.deepEqual(doc.linearAliased, [{ feature: "level", kind: "value" }]);
  const text = await paygrove([
    "gap",
    demo,
    "--target",
    "base_pay_eur",
    "--group",
    "gender",
    "--groups",
    "Woman",
    "--where",
    "level=G1",
    "--trees",
    "20",
  ]);
  assert.equal(text.code, 0, text.stderr);
  assert.match(text.stdout.replace(/\s+/g, " "), /linear version leaves out level/);
});
