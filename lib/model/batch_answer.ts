/**
 * Batch scoring: every row of a table with the model's columns, training
 * rows with their out-of-bag estimate, offers placed in the range.
 *
 * @module
 */

import { bootstrapCounts } from "../ensemble/bootstrap.ts";
import { toMoney } from "../ensemble/pay_scale.ts";
import { rangeShareBelow, readProfile } from "../ensemble/read_profile.ts";
import { applyValues, type FlatTree } from "../tree/flat_tree.ts";
import { OptionError } from "../errors.ts";
import { rowKey } from "./fit_model.ts";
import type { Profile } from "./profile.ts";
import type { ModelRows } from "./model_table.ts";
import type { Model } from "./types.ts";
import { checkCoverage, type ModelSession, resamplesOf, shiftedMoney } from "./model_session.ts";
import { profileSupport } from "./estimate_answer.ts";
import type { SupportReason } from "./answer_notes.ts";
import {
  type ContributionsAnswer,
  contributionsAnswer,
  contributionsOf,
  contributionTrees,
} from "./contributions_answer.ts";
import { contributionsOfMany } from "../ensemble/contributions_parallel.ts";
import type { FittingPool } from "../ensemble/_worker_pool.ts";

/** One scored row of `batch`. */
export interface BatchRow {
  /** The estimate in money (out-of-bag for training rows; null for a refused row). */
  estimate: number | null;
  /** Where the estimate came from; `not-scored` for a refused row. */
  estimateSource: "out-of-bag" | "ensemble" | "reference-tree" | "not-scored";
  /** The reference tree's leaf value (null for a refused row). */
  referenceTree: number | null;
  /** Why the row was not scored (a level the model never saw), or null. */
  refused: string | null;
  /** How sure. */
  ciLow: number | null;
  /** How sure. */
  ciHigh: number | null;
  /** Range. */
  rangeLow: number | null;
  /** Range. */
  rangeHigh: number | null;
  /** With an offer: offer / estimate. */
  offerToEstimate?: number | null;
  /** With an offer: (offer - range_low) / (range_high - range_low). */
  rangePosition?: number | null;
  /** With an offer: under, within or over the range. */
  offerPosition?: "under" | "within" | "over" | null;
  /**
   * With an offer: the share of comparable people paid less than it, from
   * the residual quantiles the range is read from (as `estimate --offer`).
   */
  shareBelow?: number | null;
  /** Why the row is unusual for the data, or outside it (none when it is not). */
  reasons: SupportReason[];
  /**
   * When asked for: each attribute's part of the estimate (for a training
   * row, of its out-of-bag estimate, from the trees that did not draw it);
   * null for a refused row.
   */
  contributions?: ContributionsAnswer | null;
}

/**
 * Scores every row of a table. Rows that are the model's own training rows
 * (same identifier and feature values) get their out-of-bag estimate: the
 * mean of the trees that never saw them, as at fitting time. Rows listed
 * in `rows.refused` are not scored: their figures are null and `refused`
 * says why.
 *
 * @param offers Each row's offer in money (NaN where none), or null.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { batchAnswer } from "./batch_answer.ts";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { bootstrapCounts } from "../ensemble/bootstrap.ts";
 * import { applyValues } from "../tree/flat_tree.ts";
 * import { openModel } from "./model_session.ts";
 * import { readForModel, rowProfile } from "./model_table.ts";
 * const csv = demoCompanyCsv({ rows: 200, seed: 4 });
 * const table = loadTable(csv, { target: "base_pay_eur" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 6, folds: 5, workers: 1 });
 * const session = openModel(model);
 * const trees = model.ensemble!.trees;
 * // A training row's out-of-bag estimate, worked out from the trees that did
 * // not draw it (their in-bag counts regenerated from the resampling states).
 * const counts = trees.map((_, b) => bootstrapCounts(200, model.analyst!.resamples, b));
 * const r = counts[0].findIndex((n) => n === 0); // a row tree 0 never drew
 * const rows = readForModel(model, csv, "demo.csv");
 * const p = rowProfile(rows, r);
 * const logs = trees.filter((_, b) => counts[b][r] === 0).map((t) => t.value[applyValues(t, p)]);
 * const oob = Math.exp(logs.reduce((a, b) => a + b) / logs.length + model.target.center!.shift);
 * const scored = batchAnswer(session, rows);
 * assert.equal(scored.length, 200);
 * assert.equal(scored[r].estimateSource, "out-of-bag");
 * assert(Math.abs(scored[r].estimate! - oob) <= 1e-9 * oob);
 * // An offer at the range's low end sits at position 0, share 5% (coverage 0.9).
 * const offers = new Float64Array(200).fill(NaN);
 * offers[r] = scored[r].rangeLow!;
 * const placed = batchAnswer(session, rows, 0.9, offers)[r];
 * assert.equal(placed.rangePosition, 0);
 * assert.equal(placed.offerPosition, "within");
 * assert(Math.abs(placed.shareBelow! - 0.05) < 1e-12);
 * assert.equal(batchAnswer(session, rows, 0.9, offers)[r === 0 ? 1 : 0].offerPosition, null);
 * ```
 */
export function batchAnswer(
  session: ModelSession,
  rows: ModelRows,
  coverage = 0.9,
  offers: Float64Array | null = null,
  withContributions = false,
): BatchRow[] {
  return scoreRows(session, rows, coverage, offers, withContributions, null);
}

/**
 * {@linkcode batchAnswer} with each row's contributions worked out on
 * `workers` workers (`batch --contributions`): the same figures, to the
 * last bit, in less time on several cores.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { batchAnswer, batchAnswerWithParts } from "./batch_answer.ts";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { openModel } from "./model_session.ts";
 * import { readForModel } from "./model_table.ts";
 * const csv = demoCompanyCsv({ rows: 300, seed: 4 });
 * const model = await fitModel(loadTable(csv, { target: "base_pay_eur" }), {
 *   target: "base_pay_eur", trees: 6, folds: 3, workers: 1,
 * });
 * const rows = readForModel(model, csv, "demo.csv");
 * const here = batchAnswer(openModel(model), rows, 0.9, null, true);
 * const there = await batchAnswerWithParts(openModel(model), rows, 2);
 * assert.deepEqual(there, here);
 * assert(there.some((r) => r.estimateSource === "out-of-bag" && r.contributions!.trees < 6));
 * ```
 */
export async function batchAnswerWithParts(
  session: ModelSession,
  rows: ModelRows,
  workers: number | FittingPool,
  coverage = 0.9,
  offers: Float64Array | null = null,
): Promise<BatchRow[]> {
  const wanted: PartsWanted[] = [];
  const out = scoreRows(session, rows, coverage, offers, false, wanted);
  for (const row of out) row.contributions = null;
  const trees = contributionTrees(session.model);
  if (trees === null) return out;
  const raw = await contributionsOfMany(
    trees,
    session.model.features.length,
    wanted.map((w) => w.profile),
    wanted.map((w) => w.only),
    workers,
  );
  wanted.forEach((w, i) => {
    out[w.row].contributions = contributionsAnswer(
      session.model,
      w.profile,
      raw[i],
      w.only?.length,
    );
  });
  return out;
}

// A row whose contributions are to be worked out elsewhere.
interface PartsWanted {
  row: number;
  profile: Float64Array;
  only: Int32Array | null;
}

function scoreRows(
  session: ModelSession,
  rows: ModelRows,
  coverage: number,
  offers: Float64Array | null,
  withContributions: boolean,
  partsWanted: PartsWanted[] | null,
): BatchRow[] {
  checkCoverage(coverage);
  const { model, reader } = session;
  if (model.target.kind !== "regression") {
    throw new OptionError(`batch needs a model of pay (a numeric target)`);
  }
  const scale = model.target.scale;
  const training = trainingIndex(model);
  const ensemble = model.ensemble;
  const resamples = resamplesOf(model);
  const counts = ensemble !== null && resamples !== null && training.size > 0
    ? ensemble.trees.map((_, b) => bootstrapCounts(model.rows.used, resamples, b))
    : [];
  const out: BatchRow[] = [];
  const profile = new Float64Array(model.features.length);
  const refused = new Map((rows.refused ?? []).map((x) => [x.row, x.reasons.join("; ")]));
  for (let r = 0; r < rows.rows; r++) {
    const why = refused.get(r);
    if (why !== undefined) {
      out.push({
        estimate: null,
        estimateSource: "not-scored",
        referenceTree: null,
        refused: why,
        ciLow: null,
        ciHigh: null,
        rangeLow: null,
        rangeHigh: null,
        ...(offers !== null
          ? { offerToEstimate: null, rangePosition: null, offerPosition: null, shareBelow: null }
          : {}),
        reasons: [],
        ...(withContributions ? { contributions: null } : {}),
      });
      continue;
    }
    for (let g = 0; g < profile.length; g++) profile[g] = rows.features[g][r];
    const tree = model.reference.tree;
    const leaf = applyValues(tree, profile);
    const referenceTree = toMoney(tree.value[leaf], scale);
    const reasons = profileSupport(model, profile, tree.rows[leaf]).reasons;
    let row: BatchRow;
    if (reader === null || ensemble === null) {
      row = {
        estimate: referenceTree,
        estimateSource: "reference-tree",
        referenceTree,
        refused: null,
        ciLow: null,
        ciHigh: null,
        rangeLow: null,
        rangeHigh: null,
        reasons,
      };
    } else {
      const reading = readProfile(reader, profile, coverage);
      row = {
        estimate: reading.estimate,
        estimateSource: "ensemble",
        referenceTree,
        refused: null,
        ciLow: reading.howSure.low,
        ciHigh: reading.howSure.high,
        rangeLow: reading.range.low,
        rangeHigh: reading.range.high,
        reasons,
      };
      const index = rows.ids[r] === "" || counts.length === 0
        ? undefined
        : training.get(rowKey(rows.ids[r], profile));
      if (index !== undefined) {
        const oob = outOfBag(ensemble, counts, index, profile);
        if (oob !== null) {
          row.estimate = shiftedMoney(model, oob);
          row.estimateSource = "out-of-bag";
        }
      }
    }
    if (withContributions) {
      // A training row's parts come from the trees its estimate comes from.
      const only = row.estimateSource === "out-of-bag"
        ? outOfBagTrees(counts, training.get(rowKey(rows.ids[r], profile))!)
        : undefined;
      row.contributions = contributionsOf(model, profile, only);
    } else if (partsWanted !== null) {
      partsWanted.push({
        row: r,
        profile: Float64Array.from(profile),
        only: row.estimateSource === "out-of-bag"
          ? outOfBagTrees(counts, training.get(rowKey(rows.ids[r], profile))!)
          : null,
      });
    }
    if (offers !== null) {
      const offer = offers[r];
      if (Number.isNaN(offer) || row.rangeLow === null || row.rangeHigh === null) {
        row.offerToEstimate = Number.isNaN(offer) ? null : offer / row.estimate!;
        row.rangePosition = null;
        row.offerPosition = null;
        row.shareBelow = null;
      } else {
        row.offerToEstimate = offer / row.estimate!;
        row.rangePosition = (offer - row.rangeLow) / (row.rangeHigh - row.rangeLow);
        row.offerPosition = offer < row.rangeLow
          ? "under"
          : offer > row.rangeHigh
          ? "over"
          : "within";
        const tail = (1 - coverage) / 2;
        row.shareBelow = offer === row.rangeLow
          ? tail
          : offer === row.rangeHigh
          ? 1 - tail
          : rangeShareBelow(reader!, profile, offer, coverage);
      }
    }
    out.push(row);
  }
  return out;
}

/**
 * The out-of-bag estimate (money) of a profile that is one of the model's
 * training rows (same identifier and attributes), or null when it is not
 * one, the model has no ensemble, or the analyst's part (which alone can
 * tell training rows and their trees' resamples) is not at hand.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { outOfBagEstimate } from "./batch_answer.ts";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { bootstrapCounts } from "../ensemble/bootstrap.ts";
 * import { applyValues } from "../tree/flat_tree.ts";
 * import { openModel } from "./model_session.ts";
 * import { readForModel, rowProfile } from "./model_table.ts";
 * const csv = demoCompanyCsv({ rows: 200, seed: 4 });
 * const table = loadTable(csv, { target: "base_pay_eur" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 6, folds: 5, workers: 1 });
 * const session = openModel(model);
 * const trees = model.ensemble!.trees;
 * // A training row's out-of-bag estimate, worked out from the trees that did
 * // not draw it (their in-bag counts regenerated from the resampling states).
 * const counts = trees.map((_, b) => bootstrapCounts(200, model.analyst!.resamples, b));
 * const r = counts[0].findIndex((n) => n === 0); // a row tree 0 never drew
 * const rows = readForModel(model, csv, "demo.csv");
 * const p = rowProfile(rows, r);
 * const logs = trees.filter((_, b) => counts[b][r] === 0).map((t) => t.value[applyValues(t, p)]);
 * const oob = Math.exp(logs.reduce((a, b) => a + b) / logs.length + model.target.center!.shift);
 * const estimate = outOfBagEstimate(session, rows.ids[r], p)!;
 * assert(Math.abs(estimate - oob) <= 1e-9 * oob);
 * // Another identifier, or a shared model without the analyst's part: no training row.
 * assert.equal(outOfBagEstimate(session, "NOT-AN-ID", p), null);
 * assert.equal(outOfBagEstimate(openModel({ ...model, analyst: null }), rows.ids[r], p), null);
 * ```
 */
export function outOfBagEstimate(
  session: ModelSession,
  id: string,
  profile: Profile,
): number | null {
  const { model } = session;
  const resamples = resamplesOf(model);
  if (
    model.ensemble === null || resamples === null || id === "" ||
    model.target.kind !== "regression"
  ) return null;
  const index = trainingIndex(model).get(rowKey(id, profile));
  if (index === undefined) return null;
  const counts = model.ensemble.trees.map((_, b) => bootstrapCounts(model.rows.used, resamples, b));
  const oob = outOfBag(model.ensemble, counts, index, profile);
  return oob === null ? null : shiftedMoney(model, oob);
}

// Training row keys -> training row index.
function trainingIndex(model: Model): Map<string, number> {
  const map = new Map<string, number>();
  const keys = model.analyst?.rowKeys ?? null;
  if (keys === null) return map;
  // Each key is 12 characters of base64 (8 bytes).
  for (let i = 0; i * 12 < keys.length; i++) {
    const key = keys.slice(12 * i, 12 * i + 12);
    // A key seen twice (duplicate rows) cannot say which row it is.
    map.set(key, map.has(key) ? -1 : i);
  }
  for (const [key, i] of map) if (i < 0) map.delete(key);
  return map;
}

function outOfBag(
  ensemble: { trees: readonly FlatTree[] },
  counts: Float64Array[],
  row: number,
  profile: Profile,
): number | null {
  let sum = 0;
  let n = 0;
  ensemble.trees.forEach((tree, b) => {
    if (counts[b][row] !== 0) return;
    sum += tree.value[applyValues(tree, profile)];
    n++;
  });
  return n > 0 ? sum / n : null;
}

// The trees that did not draw training row `row`.
function outOfBagTrees(counts: Float64Array[], row: number): Int32Array {
  const trees: number[] = [];
  counts.forEach((drawn, b) => {
    if (drawn[row] === 0) trees.push(b);
  });
  return Int32Array.from(trees);
}
