/**
 * The library names its options in its messages as `{privacyMin}`; the
 * terminal writes each as the flag a person types (`--privacy-min`). One
 * place maps the names to flags and words an error of the library.
 *
 * @module
 */

import {
  DataError,
  OptionError,
  optionText,
  type QualityWarning,
  type SchemaSummary,
  UnknownNameError,
} from "../mod.ts";

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

/**
 * A library note's text with its options written as flags (`{currency}`
 * -> `--currency`); names quoted from the data are left as they are.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { optionWords } from "./option_words.ts";
 * assert.equal(
 *   optionWords("the symbol was read as USD; give {currency} to say otherwise"),
 *   "the symbol was read as USD; give --currency to say otherwise",
 * );
 * ```
 */
export function optionWords(text: string): string {
  return optionText(text, flagOf);
}

/**
 * A table's data-quality warnings with their options written as flags,
 * for `--json` and the screen alike.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { wordedWarnings } from "./option_words.ts";
 * const [w] = wordedWarnings([
 *   { kind: "decimal-mark", count: 1, lines: [], message: '"pay" reads as numbers only with {decimal} ","' },
 * ]);
 * assert.equal(w.message, '"pay" reads as numbers only with --decimal ","');
 * assert.equal(w.kind, "decimal-mark");
 * ```
 */
export function wordedWarnings(warnings: readonly QualityWarning[]): QualityWarning[] {
  return warnings.map((w) => ({ ...w, message: optionWords(w.message) }));
}

/**
 * A schema summary with the options in its notes and warnings written as
 * flags.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { describeSchema, loadTable } from "../mod.ts";
 * import { wordedSchema } from "./option_words.ts";
 * const summary = describeSchema(loadTable("level,pay\nL1,$50000\nL2,$52000\nL1,$51000\n"));
 * assert.match(describeSchema(loadTable("pay\n$1\n$2\n")).columns[0].notes.join(" "), /\{currency\}/);
 * assert.match(wordedSchema(summary).columns[1].notes.join(" "), /give --currency to say otherwise/);
 * ```
 */
export function wordedSchema(summary: SchemaSummary): SchemaSummary {
  return {
    ...summary,
    notes: summary.notes.map(optionWords),
    columns: summary.columns.map((c) => ({ ...c, notes: c.notes.map(optionWords) })),
    warnings: wordedWarnings(summary.warnings),
  };
}

/** A library error as data, for `--json` (see {@linkcode errorDocument}). */
export interface ErrorDocument {
  error: {
    /** `option` (exit status 2) or `data` (exit status 1). */
    kind: "option" | "data";
    /** The options the sentence names, as flags, in order. */
    options: string[];
    /** Where in a file, for a data error (file, line, column as known). */
    location?: { file?: string; line?: number; column?: string };
    /** For a name that matched nothing: what was asked, what exists, the nearest. */
    unknownName?: { option: string; asked: string; known: string[]; nearest?: string };
    /** The sentence, as the terminal says it. */
    message: string;
  };
}

/**
 * A library error as one JSON document, so a script run with `--json` can
 * act on what went wrong without reading the sentence: its kind, the
 * options it names, where in the file, and for an unknown name the names
 * there are.
 *
 * @param message The sentence as the terminal writes it.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { DataError, OptionError } from "../mod.ts";
 * import { errorDocument, errorWords } from "./option_words.ts";
 * const option = new OptionError("{minLeaf} 2 is below the privacy minimum 5 (see {privacyMin})");
 * assert.deepEqual(errorDocument(option, errorWords(option)).error, {
 *   kind: "option",
 *   options: ["--min-leaf", "--privacy-min"],
 *   message: "--min-leaf 2 is below the privacy minimum 5 (see --privacy-min)",
 * });
 * const data = new DataError('pay.csv: line 12 has "n/a"', { file: "pay.csv", line: 12, column: "pay" });
 * assert.deepEqual(errorDocument(data, data.message).error.location, { file: "pay.csv", line: 12, column: "pay" });
 * ```
 */
export function errorDocument(error: OptionError | DataError, message: string): ErrorDocument {
  const options: string[] = [];
  // The option references as optionText reads them (outside quoted data),
  // in order, each once.
  optionText(error.template, (name) => {
    const flag = flagOf(name);
    if (!options.includes(flag)) options.push(flag);
    return flag;
  });
  const doc: ErrorDocument["error"] = {
    kind: error instanceof OptionError ? "option" : "data",
    options,
    message,
  };
  if (error instanceof DataError && Object.keys(error.location).length > 0) {
    doc.location = { ...error.location };
  }
  if (error instanceof UnknownNameError) {
    doc.unknownName = {
      option: flagOf(error.option),
      asked: error.asked,
      known: error.known,
      ...(error.nearest !== undefined ? { nearest: error.nearest } : {}),
    };
  }
  return { error: doc };
}
