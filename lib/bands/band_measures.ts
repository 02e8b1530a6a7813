/**
 * The common measures of a pay structure's bands, as compensation practice
 * defines them (common practice, no single source): range spread, midpoint
 * progression, overlap with the next band, and for a person compa-ratio and
 * range position; per band, who sits below its minimum or above its
 * maximum, and the yearly cost of bringing those below up to it.
 *
 * Plain data in, plain figures out: the privacy rules (no figure of fewer
 * than the privacy minimum of people) are the caller's, since only it knows
 * who a figure describes.
 *
 * @module
 */

/** One band: minimum, midpoint and maximum, in money. */
export interface Band {
  /** Lowest pay of the band. */
  min: number;
  /** Its midpoint. */
  mid: number;
  /** Highest pay of the band. */
  max: number;
}

/**
 * Range spread: max / min - 1 (0.5: the maximum is 50% above the minimum).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { rangeSpread } from "./band_measures.ts";
 * assert.equal(rangeSpread({ min: 40000, mid: 50000, max: 60000 }), 0.5);
 * ```
 */
export function rangeSpread(band: Band): number {
  return band.max / band.min - 1;
}

/**
 * Midpoint progression from each band to the next up the ladder:
 * mid(k + 1) / mid(k) - 1 (one fewer figure than bands).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { midpointProgression } from "./band_measures.ts";
 * const bands = [{ min: 40, mid: 50, max: 60 }, { min: 48, mid: 60, max: 72 }, { min: 54, mid: 66, max: 80 }];
 * assert.deepEqual(midpointProgression(bands).map((p) => Number(p.toFixed(12))), [0.2, 0.1]);
 * ```
 */
export function midpointProgression(bands: readonly Band[]): number[] {
  return bands.slice(1).map((band, k) => band.mid / bands[k].mid - 1);
}

/**
 * Overlap of each band with the next up the ladder: the share of the lower
 * band's width that the next band also covers,
 * max(0, max(k) - min(k + 1)) / (max(k) - min(k)).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { bandOverlap } from "./band_measures.ts";
 * // 40-60 and 50-70 share 50-60: half of the lower band. 50-70 and 75-90 share nothing.
 * const bands = [{ min: 40, mid: 50, max: 60 }, { min: 50, mid: 60, max: 70 }, { min: 75, mid: 82, max: 90 }];
 * assert.deepEqual(bandOverlap(bands), [0.5, 0]);
 * ```
 */
export function bandOverlap(bands: readonly Band[]): number[] {
  return bands.slice(0, -1).map((band, k) =>
    Math.max(0, band.max - bands[k + 1].min) / (band.max - band.min)
  );
}

/**
 * Compa-ratio: pay / the band's midpoint (1: at the midpoint).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { compaRatio } from "./band_measures.ts";
 * assert.equal(compaRatio(45000, { min: 40000, mid: 50000, max: 60000 }), 0.9);
 * ```
 */
export function compaRatio(pay: number, band: Band): number {
  return pay / band.mid;
}

/**
 * Range position: (pay - min) / (max - min): 0 at the minimum, 1 at the
 * maximum, below 0 or above 1 outside the band.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { rangePosition } from "./band_measures.ts";
 * const band = { min: 40000, mid: 50000, max: 60000 };
 * assert.equal(rangePosition(45000, band), 0.25);
 * assert.equal(rangePosition(30000, band), -0.5);
 * ```
 */
export function rangePosition(pay: number, band: Band): number {
  return (pay - band.min) / (band.max - band.min);
}

/** Who in a band's cell sits outside it, and what bringing the low ones up costs. */
export interface OutsideBand {
  /** People paid below the minimum. */
  below: number;
  /** People paid above the maximum. */
  above: number;
  /** The sum of (min - pay) over those below: the yearly cost of raising them to the minimum. */
  costToMinimum: number;
}

/**
 * Counts the people of a cell below and above a band, and the cost of
 * bringing those below up to its minimum (pay on the band's period, e.g. a
 * year).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { outsideBand } from "./band_measures.ts";
 * const band = { min: 40000, mid: 50000, max: 60000 };
 * assert.deepEqual(outsideBand([38000, 39500, 40000, 52000, 61000], band), {
 *   below: 2, above: 1, costToMinimum: 2500,
 * });
 * ```
 */
export function outsideBand(pays: ArrayLike<number>, band: Band): OutsideBand {
  let below = 0;
  let above = 0;
  let costToMinimum = 0;
  for (let i = 0; i < pays.length; i++) {
    const pay = pays[i];
    if (pay < band.min) {
      below++;
      costToMinimum += band.min - pay;
    } else if (pay > band.max) above++;
  }
  return { below, above, costToMinimum };
}
