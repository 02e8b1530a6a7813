/**
 * Money columns: one currency, one pay period, and the conversions people
 * ask for (hourly to annual, part-time to full-time-equivalent).
 *
 * @module
 */

import { DataError, OptionError } from "../errors.ts";
import type { Amount } from "./amount.ts";
import type { MoneyUnit, PayPeriod } from "./types.ts";
import { nameWords } from "./protected_names.ts";

/** Words in a column name that mark it as pay. */
const PAY_WORDS = new Set([
  "pay",
  "salary",
  "salaries",
  "wage",
  "wages",
  "compensation",
  "comp",
  "earnings",
  "income",
  "bonus",
  "remuneration",
  // Found as copies of pay an outside trial slipped past the words above.
  "gross",
  "brutto",
  "netto",
  "gehalt",
  "lohn",
  "salaire",
  "salario",
  "sueldo",
  "ote",
  "ctc",
  "tcc",
  "cash",
]);

// "base" is pay beside a word of time or kind ("annual_base", "prior_year_base").
const BASE_WITH = new Set(["annual", "year", "yearly", "prior", "current", "new", "old"]);

/** Words in a pay column's name that say its period. */
const NAME_PERIODS: Record<string, PayPeriod> = {
  hourly: "hour",
  hour: "hour",
  weekly: "week",
  week: "week",
  monthly: "month",
  month: "month",
  annual: "year",
  yearly: "year",
};

/**
 * Weeks and months in a year, used to put mixed periods on a yearly basis
 * (52 weeks: common practice; 12 months: exact).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "./load_table.ts";
 * import { PERIODS_PER_YEAR } from "./money.ts";
 * const pay = loadTable("level,pay\nL1,4000/month\nL2,1000/week\nL3,52000/year\n").columns[1];
 * assert(pay.type === "numeric");
 * assert.deepEqual([...pay.values], [
 *   4000 * PERIODS_PER_YEAR.month,
 *   1000 * PERIODS_PER_YEAR.week,
 *   52000,
 * ]);
 * assert.deepEqual(pay.notes, ["annualised (per month x 12, per week x 52)"]);
 * ```
 */
export const PERIODS_PER_YEAR: Readonly<Record<Exclude<PayPeriod, "hour">, number>> = {
  week: 52,
  month: 12,
  year: 1,
};

/**
 * True when a column's name says it holds pay (`base_pay`, `Salary`,
 * `hourlyWage`).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { isPayName } from "./money.ts";
 * assert(isPayName("base_pay") && !isPayName("payroll_id"));
 * assert(isPayName("salary2024") && isPayName("gross_eur") && isPayName("prior_year_base"));
 * assert(!isPayName("base_site"));
 * assert(!isPayName("years_experience"));
 * ```
 */
export function isPayName(name: string): boolean {
  // "salary2024", "pay_2024": a year or number glued to the word.
  const words = nameWords(name).map((w) => w.replace(/[0-9]+$/, ""));
  if (words.some((w) => PAY_WORDS.has(w))) return true;
  if (words.includes("base") && words.some((w) => BASE_WITH.has(w))) return true;
  // "hourly_rate", "day rate", "monthly rate": a rate paid per period.
  return words.includes("rate") && words.some((w) => w in NAME_PERIODS || w === "day");
}

/**
 * The pay period a column's name states (`hourly_rate` -> `"hour"`), if any.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { periodFromName } from "./money.ts";
 * assert(periodFromName("monthly_salary") === "month");
 * ```
 */
export function periodFromName(name: string): PayPeriod | undefined {
  for (const word of nameWords(name)) {
    const period = NAME_PERIODS[word];
    if (period) return period;
  }
  return undefined;
}

/** How to settle a money column's unit; see {@linkcode settleMoney}. */
export interface SettleMoneyOptions {
  /** Column name, for messages. */
  column: string;
  /** File name, for messages. */
  file: string;
  /** The currency the user says the table is in. */
  currency?: string;
  /** The period the values are for when no cell says. */
  defaultPeriod?: PayPeriod;
  /** Hours in a working year, to annualise hourly pay. */
  hoursPerYear?: number;
}

/** A money column's settled unit and what was done to reach it. */
export interface SettledMoney {
  /** The unit of the converted values. */
  unit: MoneyUnit;
  /** Sentences for the schema's notes. */
  notes: string[];
}

/**
 * Checks that a money column uses one currency, and puts its values on one
 * pay period, converting in place: mixed periods go to per-year (months x12,
 * weeks x52, hours x `hoursPerYear`), and hourly pay is annualised when
 * `hoursPerYear` is given. Refuses mixed currencies (no exchange rates are
 * known here) and hours mixed with other periods without `hoursPerYear`.
 *
 * @param values Parsed values, converted in place; `NaN` where missing.
 * @param amounts The parsed cell for each row (undefined where missing).
 * @param lines Source line of each row, for messages.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { settleMoney } from "./money.ts";
 * // 4,000 a month is 48,000 a year; 25 an hour at 2,000 hours is 50,000.
 * const values = Float64Array.of(4000, 52000, 25);
 * const settled = settleMoney(values, [
 *   { value: 4000, period: "month" },
 *   { value: 52000, period: "year" },
 *   { value: 25, period: "hour" },
 * ], [2, 3, 4], { column: "pay", file: "t.csv", hoursPerYear: 2000 });
 * assert.deepEqual([...values], [48000, 52000, 50000]);
 * assert.deepEqual(settled.unit, { period: "year" });
 * // Two currencies cannot be compared without exchange rates.
 * assert.throws(() =>
 *   settleMoney(Float64Array.of(1, 2), [
 *     { value: 1, currency: "EUR" },
 *     { value: 2, currency: "GBP" },
 *   ], [2, 3], { column: "pay", file: "t.csv" }), /mixes currencies/);
 * ```
 */
export function settleMoney(
  values: Float64Array,
  amounts: readonly (Amount | undefined)[],
  lines: ArrayLike<number>,
  options: SettleMoneyOptions,
): SettledMoney {
  const { column, file } = options;
  const notes: string[] = [];
  const currencies = new Map<string, number[]>();
  let ambiguous = false;
  const periods = new Map<PayPeriod, number[]>();
  for (let r = 0; r < amounts.length; r++) {
    const amount = amounts[r];
    if (amount === undefined) continue;
    if (amount.currency !== undefined) {
      const at = currencies.get(amount.currency) ?? [];
      at.push(lines[r]);
      currencies.set(amount.currency, at);
      if (amount.currencyAmbiguous) ambiguous = true;
    }
    const period = amount.period ?? options.defaultPeriod;
    if (period !== undefined) {
      const at = periods.get(period) ?? [];
      at.push(lines[r]);
      periods.set(period, at);
    }
  }
  if (currencies.size > 1) {
    const listed = [...currencies].map(([code, at]) => `${code} on ${lineList(at)}`).join("; ");
    throw new DataError(
      `${file}: "${column}" mixes currencies (${listed}); pay in different currencies ` +
        `cannot be compared without exchange rates: convert it to one currency first`,
      { file, column, line: [...currencies.values()][1][0] },
    );
  }
  let currency = [...currencies.keys()][0];
  if (options.currency !== undefined) {
    const wanted = options.currency.toUpperCase();
    if (currency !== undefined && currency !== wanted && !ambiguous) {
      throw new OptionError(
        `{currency} ${wanted}: "${column}" is written in ${currency} (${
          lineList(currencies.get(currency)!)
        })`,
      );
    }
    currency = wanted;
  } else if (ambiguous && currency !== undefined) {
    notes.push(`the symbol was read as ${currency}; give {currency} to say otherwise`);
  }

  let period: PayPeriod | undefined = periods.size === 1 ? [...periods.keys()][0] : undefined;
  const hours = periods.get("hour");
  // Values that state no period beside values that do: one period stated
  // on a few cells ("4000/month") would otherwise name the whole column's.
  if (periods.size >= 1 && options.defaultPeriod === undefined) {
    const unstated: number[] = [];
    let unstatedCount = 0;
    for (let r = 0; r < amounts.length; r++) {
      if (amounts[r] !== undefined && amounts[r]!.period === undefined) {
        unstatedCount++;
        if (unstated.length < 5) unstated.push(lines[r]);
      }
    }
    if (unstatedCount > 0) {
      const [only, at] = [...periods][0];
      throw new DataError(
        (periods.size > 1
          ? `${file}: "${column}" mixes pay periods (${[...periods.keys()].join(", ")}), and `
          : `${file}: "${column}" states pay per ${only} on ${lineList(at)}, and `) +
          `${lineList(unstated, unstatedCount)} ${
            unstatedCount === 1 ? "states" : "state"
          } none; ` +
          `give {period} ${column}=PERIOD ` +
          `for the values that do not say`,
        { file, column, line: unstated[0] },
      );
    }
  }
  if (periods.size > 1 || (hours && options.hoursPerYear !== undefined)) {
    if (hours && options.hoursPerYear === undefined) {
      const others = [...periods].filter(([p]) => p !== "hour");
      throw new DataError(
        `${file}: "${column}" mixes hourly pay (${lineList(hours)}) with pay per ${others[0][0]} (${
          lineList(others[0][1])
        }); give {hoursPerYear} to annualise the hourly values`,
        { file, column, line: hours[0] },
      );
    }
    for (let r = 0; r < amounts.length; r++) {
      const amount = amounts[r];
      if (amount === undefined) continue;
      const from = amount.period ?? options.defaultPeriod;
      if (from === undefined || from === "year") continue;
      values[r] *= from === "hour" ? options.hoursPerYear! : PERIODS_PER_YEAR[from];
    }
    const converted = [...periods.keys()].filter((p) => p !== "year");
    const how = converted.map((p) =>
      p === "hour" ? `hourly x ${options.hoursPerYear} hours` : `per ${p} x ${PERIODS_PER_YEAR[p]}`
    );
    notes.push(`annualised (${how.join(", ")})`);
    period = "year";
  }
  const unit: MoneyUnit = {};
  if (currency !== undefined) unit.currency = currency;
  if (period !== undefined) unit.period = period;
  return { unit, notes };
}

/**
 * Divides pay by a full-time-equivalent fraction in place. Fractions must lie
 * in (0, 1]; a column whose values all lie in (0, 100] with some above 1 is
 * read as percentages. A missing or invalid fraction makes the pay missing.
 *
 * @returns How the fractions were read and how many pay values became missing.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { applyFte } from "./money.ts";
 * const names = { pay: "pay", fte: "fte", file: "t.csv" };
 * // 30,000 at half time is 60,000 full time; a missing fraction makes pay missing.
 * const pay = Float64Array.of(30000, 50000, 40000);
 * const read = applyFte(pay, Float64Array.of(0.5, 1, NaN), [2, 3, 4], names);
 * assert.deepEqual([...pay], [60000, 50000, NaN]);
 * assert.deepEqual(read, { percent: false, madeMissing: 1 });
 * // Largest value 100: percentages, so 80 means 0.8 (32,000 / 0.8 = 40,000).
 * const pay2 = Float64Array.of(32000, 45000);
 * assert.equal(applyFte(pay2, Float64Array.of(80, 100), [2, 3], names).percent, true);
 * assert.deepEqual([...pay2], [40000, 45000]);
 * ```
 */
export function applyFte(
  pay: Float64Array,
  fte: Float64Array,
  lines: ArrayLike<number>,
  names: { pay: string; fte: string; file: string },
): { percent: boolean; madeMissing: number } {
  let max = 0;
  for (let r = 0; r < fte.length; r++) if (fte[r] > max) max = fte[r];
  // Percentages when the largest value is about full time (90-100); a column
  // of weekly hours (up to 40, say) is neither fractions nor percentages.
  const percent = max >= 90 && max <= 100;
  const limit = percent ? 100 : 1;
  for (let r = 0; r < fte.length; r++) {
    const f = fte[r];
    if (!Number.isNaN(f) && (f <= 0 || f > limit)) {
      throw new DataError(
        `${names.file} line ${lines[r]}: "${names.fte}" is ${f}, not a full-time-equivalent ` +
          `fraction between 0 and 1 (or a percentage up to 100)`,
        { file: names.file, line: lines[r], column: names.fte },
      );
    }
  }
  let madeMissing = 0;
  for (let r = 0; r < pay.length; r++) {
    const f = fte[r];
    if (Number.isNaN(f)) {
      if (!Number.isNaN(pay[r])) madeMissing++;
      pay[r] = NaN;
    } else {
      pay[r] /= percent ? f / 100 : f;
    }
  }
  return { percent, madeMissing };
}

/**
 * Formats line numbers: "lines 3, 8, 12 and 2 more". `total` is the number
 * of lines concerned when `lines` holds only the first few.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { lineList } from "./money.ts";
 * assert(lineList([3, 8], 166) === "lines 3, 8 and 164 more");
 * ```
 */
export function lineList(lines: readonly number[], total = lines.length, shown = 5): string {
  const head = lines.slice(0, shown).join(", ");
  const listed = Math.min(lines.length, shown);
  const more = total > listed ? ` and ${total - listed} more` : "";
  return `line${total === 1 ? "" : "s"} ${head}${more}`;
}
