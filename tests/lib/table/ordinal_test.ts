import assert from "node:assert/strict";
import { LADDER, ladderOrder } from "../../../lib/table/ordinal.ts";

Deno.test("LADDER takes 1 to 3 letters, an optional space, _ or -, then 1 or 2 digits", () => {
  const parts = (text: string) => LADDER.exec(text)?.slice(1) ?? null;
  assert.deepEqual(parts("L1"), ["L", "1"]);
  assert.deepEqual(parts("IC 4"), ["IC", "4"]);
  assert.deepEqual(parts("abc_12"), ["abc", "12"]);
  assert.deepEqual(parts("P-07"), ["P", "07"]);
  for (const text of ["L", "12", "ABCD1", "L123", "L 1 ", " L1", "L  1", "É1", "L1a", "L+1", ""]) {
    assert.equal(parts(text), null, JSON.stringify(text));
  }
});

Deno.test("a ladder is ordered by number, not by text", () => {
  assert.deepEqual(ladderOrder(["L10", "L2", "L1", "L9"]), ["L1", "L2", "L9", "L10"]);
  assert.deepEqual(ladderOrder(["IC 4", "IC 1", "IC 3"]), ["IC 1", "IC 3", "IC 4"]);
  // The prefix is compared without case; each level keeps its own spelling.
  assert.deepEqual(ladderOrder(["p2", "P1"]), ["P1", "p2"]);
  // Leading zeros are the same number as without.
  assert.deepEqual(ladderOrder(["G07", "G10", "G8"]), ["G07", "G8", "G10"]);
});

Deno.test("fewer than two levels, mixed prefixes, repeated numbers or words are no ladder", () => {
  assert.equal(ladderOrder([]), undefined);
  assert.equal(ladderOrder(["L1"]), undefined);
  assert.equal(ladderOrder(["L1", "M2"]), undefined);
  assert.equal(ladderOrder(["L1", "L01"]), undefined);
  assert.equal(ladderOrder(["L1", "Senior"]), undefined);
  assert.equal(ladderOrder(["Junior", "Senior"]), undefined);
  assert.equal(ladderOrder(["L1", "L2", "L100"]), undefined);
});

Deno.test("the levels given are not reordered in place", () => {
  const levels = ["L3", "L1", "L2"];
  assert.deepEqual(ladderOrder(levels), ["L1", "L2", "L3"]);
  assert.deepEqual(levels, ["L3", "L1", "L2"]);
});
