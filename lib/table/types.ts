/**
 * The typed, columnar form of a pay table.
 *
 * A table never holds row objects: numeric columns are `Float64Array`s,
 * categorical and ordinal columns integer codes into a level dictionary, so
 * the learner reads them without conversion.
 *
 * @module
 */

import type { DecimalMarkReading } from "./decimal_mark.ts";

/** The kinds of column a pay table can hold. */
export type ColumnType = "numeric" | "categorical" | "ordinal" | "identifier" | "constant";

/** The span of time a pay amount is paid for. */
export type PayPeriod = "hour" | "week" | "month" | "year";

/** The unit of a money column, as read from the values or the options. */
export interface MoneyUnit {
  /** ISO 4217 code, e.g. `"EUR"`; undefined when the values carry none. */
  currency?: string;
  /** What the amount pays for; undefined when nothing says. */
  period?: PayPeriod;
}

/** Fields every column has. */
interface ColumnBase {
  /** Header name, trimmed. */
  name: string;
  /** Missing cells in the rows kept. */
  missing: number;
  /** True when the name marks a protected attribute or the user said so. */
  protected: boolean;
  /** Sentences about what was inferred or done to the column. */
  notes: string[];
}

/** A column of numbers; missing values are `NaN`. */
export interface NumericColumn extends ColumnBase {
  /** Discriminant. */
  type: "numeric";
  /** One value per row, `NaN` where missing. */
  values: Float64Array;
  /** Set when the values are money (a currency, a pay period, or a pay column). */
  money?: MoneyUnit;
}

/** A column of levels, unordered (`categorical`) or ordered (`ordinal`). */
export interface LevelColumn extends ColumnBase {
  /** Discriminant. */
  type: "categorical" | "ordinal";
  /** One code per row indexing `levels`; `-1` where missing. */
  codes: Int32Array;
  /** Level names; for an ordinal column, lowest first. */
  levels: string[];
  /**
   * Set when the column was inferred (not declared) and looks like it names
   * rows rather than groups them: more than 50 levels, and more levels than
   * half the rows with a value (free text, names, e-mail addresses). Such a
   * column is left out of the default features.
   */
  identifierLike?: { levels: number; rows: number };
}

/** A column that names rows (unique or nearly so); never a feature. */
export interface IdentifierColumn extends ColumnBase {
  /** Discriminant. */
  type: "identifier";
  /** The text of each row's identifier; `""` where missing. */
  values: string[];
}

/** A column with at most one distinct value; dropped from modelling. */
export interface ConstantColumn extends ColumnBase {
  /** Discriminant. */
  type: "constant";
  /** The one value, or undefined when every cell is missing. */
  value?: string;
}

/** Any column of a {@linkcode Table}. */
export type Column = NumericColumn | LevelColumn | IdentifierColumn | ConstantColumn;

/** What kind of data-quality finding a {@linkcode QualityWarning} is. */
export type QualityKind =
  | "duplicate-identifier"
  | "duplicate-row"
  | "unit-slip"
  | "non-positive-pay"
  | "outlier"
  | "decimal-mark";

/** A data-quality finding: worth a look, not a reason to stop. */
export interface QualityWarning {
  /** What was found. */
  kind: QualityKind;
  /** The column concerned, when there is one. */
  column?: string;
  /** How many rows are concerned. */
  count: number;
  /** Source line numbers of the first rows concerned (at most a few). */
  lines: number[];
  /** One sentence for the user. */
  message: string;
}

/** A loaded pay table: typed columns plus what loading found. */
export interface Table {
  /** Rows kept (rows whose target was missing are not kept). */
  rows: number;
  /** Columns in file order. */
  columns: Column[];
  /** The 1-based source line on which each kept row starts. */
  lines: Int32Array;
  /** Rows left out because the target was missing. */
  excluded: { count: number; lines: number[] };
  /** The target column's name, when one was named. */
  target?: string;
  /** Data-quality findings. */
  warnings: QualityWarning[];
  /** What loading did: delimiter, conversions, dropped columns. */
  notes: string[];
  /** Where the table came from. */
  source: {
    file?: string;
    delimiter: string;
    bytes: number;
    /** SHA-256 of the input bytes (hex): the table's fingerprint. */
    sha256: string;
    /** The decimal mark the numbers were read with, and how it was chosen. */
    decimal?: DecimalMarkReading;
  };
  /**
   * Names the options gave that matched a column only without case, and the
   * column each was taken as.
   */
  nameMatches?: { option: string; asked: string; name: string }[];
}
