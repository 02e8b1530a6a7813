import assert from "node:assert/strict";
import { parseAmount, parseNumber } from "../../../lib/table/amount.ts";

// Forms of pay as exported by payroll and HR tools (common practice); each
// expected value is worked out by hand.
Deno.test("parseAmount reads plain, grouped and currency-marked pay", () => {
  assert.deepEqual(parseAmount("85000", "."), { value: 85000 });
  assert.deepEqual(parseAmount("$85,000", "."), {
    value: 85000,
    currency: "USD",
    currencyAmbiguous: true,
  });
  assert.deepEqual(parseAmount("85 000 €", "."), { value: 85000, currency: "EUR" });
  assert.deepEqual(parseAmount("85\u00a0000\u00a0€", "."), { value: 85000, currency: "EUR" });
  assert.deepEqual(parseAmount("85.000,00", ","), { value: 85000 });
  assert.deepEqual(parseAmount("85.000,50 €", ","), { value: 85000.5, currency: "EUR" });
  assert.deepEqual(parseAmount("USD 85,000", "."), { value: 85000, currency: "USD" });
  assert.deepEqual(parseAmount("85,000 GBP", "."), { value: 85000, currency: "GBP" });
  assert.deepEqual(parseAmount("CHF 120'000", "."), { value: 120000, currency: "CHF" });
  assert.deepEqual(parseAmount("-$5", "."), {
    value: -5,
    currency: "USD",
    currencyAmbiguous: true,
  });
});

Deno.test("parseAmount applies k and M multipliers", () => {
  assert.deepEqual(parseAmount("85k", "."), { value: 85000 });
  assert.deepEqual(parseAmount("85.5K", "."), { value: 85500 });
  assert.deepEqual(parseAmount("1.2M", "."), { value: 1200000 });
  assert.deepEqual(parseAmount("£30k", "."), { value: 30000, currency: "GBP" });
});

Deno.test("parseAmount reads pay-period suffixes", () => {
  assert.deepEqual(parseAmount("42.50/hour", "."), { value: 42.5, period: "hour" });
  assert.deepEqual(parseAmount("42.50 per hour", "."), { value: 42.5, period: "hour" });
  assert.deepEqual(parseAmount("$42.50/hr", ".")?.period, "hour");
  assert.deepEqual(parseAmount("£30k/yr", "."), { value: 30000, currency: "GBP", period: "year" });
  assert.deepEqual(parseAmount("3,000 / month", "."), { value: 3000, period: "month" });
  assert.deepEqual(parseAmount("55000 p.a.", "."), { value: 55000, period: "year" });
});

Deno.test("parseAmount refuses what is not a finite number", () => {
  for (const text of ["abc", "NaN", "Infinity", "-Infinity", "L3", "3 years", "$", "EUR", "1-2"]) {
    assert.equal(parseAmount(text, "."), undefined, text);
  }
});

Deno.test("parseNumber checks digit grouping strictly", () => {
  assert.equal(parseNumber("1,234,567.89", "."), 1234567.89);
  assert.equal(parseNumber("1.234.567,89", ","), 1234567.89);
  assert.equal(parseNumber("12 345", "."), 12345);
  // "1,5" under a point decimal is not fifteen: refused, not guessed.
  assert.equal(parseNumber("1,5", "."), undefined);
  assert.equal(parseNumber("12,34", "."), undefined);
  assert.equal(parseNumber("1,2345", "."), undefined);
  assert.equal(parseNumber("1,5", ","), 1.5);
  assert.equal(parseNumber("-0,25", ","), -0.25);
  assert.equal(parseNumber("1e3", "."), 1000);
  assert.equal(parseNumber(".5", "."), 0.5);
});
