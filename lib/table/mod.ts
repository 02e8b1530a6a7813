/**
 * The data layer: CSV text -> typed, columnar pay table.
 *
 * @module
 */

export * from "./types.ts";
export { type Amount, type DecimalMark, parseAmount, parseNumber } from "./amount.ts";
export { DEFAULT_MISSING_TOKENS, missingTest } from "./missing.ts";
export { isProtectedName, nameWords } from "./protected_names.ts";
export { LADDER, ladderOrder } from "./ordinal.ts";
export {
  columnNamed,
  matchLevel,
  matchName,
  type NameKind,
  type NameMatch,
  unknownColumn,
  unknownLevel,
  type UnknownName,
  UnknownNameError,
} from "./column_named.ts";
export { type DecimalMarkHow, type DecimalMarkReading, judgeDecimalMark } from "./decimal_mark.ts";
export { isPayName, periodFromName } from "./money.ts";
export type { DeclaredType } from "./infer_column.ts";
export {
  loadTable,
  loadTableChunks,
  type LoadTableOptions,
  type TargetKind,
} from "./load_table.ts";
export {
  loadTableFile,
  readTableText,
  TABLE_MAX_BYTES,
  TEXT_TABLE_MAX_BYTES,
} from "./load_table_file.ts";
export { type ColumnSummary, describeSchema, type SchemaSummary } from "./describe_schema.ts";
export { quantile } from "./quality.ts";
export { filterRows, subsetRows } from "./filter_rows.ts";
export {
  findImplausiblePay,
  type ImplausiblePay,
  ImplausiblePayError,
  implausibleRule,
  PAY_CEILING,
  PLAUSIBLE_FACTOR,
  type ScreenedTable,
  screenPay,
  type ScreenPayOptions,
} from "./implausible.ts";
