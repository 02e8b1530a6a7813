/**
 * Recognising ordered level names such as `L1..L9`, `P1..P6` or `IC 4`.
 *
 * @module
 */

/**
 * A level of a ladder: a short prefix and a number (`G7`, `IC 4`).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { LADDER } from "./ordinal.ts";
 * assert.deepEqual(LADDER.exec("IC 4")?.slice(1), ["IC", "4"]);
 * assert.equal(LADDER.exec("Senior"), null);
 * ```
 */
export const LADDER = /^([A-Za-z]{1,3})[ _-]?(\d{1,2})$/;

/**
 * Returns the levels ordered by their number when every level is a short
 * common prefix followed by a distinct number (`L1`, `L2`, `L10`), else
 * `undefined`. The prefix is compared without case.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { ladderOrder } from "./ordinal.ts";
 * assert(ladderOrder(["L10", "L2", "L1"])?.join() === "L1,L2,L10");
 * assert(ladderOrder(["Sales", "Support"]) === undefined);
 * ```
 */
export function ladderOrder(levels: readonly string[]): string[] | undefined {
  if (levels.length < 2) return undefined;
  let prefix: string | undefined;
  const ranked: { level: string; rank: number }[] = [];
  const seen = new Set<number>();
  for (const level of levels) {
    const match = LADDER.exec(level);
    if (!match) return undefined;
    const p = match[1].toLowerCase();
    if (prefix === undefined) prefix = p;
    else if (p !== prefix) return undefined;
    const rank = Number(match[2]);
    if (seen.has(rank)) return undefined;
    seen.add(rank);
    ranked.push({ level, rank });
  }
  return ranked.sort((a, b) => a.rank - b.rank).map((r) => r.level);
}
