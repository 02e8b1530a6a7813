/**
 * The characters the screens draw with: Unicode box drawing by default,
 * plain ASCII with `--ascii` (for terminals and logs that mangle UTF-8).
 *
 * @module
 */

/**
 * cli-table3 border characters: box drawing (cli-table3's own), or ASCII
 * under `--ascii` (the style's `ascii`).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { tableChars } from "./glyphs.ts";
 * assert.equal(tableChars(false), undefined);
 * assert(Object.values(tableChars(true)!).every((c) => c.charCodeAt(0) < 128));
 * ```
 */
export function tableChars(ascii: boolean): Record<string, string> | undefined {
  if (!ascii) return undefined;
  return {
    top: "-",
    "top-mid": "+",
    "top-left": "+",
    "top-right": "+",
    bottom: "-",
    "bottom-mid": "+",
    "bottom-left": "+",
    "bottom-right": "+",
    left: "|",
    "left-mid": "+",
    mid: "-",
    "mid-mid": "+",
    right: "|",
    "right-mid": "+",
    middle: "|",
  };
}

/**
 * asciichart's symbols: its defaults, or ASCII under `--ascii`.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { chartSymbols } from "./glyphs.ts";
 * assert.equal(chartSymbols(false), undefined);
 * assert(chartSymbols(true)!.every((c) => c.charCodeAt(0) < 128));
 * ```
 */
export function chartSymbols(ascii: boolean): string[] | undefined {
  return ascii ? ["+", "|", "-", "-", "-", "\\", "/", "\\", "/", "|"] : undefined;
}
