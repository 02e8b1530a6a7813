// The splitter's answers against brute force written here: for a numeric
// target, the best split of a categorical feature is the best of all
// subsets of its levels (Breiman et al. 1984, Thm 4.5: found by ordering
// levels by mean), whether the levels are ordered by insertion (up to 32)
// or by the general sort; the sorted-bins path finds what the histogram
// path finds.
import assert from "node:assert/strict";
import { makeRng } from "../../../lib/random.ts";
import { binFeatures } from "../../../lib/tree/bins.ts";
import { SquaredError } from "../../../lib/tree/criterion.ts";
import { gatherRows } from "../../../lib/tree/grow_rows.ts";
import { Histograms } from "../../../lib/tree/histogram.ts";
import { Splitter } from "../../../lib/tree/splitter.ts";
import type { Dataset } from "../../../mod.ts";
import { levels, numeric, regression } from "./_small.ts";

function splitterOf(d: Dataset, minLeaf = 1) {
  const bins = binFeatures(d);
  const rows = gatherRows(
    d,
    bins,
    new Float64Array(d.rows).fill(1),
    Int32Array.from({ length: d.rows }, (_, i) => i),
  );
  const histograms = new Histograms(rows, bins, 4);
  const splitter = new Splitter(
    rows,
    bins,
    d.features.map((f) => f.kind),
    histograms,
    new SquaredError(),
    minLeaf,
  );
  const index = Int32Array.from({ length: rows.count }, (_, i) => i);
  const hist = histograms.acquire(rows.count);
  histograms.fill(hist, index, 0, rows.count, rows.count);
  return { splitter, index, hist, rows };
}

// Squared error of the best split of `levelCount` levels, trying the
// prefix splits of the levels sorted by mean (exact by Fisher's result),
// computed from scratch.
function bestByMeans(codes: number[], y: number[], levelCount: number): number {
  const sum = new Array(levelCount).fill(0);
  const n = new Array(levelCount).fill(0);
  codes.forEach((c, i) => {
    sum[c] += y[i];
    n[c]++;
  });
  const present = [...Array(levelCount).keys()].filter((l) => n[l] > 0);
  present.sort((a, b) => sum[a] / n[a] - sum[b] / n[b] || a - b);
  let best = Infinity;
  for (let cut = 1; cut < present.length; cut++) {
    const left = new Set(present.slice(0, cut));
    const sse = (keep: (c: number) => boolean) => {
      const part = y.filter((_, i) => keep(codes[i]));
      const mean = part.reduce((a, b) => a + b, 0) / part.length;
      return part.reduce((a, v) => a + (v - mean) ** 2, 0);
    };
    best = Math.min(best, sse((c) => left.has(c)) + sse((c) => !left.has(c)));
  }
  return best;
}

for (const levelCount of [9, 31, 33, 60]) {
  Deno.test(`${levelCount} levels: the split found is the best subset split (${levelCount <= 32 ? "insertion" : "general"} sort)`, () => {
    const rng = makeRng(levelCount);
    const codes = Array.from({ length: 400 }, (_, i) => i % levelCount);
    const y = codes.map((c) => 50 + ((c * 37) % 17) + rng.next() * 3);
    const d = regression([levels("team", codes, levelCount)], y);
    const { splitter, index, hist } = splitterOf(d);
    assert.ok(splitter.find(index, 0, d.rows, hist));
    const left = new Set(splitter.choice.leftBins);
    assert.equal(left.size + splitter.choice.rightBins.length, levelCount);
    const sse = (keep: (c: number) => boolean) => {
      const part = y.filter((_, i) => keep(codes[i]));
      const mean = part.reduce((a, b) => a + b, 0) / part.length;
      return part.reduce((a, v) => a + (v - mean) ** 2, 0);
    };
    const found = sse((c) => left.has(c)) + sse((c) => !left.has(c));
    const best = bestByMeans(codes, y, levelCount);
    assert.ok(Math.abs(found - best) <= 1e-9 * best, `${found} vs ${best}`);
  });
}

Deno.test("9 levels by brute force over all 256 subsets agrees with the ordered scan", () => {
  const codes = Array.from({ length: 90 }, (_, i) => (i * 5) % 9);
  const y = codes.map((c, i) => [3, 9, 1, 7, 7, 2, 8, 4, 6][c] + (i % 3) * 0.1);
  const { splitter, index, hist } = splitterOf(regression([levels("grade", codes, 9)], y));
  assert.ok(splitter.find(index, 0, 90, hist));
  const sse = (keep: (c: number) => boolean) => {
    const part = y.filter((_, i) => keep(codes[i]));
    const mean = part.reduce((a, b) => a + b, 0) / part.length;
    return part.reduce((a, v) => a + (v - mean) ** 2, 0);
  };
  let brute = Infinity;
  for (let mask = 1; mask < 256; mask++) {
    brute = Math.min(
      brute,
      sse((c) => c < 8 && ((mask >> c) & 1) === 1) +
        sse((c) => !(c < 8 && ((mask >> c) & 1) === 1)),
    );
  }
  const left = new Set(splitter.choice.leftBins);
  const found = sse((c) => left.has(c)) + sse((c) => !left.has(c));
  assert.ok(Math.abs(found - brute) <= 1e-9 * brute);
});

Deno.test("the sorted-bins path (no histogram) finds the same split as the histogram path", () => {
  const x = Array.from({ length: 200 }, (_, i) => (i * 71) % 200 + (i % 2 ? NaN : 0));
  const y = x.map((v, i) => (Number.isNaN(v) ? 60 : v > 120 ? 90 : 40) + (i % 7));
  const d = regression([numeric("years", x)], y);
  const a = splitterOf(d, 3);
  assert.ok(a.splitter.find(a.index, 0, d.rows, a.hist));
  const withHist = { ...a.splitter.choice };
  const b = splitterOf(d, 3);
  assert.ok(b.splitter.find(b.index, 0, d.rows, null));
  assert.deepEqual({ ...b.splitter.choice }, withHist);
  assert.notEqual(withHist.missing, "heavier"); // the node has missing values
});

Deno.test("missing values: the better side is taken; a node without any leaves it to the builder", () => {
  // Missing rows are paid like the high group: they go right with it.
  const x = [1, 2, 3, 4, 5, 6, NaN, NaN];
  const y = [10, 10, 10, 30, 30, 30, 30, 30];
  const s = splitterOf(regression([numeric("x", x)], y));
  assert.ok(s.splitter.find(s.index, 0, 8, s.hist));
  assert.equal(s.splitter.choice.threshold, 3.5);
  assert.equal(s.splitter.choice.missing, "right");
  const none = splitterOf(regression([numeric("x", [1, 2, 3, 4])], [1, 1, 5, 5]));
  assert.ok(none.splitter.find(none.index, 0, 4, none.hist));
  assert.equal(none.splitter.choice.missing, "heavier");
  // Known values alike, missing ones different: the known-versus-missing split.
  const kvm = splitterOf(regression([numeric("x", [1, 1, 1, NaN, NaN])], [5, 5, 5, 9, 9]));
  assert.ok(kvm.splitter.find(kvm.index, 0, 5, kvm.hist));
  assert.equal(kvm.splitter.choice.threshold, Infinity);
  assert.equal(kvm.splitter.choice.missing, "right");
});

Deno.test("no split leaves minLeaf rows on both sides: none is found", () => {
  const s = splitterOf(regression([numeric("x", [1, 2, 3])], [1, 2, 3]), 2);
  assert.equal(s.splitter.find(s.index, 0, 3, s.hist), false);
});
