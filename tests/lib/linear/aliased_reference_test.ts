// Pivoted least squares against R's lm() (R 4.2.2, Debian r-base-core) on
// everyday tables with aliased columns: fixtures/reference/lm_aliased.json,
// written by tests/reference/lm_aliased.R from the tables in
// fixtures/aliased/ and the demo filtered to level G1. R is given the same
// design columns in the same order (the script rebuilds designOf's
// encoding), so the columns lm() leaves out (NA) must be exactly ours, and
// the other coefficients, their classical standard errors and the residual
// standard deviation must agree to a relative 1e-10: |ours - R's| <= 1e-10
// * |R's|. (Both sides solve the same full-rank problem once the aliased
// columns are out; what is left is rounding.)
import assert from "node:assert/strict";
import {
  designOf,
  filterRows,
  fitLeastSquares,
  loadTableFile,
  makeDataset,
  type Table,
} from "../../../mod.ts";

const root = new URL("../../../", import.meta.url).pathname;
const reference = JSON.parse(await Deno.readTextFile(`${root}fixtures/reference/lm_aliased.json`));
const TOLERANCE = 1e-10;

interface Case {
  table: string;
  rows: number;
  rank: number;
  names: string[];
  aliased: string[];
  coefficients: (number | null)[];
  se: (number | null)[];
  residualSd: number | null;
}

// Each case: the table as paygrove loads it, and the rows R dropped after
// building the design (the person at Cinder Hill; the first two people).
const CASES: Record<string, { file: string; where?: string; without?: (t: Table) => number[] }> = {
  one_person_site: { file: "fixtures/aliased/one_person_site.csv" },
  one_person_site_without_them: {
    file: "fixtures/aliased/one_person_site.csv",
    without: (table) => {
      const site = table.columns.find((c) => c.name === "site")!;
      assert.ok(site.type === "categorical");
      const at = site.levels.indexOf("Cinder Hill");
      return [...site.codes.keys()].filter((r) => site.codes[r] === at);
    },
  },
  months_and_years: { file: "fixtures/aliased/months_and_years.csv" },
  twenty_rows: { file: "fixtures/aliased/twenty_rows.csv" },
  twenty_rows_without_first_two: {
    file: "fixtures/aliased/twenty_rows.csv",
    without: () => [0, 1],
  },
  demo_level_g1: { file: "fixtures/demo_company.csv", where: "G1" },
};

function close(ours: number, theirs: number | null, what: string) {
  if (theirs === null) {
    assert.ok(Number.isNaN(ours), `${what}: R has NA, paygrove ${ours}`);
    return;
  }
  const error = Math.abs(ours - theirs);
  assert.ok(
    error <= TOLERANCE * Math.abs(theirs),
    `${what}: paygrove ${ours}, R ${theirs} (relative difference ${error / Math.abs(theirs)})`,
  );
}

Deno.test("the reference covers every case the R script writes", () => {
  assert.deepEqual(Object.keys(reference.cases).sort(), Object.keys(CASES).sort());
  assert.match(reference.source, /^R \d+\.\d+\.\d+ lm\(\)/);
});

for (const [name, setup] of Object.entries(CASES)) {
  Deno.test(`least squares on ${name} leaves out what R's lm() leaves out, and agrees to 1e-10`, async () => {
    const expected: Case = reference.cases[name];
    let table = await loadTableFile(`${root}${setup.file}`);
    if (setup.where) table = filterRows(table, { level: [setup.where] });
    const { dataset } = makeDataset(table, { target: "base_pay_eur" });
    const design = designOf(dataset);
    const drop = new Set(setup.without?.(table) ?? []);
    const keep = [...Array(dataset.rows).keys()].filter((r) => !drop.has(r));
    const y = dataset.target.values;
    const fit = fitLeastSquares(
      {
        names: design.names,
        columns: design.columns.map((c) => Float64Array.from(keep, (r) => c[r])),
      },
      Float64Array.from(keep, (r) => Math.log(y[r])),
    );
    assert.equal(keep.length, expected.rows);
    assert.deepEqual(fit.names, expected.names);
    assert.equal(fit.rank, expected.rank);
    assert.deepEqual(fit.aliased.map((j) => fit.names[j]), expected.aliased);
    fit.names.forEach((term, j) => {
      close(fit.coefficients[j], expected.coefficients[j], `${name} ${term}`);
      close(fit.standardErrors[j], expected.se[j], `${name} ${term} SE`);
    });
    close(fit.residualSd, expected.residualSd, `${name} residual SD`);
  });
}
