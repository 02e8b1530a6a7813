/**
 * An invented 6,000-person pay table with eight attributes, seeded, whose
 * typical person has a long decision path and a profile of two lines: the
 * flow's result screen at its fullest. Pay is a product of every
 * attribute's effect (made up here) and a little noise.
 *
 * @module
 */

import { makeRng, randomInt } from "../../mod.ts";

const DEPARTMENTS = ["Assembly", "Design", "Finance", "Logistics", "Sales"];
const SITES = ["Northgate", "Riverside", "Southport", "Westfield"];
const SHIFTS = ["day", "evening", "night"];
const CONTRACTS = ["permanent", "fixed-term"];

/** The table as CSV text: `rows` people, from `seed`. */
export function eightAttributeCsv(rows = 6000, seed = 80): string {
  const rng = makeRng(seed);
  const u = () => randomInt(rng, 0, 2 ** 30 - 1) / 2 ** 30;
  const pick = <T>(xs: T[]) => xs[Math.floor(u() * xs.length)];
  const lines = ["department,grade,site,shift,years,tenure,rating,contract,pay"];
  for (let r = 0; r < rows; r++) {
    const department = pick(DEPARTMENTS);
    const grade = 1 + Math.floor(u() * 7);
    const site = pick(SITES);
    const shift = pick(SHIFTS);
    const years = Math.round(u() * 300) / 10;
    const tenure = Math.round(u() * Math.min(years, 20) * 10) / 10;
    const rating = 1 + Math.floor(u() * 5);
    const contract = u() < 0.7 ? CONTRACTS[0] : CONTRACTS[1];
    const pay = 30000 * 1.22 ** (grade - 1) *
      (1 + 0.12 * DEPARTMENTS.indexOf(department)) *
      (1 + 0.1 * SITES.indexOf(site)) *
      (1 + 0.15 * SHIFTS.indexOf(shift)) *
      (1 + 0.015 * years) * (1 + 0.01 * tenure) * (1 + 0.1 * (rating - 3)) *
      (contract === "permanent" ? 1.3 : 1) * (1 + 0.02 * (u() - 0.5));
    lines.push(
      [department, `G${grade}`, site, shift, years, tenure, rating, contract, Math.round(pay)]
        .join(","),
    );
  }
  return lines.join("\n") + "\n";
}
