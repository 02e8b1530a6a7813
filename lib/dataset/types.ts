/**
 * The learner's view of a table: encoded features and one target.
 *
 * @module
 */

/** How a feature is split: by threshold (numeric, ordinal) or by level subset. */
export type FeatureKind = "numeric" | "ordinal" | "categorical";

/** One encoded feature column. */
export interface Feature {
  /** Column name. */
  name: string;
  /** How the feature splits. */
  kind: FeatureKind;
  /**
   * One value per row: the number, or the level code for ordinal and
   * categorical features; `NaN` where missing.
   */
  values: Float64Array;
  /** Level names (ordinal: lowest first); absent for numeric features. */
  levels?: string[];
}

/** A numeric target (pay): regression with squared error. */
export interface RegressionTarget {
  /** Discriminant. */
  kind: "regression";
  /** Column name. */
  name: string;
  /** One value per row; never missing. */
  values: Float64Array;
}

/** A class target (e.g. level): classification with Gini impurity. */
export interface ClassTarget {
  /** Discriminant. */
  kind: "classification";
  /** Column name. */
  name: string;
  /** Class names, in code order. */
  classes: string[];
  /** One class code per row; never missing. */
  values: Int32Array;
}

/** Encoded rows ready for the learner. */
export interface Dataset {
  /** Number of rows. */
  rows: number;
  /** Features in a fixed order (the order ties are broken in). */
  features: Feature[];
  /** The target. */
  target: RegressionTarget | ClassTarget;
}
