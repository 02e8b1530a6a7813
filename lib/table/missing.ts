/**
 * Which cell texts mean "no value".
 *
 * @module
 */

/**
 * The texts read as missing unless the user gives a list of their own.
 * An empty (or all-space) cell is always missing.
 */
export const DEFAULT_MISSING_TOKENS: readonly string[] = ["NA", "N/A", "null", "-"];

/**
 * Builds a test for missing cells. Matching ignores case and surrounding
 * space, so `na`, ` NULL ` and `n/a` are missing under the default list.
 *
 * @param tokens Texts that mean missing, besides the empty cell.
 * @default tokens DEFAULT_MISSING_TOKENS
 *
 * @example
 * ```ts
 * import { missingTest } from "./missing.ts";
 * const isMissing = missingTest();
 * console.assert(isMissing("n/a") && isMissing("") && !isMissing("0"));
 * ```
 */
export function missingTest(
  tokens: readonly string[] = DEFAULT_MISSING_TOKENS,
): (text: string) => boolean {
  const set = new Set(tokens.map((t) => t.trim().toLowerCase()));
  return (text) => {
    const t = text.trim();
    return t === "" || set.has(t.toLowerCase());
  };
}
