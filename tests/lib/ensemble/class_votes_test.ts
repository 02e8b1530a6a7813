// A class model's shares for one profile, on two hand-written stumps with
// shares in halves, quarters and eighths (sums exact in binary).
import assert from "node:assert/strict";
import { classVotes } from "../../../lib/ensemble/class_votes.ts";
import { stump } from "./_hand_ensemble.ts";

const TREES = [
  stump(5, [0.5, 0.25, 0.25], [0.125, 0.125, 0.75]),
  stump(3, [0.25, 0.5, 0.25], [0.75, 0, 0.25]),
];

Deno.test("shares are the trees' mean leaf shares, with each tree's kept per class", () => {
  // x = 4: the first stump's left leaf, the second's right one.
  const votes = classVotes(TREES, [4]);
  assert.deepEqual(Array.from(votes.shares), [0.625, 0.125, 0.25]);
  assert.deepEqual(votes.perTree.map((c) => Array.from(c)), [[0.5, 0.75], [0.25, 0], [0.25, 0.25]]);
  assert.equal(votes.best, 0);
  // x = 6: both right leaves; class 2 leads with (0.75 + 0.25) / 2.
  const right = classVotes(TREES, [6]);
  assert.deepEqual(Array.from(right.shares), [0.4375, 0.0625, 0.5]);
  assert.equal(right.best, 2);
});

Deno.test("a tie goes to the lowest class code", () => {
  // x = 2: both left leaves give (0.375, 0.375, 0.25).
  const votes = classVotes(TREES, [2]);
  assert.deepEqual(Array.from(votes.shares), [0.375, 0.375, 0.25]);
  assert.equal(votes.best, 0);
  // One tree alone: its own leaf.
  assert.equal(classVotes([TREES[1]], [2]).best, 1);
});
