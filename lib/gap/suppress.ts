/**
 * Small-group privacy for figures shown per category: a category where any
 * group has fewer people than the privacy minimum is not shown at all
 * (primary suppression), and then enough other categories, or the overall
 * figure, are withheld too that the hidden ones cannot be recovered by
 * subtracting the shown categories from the total (complementary
 * suppression, as statistical offices do for tables of counts and sums; a
 * practice of the trade, here in its simplest sufficient form).
 *
 * The rule: once anything is hidden while the overall figure is shown, the
 * hidden categories together must be at least two, and every group must
 * have at least the minimum number of people among them; otherwise the
 * shown category with the fewest people in its smallest group is hidden
 * too, and so on. If even hiding every category does not satisfy the rule,
 * the overall figure is withheld as well.
 *
 * @module
 */

/** What may be shown. */
export interface Suppression {
  /** Per category: true when it is withheld. */
  hidden: boolean[];
  /** Per category: true when it is withheld for its own small groups (not to protect another). */
  primary: boolean[];
  /** True when the overall figure is withheld too. */
  overallHidden: boolean;
}

/**
 * Decides which categories (and whether the overall figure) are withheld.
 *
 * @param counts Per category, the number of people of each group (the same
 * group order in every category; a group absent from a category counts 0).
 * @param minimum The privacy minimum (people per group).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { suppressSmallGroups } from "./suppress.ts";
 * // Category 1 has 2 women: hidden, and so is the next smallest category,
 * // so that the total minus the shown ones does not give it away.
 * const s = suppressSmallGroups([[40, 30], [20, 2], [50, 12], [60, 25]], 5);
 * assert.deepEqual(s.hidden, [false, true, true, false]);
 * assert(s.primary[1] && !s.primary[2] && !s.overallHidden);
 * ```
 */
export function suppressSmallGroups(counts: readonly number[][], minimum: number): Suppression {
  const k = counts.length;
  const groups = counts.reduce((m, c) => Math.max(m, c.length), 0);
  const at = (c: number, g: number) => counts[c][g] ?? 0;
  const smallest = (c: number) => Math.min(...Array.from({ length: groups }, (_, g) => at(c, g)));
  const primary = counts.map((_, c) => smallest(c) < minimum);
  const hidden = [...primary];
  const totals = Array.from({ length: groups }, (_, g) => {
    let sum = 0;
    for (let c = 0; c < k; c++) sum += at(c, g);
    return sum;
  });
  let overallHidden = totals.some((t) => t < minimum);
  const safe = () => {
    const set = hidden.flatMap((h, c) => (h ? [c] : []));
    if (set.length === 0) return true;
    if (set.length < 2) return false;
    for (let g = 0; g < groups; g++) {
      let sum = 0;
      for (const c of set) sum += at(c, g);
      if (sum < minimum) return false;
    }
    return true;
  };
  while (!overallHidden && !safe()) {
    let next = -1;
    for (let c = 0; c < k; c++) {
      if (hidden[c]) continue;
      if (
        next < 0 || smallest(c) < smallest(next) ||
        (smallest(c) === smallest(next) && total(counts[c]) < total(counts[next]))
      ) next = c;
    }
    if (next < 0) {
      overallHidden = true;
      break;
    }
    hidden[next] = true;
  }
  // A lone category is the overall figure under another name.
  if (overallHidden && k === 1) hidden[0] = true;
  return { hidden, primary, overallHidden };
}

function total(xs: readonly number[]): number {
  return xs.reduce((a, b) => a + b, 0);
}
