/**
 * Weighted least-squares isotonic regression: the nondecreasing sequence
 * closest to given values in weighted squared distance, by pooling adjacent
 * violators (Ayer, Brunk, Ewing, Reid & Silverman 1955, _Annals of
 * Mathematical Statistics_ 26; citation from memory). The pay ranges use it
 * to make band midpoints rise with the level ladder, on log pay, each level
 * weighted by its people.
 *
 * Written here: the one package on the npm registry for it is a 414 kB
 * WebAssembly build with few users, and the algorithm is twenty lines,
 * checked against R's `Iso::pava` (Debian `r-cran-iso`;
 * tests/reference/pava.R, fixtures/reference/pava.json).
 *
 * @module
 */

/**
 * The nondecreasing fit of `values` with `weights` (all positive; default
 * 1): where a value falls below the one before, the two are pooled into
 * their weighted mean, and pooling goes on backwards while the pooled
 * block still falls below the block before it.
 *
 * @throws {RangeError} for lengths that differ, or a weight that is not a
 *   positive finite number, or a value that is not finite.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { increasingFit } from "./isotonic.ts";
 * // 3 then 1 pool into 2; with weight 3 on the 1, into (3 + 3) / 4 = 1.5.
 * assert.deepEqual([...increasingFit([1, 3, 1, 4])], [1, 2, 2, 4]);
 * assert.deepEqual([...increasingFit([1, 3, 1, 4], [1, 1, 3, 1])], [1, 1.5, 1.5, 4]);
 * // Already rising: unchanged.
 * assert.deepEqual([...increasingFit([1, 2, 2, 5])], [1, 2, 2, 5]);
 * ```
 */
export function increasingFit(
  values: ArrayLike<number>,
  weights?: ArrayLike<number>,
): Float64Array {
  const n = values.length;
  if (weights !== undefined && weights.length !== n) {
    throw new RangeError(`${n} values but ${weights.length} weights`);
  }
  // Blocks as a stack: each its weighted mean, weight and length.
  const mean = new Float64Array(n);
  const weight = new Float64Array(n);
  const length = new Int32Array(n);
  let blocks = 0;
  for (let i = 0; i < n; i++) {
    const w = weights === undefined ? 1 : weights[i];
    if (!(w > 0 && Number.isFinite(w))) {
      throw new RangeError(`weight ${i + 1} must be a positive number, got ${w}`);
    }
    if (!Number.isFinite(values[i])) {
      throw new RangeError(`value ${i + 1} must be a finite number, got ${values[i]}`);
    }
    mean[blocks] = values[i];
    weight[blocks] = w;
    length[blocks] = 1;
    blocks++;
    while (blocks > 1 && mean[blocks - 2] > mean[blocks - 1]) {
      const a = blocks - 2;
      const b = blocks - 1;
      const total = weight[a] + weight[b];
      mean[a] = (weight[a] * mean[a] + weight[b] * mean[b]) / total;
      weight[a] = total;
      length[a] += length[b];
      blocks--;
    }
  }
  const out = new Float64Array(n);
  for (let b = 0, i = 0; b < blocks; b++) {
    for (let k = 0; k < length[b]; k++) out[i++] = mean[b];
  }
  return out;
}
