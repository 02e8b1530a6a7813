/**
 * Names given on the command line, in words: the one lookup of the library
 * (exact, then without case, else the nearest) applied to every option that
 * names a column, a note for a name taken without its case, and the sentence
 * for a name that matched nothing.
 *
 * @module
 */

import { flagOf } from "./option_words.ts";
import { matchName, type Table, unknownColumn, type UnknownName } from "../mod.ts";
import type { Terminal } from "./terminal.ts";
import { clipLongRuns, terminalGuard } from "./render/safe_text.ts";

/**
 * The sentence for a name that matched nothing: the nearest name, or for a
 * level beyond a ladder's end the end it lies beyond, then what there is.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { unknownNameText } from "./column_names.ts";
 * assert.equal(
 *   unknownNameText({ option: "--set", what: "level", column: "level", asked: "G8",
 *     known: ["G1", "G2"], beyond: { side: "above", level: "G2" } }),
 *   '--set: "level" has no level "G8": it is above the highest level, G2; its levels are: G1, G2',
 * );
 * assert.equal(
 *   unknownNameText({ option: "--group", what: "column", asked: "sx", known: ["sex", "pay"],
 *     nearest: "sex" }),
 *   '--group: no column named "sx" (did you mean "sex"?); the columns are: sex, pay',
 * );
 * ```
 */
export function unknownNameText(error: UnknownName): string {
  const guess = error.beyond !== undefined
    ? `: it is ${error.beyond.side === "above" ? "above the highest" : "below the lowest"} ` +
      `level, ${error.beyond.level}`
    : error.nearest !== undefined
    ? ` (did you mean "${error.nearest}"?)`
    : "";
  const known = error.known.join(", ");
  switch (error.what) {
    case "column":
      return `${
        flagOf(error.option)
      }: no column named "${error.asked}"${guess}; the columns are: ${known}`;
    case "attribute":
      return `${flagOf(error.option)}: the model has no attribute "${error.asked}"${guess}; ` +
        `its attributes are: ${known}`;
    case "level":
      return `${flagOf(error.option)}: "${error.column}" has no level "${error.asked}"${guess}; ` +
        `its levels are: ${known}`;
  }
}

/**
 * The note for a name taken as a column whose name differs only in case.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { caseNote } from "./column_names.ts";
 * assert.equal(caseNote("--group", "sex", "Sex"), '--group "sex" is taken as the column "Sex"');
 * ```
 */
export function caseNote(option: string, asked: string, name: string): string {
  return `${flagOf(option)} "${asked}" is taken as the column "${name}"`;
}

/** The options of a command that name columns of the table it read. */
export interface ColumnFlags {
  target?: string;
  group?: string;
  variable?: string;
  within?: string[];
  features?: string[];
  drop?: string[];
  increasing?: string[];
  where?: Record<string, string[]>;
}

/**
 * The command's column options with each name matched to the table's
 * columns: a name right but for its case is taken (with a note on stderr,
 * also for the names the library matched while reading: target, types,
 * orders, periods, protected, FTE); an unknown name stops with the nearest.
 *
 * @throws {UnknownNameError} for a name that matches no column.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "../mod.ts";
 * import { recordingTerminal } from "./terminal.ts";
 * import { resolveColumnFlags } from "./column_names.ts";
 * const table = loadTable("Site,level,pay\nN,L1,50\nS,L2,60\nN,L2,61\n", { target: "pay" });
 * const terminal = recordingTerminal();
 * const flags = resolveColumnFlags(table, { target: "pay", features: ["site", "level"] }, terminal);
 * assert.deepEqual(flags.features, ["Site", "level"]);
 * assert.equal(terminal.stderr.join(""), 'paygrove: note: --features "site" is taken as the column "Site"\n');
 * ```
 */
export function resolveColumnFlags<F extends ColumnFlags>(
  table: Table,
  flags: F,
  terminal: Terminal,
): F {
  const names = table.columns.map((c) => c.name);
  const note = (text: string) =>
    terminal.err(`paygrove: note: ${terminalGuard(clipLongRuns(text), false)}`);
  for (const m of table.nameMatches ?? []) note(caseNote(m.option, m.asked, m.name));
  const noted = new Set((table.nameMatches ?? []).map((m) => `${m.option}\0${m.asked}`));
  const one = (option: string, asked: string): string => {
    const match = matchName(asked, names);
    if (match.kind === "unknown") throw unknownColumn(option, asked, names);
    if (match.kind === "case" && !noted.has(`${option}\0${asked}`)) {
      noted.add(`${option}\0${asked}`);
      note(caseNote(option, asked, match.name));
    }
    return match.name;
  };
  const out: F = { ...flags };
  if (flags.target !== undefined) out.target = one("--target", flags.target);
  if (flags.group !== undefined) out.group = one("--group", flags.group);
  if (flags.variable !== undefined) out.variable = one("--variable", flags.variable);
  if (flags.within !== undefined) out.within = flags.within.map((n) => one("--within", n));
  if (flags.features !== undefined) out.features = flags.features.map((n) => one("--features", n));
  if (flags.drop !== undefined) out.drop = flags.drop.map((n) => one("--drop", n));
  if (flags.increasing !== undefined) {
    out.increasing = flags.increasing.map((n) => one("--increasing", n));
  }
  if (flags.where !== undefined) {
    const where: Record<string, string[]> = {};
    for (const [name, values] of Object.entries(flags.where)) {
      const column = one("--where", name);
      where[column] = [...(where[column] ?? []), ...values];
    }
    out.where = where;
  }
  return out;
}
