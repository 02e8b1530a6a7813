// The demo table follows the pay rule written in its generator: least
// squares (itself checked against R's lm()) on a large generated copy
// recovers every premium of the rule within 4 standard errors.
import assert from "node:assert/strict";
import {
  demoCompanyCsv,
  FAMILY_PREMIUM,
  fitLeastSquares,
  GAP,
  LEVEL_BASE,
  loadTable,
  SITE_ZONE,
} from "../../../mod.ts";

const text = demoCompanyCsv({ rows: 20000, seed: 7 });
const table = loadTable(text, { target: "base_pay_eur", missing: [""] });
const column = (name: string) => table.columns.find((c) => c.name === name)!;

Deno.test("the demo table reads with the types its users will see", () => {
  const types = Object.fromEntries(table.columns.map((c) => [c.name, c.type]));
  assert.deepEqual(types, {
    employee_id: "identifier",
    job_family: "categorical",
    level: "ordinal",
    years_experience: "numeric",
    years_at_company: "numeric",
    site: "categorical",
    performance_rating: "numeric",
    education: "categorical",
    remote: "categorical",
    gender: "categorical",
    base_pay_eur: "numeric",
  });
  // Ratings are missing exactly for people hired in the last year.
  const rating = column("performance_rating");
  const tenure = column("years_at_company");
  if (rating.type !== "numeric" || tenure.type !== "numeric") throw new Error("numeric expected");
  for (let r = 0; r < table.rows; r++) {
    assert.equal(Number.isNaN(rating.values[r]), tenure.values[r] < 1, `row ${r}`);
  }
});

Deno.test("least squares on the demo table recovers the written pay rule", () => {
  const cells = text.trim().split("\n").slice(1).map((line) => line.split(","));
  const families = Object.keys(FAMILY_PREMIUM).filter((f) => f !== "Field Service");
  const sites = Object.keys(SITE_ZONE).filter((s) => s !== "Eastgate");
  const levels = Object.keys(LEVEL_BASE).slice(1);
  const names = [
    ...families.map((f) => `family ${f}`),
    ...sites.map((s) => `site ${s}`),
    ...levels.map((l) => `level ${l}`),
    "log1p experience",
    "tenure",
    "rating - 3",
    "remote",
    "gap",
  ];
  const columns = names.map(() => new Float64Array(cells.length));
  const y = new Float64Array(cells.length);
  cells.forEach((c, r) => {
    const [, family, level, experience, tenure, site, rating, , remote, gender, pay] = c;
    let k = 0;
    for (const f of families) columns[k++][r] = family === f ? 1 : 0;
    for (const s of sites) columns[k++][r] = site === s ? 1 : 0;
    for (const l of levels) columns[k++][r] = level === l ? 1 : 0;
    columns[k++][r] = Math.log1p(Number(experience));
    columns[k++][r] = Number(tenure);
    columns[k++][r] = rating === "" ? 0 : Number(rating) - 3;
    columns[k++][r] = remote === "yes" ? 1 : 0;
    columns[k++][r] = family === GAP.family && gender === GAP.group ? 1 : 0;
    y[r] = Math.log(Number(pay));
  });
  const fit = fitLeastSquares({ names, columns }, y);
  const expected: Record<string, number> = {
    "(Intercept)": Math.log(LEVEL_BASE.G1) + FAMILY_PREMIUM["Field Service"] + SITE_ZONE.Eastgate,
    ...Object.fromEntries(families.map((f) => [`family ${f}`, FAMILY_PREMIUM[f]])),
    ...Object.fromEntries(sites.map((s) => [`site ${s}`, SITE_ZONE[s] - SITE_ZONE.Eastgate])),
    ...Object.fromEntries(
      levels.map((l) => [`level ${l}`, Math.log(LEVEL_BASE[l] / LEVEL_BASE.G1)]),
    ),
    "log1p experience": 0.09,
    "tenure": -0.004,
    "rating - 3": 0.015,
    "remote": 0.01,
    "gap": -GAP.logPoints,
  };
  fit.names.forEach((name, i) => {
    const z = (fit.coefficients[i] - expected[name]) / fit.standardErrors[i];
    assert.ok(Math.abs(z) < 4, `${name}: ${fit.coefficients[i]} vs ${expected[name]} (z ${z})`);
  });
});

Deno.test("the committed demo table is the generator's default output", async () => {
  const committed = await Deno.readTextFile(
    new URL("../../../fixtures/demo_company.csv", import.meta.url),
  );
  assert.equal(committed, demoCompanyCsv());
});
