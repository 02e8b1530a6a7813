// The pay review on the invented demo table with planted underpaid people:
// twelve people's pay is cut by 25% (far more than the demo's pay noise at
// any level); the review must find every one of them from out-of-bag
// estimates, and its costs must be the sum of the shortfalls it lists.
import assert from "node:assert/strict";
import { demoCompanyCsv, loadTable, payReview } from "../../../mod.ts";

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
