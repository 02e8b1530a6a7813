// The trees against the straight line, measure by measure, on figures
// written out so that each gain is plain: 1 - model / line.
import assert from "node:assert/strict";
import type { Accuracy } from "../../../mod.ts";
import { compareWithLine, TIE_SHARE } from "../../../lib/model/line_comparison.ts";

const fig = (rmse: number, mae: number) => ({ rmse, mae, r2: 0 });
const acc = (money: [number, number], log?: [number, number]): Accuracy => ({
  measuredBy: "out-of-bag",
  money: fig(...money),
  ...(log ? { log: fig(...log) } : {}),
});

Deno.test("better on every measure: the model; worse on every one: the line", () => {
  const c = compareWithLine(acc([90, 80], [0.18, 0.15]), null, acc([100, 100], [0.2, 0.2]))!;
  assert.equal(c.who, "ensemble");
  assert.equal(c.verdict, "model");
  assert.deepEqual(c.measures.map((m) => m.measure), ["rmse", "mae", "log-rmse", "log-mae"]);
  // Gains 1 - 90/100, 1 - 80/100, 1 - 0.18/0.2, 1 - 0.15/0.2.
  const gains = c.measures.map((m) => m.gain);
  [0.1, 0.2, 0.1, 0.25].forEach((g, i) => assert(Math.abs(gains[i] - g) < 1e-12));
  assert.deepEqual(c.measures[0], {
    measure: "rmse",
    model: 90,
    line: 100,
    gain: gains[0],
    better: "model",
  });
  const line = compareWithLine(acc([110, 120]), null, acc([100, 100]))!;
  assert.equal(line.verdict, "line");
  assert.equal(line.measures.length, 2);
});

Deno.test("within 1% is a tie; mixed when each wins somewhere; a tie only with a win is the model", () => {
  assert.equal(TIE_SHARE, 0.01);
  // Gains 0.005 and -0.009: both ties.
  const tie = compareWithLine(acc([99.5, 100.9]), null, acc([100, 100]))!;
  assert.deepEqual(tie.measures.map((m) => m.better), ["tie", "tie"]);
  assert.equal(tie.verdict, "tie");
  const mixed = compareWithLine(acc([95, 105]), null, acc([100, 100]))!;
  assert.equal(mixed.verdict, "mixed");
  const some = compareWithLine(acc([95, 100.5]), null, acc([100, 100]))!;
  assert.equal(some.verdict, "model");
  // A gain of 1.1%: the model.
  assert.equal(
    compareWithLine(acc([98.9, 100]), null, acc([100, 100]))!.measures[0].better,
    "model",
  );
});

Deno.test("the reference tree stands in without an ensemble; no line or no money, no comparison", () => {
  const c = compareWithLine(null, acc([90, 90]), acc([100, 100]))!;
  assert.equal(c.who, "reference");
  assert.equal(c.verdict, "model");
  assert.equal(compareWithLine(acc([90, 90]), null, null), null);
  assert.equal(compareWithLine(null, null, acc([1, 1])), null);
  assert.equal(
    compareWithLine({ measuredBy: "out-of-bag", accuracy: 0.9 }, null, acc([1, 1])),
    null,
  );
  // Log figures only when both have them.
  assert.equal(
    compareWithLine(acc([90, 90], [0.1, 0.1]), null, acc([100, 100]))!.measures.length,
    2,
  );
});
