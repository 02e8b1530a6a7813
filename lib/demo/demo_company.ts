/**
 * The pay table of Fernhollow Instruments, a company invented for
 * paygrove's demo: it stands for no real company and no real person. A
 * seeded generator, so the same seed gives the same table.
 *
 * The pay rule behind it ({@linkcode logPayRule}; log of yearly base pay in
 * EUR, with level index k = 0 for G1 ... 6 for G7):
 *
 *     log pay = log(LEVEL_BASE[level])               level dominates (with a big
 *                                                    step at G5, where people
 *                                                    start to manage)
 *             + FAMILY_PREMIUM[family] * (1 + k / 2) family premiums grow with level
 *             + zone                                 SITE_ZONE[site] on site; remote
 *                                                    people are paid on REMOTE_ZONE
 *             + 0.09 * log(1 + experience)           concave returns to experience
 *             - 0.004 * tenure                       tenure compression: long-serving
 *                                                    people fall behind new hires
 *             + 0.015 * (rating - 3)                 small performance effect
 *                                                    (0 when there is no rating)
 *             - GAP * [woman in Field Service]       the deliberate unexplained gap
 *             + (0.035 + 0.008 * (k + 1)) * z        noise, wider at higher levels
 *
 * with z standard normal; then pay is held within its level's band
 * (BAND_LOW to BAND_HIGH times LEVEL_BASE) and rounded to 50 EUR. The
 * interactions and the bands are what a straight line cannot follow.
 * Education has no direct effect: it only shifts which level people reach,
 * so a model that credits it is picking up level. The gap (6% in log
 * points, in one job family) is there for the pay-gap check to find.
 *
 * @module
 */

import { makeRng, randomInt } from "../random.ts";

/**
 * The invented company's name, shown wherever the demo table is.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { DEMO_COMPANY } from "./demo_company.ts";
 * // Marked invented wherever it is named, and plain enough for a CSV cell or
 * // a one-line heading (no comma, quote or line break).
 * assert.match(DEMO_COMPANY, /^[A-Z][a-z]+ [A-Z][a-z]+ \(invented\)$/);
 * assert(!/[,"\n]/.test(DEMO_COMPANY));
 * ```
 */
export const DEMO_COMPANY = "Fernhollow Instruments (invented)";

/**
 * Job levels, lowest first, with their base pay (EUR a year).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "../table/load_table.ts";
 * import { demoCompanyCsv, LEVEL_BASE } from "./demo_company.ts";
 * // The table's levels read as a ladder, lowest first: the keys in order.
 * const level = loadTable(demoCompanyCsv({ rows: 400, seed: 1 })).columns[2];
 * assert(level.type === "ordinal");
 * assert.deepEqual(level.levels, Object.keys(LEVEL_BASE));
 * ```
 */
export const LEVEL_BASE: Readonly<Record<string, number>> = {
  G1: 34000,
  G2: 39000,
  G3: 46000,
  G4: 54000,
  G5: 74000,
  G6: 88000,
  G7: 124000,
};

/**
 * What each level is called in the company's own ladder.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { LEVEL_BASE, LEVEL_TITLES } from "./demo_company.ts";
 * // A title for every level of the ladder, in the same order.
 * assert.deepEqual(Object.keys(LEVEL_TITLES), Object.keys(LEVEL_BASE));
 * assert.equal(LEVEL_TITLES.G5, "Lead"); // where people start to manage (the module notes)
 * ```
 */
export const LEVEL_TITLES: Readonly<Record<string, string>> = {
  G1: "Entry",
  G2: "Developing",
  G3: "Skilled",
  G4: "Senior",
  G5: "Lead",
  G6: "Principal",
  G7: "Director",
};

/**
 * Job families and their premium in log points.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { FAMILY_PREMIUM, logPayRule } from "./demo_company.ts";
 * const person = (family: string, level: number) => ({
 *   level, family, site: "Eastgate", experience: 5, tenure: 2, rating: 3, remote: false,
 *   gender: "Man",
 * });
 * // The premium grows with level: times (1 + k / 2), so twice as large at G3 (k = 2).
 * const gap = (k: number) => logPayRule(person("Sales", k)) - logPayRule(person("Operations", k));
 * const premium = FAMILY_PREMIUM.Sales - FAMILY_PREMIUM.Operations;
 * assert(Math.abs(gap(0) - premium) < 1e-12);
 * assert(Math.abs(gap(2) - 2 * premium) < 1e-12);
 * ```
 */
export const FAMILY_PREMIUM: Readonly<Record<string, number>> = {
  "Engineering": 0.08,
  "Field Service": 0.0,
  "Sales": 0.05,
  "Operations": -0.04,
  "Finance": 0.03,
  "People": -0.02,
};

/**
 * Sites and their pay zone in log points.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { logPayRule, SITE_ZONE } from "./demo_company.ts";
 * const at = (site: string) =>
 *   logPayRule({
 *     level: 3, family: "Finance", site, experience: 8, tenure: 4, rating: 4, remote: false,
 *     gender: "Woman",
 *   });
 * const zones = SITE_ZONE.Harbourside - SITE_ZONE["Cinder Hill"];
 * assert(Math.abs(at("Harbourside") - at("Cinder Hill") - zones) < 1e-12);
 * ```
 */
export const SITE_ZONE: Readonly<Record<string, number>> = {
  "Harbourside": 0.06,
  "Millbrook": -0.05,
  "Eastgate": 0.0,
  "Cinder Hill": -0.09,
};

/**
 * The pay zone of remote people, whatever their site (log points).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { logPayRule, REMOTE_ZONE } from "./demo_company.ts";
 * const person = (site: string, remote: boolean) => ({
 *   level: 2, family: "Engineering", site, experience: 6, tenure: 3, rating: 3, remote,
 *   gender: "Man",
 * });
 * // Remote people are paid on the remote zone whatever their site (Eastgate's zone is 0).
 * assert.equal(logPayRule(person("Harbourside", true)), logPayRule(person("Millbrook", true)));
 * const shift = logPayRule(person("Eastgate", true)) - logPayRule(person("Eastgate", false));
 * assert(Math.abs(shift - REMOTE_ZONE) < 1e-12);
 * ```
 */
export const REMOTE_ZONE = -0.02;

/**
 * Pay bands: pay is held between these multiples of the level's base.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { BAND_LOW, demoCompanyCsv, LEVEL_BASE } from "./demo_company.ts";
 * const rows = (bands: boolean) =>
 *   demoCompanyCsv({ rows: 2000, seed: 5, bands }).trim().split("\n").slice(1)
 *     .map((l) => l.split(","));
 * const lowest = (table: string[][]) =>
 *   Math.min(...table.map((c) => Number(c[10]) / LEVEL_BASE[c[2]]));
 * // Held at the band's low end (to rounding to 50 EUR); without bands the noise reaches below it.
 * assert(lowest(rows(true)) >= BAND_LOW - 25 / 34000);
 * assert(lowest(rows(false)) < BAND_LOW);
 * ```
 */
export const BAND_LOW = 0.97;

/**
 * Pay bands: pay is held between these multiples of the level's base.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { BAND_HIGH, demoCompanyCsv, LEVEL_BASE } from "./demo_company.ts";
 * const rows = demoCompanyCsv({ rows: 2000, seed: 5 }).trim().split("\n").slice(1);
 * const highest = Math.max(
 *   ...rows.map((l) => l.split(",")).map((c) => Number(c[10]) / LEVEL_BASE[c[2]]),
 * );
 * assert(highest <= BAND_HIGH + 25 / 34000); // to rounding to 50 EUR
 * ```
 */
export const BAND_HIGH = 1.55;

/** One person's attributes as the pay rule reads them. */
export interface DemoPerson {
  /** Level index, 0 (G1) to 6 (G7). */
  level: number;
  /** Job family. */
  family: string;
  /** Site. */
  site: string;
  /** Years of experience. */
  experience: number;
  /** Years at the company. */
  tenure: number;
  /** Performance rating 1-5, NaN when none. */
  rating: number;
  /** Remote role. */
  remote: boolean;
  /** Gender (the rule uses it only for the deliberate gap). */
  gender: string;
}

/**
 * The rule's log pay for a person before noise and bands.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { logPayRule } from "./demo_company.ts";
 * const p = { level: 0, family: "Field Service", site: "Eastgate", experience: 0, tenure: 0,
 *   rating: NaN, remote: false, gender: "Man" };
 * assert(Math.abs(logPayRule(p) - Math.log(34000)) < 1e-12);
 * ```
 */
export function logPayRule(p: DemoPerson): number {
  const levels = Object.keys(LEVEL_BASE);
  return Math.log(LEVEL_BASE[levels[p.level]]) + FAMILY_PREMIUM[p.family] * (1 + p.level / 2) +
    (p.remote ? REMOTE_ZONE : SITE_ZONE[p.site]) + 0.09 * Math.log1p(p.experience) -
    0.004 * p.tenure + (Number.isNaN(p.rating) ? 0 : 0.015 * (p.rating - 3)) -
    (p.family === GAP.family && p.gender === GAP.group ? GAP.logPoints : 0);
}

/**
 * Standard deviation of the noise at level index k.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { noiseSd } from "./demo_company.ts";
 * // 0.035 + 0.008 per level from the first: G1 0.043, G7 (index 6) 0.091.
 * assert(Math.abs(noiseSd(0) - 0.043) < 1e-12);
 * assert(Math.abs(noiseSd(6) - 0.091) < 1e-12);
 * ```
 */
export function noiseSd(level: number): number {
  return 0.035 + 0.008 * (level + 1);
}

/**
 * Education, lowest first (no direct pay effect; see the module notes).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, EDUCATION } from "./demo_company.ts";
 * const cells = demoCompanyCsv({ rows: 2000, seed: 1 }).trim().split("\n").slice(1)
 *   .map((l) => l.split(",")[7]);
 * assert.deepEqual([...new Set(cells)].sort(), [...EDUCATION].sort());
 * ```
 */
export const EDUCATION = ["Secondary", "Vocational", "Bachelor", "Master", "Doctorate"] as const;

/**
 * The deliberate unexplained gap: women in Field Service, in log points.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { GAP, logPayRule } from "./demo_company.ts";
 * const person = (family: string, gender: string) => ({
 *   level: 2, family, site: "Eastgate", experience: 6, tenure: 3, rating: 3, remote: false, gender,
 * });
 * const gap = (family: string) =>
 *   logPayRule(person(family, "Man")) - logPayRule(person(family, "Woman"));
 * assert(Math.abs(gap("Field Service") - GAP.logPoints) < 1e-12);
 * assert.equal(gap("Engineering"), 0); // in one job family only
 * ```
 */
export const GAP = { family: "Field Service", group: "Woman", logPoints: 0.06 } as const;

// Share of people at each level (a pyramid).
const LEVEL_SHARE = [0.17, 0.22, 0.22, 0.17, 0.11, 0.07, 0.04];
// Share of people in each family, in FAMILY_PREMIUM's order.
const FAMILY_SHARE = [0.28, 0.2, 0.16, 0.18, 0.09, 0.09];
const SITE_SHARE = [0.34, 0.27, 0.24, 0.15];

/** Options of {@linkcode demoCompanyCsv}. */
export interface DemoOptions {
  /**
   * Hold pay within the level bands (off only to check the rule itself).
   * @default {true}
   */
  bands?: boolean;
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

/**
 * The columns of the demo table, in order.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "../table/load_table.ts";
 * import { DEMO_COLUMNS, demoCompanyCsv } from "./demo_company.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 60, seed: 1 }));
 * assert.deepEqual(table.columns.map((c) => c.name), [...DEMO_COLUMNS]);
 * assert.deepEqual(table.columns.filter((c) => c.protected).map((c) => c.name), ["gender"]);
 * assert.equal(table.columns[0].type, "identifier"); // employee_id
 * ```
 */
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
    const person = { level, family, site, experience, tenure, rating, remote, gender };
    const base = LEVEL_BASE[levels[level]];
    const raw = Math.exp(logPayRule(person) + noiseSd(level) * normal());
    // Held within the level's band, then set in steps of 50 EUR.
    const held = options.bands === false
      ? raw
      : Math.min(BAND_HIGH * base, Math.max(BAND_LOW * base, raw));
    const pay = Math.round(held / 50) * 50;
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
