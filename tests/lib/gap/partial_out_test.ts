// The residual-on-residual regression with HC1 errors, Holm's adjustment
// and the gap as 1 - exp(b), against R 4.2.2 with sandwich 3.0.2 (the
// script is written out beside each check).
import assert from "node:assert/strict";
import {
  gapFromCoefficient,
  holmAdjust,
  residualRegression,
  twoSidedP,
} from "../../../lib/gap/partial_out.ts";

const close = (a: number, b: number, tol = 1e-12) =>
  assert(Math.abs(a - b) <= tol * Math.max(1, Math.abs(b)), `${a} is not ${b}`);

// Invented residuals, 12 rows.
const Y = [0.12, -0.05, 0.30, 0.08, -0.20, 0.15, 0.02, -0.11, 0.25, -0.02, 0.07, -0.30];
const X1 = [0.6, -0.4, 0.7, 0.5, -0.3, -0.4, 0.6, -0.5, 0.8, -0.2, 0.1, -0.6];
const X2 = [-0.2, 0.1, 0.3, -0.4, 0.5, 0.2, -0.1, 0.0, 0.4, -0.3, 0.2, -0.5];

Deno.test("residualRegression equals lm with sandwich::vcovHC(type = 'HC1')", () => {
  // R 4.2.2, sandwich 3.0.2:
  //   fit <- lm(y ~ x1 + x2); b <- coef(fit)
  //   se <- sqrt(diag(vcovHC(fit, type = "HC1"))); p <- 2 * pnorm(-abs(b / se))
  // x1: b 0.23901937121674707, se 0.066386808704642364, p 0.00031772239382091023
  // x2: b 0.14364245224507069, se 0.13149167545892751, p 0.27465416227138034
  const rows = Y.map((_, i) => i);
  const fit = residualRegression(Y, [X1, X2], rows)!;
  assert.equal(fit.length, 2);
  close(fit[0].coefficient, 0.23901937121674707);
  close(fit[0].se, 0.066386808704642364, 1e-10);
  close(fit[0].p, 0.00031772239382091023, 1e-8);
  close(fit[1].coefficient, 0.14364245224507069);
  close(fit[1].se, 0.13149167545892751, 1e-10);
  close(fit[1].p, 0.27465416227138034, 1e-9);
});

Deno.test("only the rows given enter the regression", () => {
  // Rows 0-9 of a longer series whose rows 10-11 are wild: the same fit as
  // the twelve rows above with those two replaced.
  const y = [...Y.slice(0, 10), 9, -9];
  const x1 = [...X1.slice(0, 10), 5, 5];
  const x2 = [...X2.slice(0, 10), -5, 5];
  const rows = [0, 1, 2, 3, 4, 5, 6, 7, 8, 9];
  const a = residualRegression(y, [x1, x2], rows)!;
  const b = residualRegression(Y.slice(0, 10), [X1.slice(0, 10), X2.slice(0, 10)], rows)!;
  assert.deepEqual(a, b);
});

Deno.test("too few rows, or a column without spread, give null", () => {
  // Two columns and an intercept need more than four rows.
  assert.equal(residualRegression(Y, [X1, X2], [0, 1, 2, 3]), null);
  assert.notEqual(residualRegression(Y, [X1, X2], [0, 1, 2, 3, 4]), null);
  assert.equal(residualRegression(Y, [new Array(12).fill(0.3)], Y.map((_, i) => i)), null);
});

Deno.test("twoSidedP under the normal approximation, and its zero-error cases", () => {
  // R: 2 * pnorm(-1) = 0.31731050786291409.
  close(twoSidedP(-0.5, 0.5), 0.31731050786291404, 1e-12);
  assert.equal(twoSidedP(0, 0), 1);
  assert.equal(twoSidedP(0.1, 0), 0);
});

Deno.test("holmAdjust equals R's p.adjust(method = 'holm'), ties included", () => {
  // R 4.2.2: p.adjust(c(0.02, 0.001, 0.02, 0.5, 0.04), "holm") = 0.08, 0.005, 0.08, 0.5, 0.08.
  assert.deepEqual(holmAdjust([0.02, 0.001, 0.02, 0.5, 0.04]), [0.08, 0.005, 0.08, 0.5, 0.08]);
  // Capped at 1: p.adjust(c(0.4, 0.6), "holm") = 0.8, 0.8; c(0.6, 0.9) gives 1, 1.
  assert.deepEqual(holmAdjust([0.4, 0.6]), [0.8, 0.8]);
  assert.deepEqual(holmAdjust([0.6, 0.9]), [1, 1]);
  assert.deepEqual(holmAdjust([]), []);
});

Deno.test("gapFromCoefficient: 1 - exp(b) with the interval's ends swapped", () => {
  // R: qnorm(0.975) = 1.9599639845400536.
  const z = 1.9599639845400536;
  const g = gapFromCoefficient(-0.1, 0.02, 0.95);
  close(g.gap, 1 - Math.exp(-0.1));
  close(g.low, 1 - Math.exp(-0.1 + z * 0.02));
  close(g.high, 1 - Math.exp(-0.1 - z * 0.02));
  assert(g.low < g.gap && g.gap < g.high);
});
