/**
 * The recruiter's question: is an offer inside what comparable people are
 * paid? An offer read like the table's amounts, placed against one
 * profile's estimate and range: under, within or over the range, its range
 * position, offer over estimate, the share of comparable people paid less
 * (from the residual quantiles the range itself is read from), and the
 * offers that would reach the estimate and the low end of the range.
 * Plain data, ready for JSON.
 *
 * @module
 */

import { type DecimalMark, parseAmount } from "../table/amount.ts";
import { rangeShareBelow } from "../ensemble/read_profile.ts";
import { OptionError } from "../errors.ts";
import type { EstimateAnswer } from "./estimate_answer.ts";
import type { ModelSession } from "./model_session.ts";
import type { Profile } from "./profile.ts";
import type { Model } from "./types.ts";

/** An offer as read from what the user typed. */
export interface ParsedOffer {
  /** The amount in the model's money (same currency and period). */
  amount: number;
  /** The text as given. */
  text: string;
  /**
   * How an ambiguous text was read (`61.000` in a table with a decimal
   * point), in words; null when the text could be read one way only.
   */
  readAs: string | null;
}

/** Where an offer sits: the `offer` part of the estimate answer. */
export interface OfferAnswer {
  /** The offer in money. */
  amount: number;
  /** The offer as given. */
  text: string;
  /** How an ambiguous text was read, or null. */
  readAs: string | null;
  /** Under, within or over the range (null without a range: a model with no ensemble). */
  position: "under" | "within" | "over" | null;
  /**
   * (offer - range low) / (range high - range low): 0 at the low end, 1 at
   * the high end, below 0 under the range and above 1 over it (null without
   * a range).
   */
  rangePosition: number | null;
  /** Offer / estimate (1.05: 5% above the estimate). */
  offerToEstimate: number;
  /**
   * The share of comparable people paid less than the offer, from the
   * residual quantiles the range is read from: the range's low end is at
   * (1 - coverage) / 2, its high end at (1 + coverage) / 2 (null without a
   * range).
   */
  shareBelow: number | null;
  /** The range's coverage the shares refer to (null without a range). */
  coverage: number | null;
  /**
   * The offers that would reach the estimate and the low end of the range,
   * with the change from this offer (negative: the offer is already above
   * by that much).
   */
  reach: {
    estimate: { offer: number; change: number };
    rangeLow: { offer: number; change: number } | null;
  };
  /** How the share was made, in words. */
  method: string;
}

const SHARE_METHOD = "the out-of-bag residual quantiles of people with similar estimates " +
  "(those the range is read from), read at the offer";

// A decimal mark before exactly three digits and nothing more ("61.000",
// "€61,000"): no one writes an offer to a tenth of a cent, so it groups
// thousands whatever the table's decimal mark.
const THOUSANDS_ONLY = /^\d{1,3}[.,]\d{3}$/;

/**
 * Reads an offer like the table's amounts (`61000`, `61k`, `€61,000`,
 * `61.000 €`), with the decimal mark the model's table was read with; a
 * mark before exactly three digits (`€61.000`) groups thousands. A currency
 * or pay period that differs from the model's is refused.
 *
 * @throws {OptionError} for a model of classes, a text that is no amount, an
 * amount of zero or less, or another currency or period.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { parseOffer } from "./offer.ts";
 * const model = {
 *   read: { decimal: "." },
 *   target: { kind: "regression", name: "pay", money: { currency: "EUR", period: "year" } },
 * } as unknown as import("./types.ts").Model;
 * assert.equal(parseOffer(model, "61k").amount, 61000);
 * assert.equal(parseOffer(model, "61,000").amount, 61000);
 * const dotted = parseOffer(model, "€61.000");
 * assert.equal(dotted.amount, 61000);
 * assert.match(dotted.readAs!, /thousands/);
 * assert.equal(parseOffer(model, "61000.50").amount, 61000.5);
 * assert.throws(() => parseOffer(model, "$61,000"), /USD/);
 * assert.throws(() => parseOffer(model, "lots"), /not an amount/);
 * ```
 */
export function parseOffer(model: Model, text: string): ParsedOffer {
  if (model.target.kind !== "regression") {
    throw new OptionError(
      `{offer} needs a model of pay (a numeric target); "${model.target.name}" is a class`,
    );
  }
  const given = text.trim();
  const decimal: DecimalMark = model.read.decimal;
  const other: DecimalMark = decimal === "." ? "," : ".";
  let read = parseAmount(given, decimal);
  let readAs: string | null = null;
  const core = given.replace(/[^\d.,]/g, "");
  if (THOUSANDS_ONLY.test(core)) {
    const grouped = parseAmount(given, other);
    if (read !== undefined && grouped !== undefined && grouped.value > read.value) {
      readAs = `read "${given}" as ${grouped.value}: a mark before exactly three digits ` +
        `groups thousands in an offer`;
      read = grouped;
    } else if (read === undefined) read = grouped;
  }
  if (read === undefined) {
    throw new OptionError(
      `{offer}: "${given}" is not an amount (write it like 61000, 61k or 61,000)`,
    );
  }
  if (!(read.value > 0 && Number.isFinite(read.value))) {
    throw new OptionError(`{offer} must be above zero, got ${given}`);
  }
  const unit = model.target.money;
  if (
    read.currency !== undefined && unit?.currency !== undefined && read.currency !== unit.currency
  ) {
    throw new OptionError(
      `{offer}: "${given}" is in ${read.currency}; the model's pay is in ${unit.currency}`,
    );
  }
  if (read.period !== undefined && unit?.period !== undefined && read.period !== unit.period) {
    throw new OptionError(
      `{offer}: "${given}" is pay per ${read.period}; the model's pay is per ${unit.period}`,
    );
  }
  return { amount: read.value, text: given, readAs };
}

/**
 * Places an offer against one profile's answer (the range and estimate of
 * {@linkcode estimateProfile} for `profile`, at its coverage).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import {
 *   checkOffer, demoCompanyCsv, estimateProfile, fitModel, loadTable, openModel, parseOffer,
 *   typicalProfile,
 * } from "../../mod.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 400, seed: 3 }), { target: "base_pay_eur" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 20, folds: 5, workers: 1 });
 * const session = openModel(model);
 * const profile = typicalProfile(model);
 * const answer = estimateProfile(session, profile, 0.9);
 * const atLow = checkOffer(session, profile, answer, parseOffer(model, String(answer.range!.low)));
 * assert.equal(atLow.position, "within");
 * assert.equal(atLow.rangePosition, 0);
 * assert(Math.abs(atLow.shareBelow! - 0.05) < 1e-9);
 * const far = checkOffer(session, profile, answer, parseOffer(model, "1"));
 * assert.equal(far.position, "under");
 * assert.equal(far.shareBelow, 0);
 * assert.equal(far.reach.rangeLow!.change, answer.range!.low - 1);
 * ```
 */
export function checkOffer(
  session: ModelSession,
  profile: Profile,
  answer: EstimateAnswer,
  offer: ParsedOffer,
): OfferAnswer {
  const { amount } = offer;
  const range = answer.range;
  const estimate = answer.estimate;
  const base = {
    amount,
    text: offer.text,
    readAs: offer.readAs,
    offerToEstimate: amount / estimate,
    method: SHARE_METHOD,
  };
  if (range === null || session.reader === null) {
    return {
      ...base,
      position: null,
      rangePosition: null,
      shareBelow: null,
      coverage: null,
      reach: { estimate: { offer: estimate, change: estimate - amount }, rangeLow: null },
      method: "no range: the model has no ensemble",
    };
  }
  const tail = (1 - range.coverage) / 2;
  // The ends are exact: money and the fitting scale round differently.
  const shareBelow = amount === range.low
    ? tail
    : amount === range.high
    ? 1 - tail
    : rangeShareBelow(session.reader, profile, amount, range.coverage);
  return {
    ...base,
    position: amount < range.low ? "under" : amount > range.high ? "over" : "within",
    rangePosition: (amount - range.low) / (range.high - range.low),
    shareBelow,
    coverage: range.coverage,
    reach: {
      estimate: { offer: estimate, change: estimate - amount },
      rangeLow: { offer: range.low, change: range.low - amount },
    },
  };
}
