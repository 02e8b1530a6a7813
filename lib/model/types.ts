/**
 * A fitted paygrove model as the commands use it and as its file keeps it:
 * the schema of the table it was fitted on, the reference tree, the
 * ensemble's trees, what the intervals need, quality figures and
 * provenance. The shared part holds no one's pay and nothing that with a
 * staff list gives pay back (see README, "What a model file holds"); what
 * would (the trees' resampling states and the training rows' keys) is the
 * separate {@linkcode AnalystPart}, kept in memory after a fit and written
 * only to an analyst's file.
 *
 * @module
 */

import type { ProxyFigure } from "../ensemble/proxies.ts";
import type { FeatureKind } from "../dataset/types.ts";
import type { DeclaredType } from "../table/infer_column.ts";
import type { DecimalMark } from "../table/amount.ts";
import type { MoneyUnit, PayPeriod } from "../table/types.ts";
import type { FlatTree } from "../tree/flat_tree.ts";
import type { PayScale } from "../ensemble/pay_scale.ts";
import type { EstimateCenter } from "../ensemble/estimate_center.ts";
import type { ResidualGroups } from "../ensemble/grouped_range.ts";
import type { RegressionMetrics } from "../tree/metrics.ts";
import type { AliasedTerm } from "../linear/cross_validate_linear.ts";

/**
 * The model file format this version writes. Format 1 (paygrove 0.1)
 * stored each tree's resampling seed and the training rows' keys, which
 * rebuild pay; it is still read, with a warning.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable, readModelFile } from "../../mod.ts";
 * import { modelToText } from "./model_file.ts";
 * import { MODEL_FORMAT } from "./types.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 60, seed: 1 }));
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 2, folds: 3, workers: 1 });
 * assert.equal(JSON.parse(modelToText(model)).format, MODEL_FORMAT);
 * // A format-1 file (fixtures/legacy) is still read, with its warning.
 * const legacy = new URL("../../fixtures/legacy/format1_demo300.json", import.meta.url).pathname;
 * const old = await readModelFile(legacy);
 * assert.equal(old.provenance.format, 1);
 * assert(old.fileNotes!.some((n) => n.kind === "rebuildsPay"));
 * ```
 */
export const MODEL_FORMAT = 2;

/** One feature as the model knows it. */
export interface FeatureSchema {
  /** Column name. */
  name: string;
  /** How it splits. */
  kind: FeatureKind;
  /** Level names (ordinal: lowest first). */
  levels?: string[];
  /** The typical value: the median (numeric) or the most common level's code. */
  typical: number;
  /** Numeric features: training minimum, maximum and 1% / 99% quantiles. */
  range?: { min: number; max: number; p01: number; p99: number };
  /** Missing cells among the training rows. */
  missing: number;
  /** Whether the column is a protected attribute (only with `allowProtected`). */
  protected: boolean;
}

/** The target as the model knows it. */
export interface TargetSchema {
  /** Column name. */
  name: string;
  /** Pay (regression) or a class such as level (classification). */
  kind: "regression" | "classification";
  /** Class names (classification). */
  classes?: string[];
  /** Currency and period of a money target. */
  money?: MoneyUnit;
  /** The scale the trees were fitted on (raw for classification). */
  scale: PayScale;
  /**
   * On the log scale with an ensemble: the shift that makes the estimate a
   * median, and Duan's smearing factor (lib/ensemble/estimate_center.ts).
   * Absent in files written before it (their estimate is a geometric mean).
   */
  center?: EstimateCenter;
}

/** How the training table was read, so other tables are read alike. */
export interface ReadSettings {
  /** Field delimiter of the training file. */
  delimiter?: string;
  /** Decimal mark. */
  decimal: DecimalMark;
  /** Text encoding label. */
  encoding: string;
  /** Texts meaning missing (when not the default). */
  missing?: string[];
  /** Every model column's type, declared so that inference cannot differ. */
  types: Record<string, DeclaredType>;
  /** Ordinal columns' level orders. */
  orders: Record<string, string[]>;
  /** Currency of pay columns, when given. */
  currency?: string;
  /** Hours per year used to annualise hourly pay. */
  hoursPerYear?: number;
  /** Column of FTE fractions. */
  fte?: string;
  /** Declared pay periods. */
  periods?: Record<string, PayPeriod>;
  /** Further protected columns the user named. */
  protected?: string[];
  /** The identifier column, if the table had one. */
  identifier?: string;
}

/** The settings the model was fitted with. */
export interface ModelSettings {
  /** Trees in the ensemble (0: the reference tree alone). */
  trees: number;
  /** Minimum distinct rows in a leaf. */
  minLeaf: number;
  /** Folds of the reference tree's cross-validation. */
  folds: number;
  /** Rule choosing the reference tree's size. */
  rule: "one-se" | "min";
  /** How the ensemble's trees were pruned. */
  prune: "alpha-min" | "none";
  /** Seed of folds, resamples and importance shuffles. */
  seed: number;
  /** Smallest group whose mean is ever shown. */
  privacyMin: number;
  /** Row conditions the table was filtered by. */
  where: Record<string, string[]>;
  /** Whether protected attributes were allowed as features. */
  allowProtected: boolean;
  /** Attributes along which the estimate never falls (empty: none constrained). */
  increasing: string[];
}

/** Accuracy of one model on the fitting scale and in money. */
export interface Accuracy {
  /** How it was measured: cross-validation folds or out-of-bag rows. */
  measuredBy: "cross-validation" | "out-of-bag" | "in-sample";
  /** Regression: figures in money (the original scale). */
  money?: RegressionMetrics;
  /** Regression on logs: the same figures on the log scale. */
  log?: RegressionMetrics;
  /** Regression: standard error of the RMSE on the fitting scale, where known. */
  rmseSe?: number;
  /** Classification: share classified correctly. */
  accuracy?: number;
  /** Classification: per-class precision and recall, and the confusion matrix. */
  classes?: { precision: number[]; recall: number[]; confusion: number[][] };
  /**
   * The straight line only: design terms some folds' fits left out as
   * combinations of other columns (counted as 0 there); absent in files from
   * before.
   */
  aliased?: AliasedTerm[];
}

/** The reference tree: the cross-validated single tree whose paths are shown. */
export interface ReferenceTree {
  /** The tree. */
  tree: FlatTree;
  /** The alpha it was pruned at. */
  alpha: number;
  /** Leaves. */
  leaves: number;
  /** Depth. */
  depth: number;
  /** The full tree's pruning path with each subtree's cross-validated error. */
  pruningPath: { alpha: number; leaves: number; risk: number; cvError: number; cvSe: number }[];
}

/** One feature's importance. */
export interface ImportanceFigure {
  /** Feature name. */
  feature: string;
  /** Mean increase of out-of-bag squared error (fitting scale) when shuffled; NaN if not measured. */
  permutation: number;
  /** Its standard deviation over repeats. */
  permutationSd: number;
  /** Share of the impurity decrease. */
  impurity: number;
}

/** What tells whether a profile is usual for the data. */
export interface SupportFigures {
  /**
   * Training rows per pair of levels of the two most important level
   * features (counts only), keyed `"levelA\u0000levelB"`.
   */
  peers: { features: [string, string]; counts: Record<string, number> } | null;
  /**
   * Per ordinal level (with at least the privacy minimum of rows), the 1% and
   * 99% quantiles of each numeric feature among its rows.
   */
  levelRanges: {
    feature: string;
    level: string;
    ranges: { feature: string; p01: number; p99: number }[];
  }[];
}

/** Where a model or an output came from. */
export interface Provenance {
  /** paygrove's version. */
  paygrove: string;
  /** The model file format. */
  format: number;
  /** When the model was fitted (ISO 8601). */
  created: string;
  /** The training table: file name as given, SHA-256 and rows read. */
  table: { file: string; sha256: string; rows: number };
  /** The model's seed. */
  seed: number;
  /** The model file read (path and SHA-256 of its bytes); set when read, never saved. */
  modelFile?: { path: string; sha256: string };
}

/** A fitted model. */
export interface Model {
  /** Provenance. */
  provenance: Provenance;
  /** The target. */
  target: TargetSchema;
  /** The features, in the trees' order. */
  features: FeatureSchema[];
  /** Columns not used as features, with the reason. */
  dropped: { name: string; reason: string }[];
  /** How the table was read. */
  read: ReadSettings;
  /** Settings. */
  settings: ModelSettings;
  /** Rows used to fit, and rows of the table left out (missing target, `where`). */
  rows: { used: number; dropped: number };
  /** The reference tree. */
  reference: ReferenceTree;
  /**
   * The ensemble (null with `trees: 0`). Its trees are shareable copies
   * (`shareTree`): node counts and internal values over every training
   * row, leaf values as fitted.
   */
  ensemble: {
    trees: FlatTree[];
    /** The alpha every tree was pruned at (0: not pruned). */
    alpha: number;
  } | null;
  /** Out-of-bag residuals by estimate, as quantile grids (regression ensembles). */
  residuals: ResidualGroups | null;
  /** Accuracy side by side. */
  quality: {
    /** The constant model on the rows it was computed from (no folds). */
    constantInSample: Accuracy;
    constant: Accuracy;
    linear: Accuracy | null;
    reference: Accuracy;
    ensemble: Accuracy | null;
  };
  /** Importance, in feature order. */
  importance: ImportanceFigure[];
  /**
   * Features that on their own predict a protected attribute of the table
   * with out-of-bag balanced accuracy at or above the proxy threshold
   * (possible proxies), highest first; absent in files from before.
   */
  proxies?: ProxyFigure[];
  /** Support figures for the unusual-profile check. */
  support: SupportFigures;
  /**
   * What only the analyst may keep (null when the model was read from a
   * shared file without the analyst's file).
   */
  analyst: AnalystPart | null;
  /** What reading the file found that its user must know (absent after a fit). */
  fileNotes?: ModelFileNote[];
  /** Seconds the fit took. */
  seconds: number;
}

/**
 * The part of a model that, with a staff list, rebuilds every person's
 * pay: each tree's resampling state regenerates its in-bag weights, after
 * which every leaf mean is a linear equation in the unknown pays, and the
 * row keys put a staff list in training order. It serves the out-of-bag
 * estimate of a training row and the infinitesimal jackknife, both of
 * which need the in-bag weights at question time.
 */
export interface AnalystPart {
  /** Each tree's resampling generator state, four words per tree. */
  resamples: Int32Array;
  /**
   * Keys of the training rows (8-byte hashes of identifier and feature
   * values, base64, 12 characters each), so `batch` recognises them; null
   * without an identifier column.
   */
  rowKeys: string | null;
}

/** Something reading a model file found. */
export type ModelFileNote =
  /** A format-1 file: it holds the seeds and row keys that rebuild pay. */
  { kind: "rebuildsPay"; format: number };
