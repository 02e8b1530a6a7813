/**
 * paygrove's public library API: everything the terminal layer and outside
 * users import. The library never prints, never reads the terminal and
 * never exits.
 *
 * @example Load a pay table and read its schema
 * ```ts
 * import assert from "node:assert/strict";
 * import { describeSchema, loadTable } from "./mod.ts";
 * const table = loadTable("level,pay\nL1,50000\nL2,61000\nL1,52000\n", { target: "pay" });
 * assert(describeSchema(table).columns[0].type === "ordinal");
 * ```
 *
 * @module
 */

export * from "./lib/table/mod.ts";
export { DataError, type DataErrorLocation, OptionError, optionText } from "./lib/errors.ts";
export { VERSION } from "./lib/version.ts";
export * from "./lib/dataset/types.ts";
export {
  type DatasetResult,
  type DroppedColumn,
  type DroppedDetail,
  isPayColumn,
  makeDataset,
  type MakeDatasetOptions,
  MAX_CLASSES,
  MAX_SPLIT_LEVELS,
} from "./lib/dataset/make_dataset.ts";
export * from "./lib/tree/mod.ts";
export { makeRng, randomInt, type Rng, shuffle } from "./lib/random.ts";
export {
  bootstrapCounts,
  legacyResampleStates,
  resampleStates,
  STATE_WORDS,
} from "./lib/ensemble/bootstrap.ts";
export {
  type Ensemble,
  type EnsembleOptions,
  fitEnsemble,
  type PruneMode,
} from "./lib/ensemble/fit_ensemble.ts";
export {
  type Difference,
  type InBagCounts,
  inBagCounts,
  infinitesimalJackknife,
  type Interval,
  type JackknifeError,
  mean,
  oobClassificationMetrics,
  oobRegressionMetrics,
  oobResiduals,
  pairedDifference,
  percentileInterval,
  residualRange,
  treeEstimates,
} from "./lib/ensemble/intervals.ts";
export { type Design, designOf, type DesignTerm } from "./lib/linear/design.ts";
export { fitLeastSquares, type LinearFit, predictLinear } from "./lib/linear/least_squares.ts";
export {
  type AliasedTerm,
  crossValidatedLinear,
  crossValidatedLinearPredictions,
  crossValidateLinear,
  type LinearCrossValidation,
} from "./lib/linear/cross_validate_linear.ts";
export { fitEnsembleParallel, type ParallelOptions } from "./lib/ensemble/fit_parallel.ts";
export { crossValidateTreeParallel } from "./lib/ensemble/cross_validate_parallel.ts";
export {
  DEFAULT_HOW_SURE,
  DEFAULT_INCREASING,
  DEFAULT_PRUNING,
  DEFAULT_RANGE,
} from "./lib/ensemble/defaults.ts";
export {
  type FeatureImportance,
  featureImportance,
  type ImportanceOptions,
  impurityDecrease,
} from "./lib/ensemble/importance.ts";
export {
  partialDependence,
  sweepGrid,
  type SweepPoint,
  sweepProfile,
} from "./lib/ensemble/sweep.ts";
export {
  groupedRange,
  groupedShareBelow,
  groupResiduals,
  type ResidualGroups,
  summarizeResidualGroups,
} from "./lib/ensemble/grouped_range.ts";
export {
  type DefaultEnsemble,
  type DefaultEnsembleOptions,
  fitDefaultEnsemble,
} from "./lib/ensemble/fit_default.ts";
export {
  type LeafMembers,
  leafMembers,
  quantileForestRange,
} from "./lib/ensemble/quantile_forest.ts";
export {
  accuracyInMoney,
  type PayScale,
  type ScaledAccuracy,
  toFitScale,
  toMoney,
} from "./lib/ensemble/pay_scale.ts";
export {
  compareProfiles,
  type ProfileReader,
  profileReader,
  type ProfileReading,
  rangeShareBelow,
  readerFromParts,
  readProfile,
  residualGroupCount,
  type WhatIf,
} from "./lib/ensemble/read_profile.ts";
export { type EstimateCenter, estimateCenter } from "./lib/ensemble/estimate_center.ts";
export { ContributionReader, type Contributions } from "./lib/ensemble/contributions.ts";
export { contributionsOfMany, ON_WORKERS_FROM } from "./lib/ensemble/contributions_parallel.ts";
export { addContributions, ContributionSpace, coverMean } from "./lib/tree/contributions.ts";
export {
  BAND_HIGH,
  BAND_LOW,
  DEMO_COLUMNS,
  DEMO_COMPANY,
  demoCompanyCsv,
  type DemoOptions,
  type DemoPerson,
  EDUCATION,
  FAMILY_PREMIUM,
  GAP,
  LEVEL_BASE,
  LEVEL_TITLES,
  logPayRule,
  noiseSd,
  REMOTE_ZONE,
  SITE_ZONE,
} from "./lib/demo/demo_company.ts";
export {
  assertCanWrite,
  type AtomicWriteOptions,
  removePendingFiles,
  sameFile,
  writeFileAtomic,
} from "./lib/io/atomic_write.ts";
export * from "./lib/model/types.ts";
export { fitModel, type FitModelOptions, rowKey, typicalValue } from "./lib/model/fit_model.ts";
export {
  checkedPrivacyMin,
  DEFAULT_PRIVACY_MIN,
  type OutOfBagFigures,
  outOfBagFigures,
  type PayRows,
  payRows,
  type PayRowsOptions,
  PRIVACY_FLOOR,
} from "./lib/model/pay_pipeline.ts";
export {
  modelFromText,
  modelToText,
  readModelFile,
  writeModelFile,
} from "./lib/model/model_file.ts";
export * from "./lib/model/profile.ts";
export * from "./lib/model/model_table.ts";
export * from "./lib/model/model_session.ts";
export * from "./lib/model/estimate_answer.ts";
export * from "./lib/model/answer_notes.ts";
export * from "./lib/model/compare_answer.ts";
export * from "./lib/model/contributions_answer.ts";
export * from "./lib/model/sweep_answer.ts";
export * from "./lib/model/batch_answer.ts";
export * from "./lib/model/offer.ts";
export {
  FIGURE_DIGITS,
  MEAN_STEP_RMSE,
  roundedFigures,
  shareableReference,
} from "./lib/model/shareable_figures.ts";
export {
  compareWithLine,
  type LineComparison,
  type MeasureComparison,
  TIE_SHARE,
} from "./lib/model/line_comparison.ts";
export {
  ANALYST_FILE_WARNING,
  analystFromText,
  analystToText,
  readAnalystFile,
  writeAnalystFile,
} from "./lib/model/analyst_file.ts";
export { type ReadBoundedOptions, readTextBounded } from "./lib/io/read_bounded.ts";
export { fixAttribute } from "./lib/tree/fix_attribute.ts";
export { increasingFit } from "./lib/bands/isotonic.ts";
export {
  type Band,
  bandOverlap,
  compaRatio,
  midpointProgression,
  type OutsideBand,
  outsideBand,
  rangePosition,
  rangeSpread,
} from "./lib/bands/band_measures.ts";
export { mixtureBand, mixtureQuantile } from "./lib/bands/cell_band.ts";
export {
  type BandCell,
  type BandTable,
  bandTable,
  type BandTableOptions,
} from "./lib/bands/band_table.ts";
export { isTenureName, type PostingRange, postingRange } from "./lib/bands/posting_range.ts";
export { type BandPosition, bandPositions } from "./lib/bands/band_positions.ts";
export { type Lever, levers, moveLever } from "./lib/model/levers.ts";
export { type PayQuartile, payQuartiles, type RawGap, rawGaps } from "./lib/gap/raw_gaps.ts";
export { type Suppression, suppressSmallGroups } from "./lib/gap/suppress.ts";
export {
  type GapCoefficient,
  gapFromCoefficient,
  holmAdjust,
  residualRegression,
  twoSidedP,
} from "./lib/gap/partial_out.ts";
export {
  oobBalancedAccuracy,
  PROXY_THRESHOLD,
  type ProxyFigure,
  proxyFigures,
} from "./lib/ensemble/proxies.ts";
export {
  chooseReference,
  GAP_CAUTIONS,
  GAP_SOURCES,
  type GapCategory,
  gapCheck,
  type GapFigure,
  type GapNote,
  type GapOptions,
  type GapRegression,
  type GapReport,
} from "./lib/gap/gap_check.ts";
export {
  CHANCE_FLOOR,
  decomposeGap,
  type DecomposeInput,
  type GapDecomposition,
  type GapDecompositionReport,
  PROPENSITY_MIN_LEAF,
} from "./lib/gap/decompose_gap.ts";
export {
  type PayReview,
  payReview,
  type ReviewCategory,
  type ReviewNote,
  type ReviewOptions,
  type ReviewPerson,
  type ReviewStatus,
} from "./lib/gap/pay_review.ts";
export {
  type Categories,
  categoriesOf,
  oobRSquared,
  type TableProvenance,
  tableProvenance,
  withinColumns,
} from "./lib/gap/categories.ts";
export {
  type ImportanceGrowth,
  importanceGrowth,
  type OutlineNode,
  treeOutline,
  typicalErrorShare,
} from "./lib/model/model_card.ts";
export { type ClassVotes, classVotes } from "./lib/ensemble/class_votes.ts";
