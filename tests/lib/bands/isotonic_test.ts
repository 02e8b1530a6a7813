// The pool-adjacent-violators fit (lib/bands/isotonic.ts) against R's
// Iso::pava (Iso 0.0-18.1, Debian r-cran-iso; fixtures/reference/pava.json,
// written by tests/reference/pava.R, rerun in CI by cps_export_test.ts), to
// 1e-12 relative; and, by fast-check, the properties that define it.
import assert from "node:assert/strict";
import fc from "fast-check";
import { increasingFit } from "../../../lib/bands/isotonic.ts";

const root = new URL("../../../", import.meta.url).pathname;
const reference = JSON.parse(await Deno.readTextFile(`${root}fixtures/reference/pava.json`));

Deno.test("increasingFit equals Iso::pava on every case of the fixture", () => {
  const names = Object.keys(reference.cases);
  assert.deepEqual(names, ["hand", "midpoints", "random", "constant", "falling"]);
  for (const name of names) {
    const { y, w, fit } = reference.cases[name];
    const ours = increasingFit(y, w);
    assert.equal(ours.length, fit.length);
    fit.forEach((expected: number, i: number) => {
      assert(
        Math.abs(ours[i] - expected) <= 1e-12 * Math.max(1, Math.abs(expected)),
        `${name}[${i}]: ${ours[i]} vs ${expected}`,
      );
    });
  }
});

Deno.test("the fit rises, keeps each pooled block's weighted sum, and is the least-squares closest of a few rising candidates", () => {
  const cases = fc.integer({ min: 1, max: 30 }).chain((n) =>
    fc.record({
      y: fc.array(fc.double({ min: -100, max: 100, noNaN: true }), { minLength: n, maxLength: n }),
      w: fc.array(fc.double({ min: 0.01, max: 50, noNaN: true }), { minLength: n, maxLength: n }),
    })
  );
  fc.assert(
    fc.property(cases, ({ y, w }) => {
      const fit = increasingFit(y, w);
      for (let i = 1; i < fit.length; i++) assert(fit[i] >= fit[i - 1]);
      // The weighted sum is kept (each block is its weighted mean).
      const sum = (a: ArrayLike<number>) => y.reduce((s, _, i) => s + w[i] * a[i], 0);
      assert(Math.abs(sum(fit) - sum(y)) <= 1e-9 * (1 + Math.abs(sum(y))));
      // No rising sequence is closer: check against the running maximum and
      // the constant weighted mean, two rising candidates.
      const loss = (a: ArrayLike<number>) => y.reduce((s, v, i) => s + w[i] * (v - a[i]) ** 2, 0);
      let running = -Infinity;
      const maxima = y.map((v) => (running = Math.max(running, v)));
      const mean = sum(y) / w.reduce((a, b) => a + b, 0);
      assert(loss(fit) <= loss(maxima) + 1e-9 * (1 + loss(maxima)));
      assert(loss(fit) <= loss(y.map(() => mean)) + 1e-9 * (1 + loss(y.map(() => mean))));
    }),
    { numRuns: 300, seed: 23 },
  );
});

Deno.test("increasingFit refuses weights that are not positive and values that are not finite", () => {
  assert.throws(() => increasingFit([1, 2], [1, 0]), /weight 2 must be a positive number/);
  assert.throws(() => increasingFit([1, NaN]), /value 2 must be a finite number/);
  assert.throws(() => increasingFit([1, 2], [1]), /2 values but 1 weights/);
  assert.deepEqual([...increasingFit([])], []);
});
