/**
 * Recognising protected attributes (sex, race, age, ...) by column name.
 *
 * Names are split into words on `_`, `-`, `.`, spaces and camelCase, and
 * only whole words match, so `wage`, `average`, `usage` and `Essex_site` are
 * not flagged. The list follows the grounds named in the U.S. Title VII
 * (42 U.S.C. 2000e-2), the Age Discrimination in Employment Act, and
 * Article 21 of the EU Charter of Fundamental Rights; it is a safety net, and
 * users mark further columns themselves.
 *
 * @module
 */

/** Single words that mark a protected attribute. */
const WORDS = new Set([
  "sex",
  "gender",
  "race",
  "racial",
  "ethnicity",
  "ethnic",
  "age",
  "dob",
  "birthdate",
  "birthday",
  "birth",
  "religion",
  "religious",
  "faith",
  "disability",
  "disabled",
  "handicap",
  "marital",
  "married",
  "pregnancy",
  "pregnant",
  "maternity",
  "veteran",
  "nationality",
  "citizenship",
  "orientation",
  "transgender",
]);

/** Word pairs that mark one where neither word alone does. */
const PHRASES = ["national origin", "country of origin", "sexual orientation"];

/**
 * Splits a column name into lower-case words.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { nameWords } from "./protected_names.ts";
 * assert(nameWords("employeeAge_band").join(" ") === "employee age band");
 * ```
 */
export function nameWords(name: string): string[] {
  return name
    .replace(/([a-z0-9])([A-Z])/g, "$1 $2")
    // A lookahead of fixed length, not `([A-Z]+)([A-Z][a-z])`: that one
    // backtracks over every run of capitals and took 8.5 s on a header of
    // 50,000 of them.
    .replace(/([A-Z])(?=[A-Z][a-z])/g, "$1 ")
    .split(/[\s_\-./()]+/)
    .filter((w) => w !== "")
    .map((w) => w.toLowerCase());
}

/**
 * True when a column name names a protected attribute.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { isProtectedName } from "./protected_names.ts";
 * assert(isProtectedName("Gender"));
 * assert(isProtectedName("date_of_birth"));
 * assert(!isProtectedName("wage") && !isProtectedName("Essex_site"));
 * ```
 */
export function isProtectedName(name: string): boolean {
  const words = nameWords(name);
  if (words.some((w) => WORDS.has(w))) return true;
  const joined = ` ${words.join(" ")} `;
  return PHRASES.some((p) => joined.includes(` ${p} `));
}
