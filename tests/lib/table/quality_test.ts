import assert from "node:assert/strict";
import fc from "fast-check";
import { loadTable, quantile } from "../../../mod.ts";
import { selectQuantile } from "../../../lib/table/quality.ts";

const rows = (header: string, values: string[]) => [header, ...values].join("\n") + "\n";
const range = (n: number, f: (i: number) => string) => Array.from({ length: n }, (_, i) => f(i));

function warning(csv: string, kind: string) {
  const types = csv.startsWith("id,") ? { id: "identifier" as const } : undefined;
  return loadTable(csv, { types }).warnings.find((w) => w.kind === kind);
}

// R's quantile(c(1, 2, 4, 8), 0.25) is 1.75 (type 7, R's default).
Deno.test("quantile interpolates like R's default (type 7)", () => {
  assert.equal(quantile([1, 2, 4, 8], 0.25), 1.75);
  assert.equal(quantile([1, 2, 4, 8], 0.5), 3);
  assert.equal(quantile([5], 0.9), 5);
});

Deno.test("duplicate identifiers are reported with their lines", () => {
  const csv = rows("id,salary", ["a1,50000", "a2,51000", "a1,52000", "a3,53000", "a2,54000"]);
  const found = warning(csv, "duplicate-identifier");
  assert.deepEqual(found?.lines, [4, 6]);
  assert.equal(found?.count, 2);
  assert.equal(found?.message, '"id": 2 identifiers repeat an earlier row (lines 4, 6)');
});

Deno.test("duplicate rows are reported", () => {
  const csv = rows("site,salary", ["A,50000", "B,51000", "A,50000", "C,52000"]);
  const found = warning(csv, "duplicate-row");
  assert.deepEqual(found?.lines, [4]);
  assert.equal(found?.count, 1);
});

Deno.test("a pay value 1,000x or 12x below the median is flagged as a unit slip", () => {
  const values = range(40, (i) => String(80000 + 500 * i));
  values.push("85", "7200");
  const found = warning(rows("salary", values), "unit-slip");
  assert.equal(found?.count, 2);
  assert.deepEqual(found?.lines, [42, 43]);
  // Weekly pay with a wide but ordinary spread has no slip.
  const weekly = range(40, (i) => String(60 + 25 * i));
  assert.equal(warning(rows("wage", weekly), "unit-slip"), undefined);
});

Deno.test("zero or negative pay is flagged", () => {
  const found = warning(rows("salary", ["50000", "0", "61000", "-10"]), "non-positive-pay");
  assert.deepEqual(found?.lines, [3, 5]);
  assert.equal(found?.message, '"salary": 2 values are zero or negative (lines 3, 5)');
});

Deno.test("far-out values are flagged beyond 3 IQR of the quartiles", () => {
  // Values 1..20, 47, 60: quartiles 6.25 and 16.75 (type 7), IQR 10.5,
  // fences -25.25 and 48.25: only 60 lies beyond.
  const values = range(20, (i) => String(i + 1));
  values.push("47", "60");
  const found = warning(rows("tenure", values), "outlier");
  assert.equal(found?.count, 1);
  assert.deepEqual(found?.lines, [23]);
  // Tenure is never negative: the fence of -25.25 is not said.
  assert.match(found!.message, /far from the rest, above 48\.25 \(line 23\)/);
  // With a negative value in the column, both fences are.
  const signed = warning(rows("change", [...values.slice(0, 21), "-1", "60"]), "outlier");
  assert.match(signed!.message, /below -2\d\.\d+ or above 4\d\.\d+/);
});

Deno.test("clean data has no warnings", () => {
  const csv = rows("id,salary", range(30, (i) => `e${i},${60000 + 1000 * i}`));
  assert.deepEqual(loadTable(csv).warnings, []);
});

// Selection must give quantile() of the sorted values to the last bit: the
// fences and medians in every warning come from it.
Deno.test("selectQuantile is quantile of the sorted values, on repeats, zeros of both signs and sorted runs", () => {
  const sortedQuantile = (values: Float64Array, q: number, map?: (v: number) => number) => {
    const sorted = values.slice().sort();
    return quantile(map ? sorted.map(map) : sorted, q);
  };
  fc.assert(
    fc.property(
      fc.array(
        fc.oneof(
          fc.double({ noNaN: true }),
          fc.integer({ min: -3, max: 3 }),
          fc.constantFrom(0, -0, 1e-300, Infinity, -Infinity),
        ),
        { minLength: 1, maxLength: 300 },
      ),
      fc.constantFrom(0, 0.25, 0.5, 0.75, 1, 0.1),
      fc.constantFrom("shuffled", "ascending", "descending"),
      (list, q, order) => {
        const values = Float64Array.from(list);
        if (order === "ascending") values.sort();
        if (order === "descending") values.sort().reverse();
        const expected = sortedQuantile(values, q);
        assert.ok(Object.is(selectQuantile(values.slice(), q), expected), `${q} of ${list}`);
        const positive = values.filter((v) => v > 0);
        if (positive.length > 0) {
          assert.ok(
            Object.is(
              selectQuantile(positive.slice(), q, Math.log),
              sortedQuantile(positive, q, Math.log),
            ),
          );
        }
      },
    ),
    { seed: 21, numRuns: 600 },
  );
  // A million values of eleven repeats (a 0..10 count column), selection in place.
  const counts = Float64Array.from({ length: 1_000_000 }, (_, i) => (i * 7919) % 11);
  assert.equal(selectQuantile(counts.slice(), 0.25), 2);
  assert.equal(selectQuantile(counts.slice(), 0.75), 8);
  assert.throws(() => selectQuantile(new Float64Array(0), 0.5), RangeError);
});
