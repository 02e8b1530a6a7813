/**
 * Reading numbers and pay amounts the way people export them:
 * `85000`, `$85,000`, `85 000 €`, `85.000,00` (with a comma decimal),
 * `85k`, `42.50/hour`.
 *
 * Digit grouping is checked strictly (groups of three after the first), so
 * that `1,5` under a point decimal is refused rather than read as 15.
 *
 * @module
 */

import type { PayPeriod } from "./types.ts";

/** The decimal mark used by the file. */
export type DecimalMark = "." | ",";

/** A number read from a cell, with any money unit it carried. */
export interface Amount {
  /** The value, after any `k` or `M` multiplier. */
  value: number;
  /** ISO 4217 code named or implied by a symbol in the cell. */
  currency?: string;
  /** True when the currency came from a symbol shared by several currencies (`$`). */
  currencyAmbiguous?: boolean;
  /** Pay period named by a suffix such as `/hour` or `per year`. */
  period?: PayPeriod;
}

// Symbols and codes people write beside amounts. "$" alone is read as USD
// but flagged ambiguous so that --currency can say otherwise.
const SYMBOLS: Record<string, { code: string; ambiguous?: boolean }> = {
  "$": { code: "USD", ambiguous: true },
  "US$": { code: "USD" },
  "C$": { code: "CAD" },
  "CA$": { code: "CAD" },
  "A$": { code: "AUD" },
  "AU$": { code: "AUD" },
  "NZ$": { code: "NZD" },
  "€": { code: "EUR" },
  "£": { code: "GBP" },
  "¥": { code: "JPY", ambiguous: true },
  "￥": { code: "JPY", ambiguous: true },
  "R$": { code: "BRL" },
  "₹": { code: "INR" },
  "₩": { code: "KRW" },
  "zł": { code: "PLN" },
  "kr": { code: "SEK", ambiguous: true },
  "Fr.": { code: "CHF" },
};

const PERIOD_WORDS: Record<string, PayPeriod> = {
  h: "hour",
  hr: "hour",
  hrs: "hour",
  hour: "hour",
  hourly: "hour",
  wk: "week",
  week: "week",
  weekly: "week",
  mo: "month",
  mon: "month",
  month: "month",
  monthly: "month",
  y: "year",
  yr: "year",
  year: "year",
  annum: "year",
  annual: "year",
  annually: "year",
  "p.a.": "year",
  pa: "year",
};

const PERIOD_SUFFIX =
  /\s*(?:(?:\/|per\s+|an?\s+)\s*(h|hrs?|hour|wk|week|mo|mon|month|y|yr|year|annum)|\b(hourly|weekly|monthly|annual|annually|p\.a\.|pa))\.?$/i;
const CODE = /^[A-Z]{3}$/;
const ESCAPED_SYMBOLS = Object.keys(SYMBOLS)
  .sort((a, b) => b.length - a.length)
  .map((s) => s.replace(/[.$]/g, "\\$&"));
const CURRENCY_PREFIX = new RegExp(`^(${ESCAPED_SYMBOLS.join("|")}|[A-Z]{3}(?=[\\s\\d.,-]))\\s*`);
const CURRENCY_SUFFIX = new RegExp(`\\s*(${ESCAPED_SYMBOLS.join("|")}|[A-Z]{3})$`);
const MULTIPLIER = /([0-9])\s*([kKmM])$/;

const GROUP_SEPARATORS: Record<DecimalMark, string> = {
  // space, no-break space, narrow no-break space, apostrophes (Swiss)
  ".": ", \u00a0\u202f'\u2019",
  ",": ". \u00a0\u202f'\u2019",
};

const HAS_DIGIT = /\d/;

/**
 * Matches a plain JavaScript-style number: `12`, `-3.5`, `1e6`, `.5`.
 * Written so that each character has one way to match (digits after a dot
 * only): the older `\d+\.?\d*` could split a run of digits n ways and took
 * 11 s on a cell of 40,000 digits and a letter.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { parseNumber, PLAIN_NUMBER } from "./amount.ts";
 * for (const text of ["12", "-3.5", "+1e6", ".5", "7."]) assert.match(text, PLAIN_NUMBER);
 * for (const text of ["1,000", "1.2.3", "0x10", "1e", "", "."]) {
 *   assert.doesNotMatch(text, PLAIN_NUMBER);
 * }
 * // A plain number reads as JavaScript reads it.
 * assert.equal(parseNumber("-3.5e2", "."), -350);
 * ```
 */
export const PLAIN_NUMBER = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;

/**
 * The longest cell read as a number or amount. The longest honest amount
 * ("EUR 1 234 567 890.00 per annum") is about 30 characters; longer text
 * is text, and the bound keeps the suffix patterns below, which try every
 * start, from taking time quadratic in a cell's length (a cell of a digit,
 * 40,000 spaces and a letter took 18 s).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { MAX_AMOUNT_CHARS, parseAmount, parseNumber } from "./amount.ts";
 * const longest = "1".padStart(MAX_AMOUNT_CHARS, "0"); // 100 characters
 * assert.equal(parseNumber(longest, "."), 1);
 * assert.equal(parseNumber(`0${longest}`, "."), undefined); // one more: text
 * assert.equal(parseAmount(`EUR ${"0".repeat(MAX_AMOUNT_CHARS)}1`, "."), undefined);
 * ```
 */
export const MAX_AMOUNT_CHARS = 100;

/**
 * Reads a number written with the given decimal mark and optional grouping,
 * without currency or unit. Returns `undefined` when the text is not one.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { parseNumber } from "./amount.ts";
 * assert(parseNumber("1,234.5", ".") === 1234.5);
 * assert(parseNumber("1.234,5", ",") === 1234.5);
 * assert(parseNumber("1,5", ".") === undefined);
 * ```
 */
export function parseNumber(text: string, decimal: DecimalMark): number | undefined {
  if (text.length > MAX_AMOUNT_CHARS) return undefined;
  if (decimal === "." && PLAIN_NUMBER.test(text)) return Number(text);
  let sign = 1;
  let body = text;
  if (body.startsWith("-") || body.startsWith("+") || body.startsWith("\u2212")) {
    if (body[0] !== "+") sign = -1;
    body = body.slice(1);
  }
  const decimalAt = body.lastIndexOf(decimal);
  const whole = decimalAt >= 0 ? body.slice(0, decimalAt) : body;
  const fraction = decimalAt >= 0 ? body.slice(decimalAt + 1) : "";
  if (!/^\d*$/.test(fraction)) return undefined;
  if (whole === "" && fraction === "") return undefined;
  const wholeDigits = ungroup(whole, GROUP_SEPARATORS[decimal]);
  if (wholeDigits === undefined) return undefined;
  const value = Number(`${wholeDigits || "0"}.${fraction || "0"}`);
  return Number.isFinite(value) ? sign * value : undefined;
}

// Removes digit-group separators, or returns undefined when the grouping is
// irregular. Accepted: 1-3 digits then groups of three (1,234,567), and the
// Indian lakh grouping, 1-2 digits then groups of two and a last group of
// three (12,34,567).
function ungroup(whole: string, separators: string): string | undefined {
  if (/^\d*$/.test(whole)) return whole;
  const separator = [...separators].find((s) => whole.includes(s));
  if (separator === undefined) return undefined;
  const groups = whole.split(separator);
  const last = groups.length - 1;
  const thousands = /^\d{1,3}$/.test(groups[0]) &&
    groups.slice(1).every((g) => /^\d{3}$/.test(g));
  const lakh = /^\d{1,2}$/.test(groups[0]) && /^\d{3}$/.test(groups[last]) &&
    groups.slice(1, last).every((g) => /^\d{2}$/.test(g));
  return thousands || lakh ? groups.join("") : undefined;
}

/**
 * Reads a cell as a number or a pay amount. Returns `undefined` when the
 * text is not a finite number in any of the accepted forms (`NaN`,
 * `Infinity` and words are not numbers).
 *
 * @param text The trimmed cell text.
 * @param decimal The file's decimal mark.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { parseAmount } from "./amount.ts";
 * const a = parseAmount("85 000 €", ".");
 * assert(a?.value === 85000 && a.currency === "EUR");
 * assert(parseAmount("85k", ".")?.value === 85000);
 * assert(parseAmount("$42.50/hour", ".")?.period === "hour");
 * ```
 */
export function parseAmount(text: string, decimal: DecimalMark): Amount | undefined {
  // Most text cells (levels, names) hold no digit: refuse them at once.
  if (text.length > MAX_AMOUNT_CHARS || !HAS_DIGIT.test(text)) return undefined;
  if (decimal === "." && PLAIN_NUMBER.test(text)) {
    const value = Number(text);
    return Number.isFinite(value) ? { value } : undefined;
  }
  let body = text;
  let period: PayPeriod | undefined;
  const periodMatch = PERIOD_SUFFIX.exec(body);
  if (periodMatch && periodMatch.index > 0) {
    period = PERIOD_WORDS[(periodMatch[1] ?? periodMatch[2]).toLowerCase()];
    body = body.slice(0, periodMatch.index);
  }
  let sign = "";
  if (/^[-\u2212]/.test(body)) {
    sign = "-";
    body = body.slice(1).trimStart();
  }
  let symbol: string | undefined;
  const prefix = CURRENCY_PREFIX.exec(body);
  if (prefix) {
    symbol = prefix[1];
    body = body.slice(prefix[0].length);
  } else {
    const suffix = CURRENCY_SUFFIX.exec(body);
    if (suffix && suffix.index > 0) {
      symbol = suffix[1];
      body = body.slice(0, suffix.index);
    }
  }
  if (sign === "" && /^[-\u2212]/.test(body)) {
    sign = "-";
    body = body.slice(1);
  }
  let multiplier = 1;
  const multiplierMatch = MULTIPLIER.exec(body);
  if (multiplierMatch) {
    multiplier = /k/i.test(multiplierMatch[2]) ? 1e3 : 1e6;
    body = body.slice(0, multiplierMatch.index + 1);
  }
  body = body.trim();
  if (body === "" || (symbol === undefined && period === undefined && multiplier === 1)) {
    // Nothing but a number can remain; grouped or comma-decimal forms only.
    const plain = parseNumber(sign + body, decimal);
    return plain === undefined ? undefined : { value: plain };
  }
  const number = parseNumber(sign + body, decimal);
  if (number === undefined) return undefined;
  const amount: Amount = { value: number * multiplier };
  if (symbol !== undefined) {
    const known = SYMBOLS[symbol];
    if (known) {
      amount.currency = known.code;
      if (known.ambiguous) amount.currencyAmbiguous = true;
    } else if (CODE.test(symbol)) {
      amount.currency = symbol;
    } else {
      return undefined;
    }
  }
  if (period !== undefined) amount.period = period;
  return amount;
}
