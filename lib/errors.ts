/**
 * Error classes that separate the user's mistakes from ours.
 *
 * The terminal layer maps {@linkcode DataError} to exit status 1 and
 * {@linkcode OptionError} to exit status 2; anything else is a programmer
 * error and keeps its stack trace.
 *
 * @module
 */

/** Where in an input file a problem was found. */
export interface DataErrorLocation {
  /** File name as the user gave it. */
  file?: string;
  /** 1-based line number in the file. */
  line?: number;
  /** Column (header) name. */
  column?: string;
}

/**
 * The input data cannot be used: a broken CSV, a value of the wrong type, a
 * table too small to work with. The message is written for the person who
 * owns the data and names the file, line and column where known.
 *
 * @example Raising and reading a data error
 * ```ts
 * import assert from "node:assert/strict";
 * import { DataError } from "./errors.ts";
 * const error = new DataError('line 12 has "n/a", not a number', { line: 12, column: "pay" });
 * assert(error.location.line === 12);
 * ```
 */
export class DataError extends Error {
  /** Where the problem is, as far as known. */
  readonly location: DataErrorLocation;

  /**
   * @param message One sentence for the user, no stack trace needed.
   * @param location Where the problem is.
   */
  constructor(message: string, location: DataErrorLocation = {}) {
    super(message);
    this.name = "DataError";
    this.location = location;
  }
}

/**
 * An option does not fit the data it was given with: an unknown column name,
 * an order that misses a level, a value outside its allowed range.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { OptionError } from "./errors.ts";
 * const error = new OptionError("--target: no column named \"salry\"");
 * assert(error.name === "OptionError");
 * ```
 */
export class OptionError extends Error {
  /**
   * @param message One sentence for the user, naming the option.
   */
  constructor(message: string) {
    super(message);
    this.name = "OptionError";
  }
}
