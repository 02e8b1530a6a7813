/**
 * R's type-7 quantile written out plainly (R's ?quantile: h = (n - 1) p,
 * x[floor(h)] + (h - floor(h)) (x[floor(h) + 1] - x[floor(h)])), for the
 * model tests' expected values.
 *
 * @module
 */

/** The type-7 quantile of `values` at `p`. */
export function type7(values: readonly number[], p: number): number {
  const x = [...values].sort((a, b) => a - b);
  const h = (x.length - 1) * p;
  const lo = Math.floor(h);
  return lo + 1 < x.length ? x[lo] + (h - lo) * (x[lo + 1] - x[lo]) : x[lo];
}

/** The mean. */
export function meanOf(values: readonly number[]): number {
  return values.reduce((a, b) => a + b, 0) / values.length;
}

/** Asserts two numbers agree to a relative 1e-12. */
export function close(a: number | null | undefined, b: number, tol = 1e-12): void {
  if (typeof a !== "number" || !(Math.abs(a - b) <= tol * Math.max(1, Math.abs(b)))) {
    throw new Error(`${a} is not ${b}`);
  }
}
