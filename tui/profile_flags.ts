/**
 * The options that build a profile from a saved model, shared by
 * `estimate`, `compare` and `sweep`: `--table TABLE --row ID` to start
 * from a person in a table, `--set COLUMN=VALUE` edits, `--coverage`.
 *
 * @module
 */

import type { Command } from "@commander-js/extra-typings";
import {
  applySets,
  findRow,
  matchName,
  type Model,
  type ModelRows,
  OptionError,
  type Profile,
  type ProfileWarning,
  readTableFileForModel,
  rowProfile,
  typicalProfile,
} from "../mod.ts";
import { PROTECTED_CAUTION } from "./render/cautions.ts";
import { ANALYST_FILE_OPTION } from "./open_model.ts";
import { coverageOption } from "./option_values.ts";
import { localeTag, type ReadFlags, readOverrides, withReadFlags } from "./table_flags.ts";
import { dataWarningLines } from "./data_check.ts";
import type { Terminal } from "./terminal.ts";
import { caseNote } from "./column_names.ts";
import { terminalText } from "./render/safe_text.ts";

/** Parsed profile options (with the options that say how --table is read). */
export type ProfileFlags = ReadFlags & {
  table?: string;
  row?: string;
  set?: string[];
  coverage: number;
  json?: true;
  locale?: string;
  analystFile?: string;
};

function collect(text: string, previous: string[] = []): string[] {
  return [...previous, text];
}

/**
 * Adds the profile options to a command.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { Command } from "@commander-js/extra-typings";
 * import { withProfileFlags } from "./profile_flags.ts";
 * const command = withProfileFlags(new Command("estimate"));
 * command.parse(["--set", "level=G3", "--set", "site=Eastgate", "--coverage", "80%"], {
 *   from: "user",
 * });
 * assert.deepEqual(command.opts().set, ["level=G3", "site=Eastgate"]);
 * assert.equal(command.opts().coverage, 0.8);
 * ```
 */
export function withProfileFlags<A extends unknown[], O extends Record<string, unknown>>(
  command: Command<A, O>,
): Command<A, O & ProfileFlags> {
  // An explicit return type keeps type checking of the option chain fast.
  // The reading options apply to --table; the model's own settings are the defaults.
  return withReadFlags(command)
    .option("--table <table>", "a table with the model's columns, to start from one of its rows")
    .option("--row <id>", "the identifier of the row of --table to start from")
    .option("--set <column=value>", "set an attribute of the profile (repeatable)", collect)
    .option("--coverage <share>", "coverage of the intervals", coverageOption, 0.9)
    .option("--locale <tag>", "locale for numbers and money, e.g. de-DE", localeTag)
    .option(...ANALYST_FILE_OPTION)
    .option("--json", "print one JSON document on stdout instead of text") as unknown as Command<
      A,
      O & ProfileFlags
    >;
}

/**
 * Reads a table for a model from a path (piece by piece, up to a stated
 * size), as the model's own table was read except where `flags` say otherwise.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../mod.ts";
 * import { readTableForModel } from "./profile_flags.ts";
 * const model = await fitModel(loadTable(demoCompanyCsv({ rows: 120, seed: 1 })), {
 *   target: "base_pay_eur", trees: 3, folds: 3, workers: 1,
 * });
 * const path = `${Deno.makeTempDirSync()}/people.csv`;
 * Deno.writeTextFileSync(path, demoCompanyCsv({ rows: 4, seed: 9 }));
 * const rows = await readTableForModel(model, path);
 * assert.equal(rows.rows, 4);
 * assert.deepEqual(rows.ids, ["FH10001", "FH10002", "FH10003", "FH10004"]);
 * Deno.removeSync(path);
 * ```
 */
export function readTableForModel(
  model: Model,
  path: string,
  amounts: readonly string[] = [],
  flags: ReadFlags = {},
): Promise<ModelRows> {
  return readTableFileForModel(model, path, amounts, false, readOverrides(flags));
}

/**
 * The profile the options describe: a row of `--table` or the typical
 * person, with `--set` applied.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, describeProfile, fitModel, loadTable } from "../mod.ts";
 * import { recordingTerminal } from "./terminal.ts";
 * import { profileFromFlags } from "./profile_flags.ts";
 * const model = await fitModel(loadTable(demoCompanyCsv({ rows: 120, seed: 1 })), {
 *   target: "base_pay_eur", trees: 3, folds: 3, workers: 1,
 * });
 * const terminal = recordingTerminal();
 * const { profile, start } = await profileFromFlags(
 *   model,
 *   { set: ["LEVEL=G6"], coverage: 0.9 },
 *   terminal,
 * );
 * assert.equal(describeProfile(model, profile).level, "G6");
 * assert.match(start, /^the typical person/);
 * // A name right but for its case is taken, with a note.
 * assert.match(terminal.stderr.join(""), /note: .*LEVEL/);
 * ```
 */
export async function profileFromFlags(
  model: Model,
  flags: ProfileFlags,
  terminal: Terminal,
  tableAlone = false,
): Promise<
  {
    profile: Profile;
    warnings: ProfileWarning[];
    rows: ModelRows | null;
    start: string;
    id: string;
  }
> {
  if (model.settings.allowProtected) {
    terminal.err(terminal.errStyle.caution(PROTECTED_CAUTION));
  }
  let base = typicalProfile(model);
  let rows: ModelRows | null = null;
  let start = "the typical person (median of each number, most common level)";
  if (flags.row !== undefined && flags.table === undefined) {
    throw new OptionError("--row needs --table: the model file keeps no one's row");
  }
  if (flags.table !== undefined && flags.row === undefined && !tableAlone) {
    throw new OptionError("--table needs --row ID: the person of the table to start from");
  }
  let id = "";
  if (flags.table !== undefined) {
    rows = await readTableForModel(model, flags.table, [], flags);
    // The table's data-quality warnings, briefly, on stderr.
    for (
      const line of dataWarningLines(rows.table.warnings, flags.table, {
        style: terminal.errStyle,
        width: terminal.width,
      })
    ) terminal.err(line);
    if (flags.row !== undefined) {
      base = rowProfile(rows, findRow(model, rows, flags.row, flags.table));
      start = `row ${flags.row} of ${flags.table}`;
      // Only the model's own identifier column can name a training row.
      if (rows.idColumn === model.read.identifier) id = flags.row;
    }
  }
  // A name right but for its case is taken, with a note.
  const attributes = model.features.map((f) => f.name);
  for (const set of flags.set ?? []) {
    const asked = set.slice(0, Math.max(0, set.indexOf("="))).trim();
    const match = matchName(asked, attributes);
    if (match.kind === "case") {
      terminal.err(`paygrove: note: ${terminalText(caseNote("--set", asked, match.name))}`);
    }
  }
  const { profile, warnings } = applySets(model, base, flags.set ?? []);
  return { profile, warnings, rows, start, id: (flags.set ?? []).length === 0 ? id : "" };
}
