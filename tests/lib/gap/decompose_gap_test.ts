// The raw gap split by factor (lib/gap/decompose_gap.ts) on small invented
// tables: the parts add up, a group paid as the reference gets an interval
// holding 0, several groups, the sample cap, and the gap check's use of it.
// The checks against R's lm() and the 20 planted tables are in
// tests/reference/gap_decomposition_test.ts.
import assert from "node:assert/strict";
import { decomposeGap, gapCheck, loadTable } from "../../../mod.ts";
import { linearGapCsv } from "./_linear_gap.ts";

// A small table: level explains most, group B is paid 0.08 less and sits low.
function smallInput(people = 240) {
  const level = Float64Array.from({ length: people }, (_, i) => i % 4);
  const site = Float64Array.from({ length: people }, (_, i) => (i >> 2) % 3);
  const groupCode = Int32Array.from(
    { length: people },
    (_, i) => ((i * 7) % 10 < 7 - 2 * (i % 4)) ? 1 : 0,
  );
  const pay = Float64Array.from(
    level,
    (l, i) => 10.5 + 0.15 * l - 0.08 * groupCode[i] + 0.02 * (((i * 37) % 11) - 5) / 5,
  );
  return {
    dataset: {
      rows: people,
      features: [
        {
          name: "level",
          kind: "ordinal" as const,
          levels: ["L1", "L2", "L3", "L4"],
          values: level,
        },
        { name: "site", kind: "categorical" as const, levels: ["N", "S", "E"], values: site },
      ],
      target: { kind: "regression" as const, name: "pay", values: pay },
    },
    group: "group",
    groups: ["A", "B"],
    groupCode,
    trees: 40,
    workers: 1,
  };
}

Deno.test("the parts add up to the raw gap in mean log pay, and the raw gap is the groups' difference", async () => {
  const input = smallInput();
  const [d] = (await decomposeGap(input)).groups;
  const y = input.dataset.target.values;
  const mean = (g: number) => {
    let sum = 0, count = 0;
    for (let r = 0; r < y.length; r++) {
      if (input.groupCode[r] === g) {
        sum += y[r];
        count++;
      }
    }
    return sum / count;
  };
  assert(Math.abs(d.rawLog - (mean(0) - mean(1))) < 1e-12);
  assert.equal(d.people.reference + d.people.group, input.dataset.rows);
  const explained = d.explained.reduce((a, p) => a + p.part, 0);
  assert(Math.abs(explained - d.explainedTotal) < 1e-12);
  assert(Math.abs(d.explainedTotal + d.unexplained.value + d.rest - d.rawLog) < 1e-12);
  assert(Math.abs(d.geometricGap - (1 - Math.exp(-d.rawLog))) < 1e-15);
  // The factors only: the group's own column is no factor.
  assert.deepEqual(d.explained.map((p) => p.attribute), ["level", "site"]);
  // Level carries the explained part; site, unrelated to group and pay, next to none.
  assert(d.explained[0].part > 0.05, `level ${d.explained[0].part}`);
  assert(Math.abs(d.explained[1].part) < 0.01, `site ${d.explained[1].part}`);
  assert(d.unexplained.low < d.unexplained.value && d.unexplained.value < d.unexplained.high);
});

Deno.test("a group paid as the reference gets an unexplained part whose interval holds 0", async () => {
  const input = smallInput();
  // The same table with the group's 0.08 taken away: only level differs.
  const y = input.dataset.target.values.map((v, r) => v + 0.08 * input.groupCode[r]);
  const [d] = (await decomposeGap({
    ...input,
    dataset: { ...input.dataset, target: { ...input.dataset.target, values: y } },
  })).groups;
  assert(d.unexplained.low < 0 && 0 < d.unexplained.high, JSON.stringify(d.unexplained));
  assert(d.explained[0].part > 0.05);
});

Deno.test("with three groups, each is split against the reference on its own people", async () => {
  const input = smallInput(300);
  const groupCode = Int32Array.from(input.groupCode, (g, r) => (g === 1 && r % 3 === 0 ? 2 : g));
  const report = await decomposeGap({ ...input, groups: ["A", "B", "C"], groupCode });
  assert.deepEqual(report.groups.map((d) => d.group), ["B", "C"]);
  const count = (g: number) => groupCode.filter((c) => c === g).length;
  for (const [k, d] of report.groups.entries()) {
    assert.deepEqual(d.people, { reference: count(0), group: count(k + 1) });
    assert(Math.abs(d.explainedTotal + d.unexplained.value + d.rest - d.rawLog) < 1e-12);
  }
});

Deno.test("beyond the sample cap, contributions come from a seeded sample of that many people", async () => {
  const input = smallInput();
  const full = (await decomposeGap(input)).groups[0];
  const capped = (await decomposeGap({ ...input, sampleCap: 50 })).groups[0];
  assert.deepEqual(capped.sampled, { reference: 50, group: 50 });
  assert.deepEqual(full.sampled, full.people);
  // What does not depend on the sample is the same.
  assert.equal(capped.unexplained.value, full.unexplained.value);
  assert.equal(capped.rawLog, full.rawLog);
  assert.notEqual(capped.explainedTotal, full.explainedTotal);
  assert(Math.abs(capped.explained[0].part - full.explained[0].part) < 0.03);
});

Deno.test("the gap check carries the split of the overall gap, and leaves it out when asked", async () => {
  const table = loadTable(linearGapCsv(4, 400), { target: "pay" });
  const report = await gapCheck(table, {
    target: "pay",
    group: "group",
    reference: "P",
    trees: 20,
    workers: 1,
  });
  const d = report.decomposition!.groups[0];
  assert.equal(d.group, "Q");
  assert.deepEqual(d.explained.map((p) => p.attribute), report.features);
  assert.equal(d.people.reference + d.people.group, report.rows);
  const off = await gapCheck(table, {
    target: "pay",
    group: "group",
    reference: "P",
    trees: 20,
    workers: 1,
    decompose: false,
  });
  assert.equal(off.decomposition, null);
});
