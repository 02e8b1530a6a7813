// Property check of pay parsing against an outside formatter: amounts
// written by the ICU data behind Intl.NumberFormat (V8's, not ours) in a
// range of locales must read back to the same value and currency.
import assert from "node:assert/strict";
import fc from "fast-check";
import { parseAmount } from "../../../lib/table/amount.ts";

const LOCALES: [locale: string, currency: string, decimal: "." | ","][] = [
  ["en-US", "USD", "."],
  ["en-GB", "GBP", "."],
  ["en-IN", "INR", "."],
  ["ja-JP", "JPY", "."],
  ["de-CH", "CHF", "."],
  ["de-DE", "EUR", ","],
  ["fr-FR", "EUR", ","],
  ["es-ES", "EUR", ","],
  ["nl-NL", "EUR", ","],
  ["pt-BR", "BRL", ","],
];

Deno.test("amounts formatted by Intl in ten locales read back exactly", () => {
  fc.assert(
    fc.property(
      fc.integer({ min: 0, max: 2_000_000_000 }),
      fc.constantFrom(...LOCALES),
      fc.boolean(),
      (cents, [locale, currency, decimal], asCode) => {
        const value = currency === "JPY" ? Math.round(cents / 100) : cents / 100;
        const text = new Intl.NumberFormat(locale, {
          style: "currency",
          currency,
          currencyDisplay: asCode ? "code" : "symbol",
        }).format(value);
        const amount = parseAmount(text, decimal);
        assert.ok(amount, `${locale}: could not read "${text}"`);
        assert.equal(amount.value, value, `${locale}: "${text}"`);
        assert.equal(amount.currency, currency, `${locale}: "${text}"`);
      },
    ),
    { numRuns: 2000, seed: 20261202 },
  );
});

Deno.test("plain numbers formatted by Intl read back exactly", () => {
  fc.assert(
    fc.property(
      fc.integer({ min: -1_000_000_000, max: 1_000_000_000 }),
      fc.constantFrom(...LOCALES),
      (cents, [locale, , decimal]) => {
        const value = cents / 100;
        const text = new Intl.NumberFormat(locale, { maximumFractionDigits: 2 }).format(value);
        assert.equal(parseAmount(text, decimal)?.value, value, `${locale}: "${text}"`);
      },
    ),
    { numRuns: 2000, seed: 20261202 },
  );
});
