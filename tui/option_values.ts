/**
 * Readers of option values typed on the command line: whole numbers with
 * their bounds, seeds, shares and coverages. Each refuses what is not
 * written as such (an empty value, `0x10`, `1e3`, ` 12`), so that a typo
 * never becomes a setting: `Number("")` is 0, and `--trees ""` once fitted
 * the reference tree alone without a word.
 *
 * @module
 */

import { InvalidArgumentError } from "@commander-js/extra-typings";

/**
 * The most trees paygrove fits in one ensemble (200 is the default).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { recordingTerminal } from "./terminal.ts";
 * import { run } from "./main.ts";
 * import { MAX_TREES } from "./option_values.ts";
 * const terminal = recordingTerminal();
 * const args = ["fit", "pay.csv", "--target", "pay", "--out", "m.json"];
 * assert.equal(await run([...args, "--trees", String(MAX_TREES + 1)], terminal), 2);
 * assert.match(terminal.stderr.join(""), /expected a whole number from 0 to 10,000, got "10001"/);
 * ```
 */
export const MAX_TREES = 10_000;
/**
 * The most people `demo-data` invents.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { recordingTerminal } from "./terminal.ts";
 * import { run } from "./main.ts";
 * import { MAX_DEMO_ROWS } from "./option_values.ts";
 * const terminal = recordingTerminal();
 * assert.equal(await run(["demo-data", "--rows", String(MAX_DEMO_ROWS + 1)], terminal), 2);
 * assert.match(terminal.stderr.join(""), /from 1 to 10,000,000/);
 * ```
 */
export const MAX_DEMO_ROWS = 10_000_000;
/**
 * The largest seed: the generators take 32-bit seeds, so a larger one would alias a smaller.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { MAX_SEED, seedOption } from "./option_values.ts";
 * assert.equal(seedOption(String(MAX_SEED)), 2147483647);
 * assert.throws(() => seedOption(String(MAX_SEED + 1)), /from 0 to 2,147,483,647/);
 * ```
 */
export const MAX_SEED = 2 ** 31 - 1;

const DIGITS = /^[0-9]+$/;

/**
 * Parses a whole number from `min` to `max`, written in digits only.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { wholeNumber } from "./option_values.ts";
 * assert(wholeNumber(2, 20)("10") === 10);
 * assert.throws(() => wholeNumber(0)(""), /a whole number >= 0, got ""/);
 * assert.throws(() => wholeNumber(2, 20)("21"), /from 2 to 20/);
 * assert.throws(() => wholeNumber(0)("1e3"));
 * ```
 */
export function wholeNumber(min: number, max = Number.MAX_SAFE_INTEGER) {
  return (text: string): number => {
    const value = DIGITS.test(text) ? Number(text) : NaN;
    if (!Number.isSafeInteger(value) || value < min || value > max) {
      const range = max === Number.MAX_SAFE_INTEGER
        ? `>= ${min}`
        : `from ${min} to ${max.toLocaleString("en-US")}`;
      throw new InvalidArgumentError(`expected a whole number ${range}, got "${text}"`);
    }
    return value;
  };
}

/**
 * Parses a seed: a whole number from 0 to 2,147,483,647.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { seedOption } from "./option_values.ts";
 * assert(seedOption("2026") === 2026);
 * assert.throws(() => seedOption("4294967296"), /from 0 to 2,147,483,647/);
 * ```
 */
export function seedOption(text: string): number {
  return wholeNumber(0, MAX_SEED)(text);
}

// A share written as 0.05 or 5%; NaN when it is neither.
function readShare(text: string): number {
  const trimmed = text.trim();
  const percent = trimmed.endsWith("%");
  const body = percent ? trimmed.slice(0, -1).trim() : trimmed;
  if (!/^(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)$/.test(body)) return NaN;
  return percent ? Number(body) / 100 : Number(body);
}

/**
 * Parses a share from 0 up to (not including) 1, as 0.05 or 5%.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { shareOption } from "./option_values.ts";
 * assert(shareOption("5%") === 0.05 && shareOption("0.02") === 0.02);
 * assert.throws(() => shareOption(""), /a share such as 0.05 or 5%/);
 * ```
 */
export function shareOption(text: string): number {
  const share = readShare(text);
  if (!(share >= 0 && share < 1)) {
    throw new InvalidArgumentError(`expected a share such as 0.05 or 5%, got "${text}"`);
  }
  return share;
}

/**
 * Parses the coverage of an interval or range: a share from 0.5 to 0.99,
 * as 0.9 or 90%. Full coverage is no interval (it would reach the lowest
 * and highest pay there could be), and below a half is no range to quote.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { coverageOption } from "./option_values.ts";
 * assert(coverageOption("0.8") === 0.8 && coverageOption("95%") === 0.95);
 * assert.throws(() => coverageOption("1"), /from 0.5 to 0.99.*full coverage/);
 * ```
 */
export function coverageOption(text: string): number {
  const share = readShare(text);
  if (!(share >= 0.5 && share <= 0.99)) {
    const full = share === 1 ? " (full coverage would span every pay there could be)" : "";
    throw new InvalidArgumentError(
      `expected a coverage from 0.5 to 0.99, such as 0.9 or 90%, got "${text}"${full}`,
    );
  }
  return share;
}

/**
 * Collects repeated `COLUMN=VALUE` options into alternatives per column.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { collectWhere } from "./option_values.ts";
 * const once = collectWhere("site=North");
 * assert.deepEqual(collectWhere("site=Harbor", once), { site: ["North", "Harbor"] });
 * assert.throws(() => collectWhere("site="), /expected COLUMN=VALUE/);
 * ```
 */
export function collectWhere(text: string, previous: Record<string, string[]> = {}) {
  const at = text.indexOf("=");
  if (at <= 0 || at === text.length - 1) {
    throw new InvalidArgumentError(`expected COLUMN=VALUE, got "${text}"`);
  }
  const column = text.slice(0, at).trim();
  const value = text.slice(at + 1).trim();
  return { ...previous, [column]: [...(previous[column] ?? []), value] };
}
