// The pay review on the invented demo table with planted underpaid people:
// twelve people's pay is cut by 25% (far more than the demo's pay noise at
// any level); the review must find every one of them from out-of-bag
// estimates, and its costs must be the sum of the shortfalls it lists.
import assert from "node:assert/strict";
import {
  bootstrapCounts,
  DataError,
  demoCompanyCsv,
  loadTable,
  OptionError,
  payReview,
  resampleStates,
} from "../../../mod.ts";
import { HAND_TABLE } from "./_hand_table.ts";

const PLANTED = Array.from({ length: 12 }, (_, i) => 37 + 163 * i);

function plantedTable() {
  const lines = demoCompanyCsv().trim().split("\n");
  const header = lines[0].split(",");
  const at = header.indexOf("base_pay_eur");
  const ids: string[] = [];
  for (const row of PLANTED) {
    const cells = lines[row + 1].split(",");
    cells[at] = String(Math.round(Number(cells[at]) * 0.75));
    ids.push(cells[0]);
    lines[row + 1] = cells.join(",");
  }
  return { csv: lines.join("\n") + "\n", ids };
}

Deno.test("review finds every planted underpaid person and costs their shortfalls", async () => {
  const { csv, ids } = plantedTable();
  const table = loadTable(csv, { target: "base_pay_eur", file: "planted.csv" });
  const review = await payReview(table, {
    target: "base_pay_eur",
    within: ["job_family"],
    trees: 100,
  });
  assert.equal(review.idColumn, "employee_id");
  assert.ok(!review.features.includes("gender"), "protected attribute left out");
  const byId = new Map(review.people.map((p) => [p.id, p]));
  for (const id of ids) {
    const person = byId.get(id)!;
    assert.equal(person.status, "under", `${id}: ${JSON.stringify(person)}`);
    assert.ok(person.estimate! > person.pay / 0.75 * 0.85, `${id}: estimate not pulled down`);
    assert.ok(Math.abs(person.shortfall - (person.low! - person.pay)) < 1e-9);
  }
  // Everyone's status agrees with their pay and range.
  for (const p of review.people) {
    if (p.status === null) continue;
    assert.equal(p.status, p.pay < p.low! ? "under" : p.pay > p.high! ? "over" : "within");
    assert.ok(Math.abs(p.position! - (p.pay - p.low!) / (p.high! - p.low!)) < 1e-12);
  }
  // The total cost is the sum of the listed shortfalls; the categories add up to it.
  const under = review.people.filter((p) => p.status === "under");
  assert.ok(!review.overall.suppressed);
  if (!review.overall.suppressed) {
    const sum = under.reduce((s, p) => s + p.shortfall, 0);
    assert.ok(Math.abs(review.overall.cost - sum) < 1e-6 * sum);
    assert.equal(review.overall.under, under.length);
    const categories = review.categories.flatMap((c) => (c.suppressed ? [] : [c]));
    assert.equal(categories.length, 6);
    const costs = categories.reduce((s, c) => s + c.cost, 0);
    assert.ok(Math.abs(costs - sum) < 1e-6 * sum);
  }
  // A 90% range leaves about 5% under it; the planted twelve come on top.
  assert.ok(under.length > 12 && under.length < 0.1 * review.people.length, `${under.length}`);
});

// The hand table (tests/lib/gap/_hand_table.ts): 39 invented people, family
// Kiln has two women.
Deno.test("a review with few trees: people every tree drew get no estimate; small categories withheld", async () => {
  const table = loadTable(HAND_TABLE, { target: "pay", file: "hand.csv" });
  const trees = 5;
  const review = await payReview(table, {
    target: "pay",
    within: ["family", "gender"],
    trees,
    minLeaf: 3,
    workers: 1,
  });
  // Which people every tree drew, from the resamples keyed by seed 1 and log pay.
  const logPay = Float64Array.from(
    HAND_TABLE.trim().split("\n").slice(1),
    (line) => Math.log(Number(line.split(",")[4])),
  );
  const states = resampleStates(1, logPay, trees);
  const drawnByAll = Array.from(
    logPay,
    (_, r) =>
      Array.from({ length: trees }, (_, b) => bootstrapCounts(39, states, b)[r]).every((c) =>
        c > 0
      ),
  );
  assert(drawnByAll.some(Boolean), "some person is in every resample");
  review.people.forEach((p, r) => {
    assert.equal(p.estimate === null, drawnByAll[r], p.id);
    if (p.estimate === null) {
      assert.equal(p.status, null);
      assert.equal(p.shortfall, 0);
    }
  });
  // Kiln / Woman has 2 people: withheld for itself, and one more category with it.
  const hidden = review.categories.filter((c) => c.suppressed).map((c) => c.name);
  assert.equal(hidden.length, 2);
  assert(hidden.includes("Kiln / Woman"));
  assert.equal(review.overall.suppressed, false);
  // The notes are data: the category named as too few, the other withheld beside it.
  const tooFew = review.notes.find((n) => n.kind === "categoriesTooFew");
  assert(tooFew?.kind === "categoriesTooFew" && tooFew.categories.includes("Kiln / Woman"));
  assert.equal(tooFew.categories.length + tooFew.alsoWithheld.length, 2);
  // 39 people, fewer than 100: the ranges are said to need care.
  const fragile = review.notes.find((n) => n.kind === "fragileRanges");
  assert(fragile?.kind === "fragileRanges" && fragile.people === 39);
});

Deno.test("review refusals name what they refuse", async () => {
  const table = loadTable(HAND_TABLE, { target: "pay" });
  await assert.rejects(
    payReview(table, { target: "pay", coverage: 1 }),
    (e: Error) => e instanceof OptionError && e.message.includes("1"),
  );
  // The answers' bounds: a 30% range is refused as estimate refuses it.
  await assert.rejects(
    payReview(table, { target: "pay", coverage: 0.3 }),
    (e: Error) => e instanceof OptionError && /between 0\.5 and 0\.99, got 0\.3/.test(e.message),
  );
  const byFamily = loadTable(HAND_TABLE, { target: "family" });
  await assert.rejects(
    payReview(byFamily, { target: "family" }),
    (e: Error) => e instanceof OptionError && e.message.includes('"family"'),
  );
  await assert.rejects(
    payReview(table, { target: "pay", drop: ["family", "years"] }),
    OptionError,
  );
  await assert.rejects(
    payReview(table, { target: "pay", minLeaf: 30 }),
    (e: Error) => e instanceof DataError && e.message.includes("39") && e.message.includes("60"),
  );
});
