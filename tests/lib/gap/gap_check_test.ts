// The gap check against outside references and by simulation:
// - the residual regression's robust standard errors against R's
//   sandwich::vcovHC(type = "HC1") on CPS1988 (fixtures/reference/hc1_cps1988.json);
// - the linear version's ethnicity coefficient against R's lm() on CPS1988
//   (fixtures/reference/lm_cps1988.json, the AER package's documented example model);
// - raw gaps per category on a table computed by hand;
// - the simulation of tests/lib/gap/_gap_sim.ts against its committed figures
//   (tests/results/gap_sim.json) and the thresholds.
import assert from "node:assert/strict";
import { HAND_TABLE } from "./_hand_table.ts";
import {
  gapCheck,
  loadTable,
  loadTableFile,
  makeDataset,
  residualRegression,
  suppressSmallGroups,
} from "../../../mod.ts";
import { type GapSimSummary, runGapSimulation } from "./_gap_sim.ts";

const ROOT = new URL("../../../", import.meta.url).pathname;

function relClose(a: number, b: number, tolerance: number, what: string): void {
  assert.ok(Math.abs(a - b) <= tolerance * Math.abs(b), `${what}: ${a} vs ${b}`);
}

Deno.test("the residual regression's HC1 standard errors equal R's sandwich on CPS1988", async () => {
  const reference = JSON.parse(
    await Deno.readTextFile(`${ROOT}fixtures/reference/hc1_cps1988.json`),
  );
  const table = await loadTableFile(`${ROOT}fixtures/cps1988.csv`, { target: "wage" });
  const { dataset } = makeDataset(table, { target: "wage", features: ["education", "experience"] });
  const y = dataset.target.values.map(Math.log);
  const rows = Array.from({ length: dataset.rows }, (_, r) => r);
  const [education, experience] = dataset.features.map((f) => f.values);
  const one = residualRegression(y, [education], rows)!;
  relClose(one[0].coefficient, reference.fits.one.education.estimate, 1e-9, "b, one");
  relClose(one[0].se, reference.fits.one.education.se, 1e-9, "HC1 se, one");
  const two = residualRegression(y, [education, experience], rows)!;
  relClose(two[0].coefficient, reference.fits.two.education.estimate, 1e-9, "b education");
  relClose(two[0].se, reference.fits.two.education.se, 1e-9, "HC1 se education");
  relClose(two[1].coefficient, reference.fits.two.experience.estimate, 1e-9, "b experience");
  relClose(two[1].se, reference.fits.two.experience.se, 1e-9, "HC1 se experience");
});

Deno.test("the linear version reproduces R's lm() ethnicity coefficient on CPS1988", async () => {
  const reference = JSON.parse(
    await Deno.readTextFile(`${ROOT}fixtures/reference/lm_cps1988.json`),
  );
  // The package's example model: log wage on experience, experience
  // squared and education, plus the group (ethnicity; cauc, the larger
  // group, is the reference as in R's treatment coding).
  const text = await Deno.readTextFile(`${ROOT}fixtures/cps1988.csv`);
  const lines = text.trim().split("\n");
  const header = lines[0].split(",");
  const at = header.indexOf("experience");
  const withSquare = [
    `${lines[0]},experience_sq`,
    ...lines.slice(1).map((l) => `${l},${Number(l.split(",")[at]) ** 2}`),
  ].join("\n");
  const table = loadTable(withSquare, { target: "wage", file: "cps1988.csv" });
  const report = await gapCheck(table, {
    target: "wage",
    group: "ethnicity",
    features: ["experience", "experience_sq", "education"],
    trees: 10,
    workers: 1,
  });
  assert.equal(report.reference, "cauc");
  const linear = report.linear!.find((l) => l.group === "afam")!;
  const r = reference.coefficients.ethnicityafam;
  relClose(linear.coefficient, r.estimate, 1e-8, "ethnicity coefficient");
  // HC1, as the adjusted gap's: sandwich::vcovHC(type = "HC1") of the same
  // lm() (fixtures/reference/hc1_cps1988.json, fit "three").
  const hc1 = JSON.parse(
    await Deno.readTextFile(`${ROOT}fixtures/reference/hc1_cps1988.json`),
  ).fits.three.ethnicityafam;
  relClose(hc1.estimate, r.estimate, 1e-9, "the two R runs' coefficient");
  relClose(linear.se, hc1.se, 1e-9, "its HC1 standard error");
  assert.ok(Math.abs(linear.se - r.se) > 1e-4, "not the classical error");
  relClose(linear.gap, 1 - Math.exp(r.estimate), 1e-8, "as a gap");
});

// Four families; in each, men and women with pay easy to average by hand.
// Family Kiln has only two women: too few to report.

Deno.test("raw gaps per category and overall equal hand-computed figures", async () => {
  const table = loadTable(HAND_TABLE, { target: "pay", file: "hand.csv" });
  const report = await gapCheck(table, {
    target: "pay",
    group: "gender",
    within: ["family"],
    trees: 20,
    workers: 1,
  });
  assert.equal(report.reference, "Man");
  const byName = new Map(report.categories.map((c) => [c.name, c]));
  // Dock: men 85, women 85 -> no gap; medians 85 and 85.
  const dock = byName.get("Dock")!;
  assert.ok(!dock.suppressed);
  if (!dock.suppressed) {
    assert.ok(Math.abs(dock.gaps[0].rawMean) < 1e-12 && Math.abs(dock.gaps[0].rawMedian) < 1e-12);
    assert.equal(dock.gaps[0].rawFlag, false);
    assert.equal(dock.rows, 12);
  }
  // Yard: men mean and median 50, women 55 -> -10% (paid more), flagged.
  const yard = byName.get("Yard")!;
  assert.ok(!yard.suppressed);
  if (!yard.suppressed) {
    assert.ok(Math.abs(yard.gaps[0].rawMean + 0.1) < 1e-12);
    assert.ok(Math.abs(yard.gaps[0].rawMedian + 0.1) < 1e-12);
    assert.equal(yard.gaps[0].rawFlag, true);
  }
  // Kiln is too few to report, and one more family is hidden with it
  // (the one with the fewest people in its smallest group, then the fewest
  // people: Bench, 5 and 5, before Yard's 5 and 5 by order, Dock's 6).
  assert.deepEqual(byName.get("Kiln"), { name: "Kiln", suppressed: true });
  assert.deepEqual(byName.get("Bench"), { name: "Bench", suppressed: true });
  // Overall: men (270 + 510 + 310 + 250) / 21, women (245 + 510 + 84 + 275) / 18.
  assert.ok(!report.overall.suppressed);
  if (!report.overall.suppressed) {
    const men = 1340 / 21;
    const women = 1114 / 18;
    assert.ok(Math.abs(report.overall.gaps[0].rawMean - (men - women) / men) < 1e-12);
  }
  // Quartiles: 39 people -> 10, 10, 10, 9.
  assert.deepEqual(report.quartiles!.map((q) => q.rows), [10, 10, 10, 9]);
});

Deno.test("Bench is the complementary choice: the smallest group first, then the fewest people", () => {
  // The hand table's counts (men, women) per family: Bench, Dock, Kiln, Yard.
  const s = suppressSmallGroups([[5, 5], [6, 6], [5, 2], [5, 5]], 5);
  assert.deepEqual(s.hidden, [true, false, true, false]);
  // Three categories below the minimum together still hide one more if
  // their women number fewer than five: here every family, leaving only
  // the overall figure (23 women).
  const t = suppressSmallGroups([[9, 1], [9, 1], [9, 1], [20, 20]], 5);
  assert.deepEqual(t.hidden, [true, true, true, true]);
  assert.equal(t.overallHidden, false);
  // With fewer than five women in all, the overall figure goes too.
  const u = suppressSmallGroups([[9, 1], [9, 1], [20, 2]], 5);
  assert.deepEqual(u.hidden, [true, true, true]);
  assert.equal(u.overallHidden, true);
  // Nothing small: nothing hidden.
  assert.deepEqual(suppressSmallGroups([[5, 5], [6, 7]], 5).hidden, [false, false]);
});

Deno.test("simulation: the planted 6% gap is found, others are not flagged, as committed", async () => {
  const committed: GapSimSummary = JSON.parse(
    await Deno.readTextFile(`${ROOT}tests/results/gap_sim.json`),
  );
  const fresh = await runGapSimulation(20);
  // The bar.
  assert.ok(fresh.plantedFlagged >= 18, `planted flagged in ${fresh.plantedFlagged} of 20`);
  assert.ok(
    fresh.falseFlags <= 0.05 * fresh.otherCategoryRuns,
    `${fresh.falseFlags} false flags in ${fresh.otherCategoryRuns}`,
  );
  assert.ok(fresh.covered >= 17, `interval covered 6% in ${fresh.covered} of 20`);
  // The simple residual difference understates the planted gap.
  assert.ok(fresh.residualDifferenceBias < fresh.adjustedBias);
  // Raw gaps are large (group Q sits in lower levels), adjusted ones small.
  for (const run of fresh.perRun) {
    assert.ok(run.overall.rawMean > 0.1 && Math.abs(run.overall.adjusted) < 0.04);
  }
  // The committed figures are these (seeded: the same on every machine).
  assert.deepEqual(
    JSON.parse(
      JSON.stringify(fresh, (_k, v) => (typeof v === "number" ? Number(v.toPrecision(10)) : v)),
    ),
    JSON.parse(
      JSON.stringify(committed, (_k, v) => (typeof v === "number" ? Number(v.toPrecision(10)) : v)),
    ),
  );
});

Deno.test("per-category intervals are family-wise (Bonferroni) and agree with the Holm flags", async () => {
  const table = await loadTableFile(`${ROOT}fixtures/demo_company.csv`, {
    target: "base_pay_eur",
  });
  const report = await gapCheck(table, {
    target: "base_pay_eur",
    group: "gender",
    within: ["job_family"],
    trees: 20,
    workers: 1,
  });
  const shown = report.categories.flatMap((c) => c.suppressed ? [] : c.gaps)
    .filter((g) => g.coefficient !== null);
  assert.ok(shown.length >= 3, `${shown.length} figures`);
  // The z of each level, printed by R 4.2.2 (Debian r-base-core):
  // sprintf("%.17g", qnorm(1 - 0.05 / (2 * m))) for m = the figures shown.
  const zFamily: Record<number, number> = {
    3: 2.3939797998185104,
    4: 2.4977054744123737,
    5: 2.5758293035488999,
    6: 2.6382572734767509,
  };
  const z = zFamily[shown.length];
  assert.ok(z !== undefined, `no z for ${shown.length} figures`);
  for (const g of shown) {
    assert.equal(g.family, shown.length);
    relClose(1 - g.familyLow!, Math.exp(g.coefficient! + z * g.se!), 1e-12, "family low");
    relClose(1 - g.familyHigh!, Math.exp(g.coefficient! - z * g.se!), 1e-12, "family high");
    // Wider than the single 95% interval.
    assert.ok(g.familyLow! <= g.low! && g.familyHigh! >= g.high!);
    // Clear of 0 -> significant after Holm (flagged, or below the materiality).
    if (g.familyLow! > 0 || g.familyHigh! < 0) assert.ok(g.pAdjusted! <= 0.05, g.group);
  }
});
