/**
 * Raw pay gaps and pay quartiles between groups, as Directive (EU)
 * 2023/970 defines them: Article 3(1)(c) "pay gap", the difference of the
 * average pay levels of two groups as a share of the reference group's
 * (with men as the reference for the gender pay gap); Article 3(1)(e) the
 * "median pay gap", the same with medians; Article 3(1)(f) "pay quartile",
 * each of four equal groups of workers into which they are divided by pay,
 * lowest to highest. These are raw figures: they explain nothing.
 *
 * @module
 */

import { quantile } from "../table/quality.ts";

/** One group's raw gaps against the reference group. */
export interface RawGap {
  /** The group. */
  group: string;
  /** People in the group. */
  rows: number;
  /** (reference mean - group mean) / reference mean: 0.05 means the group earns 5% less. */
  meanGap: number;
  /** The same with medians. */
  medianGap: number;
}

/**
 * Raw mean and median gaps of every group against the reference group.
 *
 * @param pay Each person's pay.
 * @param group Each person's group ("" for missing: left out).
 * @param reference The reference group.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { rawGaps } from "./raw_gaps.ts";
 * const gaps = rawGaps([100, 120, 80, 90], ["M", "M", "W", "W"], "M");
 * // Means 110 and 85: (110 - 85) / 110.
 * assert(Math.abs(gaps[0].meanGap - 25 / 110) < 1e-12 && gaps[0].group === "W");
 * ```
 */
export function rawGaps(
  pay: ArrayLike<number>,
  group: readonly string[],
  reference: string,
): RawGap[] {
  const byGroup = new Map<string, number[]>();
  for (let r = 0; r < pay.length; r++) {
    if (group[r] === "" || Number.isNaN(pay[r])) continue;
    const list = byGroup.get(group[r]) ?? [];
    list.push(pay[r]);
    byGroup.set(group[r], list);
  }
  const ref = byGroup.get(reference);
  if (ref === undefined) throw new RangeError(`no one is in the reference group "${reference}"`);
  const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
  const median = (xs: number[]) => quantile(Float64Array.from(xs).sort(), 0.5);
  const refMean = mean(ref);
  const refMedian = median(ref);
  return [...byGroup.keys()].filter((g) => g !== reference).sort().map((g) => {
    const xs = byGroup.get(g)!;
    return {
      group: g,
      rows: xs.length,
      meanGap: (refMean - mean(xs)) / refMean,
      medianGap: (refMedian - median(xs)) / refMedian,
    };
  });
}

/** One pay quartile: its pay bounds and each group's share of its people. */
export interface PayQuartile {
  /** 1 (lowest pay) to 4 (highest). */
  quartile: number;
  /** People in the quartile. */
  rows: number;
  /**
   * Where the quartile starts: the mean pay of the people nearest the cut
   * below it (see {@linkcode payQuartiles}); null for the first quartile,
   * which is open below ("under ...").
   */
  low: number | null;
  /** Where it ends, likewise; null for the fourth, open above ("... and above"). */
  high: number | null;
  /** Each group's share of the quartile's people. */
  shares: Record<string, number>;
}

/**
 * The four pay quartiles: people ordered by pay and cut into four groups of
 * equal size (sizes differ by at most one; the first quartiles take the
 * extra people). People of equal pay at a cut are split by their order in
 * the table, so the groups stay equal in size.
 *
 * The bounds never show one person's pay: the lowest pay of the first
 * quartile and the highest of the fourth are left open, and each cut
 * between two quartiles is the mean pay of the `privacyMin` people nearest
 * it (half rounded up just below the cut, the rest just above). With fewer
 * than `privacyMin` people in a quartile its shares would tell single
 * people's pay, so there are no quartiles then (null).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { payQuartiles } from "./raw_gaps.ts";
 * const pay = Array.from({ length: 20 }, (_, i) => 10 * (i + 1));
 * const group = pay.map((_, i) => (i < 8 ? "W" : "M"));
 * const q = payQuartiles(pay, group, 3)!;
 * assert.deepEqual(q.map((x) => x.shares.W), [1, 0.6, 0, 0]);
 * // The cut between Q1 (10..50) and Q2 (60..100): the mean of 40, 50 and 60.
 * assert.equal(q[0].high, 50);
 * assert.equal(q[1].low, 50);
 * assert.equal(q[0].low, null);
 * assert.equal(q[3].high, null);
 * assert.equal(payQuartiles(pay.slice(0, 8), group.slice(0, 8), 3), null);
 * ```
 */
export function payQuartiles(
  pay: ArrayLike<number>,
  group: readonly string[],
  privacyMin: number,
): PayQuartile[] | null {
  const rows: number[] = [];
  for (let r = 0; r < pay.length; r++) if (group[r] !== "" && !Number.isNaN(pay[r])) rows.push(r);
  rows.sort((a, b) => pay[a] - pay[b] || a - b);
  const n = rows.length;
  if (Math.floor(n / 4) < privacyMin) return null;
  const groups = [...new Set(rows.map((r) => group[r]))].sort();
  const starts: number[] = [];
  const out: PayQuartile[] = [];
  let start = 0;
  for (let q = 0; q < 4; q++) {
    const size = Math.floor(n / 4) + (q < n % 4 ? 1 : 0);
    const part = rows.slice(start, start + size);
    starts.push(start);
    start += size;
    const shares: Record<string, number> = {};
    for (const g of groups) shares[g] = part.filter((r) => group[r] === g).length / part.length;
    out.push({ quartile: q + 1, rows: part.length, low: null, high: null, shares });
  }
  // The cut before quartile q (q = 1..3) sits between sorted positions
  // starts[q] - 1 and starts[q].
  for (let q = 1; q < 4; q++) {
    const from = starts[q] - Math.ceil(privacyMin / 2);
    let sum = 0;
    for (let i = from; i < from + privacyMin; i++) sum += pay[rows[i]];
    const cut = sum / privacyMin;
    out[q - 1].high = cut;
    out[q].low = cut;
  }
  return out;
}
