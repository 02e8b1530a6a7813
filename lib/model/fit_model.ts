/**
 * Fitting a whole model from a loaded table: rows chosen, target on its
 * scale, the cross-validated reference tree, the ensemble, accuracy of the
 * constant model, the linear baseline, the reference tree and the ensemble
 * side by side, importance, and the support figures. The one library call
 * behind `paygrove fit` and the guided flow.
 *
 * @module
 */

import { createHash } from "node:crypto";
import type { Dataset } from "../dataset/types.ts";
import { OptionError } from "../errors.ts";
import { VERSION } from "../version.ts";
import { quantile } from "../table/quality.ts";
import type { LoadTableOptions } from "../table/load_table.ts";
import type { LevelColumn, Table } from "../table/types.ts";
import {
  PROXY_THRESHOLD,
  type ProxyFigure,
  proxyFigureSets,
  type ProxyQuestion,
} from "../ensemble/proxies.ts";
import { FittingPool } from "../ensemble/_worker_pool.ts";
import { proxyFigureSetsAside } from "../ensemble/proxies_parallel.ts";
import { defaultWorkers } from "../ensemble/defaults.ts";
import type { DeclaredType } from "../table/infer_column.ts";
import { leafCount, treeDepth } from "../tree/flat_tree.ts";
import { roundedFigures, shareableReference } from "./shareable_figures.ts";
import { crossValidatedLinear } from "../linear/cross_validate_linear.ts";
import { fitDefaultEnsemble } from "../ensemble/fit_default.ts";
import { checkedPrivacyMin, outOfBagFigures, payRows, PRIVACY_FLOOR } from "./pay_pipeline.ts";
import type { Ensemble } from "../ensemble/fit_ensemble.ts";
import { featureImportance, impurityDecrease } from "../ensemble/importance.ts";
import { oobClassificationMetrics } from "../ensemble/intervals.ts";
import { accuracyInMoney, type PayScale, toMoney } from "../ensemble/pay_scale.ts";
import {
  type Accuracy,
  type FeatureSchema,
  type ImportanceFigure,
  type Model,
  MODEL_FORMAT,
  type ReadSettings,
  type SupportFigures,
} from "./types.ts";

/** Options of {@linkcode fitModel}. */
export interface FitModelOptions {
  /** The column to predict. */
  target: string;
  /** The feature columns (default: every usable column). */
  features?: string[];
  /** Columns to leave out. */
  drop?: string[];
  /** Keep only rows matching these (values of one column are alternatives). */
  where?: Record<string, string[]>;
  /**
   * Allow protected attributes as features.
   * @default {false}
   */
  allowProtected?: boolean;
  /**
   * Attributes (numeric or ordinal) along which the estimate must never
   * fall, the others held fixed (see `GrowOptions.increasing`): every tree,
   * the reference tree's cross-validation and the ensemble's, is grown so.
   * @default {[]}
   */
  increasing?: string[];
  /** Fitting scale of a numeric target (default: log for money, else raw). */
  scale?: PayScale;
  /**
   * Trees in the ensemble; 0 fits the reference tree alone.
   * @default {200}
   */
  trees?: number;
  /**
   * Minimum distinct rows in a leaf (never below the privacy minimum).
   * @default {5}
   */
  minLeaf?: number;
  /**
   * Cross-validation folds.
   * @default {10}
   */
  folds?: number;
  /**
   * Rule for the reference tree's size.
   * @default {"one-se"}
   */
  rule?: "one-se" | "min";
  /**
   * Pruning of the ensemble's trees: at the minimum-CV alpha, or none.
   * @default {"alpha-min"}
   */
  prune?: "alpha-min" | "none";
  /**
   * Seed of folds, resamples and shuffles.
   * @default {1}
   */
  seed?: number;
  /** Workers (default: defaultWorkers, one per core from two million rows x trees). */
  workers?: number;
  /**
   * Smallest group whose mean is shown (at least 3).
   * @default {5}
   */
  privacyMin?: number;
  /**
   * Out-of-bag balanced accuracy from which a feature alone predicting a
   * protected attribute is named a possible proxy.
   * @default {0.65}
   */
  proxyThreshold?: number;
  /** The options the table was loaded with, kept to read other tables alike. */
  loadOptions?: LoadTableOptions;
  /** Progress: the stage, steps done and the total. */
  onProgress?: (
    stage: "cross-validation" | "trees" | "importance" | "proxies",
    done: number,
    total: number,
  ) => void;
  /** The clock, for tests (ISO 8601 of now). */
  now?: () => string;
}

/**
 * Fits a model.
 *
 * @throws {OptionError} for options that do not fit the table.
 * @throws {DataError} for data the scale cannot take (pay at or below 0 on logs).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 300, seed: 4 }), { target: "base_pay_eur" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 20, folds: 5, workers: 1 });
 * assert(model.target.scale === "log" && model.ensemble?.trees.length === 20);
 * assert(model.features.every((f) => f.name !== "gender")); // protected: left out
 * ```
 */
export async function fitModel(table: Table, options: FitModelOptions): Promise<Model> {
  const started = performance.now();
  // One set of workers for the whole fit: cross-validation and the
  // ensemble find them started and warm.
  // Unless asked, a small table is fitted in this thread (defaultWorkers).
  const count = options.workers ?? defaultWorkers(table.rows, options.trees ?? 200);
  const pool = Number.isInteger(count) && count > 1 ? new FittingPool(count) : null;
  pool?.start();
  try {
    return await fitModelOn(table, options, pool ?? count, started);
  } finally {
    pool?.close();
  }
}

async function fitModelOn(
  table: Table,
  options: FitModelOptions,
  workers: number | FittingPool | undefined,
  started: number,
): Promise<Model> {
  const trees = options.trees ?? 200;
  const minLeaf = options.minLeaf ?? 5;
  const requestedFolds = options.folds ?? 10;
  const seed = options.seed ?? 1;
  const privacyMin = checkedPrivacyMin(options.privacyMin);
  const rule = options.rule ?? "one-se";
  const prune = options.prune ?? "alpha-min";
  const where = options.where ?? {};
  checkSettings(trees, minLeaf, privacyMin, requestedFolds);

  const rows = payRows(table, {
    target: options.target,
    features: options.features,
    drop: options.drop,
    where,
    allowProtected: options.allowProtected,
    scale: options.scale,
  });
  const { table: filtered, encoded, dataset, dropped, rowIndex, scale, money } = rows;
  if (encoded.features.length === 0) {
    const why = dropped.map((d) => `${d.name} (${d.reason})`).join(", ");
    throw new OptionError(`no attributes are left to learn from${why ? `: left out ${why}` : ""}`);
  }
  if (encoded.rows < 2 * minLeaf) {
    throw new OptionError(
      `only ${encoded.rows} rows have "${options.target}"; at least ${2 * minLeaf} are needed ` +
        `for one split with {minLeaf} ${minLeaf}`,
    );
  }
  const regression = dataset.target.kind === "regression";
  const y = dataset.target.values;

  const back = (v: number) => toMoney(v, scale);
  const payInMoney = regression ? Float64Array.from(y as ArrayLike<number>, back) : null;
  // The proxy check needs neither the tree nor the ensemble: with workers,
  // it is sent aside to them when the cross-validation's trees are back,
  // while this thread scores the last of those trees; else it runs here
  // after the fit.
  const questions = proxyQuestions(filtered, rowIndex, dataset);
  let proxiesAside: Promise<ProxyFigure[][]> | null = null;
  const sendProxiesAside = workers instanceof FittingPool && questions.length > 0
    ? () => {
      proxiesAside = proxyFigureSetsAside(workers, questions, { seed });
      // Awaited after the fit; a fit that fails first reports its own error.
      proxiesAside.catch(() => {});
    }
    : undefined;
  const fitted = await fitDefaultEnsemble(dataset, {
    trees,
    seed,
    foldSeed: seed,
    folds: requestedFolds,
    rule,
    prune,
    // The reference tree is cross-validated whatever the ensemble's pruning.
    crossValidate: true,
    grow: { minLeaf, increasing: increasingFeatures(dataset, [...new Set(options.increasing)]) },
    extraLosses: regression
      ? [
        (a, p) => (back(a) - back(p)) ** 2,
        (a, p) => Math.abs(back(a) - back(p)),
        (a, p) => Math.abs(a - p),
      ]
      : [],
    workers,
    // Each tree's part of permutation importance, measured where it is fitted.
    importance: regression ? { repeats: IMPORTANCE_REPEATS, seed } : undefined,
    // Each tree's shareable copy, made where it is fitted.
    share: regression ? { money: payInMoney! } : {},
    onCrossValidation: (done, total) => options.onProgress?.("cross-validation", done, total),
    onCrossValidationGrown: sendProxiesAside,
    onProgress: (done, total) => options.onProgress?.("trees", done, total),
  });
  const cv = fitted.reference!;
  const ensemble = fitted.ensemble;
  const folds = fitted.folds;
  const minAlpha = cv.candidates[cv.best].alpha;

  // Accuracy side by side, all from the same folds (and out-of-bag rows).
  const root = cv.candidates[cv.candidates.length - 1];
  const chosen = cv.candidates[cv.chosen];
  let quality: Model["quality"];
  if (regression) {
    const moneyY = Float64Array.from(y, back);
    const varMoney = variance(moneyY);
    const varFit = variance(y);
    const fromCv = (c: typeof root): Accuracy => {
      const mseMoney = c.cvExtra[0];
      const out: Accuracy = {
        measuredBy: "cross-validation",
        money: { rmse: Math.sqrt(mseMoney), mae: c.cvExtra[1], r2: 1 - mseMoney / varMoney },
        rmseSe: c.cvRmseSe,
      };
      if (scale === "log") {
        out.log = { rmse: c.cvRmse, mae: c.cvExtra[2], r2: 1 - c.cvError / varFit };
      }
      return out;
    };
    // The constant model on the same folds: each fold's held-out rows get
    // the mean (on the fitting scale) of the other folds.
    const constant = constantPredictions(y as Float64Array, cv.fold, folds);
    const constantAccuracy = accuracyInMoney(y, constant, scale);
    const overall = (y as Float64Array).reduce((a, b) => a + b, 0) / y.length;
    const inSample = accuracyInMoney(y, new Float64Array(y.length).fill(overall), scale);
    const linear = crossValidatedLinear(dataset, cv.fold);
    const linearAccuracy = accuracyInMoney(y, linear.predictions, scale);
    const oobAccuracy = ensemble === null ? null : accuracyInMoney(y, ensemble.oob, scale);
    quality = {
      constantInSample: {
        measuredBy: "in-sample",
        money: inSample.money,
        ...(inSample.log ? { log: inSample.log } : {}),
      },
      constant: {
        measuredBy: "cross-validation",
        money: constantAccuracy.money,
        ...(constantAccuracy.log ? { log: constantAccuracy.log } : {}),
      },
      linear: {
        measuredBy: "cross-validation",
        money: linearAccuracy.money,
        ...(linearAccuracy.log ? { log: linearAccuracy.log } : {}),
        aliased: linear.aliased,
      },
      reference: fromCv(chosen),
      ensemble: oobAccuracy === null ? null : {
        measuredBy: "out-of-bag",
        money: oobAccuracy.money,
        ...(oobAccuracy.log ? { log: oobAccuracy.log } : {}),
      },
    };
  } else {
    const oob = ensemble === null ? null : oobClassificationMetrics(ensemble, y);
    const counts = new Map<number, number>();
    for (const c of y) counts.set(c, (counts.get(c) ?? 0) + 1);
    quality = {
      constantInSample: {
        measuredBy: "in-sample",
        accuracy: Math.max(...counts.values()) / y.length,
      },
      constant: {
        measuredBy: "cross-validation",
        accuracy: constantClassAccuracy(y, cv.fold, folds),
      },
      linear: null,
      reference: { measuredBy: "cross-validation", accuracy: 1 - chosen.cvError },
      ensemble: oob === null ? null : {
        measuredBy: "out-of-bag",
        accuracy: oob.accuracy,
        classes: { precision: oob.precision, recall: oob.recall, confusion: oob.confusion },
      },
    };
  }

  const outOfBag = regression && ensemble !== null
    ? outOfBagFigures(ensemble.oob, y, privacyMin)
    : null;

  options.onProgress?.("importance", 0, 1);
  const importance = importanceOf(dataset, ensemble, cv.tree, seed);
  options.onProgress?.("importance", 1, 1);

  const proxies = await possibleProxies(questions, proxiesAside, options, seed);

  const features = dataset.features.map((f): FeatureSchema => {
    const column = filtered.columns.find((c) => c.name === f.name)!;
    return {
      name: f.name,
      kind: f.kind,
      ...(f.levels ? { levels: f.levels } : {}),
      typical: typicalValue(f.values, f.kind),
      ...(f.kind === "numeric" ? { range: numericRange(f.values) } : {}),
      missing: f.values.reduce((n, v) => n + (Number.isNaN(v) ? 1 : 0), 0),
      protected: column.protected,
    };
  });
  const identifier = filtered.columns.find((c) => c.type === "identifier");

  return {
    provenance: {
      paygrove: VERSION,
      format: MODEL_FORMAT,
      created: options.now?.() ?? new Date().toISOString(),
      table: {
        file: table.source.file ?? "input",
        sha256: table.source.sha256,
        rows: table.rows + table.excluded.count,
      },
      seed,
    },
    target: {
      name: options.target,
      kind: dataset.target.kind,
      ...(dataset.target.kind === "classification" ? { classes: dataset.target.classes } : {}),
      ...(money ? { money } : {}),
      scale,
      // The estimate's shift to a median and the smearing factor, measured
      // on the out-of-bag residuals (4 digits, as every other figure).
      ...(outOfBag !== null && scale === "log" ? { center: roundedFigures(outOfBag.center) } : {}),
    },
    features,
    dropped,
    read: readSettings(filtered, options, dataset, identifier?.name),
    settings: {
      trees,
      minLeaf,
      folds,
      rule,
      prune,
      seed,
      privacyMin,
      where,
      allowProtected: options.allowProtected ?? false,
      increasing: [...new Set(options.increasing ?? [])],
    },
    rows: {
      used: dataset.rows,
      dropped: table.rows + table.excluded.count - dataset.rows,
    },
    // Exact figures over the people are kept as a shared file may hold
    // them (shareable_figures.ts), in memory as in the file.
    reference: {
      tree: shareableReference(
        cv.tree,
        regression ? chosen.cvRmse : 0,
        (options.increasing ?? []).length > 0,
      ),
      alpha: roundedFigures(chosen.alpha),
      leaves: leafCount(cv.tree),
      depth: treeDepth(cv.tree),
      pruningPath: roundedFigures(cv.candidates.map((c) => ({
        alpha: c.alpha,
        leaves: c.leaves,
        risk: c.risk,
        cvError: c.cvError,
        cvSe: c.cvSe,
      }))),
    },
    ensemble: ensemble === null ? null : {
      // No leaf whose value is a drawn member's pay, then covers only
      // (shareableTree, run where each tree was fitted).
      trees: ensemble.shared!,
      alpha: prune === "none" ? 0 : roundedFigures(minAlpha),
    },
    residuals: outOfBag?.residuals ?? null,
    quality: roundedFigures(quality),
    importance: roundedFigures(importance),
    proxies: roundedFigures(proxies),
    support: supportOf(dataset, roundedFigures(importance), privacyMin),
    analyst: {
      resamples: ensemble?.resamples ?? new Int32Array(0),
      rowKeys: identifier && identifier.type === "identifier"
        ? rowKeysOf(rowIndex, identifier.values, dataset)
        : null,
    },
    seconds: (performance.now() - started) / 1000,
  };
}

// The constrained attributes' feature indices, each checked: a feature of
// the model, with an order (numeric or ordinal), and a pay target.
function increasingFeatures(dataset: Dataset, names: readonly string[]): number[] {
  if (names.length > 0 && dataset.target.kind !== "regression") {
    throw new OptionError(
      `{increasing} constrains an estimate of pay; "${dataset.target.name}" is a class`,
    );
  }
  return names.map((name) => {
    const f = dataset.features.findIndex((feature) => feature.name === name);
    if (f < 0) {
      throw new OptionError(
        `{increasing}: "${name}" is not among the attributes learned from ` +
          `(${dataset.features.map((feature) => feature.name).join(", ")})`,
      );
    }
    if (dataset.features[f].kind === "categorical") {
      throw new OptionError(
        `{increasing}: "${name}" is categorical, with no order for pay to increase along`,
      );
    }
    return f;
  });
}

// Each protected attribute not used as a feature (categorical or ordinal,
// two groups or more among the rows) with the features that may proxy it,
// over the rows where the attribute is known.
function proxyQuestions(table: Table, rowIndex: Int32Array, dataset: Dataset): ProxyQuestion[] {
  const used = new Set(dataset.features.map((f) => f.name));
  const attributes = table.columns.filter((c): c is LevelColumn =>
    c.protected && !used.has(c.name) && (c.type === "categorical" || c.type === "ordinal")
  );
  const features = dataset.features.filter((f) => {
    const column = table.columns.find((c) => c.name === f.name);
    return column !== undefined && !column.protected;
  });
  const questions: ProxyQuestion[] = [];
  for (const attribute of attributes) {
    const rows: number[] = [];
    rowIndex.forEach((tableRow, r) => {
      if (attribute.codes[tableRow] >= 0) rows.push(r);
    });
    const codes = Int32Array.from(rows, (r) => attribute.codes[rowIndex[r]]);
    if (new Set(codes).size < 2) continue;
    const subset = features.map((f) => ({
      ...f,
      values: Float64Array.from(rows, (r) => f.values[r]),
    }));
    questions.push({
      features: subset,
      attribute: codes,
      groups: attribute.levels,
      attributeName: attribute.name,
    });
  }
  return questions;
}

// The features named possible proxies: from the workers' check when it was
// sent aside, else checked here.
async function possibleProxies(
  questions: ProxyQuestion[],
  aside: Promise<ProxyFigure[][]> | null,
  options: FitModelOptions,
  seed: number,
): Promise<ProxyFigure[]> {
  const threshold = options.proxyThreshold ?? PROXY_THRESHOLD;
  options.onProgress?.("proxies", 0, questions.length);
  const figures = aside !== null ? await aside : proxyFigureSets(
    questions,
    { seed },
    (done, total) => options.onProgress?.("proxies", done, total),
  );
  if (aside !== null) options.onProgress?.("proxies", questions.length, questions.length);
  const found = figures.flat().filter((f) => f.balancedAccuracy >= threshold);
  return found.sort((x, y) => y.balancedAccuracy - x.balancedAccuracy);
}

function checkSettings(trees: number, minLeaf: number, privacyMin: number, folds: number): void {
  if (!Number.isInteger(trees) || trees < 0) {
    throw new OptionError(`{trees} must be a whole number >= 0, got ${trees}`);
  }
  if (!Number.isInteger(minLeaf) || minLeaf < 1) {
    throw new OptionError(`{minLeaf} must be a whole number >= 1, got ${minLeaf}`);
  }
  if (minLeaf < privacyMin) {
    throw new OptionError(
      `{minLeaf} ${minLeaf} is below the privacy minimum ${privacyMin}: a leaf of fewer people ` +
        `would keep their pay in the model file (use {minLeaf} ${privacyMin} or more; ` +
        `{privacyMin} can go down to ${PRIVACY_FLOOR})`,
    );
  }
  if (!Number.isInteger(folds) || folds < 2) {
    throw new OptionError(`{folds} must be a whole number >= 2, got ${folds}`);
  }
}

/** Each row's prediction by the mean of the other folds' targets. */
function constantPredictions(y: Float64Array, fold: Int32Array, folds: number): Float64Array {
  const sum = new Float64Array(folds);
  const count = new Float64Array(folds);
  let total = 0;
  for (let r = 0; r < y.length; r++) {
    sum[fold[r]] += y[r];
    count[fold[r]]++;
    total += y[r];
  }
  return Float64Array.from(y, (_, r) => (total - sum[fold[r]]) / (y.length - count[fold[r]]));
}

/**
 * The share of rows whose class is the most common class of the other
 * folds (ties to the lowest class code): a constant guess on the same
 * folds. The root's pruned trees are not a constant (they split).
 */
function constantClassAccuracy(y: ArrayLike<number>, fold: Int32Array, folds: number): number {
  const classes = Math.max(...Array.from(y)) + 1;
  const perFold = Array.from({ length: folds }, () => new Float64Array(classes));
  const total = new Float64Array(classes);
  for (let r = 0; r < y.length; r++) {
    perFold[fold[r]][y[r]]++;
    total[y[r]]++;
  }
  const guess = perFold.map((counts) => {
    let best = 0;
    for (let c = 1; c < classes; c++) {
      if (total[c] - counts[c] > total[best] - counts[best]) best = c;
    }
    return best;
  });
  let right = 0;
  for (let r = 0; r < y.length; r++) if (y[r] === guess[fold[r]]) right++;
  return right / y.length;
}

/** Population variance. */
function variance(values: ArrayLike<number>): number {
  let mean = 0;
  for (let i = 0; i < values.length; i++) mean += values[i];
  mean /= values.length;
  let ss = 0;
  for (let i = 0; i < values.length; i++) ss += (values[i] - mean) ** 2;
  return ss / values.length;
}

/**
 * Median of the known values (numeric) or the most common level code.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { typicalValue } from "./fit_model.ts";
 * // Known values 1, 2, 3, 10: median (2 + 3) / 2.
 * assert.equal(typicalValue(Float64Array.of(3, NaN, 1, 10, 2), "numeric"), 2.5);
 * // Codes 1 and 2 are both most common (twice): the lower code wins.
 * assert.equal(typicalValue(Float64Array.of(2, 1, 2, 1, 0), "categorical"), 1);
 * assert.equal(typicalValue(Float64Array.of(0, 3, 3), "ordinal"), 3);
 * assert(Number.isNaN(typicalValue(Float64Array.of(NaN), "numeric")));
 * ```
 */
export function typicalValue(values: Float64Array, kind: FeatureSchema["kind"]): number {
  const known = values.filter((v) => !Number.isNaN(v));
  if (known.length === 0) return NaN;
  if (kind === "numeric") return quantile(known.sort(), 0.5);
  const counts = new Map<number, number>();
  for (const v of known) counts.set(v, (counts.get(v) ?? 0) + 1);
  let best = known[0];
  for (const [code, n] of counts) {
    const bestCount = counts.get(best)!;
    if (n > bestCount || (n === bestCount && code < best)) best = code;
  }
  return best;
}

function numericRange(values: Float64Array): FeatureSchema["range"] {
  const known = values.filter((v) => !Number.isNaN(v)).sort();
  if (known.length === 0) return { min: NaN, max: NaN, p01: NaN, p99: NaN };
  return {
    min: known[0],
    max: known[known.length - 1],
    p01: quantile(known, 0.01),
    p99: quantile(known, 0.99),
  };
}

// Shuffles per feature of permutation importance.
const IMPORTANCE_REPEATS = 3;

function importanceOf(
  dataset: Dataset,
  ensemble: Ensemble | null,
  reference: Ensemble["trees"][number],
  seed: number,
): ImportanceFigure[] {
  if (ensemble !== null && dataset.target.kind === "regression") {
    return featureImportance(ensemble, dataset, { repeats: IMPORTANCE_REPEATS, seed });
  }
  const decrease = impurityDecrease(
    { trees: ensemble?.trees ?? [reference] },
    dataset.features.length,
  );
  const total = decrease.reduce((a, b) => a + b, 0);
  return dataset.features.map((f, i) => ({
    feature: f.name,
    permutation: NaN,
    permutationSd: NaN,
    impurity: total > 0 ? decrease[i] / total : 0,
  }));
}

function supportOf(
  dataset: Dataset,
  importance: ImportanceFigure[],
  privacyMin: number,
): SupportFigures {
  const score = (i: number) =>
    Number.isNaN(importance[i].permutation) ? importance[i].impurity : importance[i].permutation;
  const levelFeatures = dataset.features
    .map((f, i) => ({ f, i }))
    .filter(({ f }) => f.kind !== "numeric")
    .sort((a, b) => score(b.i) - score(a.i));
  let peers: SupportFigures["peers"] = null;
  if (levelFeatures.length >= 2) {
    const [a, b] = [levelFeatures[0].f, levelFeatures[1].f];
    const counts: Record<string, number> = {};
    for (let r = 0; r < dataset.rows; r++) {
      if (Number.isNaN(a.values[r]) || Number.isNaN(b.values[r])) continue;
      const key = `${a.levels![a.values[r]]}\u0000${b.levels![b.values[r]]}`;
      counts[key] = (counts[key] ?? 0) + 1;
    }
    peers = { features: [a.name, b.name], counts };
  }
  const levelRanges: SupportFigures["levelRanges"] = [];
  const numeric = dataset.features.filter((f) => f.kind === "numeric");
  for (const f of dataset.features) {
    if (f.kind !== "ordinal") continue;
    f.levels!.forEach((level, code) => {
      const rows: number[] = [];
      for (let r = 0; r < dataset.rows; r++) if (f.values[r] === code) rows.push(r);
      if (rows.length < privacyMin) return;
      const ranges = numeric.map((g) => {
        const known = Float64Array.from(rows, (r) => g.values[r]).filter((v) => !Number.isNaN(v))
          .sort();
        return known.length < privacyMin
          ? { feature: g.name, p01: NaN, p99: NaN }
          : { feature: g.name, p01: quantile(known, 0.01), p99: quantile(known, 0.99) };
      }).filter((r) => !Number.isNaN(r.p01));
      levelRanges.push({ feature: f.name, level, ranges });
    });
  }
  return { peers, levelRanges };
}

/**
 * The key of a training row: the first 8 bytes (base64) of the SHA-256 of
 * its identifier and feature values, so `batch` can tell a training row
 * from a new one without the model keeping the rows.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { rowKey } from "./fit_model.ts";
 * // SHA-256 of "E7\u00012\u0001NA\u00013.5", first 8 bytes in base64, from Python:
 * // base64.b64encode(hashlib.sha256(t.encode()).digest()[:8]).
 * assert.equal(rowKey("E7", [2, NaN, 3.5]), "IQYqfhnp1QU=");
 * assert.notEqual(rowKey("E8", [2, NaN, 3.5]), "IQYqfhnp1QU=");
 * ```
 */
export function rowKey(identifier: string, values: ArrayLike<number>): string {
  const text = `${identifier}\u0001${
    Array.from(values, (v) => (Number.isNaN(v) ? "NA" : String(v))).join("\u0001")
  }`;
  return createHash("sha256").update(text).digest().subarray(0, 8).toString("base64");
}

function rowKeysOf(rowIndex: Int32Array, ids: string[], dataset: Dataset): string {
  const profile = new Float64Array(dataset.features.length);
  const keys: string[] = [];
  for (let r = 0; r < dataset.rows; r++) {
    for (let f = 0; f < profile.length; f++) profile[f] = dataset.features[f].values[r];
    keys.push(rowKey(ids[rowIndex[r]], profile));
  }
  return keys.join("");
}

function readSettings(
  table: Table,
  options: FitModelOptions,
  dataset: Dataset,
  identifier: string | undefined,
): ReadSettings {
  const load = options.loadOptions ?? {};
  const types: Record<string, DeclaredType> = {};
  const orders: Record<string, string[]> = {};
  for (const f of dataset.features) {
    types[f.name] = f.kind;
    if (f.kind === "ordinal") orders[f.name] = f.levels!;
  }
  const target = table.columns.find((c) => c.name === options.target)!;
  if (target.type === "numeric") types[target.name] = "numeric";
  else if (target.type === "categorical" || target.type === "ordinal") {
    types[target.name] = target.type;
    if (target.type === "ordinal") orders[target.name] = target.levels;
  }
  if (identifier !== undefined) types[identifier] = "identifier";
  return {
    ...(load.delimiter ? { delimiter: load.delimiter } : {}),
    // The mark the table was read with, given or settled by its cells.
    decimal: table.source.decimal?.mark ?? load.decimal ?? ".",
    encoding: load.encoding ?? "utf-8",
    ...(load.missing ? { missing: [...load.missing] } : {}),
    types,
    orders,
    ...(load.currency ? { currency: load.currency } : {}),
    ...(load.hoursPerYear ? { hoursPerYear: load.hoursPerYear } : {}),
    ...(load.fte ? { fte: load.fte } : {}),
    ...(load.periods ? { periods: { ...load.periods } } : {}),
    ...(load.protected ? { protected: [...load.protected] } : {}),
    ...(identifier !== undefined ? { identifier } : {}),
  };
}
