// The rows' bin orders handed down the tree (bin_orders.ts) must give the
// trees that sorting every sparse node afresh gives, bit for bit: tables of
// many-valued numeric features, categorical features of many levels (so that
// small nodes go through rows, not histograms), missing values, bootstrap
// weights, regression and classes, every stopping rule. The split itself is a
// stable partition, checked against a filter.
import assert from "node:assert/strict";
import fc from "fast-check";
import type { Dataset, Feature } from "../../../lib/dataset/types.ts";
import { binFeatures } from "../../../lib/tree/bins.ts";
import { growTree } from "../../../lib/tree/grow_tree.ts";
import { Splitter } from "../../../lib/tree/splitter.ts";
import { BinOrders, KEPT_FEATURES } from "../../../lib/tree/bin_orders.ts";

Deno.test("BinOrders.split: each order's left rows, then its right rows, each in order", () => {
  fc.assert(
    fc.property(
      fc.integer({ min: 1, max: 60 }).chain((rows) =>
        fc.record({
          rows: fc.constant(rows),
          orders: fc.array(fc.shuffledSubarray([...Array(rows).keys()], { minLength: rows }), {
            minLength: 1,
            maxLength: 3,
          }),
          left: fc.array(fc.boolean(), { minLength: rows, maxLength: rows }),
          start: fc.nat(rows - 1),
        })
      ),
      ({ rows, orders, left, start }) => {
        // The node is [start, rows): its rows are those the orders hold there.
        const node = new Set(orders[0].slice(start));
        const sorted = orders.map((o, f) =>
          f === 0 ? o : [
            ...o.slice(0, start),
            ...o.slice(start).filter((r) => node.has(r)),
            ...[...node].filter((r) => !o.slice(start).includes(r)),
          ].slice(0, rows)
        );
        // Only orders holding the same rows in [start, rows) take part.
        const same = sorted.filter((o) =>
          o.slice(start).every((r) => node.has(r)) && new Set(o.slice(start)).size === node.size
        );
        const binOrders = new BinOrders(rows, same.length);
        same.forEach((o, f) => binOrders.order(f).set(o));
        const nodeRows = [...node].sort((a, b) => a - b);
        const index = Int32Array.from([
          ...Array(start).fill(0),
          ...nodeRows.filter((r) => left[r]),
          ...nodeRows.filter((r) => !left[r]),
        ]);
        const mid = start + nodeRows.filter((r) => left[r]).length;
        const mask = (1 << same.length) - 1;
        binOrders.split(mask, index, new Int32Array(rows), start, mid, rows);
        same.forEach((o, f) => {
          const tail = o.slice(start);
          assert.deepEqual(
            [...binOrders.order(f)],
            [...o.slice(0, start), ...tail.filter((r) => left[r]), ...tail.filter((r) => !left[r])],
          );
        });
      },
    ),
    { numRuns: 300, seed: 12 },
  );
  assert.equal(KEPT_FEATURES, 31);
});

interface Table {
  dataset: Dataset;
  weights: Float64Array;
  minLeaf: number;
  maxDepth: number;
}

// Invented tables: numeric features of many distinct values (ties and
// missing values among them), a categorical one of up to 300 levels, an
// ordinal one; pay or a class; whole bootstrap-like weights with zeros.
const tables: fc.Arbitrary<Table> = fc.record({
  rows: fc.integer({ min: 20, max: 400 }),
  features: fc.integer({ min: 1, max: 4 }),
  levels: fc.integer({ min: 2, max: 300 }),
  classes: fc.constantFrom(0, 0, 2, 3),
  minLeaf: fc.integer({ min: 1, max: 5 }),
  maxDepth: fc.constantFrom(Infinity, Infinity, 4),
  seed: fc.integer({ min: 1, max: 2 ** 30 }),
}).map((c) => {
  let state = c.seed;
  const next = () => {
    state = (state * 1103515245 + 12345) % 2147483648;
    return state / 2147483648;
  };
  const features: Feature[] = [];
  for (let f = 0; f < c.features; f++) {
    features.push({
      name: `x${f}`,
      kind: "numeric",
      values: Float64Array.from(
        { length: c.rows },
        () => (next() < 0.05 ? NaN : Math.floor(next() * c.rows * (f + 1))),
      ),
    });
  }
  const levels = Array.from({ length: c.levels }, (_, i) => `L${i}`);
  features.push({
    name: "site",
    kind: "categorical",
    levels,
    values: Float64Array.from(
      { length: c.rows },
      () => (next() < 0.03 ? NaN : Math.floor(next() * c.levels)),
    ),
  });
  features.push({
    name: "grade",
    kind: "ordinal",
    levels: levels.slice(0, Math.min(40, c.levels)),
    values: Float64Array.from(
      { length: c.rows },
      () => Math.floor(next() * Math.min(40, c.levels)),
    ),
  });
  const pay = Float64Array.from(
    { length: c.rows },
    (_, r) =>
      10 + (Number.isNaN(features[0].values[r]) ? 0 : features[0].values[r] / c.rows) +
      ((features.at(-2)!.values[r] || 0) % 7) / 10 + next(),
  );
  const target: Dataset["target"] = c.classes === 0
    ? { kind: "regression", name: "pay", values: pay }
    : {
      kind: "classification",
      name: "band",
      classes: Array.from({ length: c.classes }, (_, k) => `b${k}`),
      values: Int32Array.from(
        pay,
        (v) => Math.min(c.classes - 1, Math.floor((v - 10) * c.classes / 3)),
      ),
    };
  const weights = Float64Array.from({ length: c.rows }, () => Math.floor(next() * 3));
  weights[0] = 1;
  return {
    dataset: { rows: c.rows, features, target },
    weights,
    minLeaf: c.minLeaf,
    maxDepth: c.maxDepth,
  };
});

Deno.test("trees grown with bin orders handed down are those of sorting every node afresh", () => {
  const find = Splitter.prototype.find;
  let handedDown = 0;
  fc.assert(
    fc.property(tables, ({ dataset, weights, minLeaf, maxDepth }) => {
      const bins = binFeatures(dataset);
      const input = { dataset, bins, weights };
      const options = { minLeaf, maxDepth };
      // Counts the searches given an order from above.
      Splitter.prototype.find = function (this: Splitter, index, start, end, hist, ordered = 0) {
        if (ordered !== 0) handedDown++;
        return find.call(this, index, start, end, hist, ordered);
      };
      let kept;
      try {
        kept = growTree(input, options);
      } finally {
        Splitter.prototype.find = find;
      }
      // Every search told that no order is known: each sorts afresh.
      Splitter.prototype.find = function (this: Splitter, index, start, end, hist) {
        return find.call(this, index, start, end, hist, 0);
      };
      let fresh;
      try {
        fresh = growTree(input, options);
      } finally {
        Splitter.prototype.find = find;
      }
      assert.deepEqual(kept, fresh);
    }),
    { numRuns: 250, seed: 7 },
  );
  // The orders were handed down, not merely made.
  assert(handedDown > 1000, `only ${handedDown} searches were given an order`);
});
