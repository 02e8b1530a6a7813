/**
 * Which cell texts mean "no value".
 *
 * @module
 */

/**
 * The texts read as missing unless the user gives a list of their own:
 * R's `NA`, spreadsheet `N/A` and `#N/A`, `NaN` as pandas writes it, `null`
 * and a dash. An empty (or all-space) cell is always missing.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "./load_table.ts";
 * import { DEFAULT_MISSING_TOKENS } from "./missing.ts";
 * // Each default token, in a column of numbers, is a missing value, not text.
 * const cells = [...DEFAULT_MISSING_TOKENS, "50000", "61000"];
 * const pay = loadTable(`pay\n${cells.map((c) => `"${c}"`).join("\n")}\n`).columns[0];
 * assert.equal(pay.type, "numeric");
 * assert.equal(pay.missing, DEFAULT_MISSING_TOKENS.length);
 * ```
 */
export const DEFAULT_MISSING_TOKENS: readonly string[] = ["NA", "N/A", "#N/A", "NaN", "null", "-"];

/**
 * Builds a test for missing cells. Matching ignores case and surrounding
 * space, so `na`, ` NULL ` and `n/a` are missing under the default list.
 *
 * @param tokens Texts that mean missing, besides the empty cell.
 * @default tokens DEFAULT_MISSING_TOKENS
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { missingTest } from "./missing.ts";
 * const isMissing = missingTest();
 * assert(isMissing("n/a") && isMissing("") && !isMissing("0"));
 * ```
 */
export function missingTest(
  tokens: readonly string[] = DEFAULT_MISSING_TOKENS,
): (text: string) => boolean {
  const { set, longest, firsts } = tokenSet(tokens);
  // Called for every cell, often more than once: most cells are longer than
  // any token or hold no space to trim, so they are decided without copying.
  return (text) => {
    if (text.length === 0) return true;
    const padded = text.charCodeAt(0) <= 32 || text.charCodeAt(text.length - 1) <= 32;
    const t = padded ? text.trim() : text;
    if (t.length === 0) return true;
    if (t.length > longest) return false;
    // An ASCII first character lower-cases to ASCII: refused unless a token
    // starts with it (any other character takes the full test).
    const first = t.charCodeAt(0);
    if (first < 128 && !firsts.has(first)) return false;
    return set.has(t.toLowerCase());
  };
}

/**
 * The test of {@linkcode missingTest} on the cell `text.slice(start, end)`
 * without cutting it out when its length or first character already refuses
 * it (a reader of a million rows asks this of cells it has not cut).
 *
 * @param tokens Texts that mean missing, besides the empty cell.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { missingTestAt } from "./missing.ts";
 * const isMissingAt = missingTestAt();
 * const row = "12.5,n/a,, NULL ,-";
 * assert.deepEqual(
 *   [[0, 4], [5, 8], [9, 9], [10, 16], [17, 18]].map(([s, e]) => isMissingAt(row, s, e)),
 *   [false, true, true, true, true],
 * );
 * ```
 */
export function missingTestAt(
  tokens: readonly string[] = DEFAULT_MISSING_TOKENS,
): (text: string, start: number, end: number) => boolean {
  const { longest, firsts } = tokenSet(tokens);
  const isMissing = missingTest(tokens);
  return (text, start, end) => {
    if (end === start) return true;
    const first = text.charCodeAt(start);
    // Unpadded (the padded take the full test): refused by length or first character.
    if (first > 32 && text.charCodeAt(end - 1) > 32) {
      if (end - start > longest) return false;
      if (first < 128 && !firsts.has(first)) return false;
    }
    return isMissing(text.slice(start, end));
  };
}

// The tokens lower-cased, the longest one's length, and the first
// characters a token can start with in either case: most cells (numbers,
// names) are refused on their first character, with no lower-case copy.
function tokenSet(tokens: readonly string[]) {
  const set = new Set(tokens.map((t) => t.trim().toLowerCase()));
  let longest = 0;
  const firsts = new Set<number>();
  for (const token of set) {
    longest = Math.max(longest, token.length);
    if (token.length > 0) {
      firsts.add(token.charCodeAt(0));
      firsts.add(token[0].toUpperCase().charCodeAt(0));
    }
  }
  return { set, longest, firsts };
}
