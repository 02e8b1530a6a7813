/**
 * Terminal styling that switches itself off where it does not belong: when
 * `NO_COLOR` is set (https://no-color.org) or output is not a terminal.
 *
 * @module
 */

/** Text styles; each returns its input unchanged when colour is off. */
export interface Style {
  /** True when ANSI styling is on. */
  enabled: boolean;
  /** True when screens are limited to ASCII characters (`--ascii`). */
  ascii: boolean;
  /** Emphasis for headings and key figures. */
  bold(text: string): string;
  /** Secondary text: notes, hints. */
  dim(text: string): string;
  /** Warnings. */
  warn(text: string): string;
  /** Protected-attribute markers and cautions. */
  caution(text: string): string;
}

const wrap = (open: number, close: number) => (text: string) =>
  `\x1b[${open}m${text}\x1b[${close}m`;
const same = (text: string) => text;

/**
 * Makes a style.
 *
 * @param enabled Whether to emit ANSI codes.
 * @param ascii Whether screens are limited to ASCII (box drawing, symbols).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { makeStyle } from "./style.ts";
 * assert(makeStyle(false).bold("x") === "x");
 * assert(makeStyle(true).bold("x") === "\x1b[1mx\x1b[22m");
 * ```
 */
export function makeStyle(enabled: boolean, ascii = false): Style {
  return enabled
    ? {
      enabled,
      ascii,
      bold: wrap(1, 22),
      dim: wrap(2, 22),
      warn: wrap(33, 39),
      caution: wrap(35, 39),
    }
    : { enabled, ascii, bold: same, dim: same, warn: same, caution: same };
}

/**
 * The style for a stream: on only for a terminal, and never with `NO_COLOR`.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { styleFor } from "./style.ts";
 * assert.equal(styleFor({ isTerminal: () => false }).bold("x"), "x");
 * assert.equal(styleFor({ isTerminal: () => true }).enabled, !Deno.noColor);
 * ```
 */
export function styleFor(stream: { isTerminal(): boolean }): Style {
  return makeStyle(stream.isTerminal() && !Deno.noColor);
}
