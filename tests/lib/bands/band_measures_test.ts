// The structure's measures (lib/bands/band_measures.ts) on a small invented
// structure of three levels, each figure worked out by hand in the comments.
import assert from "node:assert/strict";
import {
  bandOverlap,
  compaRatio,
  midpointProgression,
  outsideBand,
  rangePosition,
  rangeSpread,
} from "../../../lib/bands/band_measures.ts";

// G1 36,000-45,000-54,000; G2 44,000-55,000-66,000; G3 60,000-72,000-90,000.
const bands = [
  { min: 36000, mid: 45000, max: 54000 },
  { min: 44000, mid: 55000, max: 66000 },
  { min: 60000, mid: 72000, max: 90000 },
];
const near = (a: number, b: number) => Math.abs(a - b) < 1e-12;

Deno.test("spread, progression and overlap of a three-level structure, by hand", () => {
  // 54/36 - 1 = 0.5; 66/44 - 1 = 0.5; 90/60 - 1 = 0.5.
  assert.deepEqual(bands.map(rangeSpread).map((s) => Number(s.toFixed(12))), [0.5, 0.5, 0.5]);
  // 55/45 - 1 = 2/9; 72/55 - 1 = 17/55.
  const progression = midpointProgression(bands);
  assert(near(progression[0], 2 / 9) && near(progression[1], 17 / 55));
  // G1 and G2 share 44,000-54,000: 10,000 of G1's 18,000. G2 and G3 share 60,000-66,000: 6 of 22.
  const overlap = bandOverlap(bands);
  assert(near(overlap[0], 10 / 18) && near(overlap[1], 6 / 22));
});

Deno.test("compa-ratio, range position and the cost to the minimum, by hand", () => {
  const g2 = bands[1];
  // 49,500 / 55,000 = 0.9; (49,500 - 44,000) / 22,000 = 0.25.
  assert(near(compaRatio(49500, g2), 0.9) && near(rangePosition(49500, g2), 0.25));
  // Above the maximum: position above 1 ((70,400 - 44,000) / 22,000 = 1.2).
  assert(near(rangePosition(70400, g2), 1.2));
  // Two below (1,000 and 3,500 short), one above, one at the minimum exactly (inside).
  assert.deepEqual(outsideBand([43000, 40500, 44000, 56000, 67000], g2), {
    below: 2,
    above: 1,
    costToMinimum: 4500,
  });
});
