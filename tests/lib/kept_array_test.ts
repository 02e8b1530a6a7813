import assert from "node:assert/strict";
import { KeptArray } from "../../lib/kept_array.ts";

Deno.test("a kept array gives views of the length asked, growing only when shorter", () => {
  const kept = new KeptArray((n) => new Int32Array(n));
  const buffers = new Set<ArrayBufferLike>();
  // Lengths as a bagged tree's rows vary from tree to tree.
  for (const length of [0, 630, 612, 640, 655, 700, 10, 640]) {
    const view = kept.view(length);
    assert.equal(view.length, length);
    assert(view instanceof Int32Array);
    buffers.add(view.buffer);
  }
  // Grown at 630 (to 693), at 700 (to 770), and never again: 0 is the first.
  assert.equal(buffers.size, 3);
  assert.equal(kept.view(770).buffer, kept.view(1).buffer);
});

Deno.test("a kept array's view keeps what the last user wrote: users set what they read", () => {
  const kept = new KeptArray((n) => new Float64Array(n));
  kept.view(4).set([1, 2, 3, 4]);
  assert.deepEqual([...kept.view(3)], [1, 2, 3]);
});
