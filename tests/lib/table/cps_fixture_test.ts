// Checks of the loader on open data: CPS1988 and CPS1985 from the R package
// AER (Debian r-cran-aer), as documented on the package's help pages
// (?CPS1988: "28,155 observations on 7 variables", wage in dollars per
// week; ?CPS1985: "534 observations on 11 variables", wage in dollars per
// hour). Provenance: fixtures/README.md.
import assert from "node:assert/strict";
import { describeSchema, loadTableFile, quantile } from "../../../mod.ts";

const fixture = (name: string) => new URL(`../../../fixtures/${name}`, import.meta.url).pathname;

Deno.test("CPS1988 loads with the documented rows, columns and types", async () => {
  const table = await loadTableFile(fixture("cps1988.csv"), {
    target: "wage",
    targetKind: "numeric",
  });
  const schema = describeSchema(table);
  assert.equal(schema.rows, 28155);
  assert.equal(schema.rowsExcluded, 0);
  assert.deepEqual(
    schema.columns.map((c) => [c.name, c.type, c.missing]),
    [
      ["wage", "numeric", 0],
      ["education", "numeric", 0],
      ["experience", "numeric", 0],
      ["ethnicity", "categorical", 0],
      ["smsa", "categorical", 0],
      ["region", "categorical", 0],
      ["parttime", "categorical", 0],
    ],
  );
  const levels = Object.fromEntries(schema.columns.map((c) => [c.name, c.levels]));
  assert.deepEqual(levels.ethnicity, ["afam", "cauc"]);
  assert.deepEqual(levels.region, ["midwest", "northeast", "south", "west"]);
  assert.deepEqual(levels.smsa, ["no", "yes"]);
  // The help page: experience is age - education - 6, "some respondents have
  // negative experience".
  const experience = schema.columns[2];
  assert.ok(experience.min !== undefined && experience.min < 0);
  // "ethnicity" is a protected attribute; nothing else in CPS1988 is.
  assert.deepEqual(schema.columns.filter((c) => c.protected).map((c) => c.name), ["ethnicity"]);
  // wage is pay by its name; the file states no currency or period.
  assert.deepEqual(schema.columns[0].unit, {});
});

Deno.test("CPS1988's wage matches R's summary(CPS1988$wage)", async () => {
  // Printed by R 4.2.2 with AER 1.2-10 on this project's machine:
  //   Rscript -e 'library(AER); data(CPS1988); print(summary(CPS1988$wage), digits=10);
  //               cat(sprintf("%.10f", mean(CPS1988$wage)))'
  //   Min. 50.050, 1st Qu. 308.640, Median 522.320, 3rd Qu. 783.480, Max. 18777.200,
  //   mean 603.7268463861
  const table = await loadTableFile(fixture("cps1988.csv"));
  const wage = table.columns[0];
  assert.ok(wage.type === "numeric");
  const sorted = wage.values.slice().sort();
  assert.equal(sorted[0], 50.05);
  assert.equal(sorted[sorted.length - 1], 18777.2);
  // summary() uses quantile type 7, as paygrove's quantile() does.
  assert.ok(Math.abs(quantile(sorted, 0.25) - 308.64) < 1e-9);
  assert.ok(Math.abs(quantile(sorted, 0.5) - 522.32) < 1e-9);
  assert.ok(Math.abs(quantile(sorted, 0.75) - 783.48) < 1e-9);
  let sum = 0;
  for (const v of wage.values) sum += v;
  assert.ok(Math.abs(sum / wage.values.length - 603.7268463861) < 1e-9);
});

Deno.test("CPS1985 loads with the documented rows and flags its protected columns", async () => {
  const table = await loadTableFile(fixture("cps1985.csv"), {
    target: "wage",
    periods: { wage: "hour" },
  });
  const schema = describeSchema(table);
  assert.equal(schema.rows, 534);
  assert.equal(schema.columns.length, 11);
  assert.deepEqual(
    schema.columns.filter((c) => c.protected).map((c) => c.name),
    ["age", "ethnicity", "gender", "married"],
  );
  assert.deepEqual(schema.columns[0].unit, { period: "hour" });
  const occupation = schema.columns.find((c) => c.name === "occupation");
  assert.equal(occupation?.levels?.length, 6);
});

Deno.test("duplicate rows in CPS1988 match R's duplicated()", async () => {
  // R 4.2.2, AER 1.2-10: sum(duplicated(CPS1988)) is 2128 and the first
  // duplicated rows are 349, 505, 633, 659, 664 (file lines one more, for the
  // header); CPS1985 has none.
  const table = await loadTableFile(fixture("cps1988.csv"));
  const duplicates = table.warnings.find((w) => w.kind === "duplicate-row");
  assert.equal(duplicates?.count, 2128);
  assert.deepEqual(duplicates?.lines, [350, 506, 634, 660, 665]);
  const cps1985 = await loadTableFile(fixture("cps1985.csv"));
  assert.equal(cps1985.warnings.find((w) => w.kind === "duplicate-row"), undefined);
});
