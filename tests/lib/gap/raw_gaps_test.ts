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
  // With a privacy minimum of 2, each quartile holds enough people.
  const q = payQuartiles(pay, group, 2)!;
  assert.deepEqual(q.map((x) => x.rows), [3, 2, 2, 2]);
  // Q1: W20, M30, W30 -> W 2/3; Q2: M40, W45 -> 1/2; Q3: M50, W50 -> 1/2; Q4: M60, M100 -> 0.
  assert.deepEqual(q.map((x) => x.shares.W), [2 / 3, 0.5, 0.5, 0]);
  for (const x of q) assert.ok(Math.abs(x.shares.M + x.shares.W - 1) < 1e-12);
  // Bounds: open at both ends; each cut the mean of the 2 people nearest
  // it (one each side): (W30 + M40) / 2 = 35, (W45 + M50) / 2 = 47.5,
  // (W50 + M60) / 2 = 55. No bound is one person's pay.
  assert.deepEqual(q.map((x) => [x.low, x.high]), [[null, 35], [35, 47.5], [47.5, 55], [55, null]]);
  const everyone = new Set(pay);
  for (const x of q) {
    for (const b of [x.low, x.high]) assert.ok(b === null || !everyone.has(b), `${b}`);
  }
});

Deno.test("pay quartiles are withheld when a quartile would hold fewer than the minimum", () => {
  // Nine people: quartiles of 2 or 3, below a minimum of 3.
  assert.equal(payQuartiles(pay, group, 3), null);
  // Twelve people, a minimum of 3: each cut is the mean of two people just
  // below it and one just above.
  const big = Array.from({ length: 12 }, (_, i) => 10 + i);
  const q = payQuartiles(big, big.map(() => "M"), 3)!;
  // Cut 1 between positions 2 and 3: people at 1, 2 (below) and 3 (above): (11 + 12 + 13) / 3.
  assert.equal(q[0].high, 12);
  assert.equal(q[1].high, 15);
  assert.equal(q[2].high, 18);
});
