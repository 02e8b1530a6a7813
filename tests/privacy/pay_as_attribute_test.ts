// A model of something else (a level, a rating) must not keep anyone's pay
// either: with pay as an attribute, its split points lay halfway between
// two people's pay and its ranges were the lowest and highest pay (an
// attack found the top earners' pay and each level's exact lowest and
// highest). Pay columns are never attributes; the file is scanned for
// every number in it, plain or in its base64 arrays, and none may be a
// person's pay, nor halfway between two people's. Demo table (invented).
import assert from "node:assert/strict";
import { fitModel, loadTable, modelToText, OptionError } from "../../mod.ts";

const CSV = await Deno.readTextFile(
  new URL("../../fixtures/demo_company.csv", import.meta.url).pathname,
);
const table = loadTable(CSV, { target: "base_pay_eur" });
const pay = (table.columns.find((c) => c.name === "base_pay_eur") as { values: Float64Array })
  .values;

function numbersIn(text: string): Set<number> {
  const numbers = new Set<number>();
  JSON.stringify(JSON.parse(text), (_k, v) => {
    if (typeof v === "number") numbers.add(v);
    if (typeof v === "string" && v.length >= 12 && /^[A-Za-z0-9+/]+=*$/.test(v)) {
      const bytes = Uint8Array.from(atob(v), (c) => c.charCodeAt(0));
      if (bytes.length % 8 === 0) {
        for (const x of new Float64Array(bytes.buffer)) numbers.add(x);
      }
    }
    return v;
  });
  return numbers;
}

for (const target of ["level", "performance_rating"]) {
  Deno.test(`a model of ${target} keeps no one's pay, not even in its split points`, async () => {
    const model = await fitModel(table, { target, trees: 20, folds: 3, workers: 1 });
    assert.ok(!model.features.some((f) => f.name === "base_pay_eur"));
    assert.equal(model.dropped.find((d) => d.name === "base_pay_eur")?.reason, "pay");
    const numbers = numbersIn(modelToText(model));
    const sorted = [...new Set(pay)].sort((a, b) => a - b);
    const exposed = sorted.filter((p) => numbers.has(p));
    const midpoints = sorted.slice(1).map((p, i) => sorted[i] / 2 + p / 2).filter((m) =>
      numbers.has(m)
    );
    assert.deepEqual(exposed.filter((p) => p > 1000), [], "a person's pay is in the file");
    assert.deepEqual(midpoints.filter((p) => p > 1000), [], "a split point between two pays");
  });
}

Deno.test("pay named as an attribute is refused with the reason", async () => {
  await assert.rejects(
    () => fitModel(table, { target: "level", features: ["base_pay_eur", "job_family"] }),
    (e) =>
      e instanceof OptionError &&
      /"base_pay_eur" is pay; pay is never an attribute/.test(e.message),
  );
});

Deno.test("copies of pay under other names are left out too (names an outside trial used)", async () => {
  // Each name once slipped past the pay-word list; "stipend", "paid" and
  // "eur" name no pay word and are caught by their values (a correlation
  // of at least 0.99 with the pay being modelled).
  const names = [
    "Gehalt",
    "gross_eur",
    "total_cash",
    "OTE",
    "CTC",
    "salary2024",
    "annual_base",
    "pay2024",
    "Brutto",
    "prior_year_base",
    "salario",
    "stipend",
    "paid",
    "eur",
  ];
  const [head, ...lines] = CSV.trim().split("\n");
  const at = head.split(",").indexOf("base_pay_eur");
  const withCopies = [
    `${head},${names.join(",")}`,
    ...lines.map((l) => `${l}${`,${l.split(",")[at]}`.repeat(names.length)}`),
  ].join("\n");
  const copies = loadTable(withCopies, { target: "base_pay_eur" });
  const model = await fitModel(copies, { target: "base_pay_eur", trees: 5, workers: 1 });
  const features = model.features.map((f) => f.name);
  for (const name of names) assert.ok(!features.includes(name), `${name} is an attribute`);
  assert.deepEqual(
    model.dropped.filter((d) => names.includes(d.name)).map((d) => d.reason),
    names.map(() => "pay"),
  );
});
