/**
 * The command-line options that say how to read a pay table, shared by every
 * command that loads one, and their translation into the library's
 * {@linkcode LoadTableOptions}.
 *
 * @module
 */

import { type Command, InvalidArgumentError, Option } from "@commander-js/extra-typings";
import {
  type DeclaredType,
  loadTableFile,
  type LoadTableOptions,
  type PayPeriod,
  type ReadOverrides,
  type Table,
} from "../mod.ts";
import type { Progress } from "./progress.ts";

const DELIMITERS: Record<string, string> = {
  ",": ",",
  comma: ",",
  ";": ";",
  semicolon: ";",
  "\\t": "\t",
  "\t": "\t",
  tab: "\t",
  "|": "|",
  pipe: "|",
};
const TYPES: readonly DeclaredType[] = ["numeric", "categorical", "ordinal", "identifier"];
const PERIODS: readonly PayPeriod[] = ["hour", "week", "month", "year"];

/** Splits `COL=VALUE`, refusing text without `=` or with an empty side. */
function pair(text: string): [string, string] {
  const at = text.indexOf("=");
  if (at <= 0 || at === text.length - 1) {
    throw new InvalidArgumentError(`expected COLUMN=VALUE, got "${text}"`);
  }
  return [text.slice(0, at).trim(), text.slice(at + 1).trim()];
}

/**
 * Splits a comma-separated list, trimming items and dropping empty ones.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { list } from "./table_flags.ts";
 * assert.deepEqual(list(" job_family, level,,"), ["job_family", "level"]);
 * assert.deepEqual(list(""), []);
 * ```
 */
export function list(text: string): string[] {
  return text.split(",").map((s) => s.trim()).filter((s) => s !== "");
}

/**
 * Parses a comma-separated list of columns that must name at least one
 * (`--features ""` would otherwise mean "no attribute at all").
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { columnList } from "./table_flags.ts";
 * assert.deepEqual(columnList("level, site"), ["level", "site"]);
 * assert.throws(() => columnList(" , "), /name at least one column/);
 * ```
 */
export function columnList(text: string): string[] {
  const names = list(text);
  if (names.length === 0) {
    throw new InvalidArgumentError(
      "name at least one column, or leave the option out to use every usable one",
    );
  }
  return names;
}

function collectPair<V>(check: (value: string, column: string) => V) {
  return (text: string, previous: Record<string, V> = {}): Record<string, V> => {
    const [column, value] = pair(text);
    return { ...previous, [column]: check(value, column) };
  };
}

function oneOf<T extends string>(allowed: readonly T[], what: string) {
  return (value: string): T => {
    if (!(allowed as readonly string[]).includes(value)) {
      throw new InvalidArgumentError(
        `${what} must be one of ${allowed.join(", ")}, got "${value}"`,
      );
    }
    return value as T;
  };
}

function positiveNumber(text: string): number {
  const value = Number(text);
  if (!Number.isFinite(value) || value <= 0) {
    throw new InvalidArgumentError(`expected a positive number, got "${text}"`);
  }
  return value;
}

function currencyCode(text: string): string {
  const code = text.trim().toUpperCase();
  if (!/^[A-Z]{3}$/.test(code)) {
    throw new InvalidArgumentError(`expected a 3-letter ISO 4217 code such as USD or EUR`);
  }
  return code;
}

/**
 * Parses `--locale`: a BCP 47 tag that number formatting accepts. Every
 * command with the option uses this one parser, so a tag in the wrong form
 * (`en_US`, an empty one) is refused at the start, never met mid-output.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { localeTag } from "./table_flags.ts";
 * assert(localeTag("de-DE") === "de-DE");
 * assert.throws(() => localeTag("en_US"), /"en_US" is not a locale tag such as en-US or de-DE/);
 * assert.throws(() => localeTag(""), /not a locale tag/);
 * ```
 */
export function localeTag(text: string): string {
  try {
    const tag = new Intl.Locale(text).toString();
    // What the output will do with it; throws for a tag it cannot use.
    new Intl.NumberFormat(tag).format(1);
    return tag;
  } catch {
    throw new InvalidArgumentError(`"${text}" is not a locale tag such as en-US or de-DE`);
  }
}

/**
 * Adds the options that say how a file's bytes are read (delimiter, decimal
 * mark, encoding, missing texts, currency, pay periods, FTE): every command
 * that reads a table has them, those that read one for a saved model too
 * (there they override what the model remembers of its own table).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { Command } from "@commander-js/extra-typings";
 * import { withReadFlags } from "./table_flags.ts";
 * const command = withReadFlags(new Command("x")).exitOverride();
 * command.parse(["--decimal", ",", "--delimiter", "semicolon"], { from: "user" });
 * assert.equal(command.opts().decimal, ",");
 * assert.equal(command.opts().delimiter, ";");
 * assert.equal(command.opts().encoding, undefined);
 * ```
 */
export function withReadFlags<A extends unknown[], O extends Record<string, unknown>>(
  command: Command<A, O>,
): Command<A, O & ReadFlags> {
  const chained = command
    .option(
      "--delimiter <char>",
      "field delimiter: comma, semicolon, tab or pipe (default: detected)",
      (text: string) => {
        const delimiter = DELIMITERS[text];
        if (!delimiter) {
          throw new InvalidArgumentError(`use comma, semicolon, tab or pipe, got "${text}"`);
        }
        return delimiter;
      },
    )
    .addOption(
      new Option(
        "--decimal <mark>",
        "decimal mark of numbers in the file (default: read from a semicolon file's cells " +
          "where they settle it, else .)",
      ).choices([".", ","] as const),
    )
    .option("--encoding <label>", "text encoding of the file, e.g. windows-1252 (default: utf-8)")
    .option(
      "--missing <list>",
      "comma-separated texts that mean missing (default: NA,N/A,#N/A,NaN,null,-; an empty cell always does)",
      list,
    )
    .option("--currency <code>", "ISO 4217 currency of pay columns, e.g. EUR", currencyCode)
    .option("--hours-per-year <n>", "annualise hourly pay with this many hours", positiveNumber)
    .option(
      "--fte <column>",
      "column of full-time-equivalent fractions; pay is divided by it",
    )
    .option(
      "--period <column=period>",
      "pay period of a column whose cells do not say it: hour, week, month or year (repeatable)",
      collectPair(oneOf(PERIODS, "a period")),
    );
  return chained as unknown as Command<A, O & ReadFlags>;
}

/**
 * Adds the table-reading options to a command: {@linkcode withReadFlags}
 * and the options that say what the columns are (target, types, orders,
 * protected attributes) and how output is written (locale).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { Command } from "@commander-js/extra-typings";
 * import { withTableFlags } from "./table_flags.ts";
 * const command = withTableFlags(new Command("x")).exitOverride();
 * command.parse(["--decimal", ","], { from: "user" });
 * assert(command.opts().decimal === ",");
 * ```
 */
export function withTableFlags<A extends unknown[], O extends Record<string, unknown>>(
  command: Command<A, O>,
  targetHelp = "the column to predict; rows where it is missing are left out",
): Command<A, O & TableFlags> {
  // The explicit return type matters: left to inference, the type of this
  // chain of options is deep enough that type checking it together with
  // other modules could take minutes.
  const chained = withReadFlags(command.option("--target <column>", targetHelp))
    .option(
      "--type <column=type>",
      "declare a column's type: numeric, categorical, ordinal or identifier (repeatable)",
      collectPair(oneOf(TYPES, "a type")),
    )
    .option(
      "--order <column=levels>",
      "declare an ordinal column's levels, lowest first, e.g. level=Junior,Senior,Lead (repeatable)",
      collectPair((value) => list(value)),
    )
    .option("--protected <columns>", "further protected attributes, comma-separated", list)
    .option("--locale <tag>", "locale for numbers and money in output, e.g. de-DE", localeTag);
  return chained as unknown as Command<A, O & TableFlags>;
}

/** The parsed values of {@linkcode withReadFlags}' options. */
export type ReadFlags = {
  delimiter?: string;
  decimal?: "." | ",";
  encoding?: string;
  missing?: string[];
  currency?: string;
  hoursPerYear?: number;
  fte?: string;
  period?: Record<string, PayPeriod>;
};

/**
 * The reading options given, as the library's overrides of what a model
 * remembers of its own table (options not given are left out, so the
 * model's settings stand).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { readOverrides } from "./table_flags.ts";
 * assert.deepEqual(readOverrides({ decimal: ".", encoding: "utf-8" }), {
 *   decimal: ".",
 *   encoding: "utf-8",
 * });
 * assert.deepEqual(readOverrides({}), {});
 * ```
 */
export function readOverrides(flags: ReadFlags): ReadOverrides {
  const out: ReadOverrides = {};
  if (flags.delimiter !== undefined) out.delimiter = flags.delimiter;
  if (flags.decimal !== undefined) out.decimal = flags.decimal;
  if (flags.encoding !== undefined) out.encoding = flags.encoding;
  if (flags.missing !== undefined) out.missing = flags.missing;
  if (flags.currency !== undefined) out.currency = flags.currency;
  if (flags.hoursPerYear !== undefined) out.hoursPerYear = flags.hoursPerYear;
  if (flags.fte !== undefined) out.fte = flags.fte;
  if (flags.period !== undefined) out.periods = flags.period;
  return out;
}

/** The parsed values of {@linkcode withTableFlags}' options. */
export interface TableFlags extends ReadFlags {
  target?: string;
  type?: Record<string, DeclaredType>;
  order?: Record<string, string[]>;
  protected?: string[];
  locale?: string;
}

/**
 * Translates parsed flags into the library's load options.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadOptions } from "./table_flags.ts";
 * const options = loadOptions({ decimal: ",", encoding: "utf-8", target: "pay" }, "t.csv");
 * assert(options.decimal === "," && options.target === "pay" && options.file === "t.csv");
 * ```
 */
export function loadOptions(flags: TableFlags, file: string): LoadTableOptions {
  const options: LoadTableOptions = { file, encoding: flags.encoding ?? "utf-8" };
  // Not given: read from the file's cells where they settle it.
  if (flags.decimal !== undefined) options.decimal = flags.decimal;
  if (flags.target !== undefined) options.target = flags.target;
  if (flags.delimiter !== undefined) options.delimiter = flags.delimiter;
  if (flags.missing !== undefined) options.missing = flags.missing;
  if (flags.type !== undefined) options.types = flags.type;
  if (flags.order !== undefined) options.orders = flags.order;
  if (flags.protected !== undefined) options.protected = flags.protected;
  if (flags.currency !== undefined) options.currency = flags.currency;
  if (flags.hoursPerYear !== undefined) options.hoursPerYear = flags.hoursPerYear;
  if (flags.fte !== undefined) options.fte = flags.fte;
  if (flags.period !== undefined) options.periods = flags.period;
  return options;
}

/**
 * Reads a table file with the reading shown on the progress bar (in MB,
 * with the time left), the bar cleared afterwards so a message or the next
 * stage starts on a clean line.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { readTable } from "./table_flags.ts";
 * const path = `${Deno.makeTempDirSync()}/pay.csv`;
 * Deno.writeTextFileSync(path, "level,pay\nL1,50000\nL2,61000\nL1,52000\n");
 * const seen: string[] = [];
 * let finished = 0;
 * const table = await readTable(path, { target: "pay" }, {
 *   update: (stage) => seen.push(stage),
 *   finish: () => finished++,
 * });
 * assert.equal(table.rows, 3);
 * assert(seen.length > 0 && seen.every((stage) => stage === "reading"));
 * assert(finished >= 1); // the bar is cleared after reading
 * Deno.removeSync(path);
 * ```
 */
export async function readTable(
  file: string,
  options: LoadTableOptions,
  progress: Progress,
): Promise<Table> {
  try {
    return await loadTableFile(
      file,
      options,
      (read, total) =>
        progress.update("reading", Math.round(read / 1e6), Math.max(1, Math.round(total / 1e6))),
    );
  } finally {
    progress.finish();
  }
}
