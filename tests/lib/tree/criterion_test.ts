// The criteria against the textbook formulas (common practice, Breiman et
// al. 1984 ch. 4 and 8): a side's squared-error impurity is the weighted
// variance of its targets, Gini is 1 - sum of squared class shares; the
// squared-error proxy ranks splits as the drop in squared error does.
import assert from "node:assert/strict";
import { criterionFor, Gini, SquaredError } from "../../../lib/tree/criterion.ts";
import { classification, numeric, regression } from "./_small.ts";

function summary(y: number[], w: number[]): number[] {
  let sw = 0, s = 0, q = 0;
  y.forEach((v, i) => {
    sw += w[i];
    s += w[i] * v;
    q += w[i] * v * v;
  });
  return [y.length, sw, s, q];
}

Deno.test("squared error: impurity is the weighted variance; the proxy orders splits as their squared error", () => {
  const c = new SquaredError();
  const y = [3, 5, 8, 13, 21, 34];
  const w = [1, 2, 1, 3, 1, 2];
  const sse = (part: number[], weights: number[]) => {
    const sw = weights.reduce((a, b) => a + b, 0);
    const mean = part.reduce((a, v, i) => a + weights[i] * v, 0) / sw;
    return part.reduce((a, v, i) => a + weights[i] * (v - mean) ** 2, 0);
  };
  const scores = [1, 2, 3, 4, 5].map((cut) => {
    const sides = Float64Array.from([
      ...summary(y.slice(0, cut), w.slice(0, cut)),
      ...summary(y.slice(cut), w.slice(cut)),
    ]);
    const leftW = w.slice(0, cut).reduce((a, b) => a + b, 0);
    assert.ok(
      Math.abs(c.impurity(sides, 0) * leftW - sse(y.slice(0, cut), w.slice(0, cut))) < 1e-9,
    );
    return {
      cut,
      proxy: c.proxy(sides, 0, 4),
      error: sse(y.slice(0, cut), w.slice(0, cut)) + sse(y.slice(cut), w.slice(cut)),
    };
  });
  const byProxy = [...scores].sort((a, b) => b.proxy - a.proxy).map((s) => s.cut);
  const byError = [...scores].sort((a, b) => a.error - b.error).map((s) => s.cut);
  assert.deepEqual(byProxy, byError);
});

Deno.test("Gini: 1 - sum of squared shares, and the proxy is minus the weighted impurities", () => {
  const c = new Gini(3);
  // Left: class weights 2, 1, 1; right: 0, 0, 4.
  const sides = Float64Array.of(4, 4, 2, 1, 1, 4, 4, 0, 0, 4);
  assert.equal(c.impurity(sides, 0), 1 - (0.25 + 0.0625 + 0.0625));
  assert.equal(c.impurity(sides, 5), 0);
  assert.equal(c.proxy(sides, 0, 5), -4 * 0.625);
  assert.equal(c.stride, 5);
});

Deno.test("criterionFor picks the target's criterion", () => {
  const r = criterionFor(regression([numeric("x", [1, 2])], [1, 2]));
  assert.ok(r instanceof SquaredError);
  assert.equal(r.width, 1);
  const g = criterionFor(classification([numeric("x", [1, 2])], [0, 1], 2));
  assert.ok(g instanceof Gini);
  assert.equal(g.width, 2);
});
