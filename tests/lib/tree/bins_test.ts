import assert from "node:assert/strict";
import { binFeatures, FEATURE_TOLERANCE, rowMajorBins } from "../../../lib/tree/bins.ts";
import { gatherRows } from "../../../lib/tree/grow_rows.ts";
import { levels, numeric, regression } from "./_small.ts";

Deno.test("numeric values are ranked among their distinct values; missing is the last bin", () => {
  const data = regression([numeric("x", [30, 10, NaN, 20, 10, -5])], [1, 2, 3, 4, 5, 6]);
  const [bins] = binFeatures(data);
  // Distinct values -5, 10, 20, 30: four bins; NaN in bin 4.
  assert.equal(bins.count, 4);
  assert.deepEqual(Array.from(bins.ids), [3, 1, 4, 2, 1, 0]);
  assert.deepEqual(Array.from(bins.lower), [-5, 10, 20, 30]);
  assert.deepEqual(Array.from(bins.upper), [-5, 10, 20, 30]);
  assert.ok(bins.ids instanceof Uint16Array);
});

Deno.test("values within the tolerance of the one before share a bin", () => {
  assert.equal(FEATURE_TOLERANCE, 1e-7);
  const t = FEATURE_TOLERANCE;
  const data = regression([numeric("x", [1, 1 + t / 2, 1 + t, 2, 2 + 3 * t])], [0, 0, 0, 0, 0]);
  const [bins] = binFeatures(data);
  // 1, 1 + t/2 and 1 + t chain into one bin; 2 + 3t is more than t above 2.
  assert.equal(bins.count, 3);
  assert.deepEqual(Array.from(bins.ids), [0, 0, 0, 1, 2]);
  assert.deepEqual(Array.from(bins.lower), [1, 2, 2 + 3 * t]);
  assert.deepEqual(Array.from(bins.upper), [1 + t, 2, 2 + 3 * t]);
});

Deno.test("level features use their codes as bins, every level a bin even if empty", () => {
  const data = regression(
    [levels("site", [2, 0, NaN, 2], 4), levels("grade", [1, 1, 0, 2], 3, "ordinal")],
    [1, 2, 3, 4],
  );
  const [site, grade] = binFeatures(data);
  assert.equal(site.count, 4);
  assert.deepEqual(Array.from(site.ids), [2, 0, 4, 2]);
  assert.deepEqual(Array.from(site.lower), [0, 1, 2, 3]);
  assert.deepEqual(Array.from(site.upper), [0, 1, 2, 3]);
  assert.deepEqual(Array.from(grade.ids), [1, 1, 0, 2]);
});

Deno.test("all missing, one row and no row", () => {
  const [missing] = binFeatures(regression([numeric("x", [NaN, NaN])], [1, 2]));
  assert.equal(missing.count, 0);
  assert.deepEqual(Array.from(missing.ids), [0, 0]);
  const [one] = binFeatures(regression([numeric("x", [7])], [1]));
  assert.equal(one.count, 1);
  assert.deepEqual(Array.from(one.ids), [0]);
  const [none] = binFeatures(regression([numeric("x", [])], []));
  assert.equal(none.count, 0);
  assert.equal(none.ids.length, 0);
});

Deno.test("more than 65,535 distinct values take 32-bit bin ids", () => {
  const values = Array.from({ length: 70_000 }, (_, i) => i * 0.5);
  const [bins] = binFeatures(regression([numeric("x", values)], new Array(70_000).fill(0)));
  assert.ok(bins.ids instanceof Uint32Array);
  assert.equal(bins.count, 70_000);
  assert.equal(bins.ids[69_999], 69_999);
});

// A second implementation: rank by sorting distinct values, checked on a few hundred values
// with many ties.
Deno.test("bin ids agree with ranks among the distinct values", () => {
  const values = Array.from({ length: 500 }, (_, i) => ((i * 7919) % 97) / 4 - 10);
  const [bins] = binFeatures(regression([numeric("x", values)], new Array(500).fill(0)));
  const distinct = [...new Set(values)].sort((a, b) => a - b);
  assert.equal(bins.count, distinct.length);
  values.forEach((v, r) => assert.equal(bins.ids[r], distinct.indexOf(v)));
});

Deno.test("rowMajorBins lays out each row's bins side by side, shifted by offsets, cached", () => {
  const data = regression([numeric("x", [5, 1, NaN]), levels("site", [1, 0, 1], 2)], [1, 2, 3]);
  const bins = binFeatures(data);
  // x has bins {1, 5} + missing (3 slots); site starts at offset 3.
  const offsets = Int32Array.of(0, 3);
  const flat = rowMajorBins(bins, 3, offsets);
  assert.deepEqual(Array.from(flat), [1, 3 + 1, 0, 3 + 0, 2, 3 + 1]);
  assert.equal(rowMajorBins(bins, 3, offsets), flat);
  // Another set of bins is laid out anew.
  assert.notEqual(rowMajorBins(binFeatures(data), 3, offsets), flat);
});

Deno.test("row-major bin ids take the narrowest array that holds the largest id, values unchanged", () => {
  // Two features: 40 levels (41 slots with missing) and a numeric one of n
  // distinct values (n + 1 slots): ids up to 41 + n.
  for (
    const [n, kind] of [[214, Uint8Array], [215, Uint16Array], [65_494, Uint16Array], [
      65_495,
      Uint32Array,
    ]] as const
  ) {
    const rows = n + 1;
    const values = Array.from({ length: rows }, (_, r) => (r < n ? r : NaN));
    const site = Array.from({ length: rows }, (_, r) => r % 40);
    const data = regression(
      [levels("site", site, 40), numeric("x", values)],
      new Array(rows).fill(1),
    );
    const bins = binFeatures(data);
    const offsets = Int32Array.of(0, 41, 41 + n + 1);
    const flat = rowMajorBins(bins, rows, offsets);
    assert.ok(flat instanceof kind, `${n} values: ${flat.constructor.name}`);
    // The last row's x is missing: the largest id, n slots after x's first.
    assert.equal(flat[2 * rows - 1], 41 + n);
    const local = gatherRows(
      data,
      bins,
      new Float64Array(rows).fill(1),
      Int32Array.from({ length: rows }, (_, r) => r),
    );
    assert.ok(local.bins instanceof kind);
    assert.deepEqual(Array.from(local.bins), Array.from(flat));
  }
});
