/**
 * The library names its options in its messages as `{privacyMin}`; the
 * terminal writes each as the flag a person types (`--privacy-min`). One
 * place maps the names to flags and words an error of the library.
 *
 * @module
 */

import { DataError, OptionError, optionText } from "../mod.ts";

/**
 * The flag of a library option (a flag given already is kept).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { flagOf } from "./option_words.ts";
 * assert.equal(flagOf("privacyMin"), "--privacy-min");
 * assert.equal(flagOf("where"), "--where");
 * assert.equal(flagOf("--report"), "--report");
 * ```
 */
export function flagOf(option: string): string {
  if (option.startsWith("--")) return option;
  return `--${option.replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`)}`;
}

/**
 * A library error's sentence with its options written as flags (any
 * other error: its message).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { OptionError } from "../mod.ts";
 * import { errorWords } from "./option_words.ts";
 * const error = new OptionError("{minLeaf} 2 is below the privacy minimum 5 (see {privacyMin})");
 * assert.equal(error.message, "minLeaf 2 is below the privacy minimum 5 (see privacyMin)");
 * assert.equal(errorWords(error), "--min-leaf 2 is below the privacy minimum 5 (see --privacy-min)");
 * assert.equal(errorWords(new Error("plain")), "plain");
 * ```
 */
export function errorWords(error: Error): string {
  if (error instanceof OptionError || error instanceof DataError) {
    return optionText(error.template, flagOf);
  }
  return error.message;
}
