/**
 * Error classes that separate the user's mistakes from ours.
 *
 * The terminal layer maps {@linkcode DataError} to exit status 1 and
 * {@linkcode OptionError} to exit status 2; anything else is a programmer
 * error and keeps its stack trace.
 *
 * @module
 */

/**
 * A library text's references to options, `{privacyMin}`, in words: the
 * option's own name by default (what a library caller passed), or what
 * `word` makes of it (the terminal writes the flag, `--privacy-min`). A
 * reference the terminal filled with a flag already, `{--report}`, is
 * kept as it is.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { optionText } from "./errors.ts";
 * const text = "{minLeaf} 2 is below the privacy minimum 5 (see {privacyMin})";
 * assert.equal(optionText(text), "minLeaf 2 is below the privacy minimum 5 (see privacyMin)");
 * const flag = (name: string) => `--${name.replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`)}`;
 * assert.equal(optionText(text, flag), "--min-leaf 2 is below the privacy minimum 5 (see --privacy-min)");
 * assert.equal(optionText("{--report}: exists", flag), "--report: exists");
 * assert.equal(optionText("site in {North, South}", flag), "site in {North, South}");
 * // A column named "{where}" is quoted data, left as it is.
 * assert.equal(optionText('{where}: no column named "{where}"', flag), '--where: no column named "{where}"');
 * ```
 */
export function optionText(text: string, word: (option: string) => string = (o) => o): string {
  // Names from the data are quoted ("{where}" as a column's name): only
  // the text outside double quotes is the library's own.
  return text.split('"').map((part, i) =>
    i % 2 === 1 ? part : part.replace(
      /\{(--[a-z][a-z-]*|[a-z][A-Za-z]*)\}/g,
      (_, name: string) => (name.startsWith("--") ? name : word(name)),
    )
  ).join('"');
}

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
  /** The sentence with its option references, `{option}` (see {@linkcode optionText}). */
  readonly template: string;

  /**
   * @param message One sentence for the user, no stack trace needed;
   * options named as `{option}`.
   * @param location Where the problem is.
   */
  constructor(message: string, location: DataErrorLocation = {}) {
    super(optionText(message));
    this.name = "DataError";
    this.location = location;
    this.template = message;
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
 * const error = new OptionError('{target}: no column named "salry"');
 * assert(error.name === "OptionError");
 * assert.equal(error.message, 'target: no column named "salry"');
 * ```
 */
export class OptionError extends Error {
  /** The sentence with its option references, `{option}` (see {@linkcode optionText}). */
  readonly template: string;

  /**
   * @param message One sentence for the user, naming the option as
   * `{option}` (the library's name; the terminal writes its flag).
   */
  constructor(message: string) {
    super(optionText(message));
    this.name = "OptionError";
    this.template = message;
  }
}
