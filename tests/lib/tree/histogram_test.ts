import assert from "node:assert/strict";
import { binFeatures } from "../../../lib/tree/bins.ts";
import { gatherRows } from "../../../lib/tree/grow_rows.ts";
import { Histograms } from "../../../lib/tree/histogram.ts";
import { classification, levels, numeric, regression } from "./_small.ts";

Deno.test("a child's histogram from the parent's minus its sibling's equals one filled from its rows", () => {
  const x = Array.from({ length: 30 }, (_, i) => (i * 7) % 11);
  const site = Array.from({ length: 30 }, (_, i) => (i % 4 === 3 ? NaN : i % 3));
  const y = x.map((v, i) => 40 + v * 2 + (i % 5));
  const d = regression([numeric("x", x), levels("site", site, 3)], y);
  const bins = binFeatures(d);
  const weights = Float64Array.from({ length: 30 }, (_, i) => (i % 6) % 3);
  const rows = gatherRows(d, bins, weights, Int32Array.from({ length: 30 }, (_, i) => i));
  const h = new Histograms(rows, bins, 4);
  const index = Int32Array.from({ length: rows.count }, (_, i) => i);
  const mid = 7;
  const parent = h.acquire(rows.count);
  h.fill(parent, index, 0, rows.count, rows.count);
  const [left, right] = h.children(parent, index, 0, mid, rows.count);
  const direct = h.acquire(rows.count - mid);
  h.fill(direct, index, mid, rows.count, rows.count - mid);
  assert.ok(left !== null && right !== null);
  assert.deepEqual([...right], [...direct]);
  // Row counts per bin add up to the child's rows, feature by feature.
  const countOf = (hist: Float64Array, f: number) => {
    let n = 0;
    for (let b = 0; b <= bins[f].count; b++) n += hist[h.at(f, b)];
    return n;
  };
  assert.equal(countOf(left!, 0), mid);
  assert.equal(countOf(left!, 1), mid);
  assert.equal(countOf(right!, 1), rows.count - mid);
});

Deno.test("class histograms hold each class's weight per bin", () => {
  const d = classification([numeric("x", [1, 1, 2, 2])], [0, 1, 1, 1], 2);
  const bins = binFeatures(d);
  const rows = gatherRows(d, bins, Float64Array.of(1, 2, 1, 1), Int32Array.of(0, 1, 2, 3));
  const h = new Histograms(rows, bins, 4);
  const hist = h.acquire(4);
  h.fill(hist, Int32Array.of(0, 1, 2, 3), 0, 4, 4);
  // Bin 0: rows 0 (class 0, w 1) and 1 (class 1, w 2).
  assert.deepEqual([...hist.subarray(0, 8)], [2, 3, 1, 2, 2, 2, 0, 2]);
});

Deno.test("features with many more bins than a node's rows are left to the sort", () => {
  const x = Array.from({ length: 100 }, (_, i) => i);
  const d = regression([numeric("x", x), levels("two", x.map((v) => v % 2), 2)], x);
  const bins = binFeatures(d);
  const rows = gatherRows(d, bins, new Float64Array(100).fill(1), Int32Array.from(x));
  const h = new Histograms(rows, bins, 4);
  assert.equal(h.isDense(0, 100), true);
  assert.equal(h.isDense(0, 12), false); // 100 bins > 8 x 12
  assert.equal(h.isDense(1, 1), true);
  assert.equal(h.anyDense(1), true);
});
