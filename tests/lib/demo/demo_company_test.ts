// The demo table follows the pay rule written in its generator: without
// the pay bands, log pay minus the rule is noise with mean 0 and the stated
// spread per level, unrelated to experience; with them (the default), pay is
// the same but held within each level's band.
import assert from "node:assert/strict";
import {
  BAND_HIGH,
  BAND_LOW,
  demoCompanyCsv,
  LEVEL_BASE,
  loadTable,
  logPayRule,
  noiseSd,
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

Deno.test("log pay minus the written rule is noise of the stated size", () => {
  const levels = Object.keys(LEVEL_BASE);
  const cells = demoCompanyCsv({ rows: 20000, seed: 7, bands: false }).trim().split("\n").slice(1)
    .map((line) => line.split(","));
  const residuals: number[][] = levels.map(() => []);
  // Correlation of the residual with experience, as a check that no
  // attribute's effect is missing from the rule.
  const pairs: [number, number][] = [];
  for (const c of cells) {
    const [, family, level, experience, tenure, site, rating, , remote, gender, pay] = c;
    const k = levels.indexOf(level);
    const amount = Number(pay);
    const rule = logPayRule({
      level: k,
      family,
      site,
      experience: Number(experience),
      tenure: Number(tenure),
      rating: rating === "" ? NaN : Number(rating),
      remote: remote === "yes",
      gender,
    });
    const r = Math.log(amount) - rule;
    residuals[k].push(r);
    pairs.push([Number(experience), r]);
  }
  residuals.forEach((rs, k) => {
    const m = rs.reduce((a, b) => a + b, 0) / rs.length;
    const sd = Math.sqrt(rs.reduce((a, b) => a + (b - m) ** 2, 0) / (rs.length - 1));
    // Rounding to 50 EUR adds at most 25 / pay (< 0.001) to a residual.
    assert.ok(Math.abs(m) < 4 * noiseSd(k) / Math.sqrt(rs.length) + 0.001, `level ${k}: mean ${m}`);
    assert.ok(Math.abs(sd / noiseSd(k) - 1) < 0.06, `level ${k}: sd ${sd} vs ${noiseSd(k)}`);
  });
  const n = pairs.length;
  const mx = pairs.reduce((a, p) => a + p[0], 0) / n;
  const my = pairs.reduce((a, p) => a + p[1], 0) / n;
  const cov = pairs.reduce((a, p) => a + (p[0] - mx) * (p[1] - my), 0);
  const vx = pairs.reduce((a, p) => a + (p[0] - mx) ** 2, 0);
  const vy = pairs.reduce((a, p) => a + (p[1] - my) ** 2, 0);
  assert.ok(Math.abs(cov / Math.sqrt(vx * vy)) < 0.05);
});

Deno.test("pay bands hold pay within each level's band and change nothing else", () => {
  const free = demoCompanyCsv({ rows: 5000, seed: 3, bands: false }).trim().split("\n");
  const held = demoCompanyCsv({ rows: 5000, seed: 3 }).trim().split("\n");
  let moved = 0;
  for (let i = 1; i < free.length; i++) {
    const a = free[i].split(",");
    const b = held[i].split(",");
    assert.deepEqual(a.slice(0, 10), b.slice(0, 10));
    const base = LEVEL_BASE[a[2]];
    // Both are rounded to 50 EUR after holding, so allow 25 either way.
    const expected = Math.min(BAND_HIGH * base, Math.max(BAND_LOW * base, Number(a[10])));
    assert.ok(Math.abs(Number(b[10]) - expected) <= 25, held[i]);
    if (a[10] !== b[10]) moved++;
  }
  assert.ok(moved > 0 && moved < 0.12 * free.length, `${moved} held at a band edge`);
});

Deno.test("the committed demo table is the generator's default output", async () => {
  const committed = await Deno.readTextFile(
    new URL("../../../fixtures/demo_company.csv", import.meta.url),
  );
  assert.equal(committed, demoCompanyCsv());
});
