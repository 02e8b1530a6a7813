/**
 * A model opened for answers: the reader of its ensemble built once, the
 * checks every answer shares (coverage), and the shift of log-scale
 * figures to a measured median.
 *
 * @module
 */

import { STATE_WORDS } from "../ensemble/bootstrap.ts";
import { toMoney } from "../ensemble/pay_scale.ts";
import { type ProfileReader, readerFromParts } from "../ensemble/read_profile.ts";
import { OptionError } from "../errors.ts";
import type { Model } from "./types.ts";

/** A prepared model: the reader of its ensemble, built once. */
export interface ModelSession {
  /** The model. */
  model: Model;
  /** The ensemble's reader (regression with an ensemble), else null. */
  reader: ProfileReader | null;
}

/**
 * Prepares a model for answers (regenerates what the jackknife needs when
 * the analyst's part is at hand).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { openModel } from "./model_session.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 200, seed: 4 }), { target: "base_pay_eur" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 6, folds: 5, workers: 1 });
 * const session = openModel(model);
 * assert.equal(session.model, model);
 * assert.equal(session.reader!.trainingRows, 200);
 * assert.equal(session.reader!.ensemble.trees, model.ensemble!.trees);
 * assert.equal(session.reader!.groups, model.residuals);
 * // 6 trees for 200 rows: fewer than one a row, so no jackknife counts.
 * assert.equal(session.reader!.bag, null);
 * // Without an ensemble only the reference tree answers: no reader.
 * assert.equal(openModel({ ...model, ensemble: null }).reader, null);
 * ```
 */
export function openModel(model: Model): ModelSession {
  const reader = model.ensemble !== null && model.residuals !== null &&
      model.target.kind === "regression"
    ? readerFromParts({
      ensemble: model.ensemble,
      scale: model.target.scale,
      groups: model.residuals,
      trainingRows: model.rows.used,
      resamples: resamplesOf(model),
      center: model.target.center ?? null,
    })
    : null;
  return { model, reader };
}

/**
 * The trees' resampling states, when the analyst's part has one per tree
 * (a shared model file has none: null).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { resamplesOf } from "./model_session.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 200, seed: 4 }), { target: "base_pay_eur" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 6, folds: 5, workers: 1 });
 * assert.equal(resamplesOf(model), model.analyst!.resamples);
 * assert.equal(resamplesOf({ ...model, analyst: null }), null);
 * ```
 */
export function resamplesOf(model: Model): Int32Array | null {
  const states = model.analyst?.resamples;
  const trees = model.ensemble?.trees.length ?? 0;
  return states !== undefined && trees > 0 && states.length === trees * STATE_WORDS ? states : null;
}

/**
 * Checks a coverage option.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { OptionError } from "../errors.ts";
 * import { checkCoverage } from "./model_session.ts";
 * checkCoverage(0.5);
 * checkCoverage(0.99);
 * assert.throws(() => checkCoverage(0.49), OptionError);
 * assert.throws(() => checkCoverage(0.995), /between 0.5 and 0.99, got 0.995/);
 * assert.throws(() => checkCoverage(NaN), OptionError);
 * ```
 */
export function checkCoverage(coverage: number): void {
  if (!(coverage >= 0.5 && coverage <= 0.99)) {
    throw new OptionError(`{coverage} must be between 0.5 and 0.99, got ${coverage}`);
  }
}

/**
 * A log-scale estimate in money, moved by the model's measured shift to a
 * median (batch and sweep figures, as `readProfile` moves the estimate).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { shiftedMoney } from "./model_session.ts";
 * const model = { target: { scale: "log", center: { shift: 0.02 } } } as unknown as import("./types.ts").Model;
 * assert(Math.abs(shiftedMoney(model, Math.log(50000)) - 50000 * Math.exp(0.02)) < 1e-6);
 * ```
 */
export function shiftedMoney(model: Model, value: number): number {
  const shift = model.target.scale === "log" ? model.target.center?.shift ?? 0 : 0;
  return toMoney(value + shift, model.target.scale);
}
