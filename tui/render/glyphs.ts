/**
 * The characters the screens draw with: Unicode box drawing by default,
 * plain ASCII with `--ascii` (for terminals and logs that mangle UTF-8).
 *
 * @module
 */

/** Whether screens are limited to ASCII; set once at start by `--ascii`. */
let asciiOnly = false;

/** Limits (or not) every screen to ASCII characters. */
export function setAscii(on: boolean): void {
  asciiOnly = on;
}

/** Whether screens are limited to ASCII. */
export function isAscii(): boolean {
  return asciiOnly;
}

/** cli-table3 border characters: box drawing, or ASCII under `--ascii`. */
export function tableChars(): Record<string, string> | undefined {
  if (!asciiOnly) return undefined;
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

/** asciichart's symbols: its defaults, or ASCII under `--ascii`. */
export function chartSymbols(): string[] | undefined {
  return asciiOnly ? ["+", "|", "-", "-", "-", "\\", "/", "\\", "/", "|"] : undefined;
}
