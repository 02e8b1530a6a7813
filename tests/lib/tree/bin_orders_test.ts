// The rows' bin orders handed down the tree (bin_orders.ts) must give the
// trees that sorting every sparse node afresh gives, bit for bit: tables of
// many-valued numeric features, categorical features of many levels (so that
// small nodes go through rows, not histograms), missing values, bootstrap
// weights, regression and classes, every stopping rule. The split itself is a
// stable partition, checked against a filter.
import assert from "node:assert/strict";
import fc from "fast-check";
import { binFeatures } from "../../../lib/tree/bins.ts";
import { growTree } from "../../../lib/tree/grow_tree.ts";
import { Splitter } from "../../../lib/tree/splitter.ts";
import { BinOrders, KEPT_FEATURES } from "../../../lib/tree/bin_orders.ts";
import { tables } from "./_random_tables.ts";

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
