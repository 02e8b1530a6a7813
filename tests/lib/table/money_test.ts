import assert from "node:assert/strict";
import { DataError, OptionError } from "../../../lib/errors.ts";
import type { Amount } from "../../../lib/table/amount.ts";
import {
  applyFte,
  isPayName,
  lineList,
  periodFromName,
  PERIODS_PER_YEAR,
  settleMoney,
} from "../../../lib/table/money.ts";

const opts = { column: "pay", file: "pay.csv" };
const lines = [2, 3, 4, 5, 6, 7, 8];

function thrown<T extends Error>(run: () => unknown, kind: new (...a: never[]) => T): T {
  try {
    run();
  } catch (error) {
    assert.ok(error instanceof kind, String(error));
    return error as T;
  }
  assert.fail("no error");
}

Deno.test("pay names: pay words, words glued to a year, base beside a time word, rates", () => {
  for (const name of ["salary", "Base Salary", "salary2024", "pay_2024", "annual_base"]) {
    assert.equal(isPayName(name), true, name);
  }
  for (const name of ["prior_year_base", "hourly_rate", "day rate", "Gehalt", "OTE", "gross_eur"]) {
    assert.equal(isPayName(name), true, name);
  }
  for (const name of ["base", "rate", "site", "level", "years", "payroll_id", "tax rate", "age"]) {
    assert.equal(isPayName(name), false, name);
  }
});

Deno.test("a period is read from the first word of time in a name", () => {
  assert.equal(periodFromName("hourly_rate"), "hour");
  assert.equal(periodFromName("pay per week"), "week");
  assert.equal(periodFromName("Monthly Salary"), "month");
  assert.equal(periodFromName("annual_base"), "year");
  assert.equal(periodFromName("salary"), undefined);
  assert.equal(periodFromName("weekday"), undefined);
});

Deno.test("a week is 52, a month 12 and a year 1 per year", () => {
  assert.deepEqual(PERIODS_PER_YEAR, { week: 52, month: 12, year: 1 });
});

Deno.test("line lists: one line, several, and more than shown", () => {
  assert.equal(lineList([7]), "line 7");
  assert.equal(lineList([2, 5]), "lines 2, 5");
  assert.equal(lineList([2, 3, 4, 5, 6, 7, 8]), "lines 2, 3, 4, 5, 6 and 2 more");
  assert.equal(lineList([2, 3], 10), "lines 2, 3 and 8 more");
  assert.equal(lineList([9, 10, 11], 3, 2), "lines 9, 10 and 1 more");
});

Deno.test("one currency and one period settle the unit; values are not changed", () => {
  const values = Float64Array.of(50000, 61000, NaN);
  const amounts: (Amount | undefined)[] = [
    { value: 50000, currency: "EUR", period: "year" },
    { value: 61000, currency: "EUR" },
    undefined,
  ];
  const settled = settleMoney(values, amounts, lines, { ...opts, defaultPeriod: "year" });
  assert.deepEqual(settled, { unit: { currency: "EUR", period: "year" }, notes: [] });
  assert.deepEqual(Array.from(values.subarray(0, 2)), [50000, 61000]);
});

Deno.test("no currency nor period gives an empty unit", () => {
  const settled = settleMoney(Float64Array.of(1, 2), [{ value: 1 }, { value: 2 }], lines, opts);
  assert.deepEqual(settled, { unit: {}, notes: [] });
  assert.deepEqual(settleMoney(new Float64Array(0), [], [], opts), { unit: {}, notes: [] });
});

Deno.test("two currencies are refused with the lines of each", () => {
  const amounts: Amount[] = [
    { value: 1, currency: "EUR" },
    { value: 2, currency: "USD" },
    { value: 3, currency: "EUR" },
  ];
  const error = thrown(
    () => settleMoney(Float64Array.of(1, 2, 3), amounts, lines, opts),
    DataError,
  );
  assert.equal(
    error.message,
    'pay.csv: "pay" mixes currencies (EUR on lines 2, 4; USD on line 3); pay in different ' +
      "currencies cannot be compared without exchange rates: convert it to one currency first",
  );
  assert.deepEqual(error.location, { file: "pay.csv", column: "pay", line: 3 });
});

Deno.test("--currency must agree with a stated code, settles an ambiguous symbol", () => {
  const eur: Amount[] = [{ value: 1, currency: "EUR" }];
  const error = thrown(
    () => settleMoney(Float64Array.of(1), eur, lines, { ...opts, currency: "usd" }),
    OptionError,
  );
  assert.equal(error.message, 'currency USD: "pay" is written in EUR (line 2)');
  const dollar: Amount[] = [{ value: 1, currency: "USD", currencyAmbiguous: true }];
  assert.deepEqual(
    settleMoney(Float64Array.of(1), dollar, lines, { ...opts, currency: "cad" }).unit,
    { currency: "CAD" },
  );
  assert.deepEqual(settleMoney(Float64Array.of(1), dollar, lines, opts), {
    unit: { currency: "USD" },
    notes: ["the symbol was read as USD; give {currency} to say otherwise"],
  });
  // A currency given for plain numbers is the unit.
  assert.deepEqual(
    settleMoney(Float64Array.of(1), [{ value: 1 }], lines, { ...opts, currency: "gbp" }).unit,
    { currency: "GBP" },
  );
});

Deno.test("mixed periods are annualised: month x 12, week x 52, hour x the hours given", () => {
  const values = Float64Array.of(5000, 1000, 40, 60000);
  const amounts: Amount[] = [
    { value: 5000, period: "month" },
    { value: 1000, period: "week" },
    { value: 40, period: "hour" },
    { value: 60000, period: "year" },
  ];
  const settled = settleMoney(values, amounts, lines, { ...opts, hoursPerYear: 2080 });
  assert.deepEqual(Array.from(values), [60000, 52000, 83200, 60000]);
  assert.deepEqual(settled.unit, { period: "year" });
  assert.deepEqual(settled.notes, [
    "annualised (per month x 12, per week x 52, hourly x 2080 hours)",
  ]);
});

Deno.test("values without a period take the default period when periods are mixed", () => {
  const values = Float64Array.of(4000, 50000);
  const amounts: Amount[] = [{ value: 4000 }, { value: 50000, period: "year" }];
  settleMoney(values, amounts, lines, { ...opts, defaultPeriod: "month" });
  assert.deepEqual(Array.from(values), [48000, 50000]);
});

Deno.test("all hourly with hours per year given becomes yearly", () => {
  const values = Float64Array.of(20, 30.5);
  const amounts: Amount[] = [{ value: 20, period: "hour" }, { value: 30.5, period: "hour" }];
  const settled = settleMoney(values, amounts, lines, { ...opts, hoursPerYear: 1600 });
  assert.deepEqual(Array.from(values), [32000, 48800]);
  assert.deepEqual(settled.unit, { period: "year" });
  // Without hours per year, hourly stays hourly.
  const kept = Float64Array.of(20);
  assert.deepEqual(settleMoney(kept, [{ value: 20, period: "hour" }], lines, opts).unit, {
    period: "hour",
  });
  assert.equal(kept[0], 20);
});

Deno.test("mixed periods with some unstated, or hourly without hours, are refused", () => {
  const amounts: Amount[] = [
    { value: 4000, period: "month" },
    { value: 50000 },
    { value: 1 },
    { value: 900, period: "week" },
  ];
  const error = thrown(
    () => settleMoney(Float64Array.of(4000, 50000, 1, 900), amounts, lines, opts),
    DataError,
  );
  assert.equal(
    error.message,
    'pay.csv: "pay" mixes pay periods (month, week), and lines 3, 4 state none; ' +
      "give period pay=PERIOD for the values that do not say",
  );
  assert.equal(error.location.line, 3);
  // One period stated on a few cells and none on the others is refused too:
  // it used to name the whole column's period ("4000/month" beside 85,000
  // made every value a month's pay), said nowhere.
  const one = thrown(
    () =>
      settleMoney(
        Float64Array.of(4000, 85000),
        [{ value: 4000, period: "month" }, { value: 85000 }],
        lines,
        opts,
      ),
    DataError,
  );
  assert.equal(
    one.message,
    'pay.csv: "pay" states pay per month on line 2, and line 3 states none; ' +
      "give period pay=PERIOD for the values that do not say",
  );
  // Every value stating the period: that period, no change.
  const all = Float64Array.of(4000, 4100);
  const settled = settleMoney(
    all,
    [{ value: 4000, period: "month" }, { value: 4100, period: "month" }],
    lines,
    opts,
  );
  assert.deepEqual(settled.unit, { period: "month" });
  assert.deepEqual(Array.from(all), [4000, 4100]);
  const hourly: Amount[] = [{ value: 20, period: "hour" }, { value: 5000, period: "month" }];
  const noHours = thrown(
    () => settleMoney(Float64Array.of(20, 5000), hourly, lines, opts),
    DataError,
  );
  assert.equal(
    noHours.message,
    'pay.csv: "pay" mixes hourly pay (line 2) with pay per month (line 3); ' +
      "give hoursPerYear to annualise the hourly values",
  );
});

Deno.test("FTE fractions scale pay to full time; percentages are told by a maximum of 90-100", () => {
  const names = { pay: "pay", fte: "fte", file: "pay.csv" };
  const pay = Float64Array.of(30000, 60000, 45000, NaN);
  const result = applyFte(pay, Float64Array.of(0.5, 1, NaN, 0.75), lines, names);
  // 30000 / 0.5 = 60000; 45000 with no FTE becomes missing; a missing pay stays missing.
  assert.deepEqual(result, { percent: false, madeMissing: 1 });
  assert.deepEqual(Array.from(pay.subarray(0, 2)), [60000, 60000]);
  assert.ok(Number.isNaN(pay[2]) && Number.isNaN(pay[3]));
  const inPercent = Float64Array.of(30000, 40000);
  assert.deepEqual(applyFte(inPercent, Float64Array.of(50, 100), lines, names), {
    percent: true,
    madeMissing: 0,
  });
  assert.deepEqual(Array.from(inPercent), [60000, 40000]);
});

Deno.test("FTE out of range is refused with its line: 0, negative, above 1, hours per week", () => {
  const names = { pay: "pay", fte: "fte", file: "pay.csv" };
  const cases: [number[], number, number][] = [
    [[0.5, 0], 3, 0],
    [[-0.2, 1], 2, -0.2],
    [[1, 1.2], 3, 1.2],
    [[40, 38], 2, 40], // weekly hours: largest 40 is neither a fraction nor a percentage
    [[101, 0.5], 2, 101], // above 100: not a percentage either
  ];
  for (const [fte, line, value] of cases) {
    const error = thrown(
      () => applyFte(new Float64Array(fte.length).fill(1000), Float64Array.from(fte), lines, names),
      DataError,
    );
    assert.equal(
      error.message,
      `pay.csv line ${line}: "fte" is ${value}, not a full-time-equivalent fraction between 0 ` +
        "and 1 (or a percentage up to 100)",
    );
    assert.deepEqual(error.location, { file: "pay.csv", line, column: "fte" });
  }
});
