/**
 * An invented table for the proxy tests: night shifts are mostly worked by
 * one sex (85%), so "shift" carries it; "level" is drawn independently of it.
 *
 * @module
 */

import { makeRng, randomInt } from "../../../mod.ts";

/** The table's CSV text: 400 people, id, sex, shift, level and pay. */
export function shiftTable(): string {
  const rng = makeRng(11);
  const lines = ["id,sex,shift,level,pay"];
  for (let i = 0; i < 400; i++) {
    const sex = randomInt(rng, 0, 1) === 0 ? "F" : "M";
    const tracks = randomInt(rng, 0, 99) < 85;
    const shift = tracks
      ? (sex === "M" ? "night" : "day")
      : (randomInt(rng, 0, 1) ? "night" : "day");
    const level = randomInt(rng, 1, 3);
    const pay = 40000 + 10000 * level + (shift === "night" ? 3000 : 0) +
      randomInt(rng, -2000, 2000);
    lines.push(`E${i},${sex},${shift},L${level},${pay}`);
  }
  return lines.join("\n") + "\n";
}
