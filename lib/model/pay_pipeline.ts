/**
 * The one road from a pay table to the figures every command reports:
 * rows kept (`where`), target and attributes encoded, pay put on its
 * fitting scale ({@linkcode payRows}); then the reference tree and the
 * ensemble by the measured defaults (lib/ensemble/fit_default.ts), and the
 * out-of-bag figures the range and the estimate's centre are read from
 * ({@linkcode outOfBagFigures}). `fit` (and the guided flow), `review` and
 * `gap` all call these; each adds only what is its own (the gap check's
 * ensembles stay unpruned, the review reads a range per person).
 *
 * @module
 */

import { type DroppedColumn, makeDataset } from "../dataset/make_dataset.ts";
import type { Dataset } from "../dataset/types.ts";
import { OptionError } from "../errors.ts";
import { type EstimateCenter, estimateCenter } from "../ensemble/estimate_center.ts";
import {
  groupResiduals,
  type ResidualGroups,
  summarizeResidualGroups,
} from "../ensemble/grouped_range.ts";
import { DEFAULT_RANGE } from "../ensemble/defaults.ts";
import { type PayScale, toFitScale } from "../ensemble/pay_scale.ts";
import { residualGroupCount } from "../ensemble/read_profile.ts";
import { filterRows } from "../table/filter_rows.ts";
import { isPayName } from "../table/money.ts";
import type { MoneyUnit, Table } from "../table/types.ts";

/**
 * The smallest privacy minimum anything accepts: a group of fewer people
 * than this never has a figure of its own (no mean, no count, no leaf).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { OptionError } from "../errors.ts";
 * import { checkedPrivacyMin, PRIVACY_FLOOR } from "./pay_pipeline.ts";
 * assert.equal(checkedPrivacyMin(PRIVACY_FLOOR), 3);
 * assert.throws(
 *   () => checkedPrivacyMin(PRIVACY_FLOOR - 1),
 *   (e: unknown) =>
 *     e instanceof OptionError && /must be a whole number of at least 3, got 2/.test(e.message),
 * );
 * ```
 */
export const PRIVACY_FLOOR = 3;

/**
 * The privacy minimum when none is given.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { DEFAULT_PRIVACY_MIN } from "./pay_pipeline.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 60, seed: 1 }));
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 0, folds: 3, workers: 1 });
 * assert.equal(model.settings.privacyMin, DEFAULT_PRIVACY_MIN);
 * // No node of the reference tree holds fewer people than that.
 * assert(model.reference.tree.rows.every((n) => n >= DEFAULT_PRIVACY_MIN));
 * ```
 */
export const DEFAULT_PRIVACY_MIN = 5;

/**
 * The privacy minimum asked for, checked against {@linkcode PRIVACY_FLOOR}.
 *
 * @throws {OptionError} (option `privacyMin`) for a value below the floor or not whole.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { checkedPrivacyMin } from "./pay_pipeline.ts";
 * assert.equal(checkedPrivacyMin(undefined), 5);
 * assert.throws(() => checkedPrivacyMin(2), /at least 3/);
 * ```
 */
export function checkedPrivacyMin(privacyMin: number | undefined): number {
  const value = privacyMin ?? DEFAULT_PRIVACY_MIN;
  if (!Number.isInteger(value) || value < PRIVACY_FLOOR) {
    throw new OptionError(
      `{privacyMin} must be a whole number of at least ${PRIVACY_FLOOR}, got ${value}`,
    );
  }
  return value;
}

/** Options of {@linkcode payRows}. */
export interface PayRowsOptions {
  /** The column to estimate. */
  target: string;
  /** The attributes (default: every usable column). */
  features?: string[];
  /** Columns to leave out. */
  drop?: string[];
  /** Keep only rows matching these (values of one column are alternatives). */
  where?: Readonly<Record<string, readonly string[]>>;
  /**
   * Allow protected attributes as features.
   * @default {false}
   */
  allowProtected?: boolean;
  /** Fitting scale of a numeric target (default: log for money, else raw). */
  scale?: PayScale;
}

/** A table's rows ready to fit: kept, encoded and on the fitting scale. */
export interface PayRows {
  /** The table after `where`. */
  table: Table;
  /** The encoded rows with the target as read (money for pay). */
  encoded: Dataset;
  /** The same rows with a numeric target on its fitting scale. */
  dataset: Dataset;
  /** Row of `table` of each dataset row. */
  rowIndex: Int32Array;
  /** Columns that are not attributes, with the reason. */
  dropped: DroppedColumn[];
  /** The fitting scale ("raw" for a class target). */
  scale: PayScale;
  /** The target's currency and period, when it is money. */
  money?: MoneyUnit;
}

/**
 * Keeps, encodes and scales a table's rows for fitting.
 *
 * @throws {OptionError} for names or conditions that do not fit the table.
 * @throws {DataError} for pay at or below zero on the log scale.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "../../mod.ts";
 * import { payRows } from "./pay_pipeline.ts";
 * const table = loadTable("site,years,pay_eur\nN,1,40000\nS,2,50000\nN,3,60000\n", { target: "pay_eur" });
 * const rows = payRows(table, { target: "pay_eur", where: { site: ["N"] } });
 * assert.equal(rows.scale, "log"); // money: fitted on logs
 * assert.deepEqual(Array.from(rows.dataset.target.values), [Math.log(40000), Math.log(60000)]);
 * ```
 */
export function payRows(table: Table, options: PayRowsOptions): PayRows {
  const filtered = filterRows(table, options.where ?? {});
  const { dataset: encoded, dropped, rowIndex } = makeDataset(filtered, {
    target: options.target,
    features: options.features,
    drop: options.drop,
    allowProtected: options.allowProtected,
  });
  const targetColumn = filtered.columns.find((c) => c.name === options.target)!;
  const money = targetColumn.type === "numeric" ? targetColumn.money : undefined;
  let scale: PayScale = "raw";
  let dataset = encoded;
  if (encoded.target.kind === "regression") {
    const isMoney = money !== undefined || isPayName(options.target);
    // Money on the scale the range was measured on (DEFAULT_RANGE: logs).
    scale = options.scale ?? (isMoney ? DEFAULT_RANGE.scale : "raw");
    if (scale === "log") {
      dataset = {
        ...encoded,
        target: {
          ...encoded.target,
          values: toFitScale(encoded.target.values, "log", options.target),
        },
      };
    }
  } else if (options.scale === "log") {
    throw new OptionError(`{scale} log needs a numeric target; "${options.target}" is a class`);
  }
  return {
    table: filtered,
    encoded,
    dataset,
    rowIndex,
    dropped,
    scale,
    ...(money ? { money } : {}),
  };
}

/** What the range and the estimate's centre are read from. */
export interface OutOfBagFigures {
  /** Out-of-bag residuals grouped by the size of the estimate (the range's source). */
  residuals: ResidualGroups;
  /** The shift to a measured median and the smearing factor. */
  center: EstimateCenter;
}

/**
 * The out-of-bag figures of a regression ensemble: residual groups (none
 * smaller than the privacy minimum) and the estimate's centre.
 *
 * @param oob Each row's out-of-bag estimate on the fitting scale (NaN: none).
 * @param y The target on the fitting scale.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { outOfBagFigures } from "./pay_pipeline.ts";
 * const y = Float64Array.from({ length: 200 }, (_, i) => 10 + (i % 7) / 10);
 * // Residuals 0.05, 0.04, 0.03 in turn: their median is 0.04.
 * const oob = y.map((v, i) => v - 0.05 + (i % 3) / 100);
 * const figures = outOfBagFigures(oob, y, 5);
 * assert(Math.abs(figures.center.shift - 0.04) < 1e-12);
 * assert.equal(figures.residuals.edges.at(-1), Infinity);
 * ```
 */
export function outOfBagFigures(
  oob: ArrayLike<number>,
  y: ArrayLike<number>,
  privacyMin: number,
): OutOfBagFigures {
  return {
    residuals: summarizeResidualGroups(
      groupResiduals(oob, y, residualGroupCount(y.length)),
      privacyMin,
    ),
    center: estimateCenter(oob, y),
  };
}
