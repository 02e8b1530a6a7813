/**
 * Levers of a what-if explored key by key: the attributes a person may
 * move (never a protected one, by the one policy of `offeredLevers`), and
 * one move of each: an ordinal ladder one level, a categorical to the next
 * level in the model's order, a number by a step that suits its range (one
 * year for a span of years), or five steps at once.
 *
 * @module
 */

import { offeredLevers } from "./profile.ts";
import type { FeatureSchema, Model } from "./types.ts";
import type { Profile } from "./profile.ts";

/** One attribute that may be moved, and how far one move goes. */
export interface Lever {
  /** The attribute's index in the model's features. */
  index: number;
  /** Its name. */
  name: string;
  /** Its kind. */
  kind: FeatureSchema["kind"];
  /** Its levels, in the model's order (ordinal: the ladder). */
  levels: string[] | null;
  /** A number's step, and the lowest and highest value a move reaches (null for levels). */
  step: number | null;
  min: number | null;
  max: number | null;
}

// Steps of 1, 2 or 5 times a power of ten.
function niceStep(raw: number): number {
  if (!(raw > 0) || !Number.isFinite(raw)) return 1;
  const power = 10 ** Math.floor(Math.log10(raw));
  const scaled = raw / power;
  return (scaled < 1.5 ? 1 : scaled < 3.5 ? 2 : scaled < 7.5 ? 5 : 10) * power;
}

/**
 * The levers of a model, in its feature order.
 *
 * A number's step is about a thirtieth of the span its middle 98% of people
 * cover, rounded to 1, 2 or 5 times a power of ten (one year for
 * experience spanning 35 years, 1,000 for a bonus spanning 30,000), and
 * at least 1 for a count or a rating whose range figures are all whole.
 * Moves stop at the lowest and highest values in the model's table.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { levers } from "./levers.ts";
 * const model = {
 *   settings: { allowProtected: false },
 *   features: [
 *     { name: "level", kind: "ordinal", levels: ["L1", "L2"], typical: 0, protected: false },
 *     { name: "years", kind: "numeric", typical: 6, protected: false,
 *       range: { min: 0, max: 40, p01: 1, p99: 36 } },
 *     { name: "gender", kind: "categorical", levels: ["Man", "Woman"], typical: 0, protected: true },
 *   ],
 * } as unknown as import("./types.ts").Model;
 * const [level, years, ...rest] = levers(model);
 * assert.deepEqual(rest, []); // a protected attribute is no lever
 * assert.equal(level.step, null);
 * assert.deepEqual([years.step, years.min, years.max], [1, 0, 40]);
 * ```
 */
export function levers(model: Model): Lever[] {
  return offeredLevers(model).map((index) => {
    const f = model.features[index];
    if (f.kind !== "numeric") {
      return {
        index,
        name: f.name,
        kind: f.kind,
        levels: f.levels ?? [],
        step: null,
        min: null,
        max: null,
      };
    }
    const r = f.range;
    const span = r === undefined ? 1 : r.p99 - r.p01 > 0 ? r.p99 - r.p01 : r.max - r.min;
    // A count or a rating (every figure of its range whole) moves by whole units.
    const whole = r !== undefined && [r.min, r.max, r.p01, r.p99].every(Number.isInteger);
    const step = niceStep(span / 30);
    return {
      index,
      name: f.name,
      kind: f.kind,
      levels: null,
      step: whole ? Math.max(1, step) : step,
      min: r?.min ?? null,
      max: r?.max ?? null,
    };
  });
}

/**
 * One move of a lever: `direction` +1 or -1, `big` five steps (a number) or
 * two levels. A level moves along the model's order and stops at either
 * end; a number moves by its step, lands on a multiple of it, and stops at
 * the table's lowest and highest values; a missing value moves from the
 * attribute's typical value. Returns a new profile; the given one is left
 * as it was.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { moveLever } from "./levers.ts";
 * const level = { index: 0, name: "level", kind: "ordinal" as const, levels: ["L1", "L2", "L3"], step: null, min: null, max: null };
 * const years = { index: 1, name: "years", kind: "numeric" as const, levels: null, step: 1, min: 0, max: 40 };
 * const typical = Float64Array.of(1, 6);
 * const start = Float64Array.of(0, 6.5);
 * assert.deepEqual([...moveLever(start, level, 1, false, typical)], [1, 6.5]);
 * assert.deepEqual([...moveLever(start, level, -1, false, typical)], [0, 6.5]); // the bottom
 * assert.deepEqual([...moveLever(start, years, 1, false, typical)], [0, 7]); // onto a whole year
 * assert.deepEqual([...moveLever(start, years, 1, true, typical)], [0, 11]);
 * assert.deepEqual([...moveLever(Float64Array.of(0, 39.5), years, 1, true, typical)], [0, 40]);
 * assert.deepEqual([...moveLever(Float64Array.of(NaN, 6), level, 1, false, typical)], [1, 6]);
 * assert.deepEqual([...start], [0, 6.5]);
 * ```
 */
export function moveLever(
  profile: Profile,
  lever: Lever,
  direction: 1 | -1,
  big: boolean,
  typical: Profile,
): Profile {
  const out = Float64Array.from(profile);
  const i = lever.index;
  if (Number.isNaN(out[i])) {
    out[i] = typical[i];
    return out;
  }
  if (lever.step === null) {
    const count = lever.levels?.length ?? 0;
    out[i] = Math.max(0, Math.min(count - 1, out[i] + direction * (big ? 2 : 1)));
    return out;
  }
  const step = lever.step;
  // The next multiple of the step in that direction, then the rest of a big move.
  const onGrid = Math.abs(out[i] / step - Math.round(out[i] / step)) < 1e-9;
  let next = onGrid
    ? Math.round(out[i] / step) + direction
    : direction > 0
    ? Math.ceil(out[i] / step)
    : Math.floor(out[i] / step);
  if (big) next += direction * 4;
  // Written as a multiple, then rounded, so 0.1 steps read 0.3, not 0.30000000000000004.
  let value = Number((next * step).toPrecision(12));
  if (lever.min !== null) value = Math.max(lever.min, value);
  if (lever.max !== null) value = Math.min(lever.max, value);
  out[i] = value;
  return out;
}
