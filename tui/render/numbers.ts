/**
 * Formatting numbers and money for people, with `Intl.NumberFormat`.
 *
 * @module
 */

import type { MoneyUnit } from "../../mod.ts";

/** How to format money and numbers. */
export interface NumberStyle {
  /**
   * BCP 47 locale for digit grouping and decimal marks.
   * @default {"en-US"}
   */
  locale?: string;
  /** ISO 4217 currency to show money in, overriding the column's. */
  currency?: string;
  /**
   * Limit money to ASCII (`EUR 61,235`, no symbol, no no-break space).
   * @default {false}
   */
  ascii?: boolean;
}

const PERIOD_WORDS: Record<string, string> = {
  hour: "an hour",
  week: "a week",
  month: "a month",
  year: "a year",
};

/**
 * Formats a plain number with grouping and at most `digits` decimals.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { formatNumber } from "./numbers.ts";
 * assert(formatNumber(18777.2) === "18,777.2");
 * assert(formatNumber(1234.5, { locale: "de-DE" }) === "1.234,5");
 * ```
 */
export function formatNumber(value: number, style: NumberStyle = {}, digits = 4): string {
  return new Intl.NumberFormat(style.locale ?? "en-US", { maximumFractionDigits: digits })
    .format(value);
}

/**
 * Formats an amount of money in a currency; with no currency known, as a
 * number with at most two decimals.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { formatMoney } from "./numbers.ts";
 * assert(formatMoney(85000, { currency: "USD" }) === "$85,000.00");
 * assert(formatMoney(85000, { currency: "EUR", locale: "de-DE" }) === "85.000,00\u00a0€");
 * assert(formatMoney(522.3, {}) === "522.3");
 * ```
 */
export function formatMoney(value: number, style: NumberStyle): string {
  if (style.currency === undefined) return formatNumber(value, style, 2);
  return new Intl.NumberFormat(style.locale ?? "en-US", {
    style: "currency",
    currency: style.currency,
    currencyDisplay: style.ascii === true ? "code" : "symbol",
  }).format(value).replace(style.ascii === true ? /[\u00a0\u202f]/g : /(?!)/, " ");
}

/**
 * Describes a money unit in words: `"USD a week"`, `"pay a year, currency not stated"`.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { describeUnit } from "./numbers.ts";
 * assert(describeUnit({ currency: "EUR", period: "year" }) === "EUR a year");
 * ```
 */
export function describeUnit(unit: MoneyUnit, currency?: string): string {
  const code = currency ?? unit.currency;
  const per = unit.period ? ` ${PERIOD_WORDS[unit.period]}` : "";
  return code === undefined ? `pay${per}, currency not stated` : `${code}${per}`;
}

/**
 * Formats an estimate of pay: whole units from 100 up (pay estimates are
 * not precise to the cent), two decimals below (hourly rates).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { formatPay } from "./numbers.ts";
 * assert(formatPay(61234.56, { currency: "EUR" }) === "€61,235");
 * assert(formatPay(23.456, { currency: "USD" }) === "$23.46");
 * assert(formatPay(512.4, {}) === "512");
 * assert(formatPay(-19.64, { currency: "EUR" }, true) === "-€20");
 * ```
 */
export function formatPay(value: number, style: NumberStyle, wholeUnits = false): string {
  // Whole units from 100 up, and for nothing at all (not "0.00"); a change
  // of a salary is said in whole units too (`wholeUnits`).
  const digits = wholeUnits || Math.abs(value) >= 100 || value === 0 ? 0 : 2;
  if (style.currency === undefined) return formatNumber(value, style, digits);
  return new Intl.NumberFormat(style.locale ?? "en-US", {
    style: "currency",
    currency: style.currency,
    // Under --ascii, "EUR 61,235" rather than a symbol outside ASCII.
    currencyDisplay: style.ascii === true ? "code" : "symbol",
    minimumFractionDigits: digits,
    maximumFractionDigits: digits,
    // Intl puts a no-break space after a currency code: a plain one under --ascii.
  }).format(value).replace(style.ascii === true ? /[\u00a0\u202f]/g : /(?!)/, " ");
}

/**
 * A share as a percentage with one decimal.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { formatPercent } from "./numbers.ts";
 * assert(formatPercent(0.1234) === "12.3%" && formatPercent(-0.05, true) === "-5.0%");
 * assert(formatPercent(0.05, true) === "+5.0%");
 * ```
 */
export function formatPercent(share: number, signed = false, style: NumberStyle = {}): string {
  return new Intl.NumberFormat(style.locale ?? "en-US", {
    style: "percent",
    minimumFractionDigits: 1,
    maximumFractionDigits: 1,
    signDisplay: signed ? "exceptZero" : "auto",
  }).format(share);
}

/**
 * A change in money with its sign always shown: `+€1,200`, `-€300`.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { formatSignedPay } from "./numbers.ts";
 * assert.equal(formatSignedPay(1200, { currency: "EUR" }), "+€1,200");
 * assert.equal(formatSignedPay(-300.4, { currency: "EUR" }, true), "-€300");
 * ```
 */
export function formatSignedPay(value: number, style: NumberStyle, wholeUnits = false): string {
  return `${value >= 0 ? "+" : "-"}${formatPay(Math.abs(value), style, wholeUnits)}`;
}

/**
 * A coverage or confidence level as a whole percentage: `90%`, `95%`.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { formatLevel } from "./numbers.ts";
 * assert.equal(formatLevel(0.9), "90%");
 * assert.equal(formatLevel(0.95, { locale: "de-DE" }), "95%");
 * ```
 */
export function formatLevel(share: number, style: NumberStyle = {}): string {
  return `${formatNumber(100 * share, style, 0)}%`;
}

/**
 * A tree's size in words: `1 leaf`, `44 leaves`.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { formatLeaves } from "./numbers.ts";
 * assert.equal(formatLeaves(1), "1 leaf");
 * assert.equal(formatLeaves(44), "44 leaves");
 * ```
 */
export function formatLeaves(count: number): string {
  return `${count} ${count === 1 ? "leaf" : "leaves"}`;
}
