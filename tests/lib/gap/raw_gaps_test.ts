// Raw gaps and pay quartiles on a table small enough to compute by hand
// (Directive (EU) 2023/970, Article 3(1)(c), (e) and (f)).
import assert from "node:assert/strict";
import { payQuartiles, rawGaps } from "../../../mod.ts";

// Ten invented people: men earn 30, 40, 50, 60, 100; women 20, 30, 45, 50;
// one person's group is not known and is left out.
const pay = [30, 40, 50, 60, 100, 20, 30, 45, 50, 70];
const group = ["M", "M", "M", "M", "M", "W", "W", "W", "W", ""];

Deno.test("raw mean and median gaps against the reference group, by hand", () => {
  const [w] = rawGaps(pay, group, "M");
  // Means: M 280/5 = 56, W 145/4 = 36.25; (56 - 36.25) / 56.
  assert.ok(Math.abs(w.meanGap - 19.75 / 56) < 1e-12, `${w.meanGap}`);
  // Medians: M 50, W (30 + 45) / 2 = 37.5; (50 - 37.5) / 50 = 0.25.
  assert.ok(Math.abs(w.medianGap - 0.25) < 1e-12, `${w.medianGap}`);
  assert.equal(w.rows, 4);
  // Against W as the reference, M earns more: a negative gap.
  const [m] = rawGaps(pay, group, "W");
  assert.ok(Math.abs(m.meanGap - (36.25 - 56) / 36.25) < 1e-12);
  assert.throws(() => rawGaps(pay, group, "X"), /no one is in the reference group "X"/);
});

Deno.test("pay quartiles: four equal groups by pay, each group's share", () => {
  // Nine people with a known group, ordered by pay (ties by table order):
  // W20 | M30 W30 | M40 W45 | M50 W50 | M60 M100 -> sizes 3, 2, 2, 2.
  const q = payQuartiles(pay, group);
  assert.deepEqual(q.map((x) => x.rows), [3, 2, 2, 2]);
  // Q1: W20, M30, W30 -> W 2/3; Q2: M40, W45 -> 1/2; Q3: M50, W50 -> 1/2; Q4: M60, M100 -> 0.
  assert.deepEqual(q.map((x) => x.shares.W), [2 / 3, 0.5, 0.5, 0]);
  assert.deepEqual(q.map((x) => [x.low, x.high]), [[20, 30], [40, 45], [50, 50], [60, 100]]);
  for (const x of q) assert.ok(Math.abs(x.shares.M + x.shares.W - 1) < 1e-12);
});
