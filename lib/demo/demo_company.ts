/**
 * The pay table of Fernhollow Instruments, a company invented for
 * paygrove's demo: it stands for no real company and no real person. A
 * seeded generator, so the same seed gives the same table.
 *
 * The pay rule behind it (log of yearly base pay in EUR):
 *
 *     log pay = log(LEVEL_BASE[level])          level dominates
 *             + FAMILY_PREMIUM[family]          job family premium
 *             + SITE_ZONE[site]                 pay zone of the site
 *             + 0.09 * log(1 + experience)      concave returns to experience
 *             - 0.004 * tenure                  tenure compression: long-serving
 *                                               people fall behind new hires
 *             + 0.015 * (rating - 3)            small performance effect
 *                                               (0 when there is no rating)
 *             + 0.01 * [remote]                 remote roles
 *             + (0.035 + 0.008 * level) * z     noise, wider at higher levels
 *             - GAP * [woman in Field Service]  the deliberate unexplained gap
 *
 * with z standard normal. Education has no direct effect: it only shifts
 * which level people reach, so a model that credits it is picking up
 * level. The gap (6% in log points, in one job family) is there for the
 * pay-gap check to find.
 *
 * @module
 */

import { makeRng, randomInt } from "../random.ts";

/** The invented company's name, shown wherever the demo table is. */
export const DEMO_COMPANY = "Fernhollow Instruments (invented)";

/** Job levels, lowest first, with their base pay (EUR a year). */
export const LEVEL_BASE: Readonly<Record<string, number>> = {
  G1: 34000,
  G2: 41000,
  G3: 50000,
  G4: 61000,
  G5: 75000,
  G6: 93000,
  G7: 118000,
};

/** What each level is called in the company's own ladder. */
export const LEVEL_TITLES: Readonly<Record<string, string>> = {
  G1: "Entry",
  G2: "Developing",
  G3: "Skilled",
  G4: "Senior",
  G5: "Lead",
  G6: "Principal",
  G7: "Director",
};

/** Job families and their premium in log points. */
export const FAMILY_PREMIUM: Readonly<Record<string, number>> = {
  "Engineering": 0.08,
  "Field Service": 0.0,
  "Sales": 0.05,
  "Operations": -0.04,
  "Finance": 0.03,
  "People": -0.02,
};

/** Sites and their pay zone in log points. */
export const SITE_ZONE: Readonly<Record<string, number>> = {
  "Harbourside": 0.06,
  "Millbrook": -0.05,
  "Eastgate": 0.0,
  "Cinder Hill": -0.09,
};

/** Education, lowest first (no direct pay effect; see the module notes). */
export const EDUCATION = ["Secondary", "Vocational", "Bachelor", "Master", "Doctorate"] as const;

/** The deliberate unexplained gap: women in Field Service, in log points. */
export const GAP = { family: "Field Service", group: "Woman", logPoints: 0.06 } as const;

// Share of people at each level (a pyramid).
const LEVEL_SHARE = [0.17, 0.22, 0.22, 0.17, 0.11, 0.07, 0.04];
// Share of people in each family, in FAMILY_PREMIUM's order.
const FAMILY_SHARE = [0.28, 0.2, 0.16, 0.18, 0.09, 0.09];
const SITE_SHARE = [0.34, 0.27, 0.24, 0.15];

/** Options of {@linkcode demoCompanyCsv}. */
export interface DemoOptions {
  /**
   * People in the table.
   * @default {2000}
   */
  rows?: number;
  /**
   * Seed of the generator.
   * @default {2026}
   */
  seed?: number;
}

/** The columns of the demo table, in order. */
export const DEMO_COLUMNS = [
  "employee_id",
  "job_family",
  "level",
  "years_experience",
  "years_at_company",
  "site",
  "performance_rating",
  "education",
  "remote",
  "gender",
  "base_pay_eur",
] as const;

/**
 * The demo table as CSV text (header row, one person per line; a blank
 * performance rating for people hired in the last year).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv } from "./demo_company.ts";
 * const lines = demoCompanyCsv({ rows: 5, seed: 1 }).trim().split("\n");
 * assert(lines.length === 6 && lines[0].startsWith("employee_id,job_family,level"));
 * assert(demoCompanyCsv({ rows: 5, seed: 1 }) === demoCompanyCsv({ rows: 5, seed: 1 }));
 * ```
 */
export function demoCompanyCsv(options: DemoOptions = {}): string {
  const rows = options.rows ?? 2000;
  const seed = options.seed ?? 2026;
  if (!Number.isInteger(rows) || rows < 1) {
    throw new RangeError(`rows must be a whole number >= 1, got ${rows}`);
  }
  const rng = makeRng(seed);
  const uniform = () => (randomInt(rng, 0, 2 ** 30 - 1) + 0.5) / 2 ** 30;
  const normal = () => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform());
  const pick = (shares: readonly number[]) => {
    let u = uniform();
    for (let i = 0; i < shares.length - 1; i++) {
      if (u < shares[i]) return i;
      u -= shares[i];
    }
    return shares.length - 1;
  };
  const levels = Object.keys(LEVEL_BASE);
  const families = Object.keys(FAMILY_PREMIUM);
  const sites = Object.keys(SITE_ZONE);
  const lines: string[] = [DEMO_COLUMNS.join(",")];
  for (let i = 0; i < rows; i++) {
    const level = pick(LEVEL_SHARE); // 0 = G1
    const family = families[pick(FAMILY_SHARE)];
    const site = sites[pick(SITE_SHARE)];
    // Experience grows with level, with a wide spread; one decimal.
    const experience = Math.max(
      0,
      Math.round((1 + 3.2 * level + 4 * Math.abs(normal()) * (0.6 + level / 6)) * 10) / 10,
    );
    // Tenure: a share of experience, often short.
    const tenure = Math.round(experience * uniform() ** 1.6 * 10) / 10;
    const newHire = tenure < 1;
    const rating = newHire ? NaN : Math.min(5, Math.max(1, Math.round(3 + 0.9 * normal())));
    // Education: higher levels reach further, on average.
    const education = EDUCATION[
      Math.min(4, Math.max(0, Math.round(1.4 + 0.25 * level + 0.9 * normal())))
    ];
    const remote = uniform() < 0.18;
    const g = uniform();
    const gender = g < 0.47 ? "Woman" : g < 0.98 ? "Man" : "Non-binary";
    const logPay = Math.log(LEVEL_BASE[levels[level]]) + FAMILY_PREMIUM[family] +
      SITE_ZONE[site] + 0.09 * Math.log1p(experience) - 0.004 * tenure +
      (newHire ? 0 : 0.015 * (rating - 3)) + (remote ? 0.01 : 0) +
      (0.035 + 0.008 * (level + 1)) * normal() -
      (family === GAP.family && gender === GAP.group ? GAP.logPoints : 0);
    // Pay is set in steps of 50 EUR.
    const pay = Math.round(Math.exp(logPay) / 50) * 50;
    lines.push(
      [
        `FH${String(10001 + i)}`,
        family,
        levels[level],
        experience.toFixed(1),
        tenure.toFixed(1),
        site,
        newHire ? "" : String(rating),
        education,
        remote ? "yes" : "no",
        gender,
        String(pay),
      ].join(","),
    );
  }
  return lines.join("\n") + "\n";
}
