// The raw gap split by factor (lib/gap/decompose_gap.ts) against the outside.
//
// On the invented table fixtures/gap_decomposition/linear_gap.csv, R's lm()
// (R 4.2.2, Debian r-base-core; tests/reference/oaxaca_pooled.R, its output
// fixtures/reference/oaxaca_pooled.json, rerun in CI by cps_export_test.ts)
// gives the pooled Oaxaca-Blinder decomposition: the trees' explained parts
// must come within 0.006 of it (0.6 points; the largest seen over the 20
// planted tables is 0.42 points, bench/results/gap_decomposition.md). On
// the 20 planted tables (tests/results/gap_decomposition.json, written by
// bench/gap_decomposition.ts) the unexplained part's 95% interval must hold
// the planted effect of 0.06 in at least 17.
import assert from "node:assert/strict";
import { decomposeGap, loadTable } from "../../mod.ts";
import { payRows } from "../../lib/model/pay_pipeline.ts";
import { linearGapCsv, linearGapRun, PLANTED_EFFECT, summarise } from "../lib/gap/_linear_gap.ts";

const root = new URL("../../", import.meta.url).pathname;

Deno.test("the table of the R check is the seed-1 planted table", async () => {
  const committed = (await Deno.readTextFile(`${root}fixtures/gap_decomposition/linear_gap.csv`))
    .trim().split("\n");
  const fresh = linearGapCsv(1).trim().split("\n");
  assert.equal(committed.length, fresh.length);
  assert.equal(committed[0], fresh[0]);
  for (let i = 1; i < fresh.length; i++) {
    const a = committed[i].split(",");
    const b = fresh[i].split(",");
    assert.deepEqual(a.slice(0, 5), b.slice(0, 5));
    // Pay to the cent, compared as numbers (exp on another machine may end a digit apart).
    assert(Math.abs(Number(a[5]) - Number(b[5])) <= 0.011, `line ${i + 1}`);
  }
});

Deno.test("the trees' explained parts come within 0.006 of R's pooled linear decomposition", async () => {
  const reference = JSON.parse(
    await Deno.readTextFile(`${root}fixtures/reference/oaxaca_pooled.json`),
  );
  const table = loadTable(
    await Deno.readTextFile(`${root}fixtures/gap_decomposition/linear_gap.csv`),
    { target: "pay" },
  );
  const { dataset } = payRows(table, { target: "pay", drop: ["person", "group"], scale: "log" });
  const group = table.columns.find((c) => c.name === "group");
  assert(group?.type === "categorical");
  const groupCode = Int32Array.from(group.codes, (c) => ["P", "Q"].indexOf(group.levels[c]));
  const [d] = (await decomposeGap({
    dataset,
    group: "group",
    groups: ["P", "Q"],
    groupCode,
    workers: 2,
  })).groups;
  assert(Math.abs(d.rawLog - reference.rawLog) < 1e-12);
  for (const { attribute, part } of d.explained) {
    const r = reference.explained[attribute];
    assert(Math.abs(part - r) <= 0.006, `${attribute}: trees ${part}, R ${r}`);
  }
  // Our own least squares on the same table equals R's to 1e-9.
  const run = await linearGapRun(1, 20);
  for (const attribute of ["level", "years", "site"]) {
    assert(Math.abs(run.linear[attribute] - reference.explained[attribute]) < 1e-9);
  }
  assert(Math.abs(run.linearUnexplained - reference.unexplained) < 1e-9);
  // And the trees' unexplained part's interval holds R's coefficient.
  assert(d.unexplained.low <= reference.unexplained && reference.unexplained <= d.unexplained.high);
});

Deno.test("20 planted tables: the unexplained part's interval holds the planted 0.06 in at least 17, as recorded", async () => {
  const recorded = JSON.parse(
    await Deno.readTextFile(`${root}tests/results/gap_decomposition.json`),
  );
  const runs = [];
  for (let seed = 1; seed <= 20; seed++) runs.push(await linearGapRun(seed));
  const summary = summarise(runs);
  assert(summary.covered >= 17, `covered ${summary.covered} of 20`);
  assert(Math.abs(summary.meanUnexplained - PLANTED_EFFECT) < 0.01, `${summary.meanUnexplained}`);
  assert(summary.largestLinearGap <= 0.006, `${summary.largestLinearGap}`);
  // The same figures as bench/gap_decomposition.ts wrote (relative 1e-9).
  assert.equal(summary.covered, recorded.covered);
  runs.forEach((run, i) => {
    const was = recorded.runs[i].trees;
    for (const key of ["rawLog", "explainedTotal", "rest"] as const) {
      assert(Math.abs(run.trees[key] - was[key]) <= 1e-9 * Math.max(1, Math.abs(was[key])), key);
    }
    assert(Math.abs(run.trees.unexplained.value - was.unexplained.value) <= 1e-9);
  });
});
