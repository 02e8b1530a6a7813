import assert from "node:assert/strict";
import fc from "fast-check";
import { binFeatures } from "../../../lib/tree/bins.ts";
import { canonicalRowOrder } from "../../../lib/tree/grow_tree.ts";
import { gatherRows, RowBuffers } from "../../../lib/tree/grow_rows.ts";
import { classification, levels, numeric, regression } from "./_small.ts";
import { tables } from "./_random_tables.ts";

Deno.test("rows of weight 0 are left out; the rest follow the canonical order with their bins", () => {
  const d = regression(
    [numeric("x", [10, 20, 30, 40, 50]), levels("site", [1, 0, NaN, 1, 0], 2)],
    [5, 1, 4, 2, 3],
  );
  const bins = binFeatures(d);
  const order = canonicalRowOrder(d); // by target: rows 1, 3, 4, 2, 0
  assert.deepEqual([...order], [1, 3, 4, 2, 0]);
  const rows = gatherRows(d, bins, Float64Array.of(1, 0, 2, 1, 3), order);
  assert.equal(rows.count, 4);
  // Kept rows in order: 3, 4, 2, 0.
  assert.deepEqual([...rows.target], [2, 3, 4, 5]);
  assert.deepEqual([...rows.weight], [1, 3, 2, 1]);
  assert.equal(rows.totalWeight, 7);
  // x has 5 bins + missing (offsets 0, 6); site 2 levels + missing (offset 6).
  assert.deepEqual([...rows.offsets], [0, 6, 9]);
  assert.deepEqual([...rows.bins], [3, 7, 4, 6, 2, 8, 0, 7]);
  assert.deepEqual([...rows.moments.subarray(3, 6)], [3, 9, 27]);
});

Deno.test("class targets keep each row's class and no moments", () => {
  const d = classification([numeric("x", [1, 2, 3])], [2, 0, 1], 3);
  const rows = gatherRows(d, binFeatures(d), Float64Array.of(1, 1, 1), Int32Array.of(0, 1, 2));
  assert.deepEqual([...rows.classOf], [2, 0, 1]);
  assert.equal(rows.moments.length, 0);
  assert.equal(rows.target.length, 0);
});

Deno.test("bad weights, targets and orders are refused with the row named", () => {
  const d = regression([numeric("x", [1, 2])], [1, 2]);
  const bins = binFeatures(d);
  const order = Int32Array.of(0, 1);
  assert.throws(
    () => gatherRows(d, bins, Float64Array.of(1), order),
    /weights has 1 entries for 2 rows/,
  );
  assert.throws(() => gatherRows(d, bins, Float64Array.of(1, -1), order), /weight of row 1 is -1/);
  assert.throws(
    () => gatherRows(d, bins, Float64Array.of(1, Infinity), order),
    /weight of row 1 is Infinity/,
  );
  assert.throws(
    () => gatherRows(d, bins, Float64Array.of(1, 1), Int32Array.of(0)),
    /order has 1 entries/,
  );
  const bad = regression([numeric("x", [1, 2])], [1, NaN]);
  assert.throws(
    () => gatherRows(bad, bins, Float64Array.of(1, 1), order),
    /target of row 1 is NaN/,
  );
});

Deno.test("gathering into kept buffers gives the rows new arrays give, table after table", () => {
  const buffers = new RowBuffers();
  let grown = 0;
  let previous = buffers.weight;
  fc.assert(
    fc.property(tables, ({ dataset, weights }) => {
      const bins = binFeatures(dataset);
      const order = canonicalRowOrder(dataset);
      const kept = gatherRows(dataset, bins, weights, order, buffers);
      assert.deepEqual(kept, gatherRows(dataset, bins, weights, order));
      if (buffers.weight !== previous) grown++;
      previous = buffers.weight;
    }),
    { numRuns: 120, seed: 3 },
  );
  // Most tables fit in the buffers an earlier one left; some need more.
  assert(grown > 1 && grown < 60, `buffers grown ${grown} times`);
});
