/**
 * `paygrove bands MODEL --table TABLE [--by level]`: the pay bands to
 * publish, per cell of the `--by` attributes, from a model and the table of
 * current people (the model file holds no one's pay, so the table is
 * needed for every figure of current pay).
 *
 * @module
 */

import { Command, type CommandUnknownOpts } from "@commander-js/extra-typings";
import wrapAnsi from "wrap-ansi";
import {
  applySets,
  assertCanWrite,
  bandPositions,
  bandTable,
  findFeature,
  fitModel,
  type Model,
  type ModelRows,
  openModel,
  OptionError,
  postingRange,
  RowsRefusedError,
  typicalProfile,
  writeFileAtomic,
} from "../../mod.ts";
import { ANALYST_FILE_OPTION, openModelFile } from "../open_model.ts";
import { assertApart } from "../report_file.ts";
import { readTableForModel } from "../profile_flags.ts";
import {
  coverageOption,
  MAX_TREES,
  seedOption,
  shareOption,
  wholeNumber,
} from "../option_values.ts";
import {
  list,
  loadOptions,
  localeTag,
  type ReadFlags,
  readTable,
  withReadFlags,
} from "../table_flags.ts";
import { resolveColumnFlags } from "../column_names.ts";
import { progressBar } from "../progress.ts";
import { screenPayFlags } from "../data_check.ts";
import { cappedWorkers } from "../workers.ts";
import { ANSWER_CAUTIONS, printAnswer, provenanceLine } from "../render/cautions.ts";
import { isHtmlPath } from "../render/html/page.ts";
import { moneyStyle } from "../render/model_view.ts";
import {
  bandPositionsCsv,
  bandsCsv,
  bandsMarkdown,
  renderBands,
  renderPosting,
} from "../render/bands_view.ts";
import { forMarkdown, forTerminal, terminalText } from "../render/safe_text.ts";
import type { Terminal } from "../terminal.ts";

/**
 * Builds the `bands` command.
 *
 * @param terminal Where output goes.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable, writeModelFile } from "../../mod.ts";
 * import { recordingTerminal } from "../terminal.ts";
 * import { bandsCommand } from "./bands.ts";
 * const csv = demoCompanyCsv({ rows: 400, seed: 2 });
 * const model = await fitModel(loadTable(csv), { target: "base_pay_eur", trees: 10, folds: 3, workers: 1 });
 * const dir = Deno.makeTempDirSync();
 * await writeModelFile(`${dir}/m.json`, model);
 * Deno.writeTextFileSync(`${dir}/people.csv`, csv);
 * const terminal = recordingTerminal();
 * await bandsCommand(terminal).parseAsync([`${dir}/m.json`, "--table", `${dir}/people.csv`, "--json"], { from: "user" });
 * const doc = JSON.parse(terminal.stdout.join(""));
 * assert.deepEqual(doc.by, ["level"]); // the ladder by default
 * assert(doc.cells.length >= 5);
 * Deno.removeSync(dir, { recursive: true });
 * ```
 */
export function bandsCommand(terminal: Terminal): CommandUnknownOpts {
  return withReadFlags(new Command("bands"))
    .description(
      "Pay bands to publish per level (and family, site...): current pay, the model's band " +
        "(minimum, midpoint, maximum), spread, progression and who sits outside",
    )
    .argument(
      "<model>",
      "model file written by paygrove fit; or, with --target, the pay table to fit first",
    )
    .option("--table <file>", "the table of current people, with pay (needed with a model file)")
    .option(
      "--target <column>",
      "the argument is a pay table: fit a model on it first (default settings), with this pay column",
    )
    .option("--trees <n>", "trees when fitting first", wholeNumber(10, MAX_TREES), 200)
    .option("--seed <s>", "seed of resamples when fitting first", seedOption, 1)
    .option(
      "--workers <n>",
      "parallel workers when fitting first (default as in fit)",
      wholeNumber(1),
    )
    .option(
      "--by <columns>",
      "attributes whose combinations are the cells (default: the ladder)",
      list,
    )
    .option(
      "--coverage <share>",
      "share of each cell's people a band is built to hold",
      coverageOption,
    )
    .option(
      "--spread <share>",
      "a fixed range spread instead (max / min - 1, e.g. 40%)",
      shareOption,
    )
    .option(
      "--privacy-min <n>",
      "fewest people for a cell to be shown (at least 3)",
      wholeNumber(3),
      5,
    )
    .option("--locale <tag>", "locale for numbers and money, e.g. de-DE", localeTag)
    .option(...ANALYST_FILE_OPTION)
    .option("--new-hire", "each cell's typical profile as a new hire (tenure at its entry value)")
    .option("--posting", "the range to post for one role (with --set), as a new hire")
    .option(
      "--set <column=value>",
      "an attribute of the role for --posting (repeatable)",
      collectSets,
    )
    .option("--out <file>", "also write the band table as CSV")
    .option(
      "--people <file>",
      "also write the analyst's per-person CSV (pay, compa-ratio, range position): " +
        "everyone's pay, readable by you alone; never share it",
    )
    .option("--report <file>", "also write a report: HTML for a .html name, else Markdown")
    .option("--force", "replace an existing --out or --report file")
    .option("--json", "print one JSON document on stdout instead of text")
    .action(async (file, flags) => {
      if (flags.target !== undefined && flags.table !== undefined) {
        throw new OptionError(
          "--target fits on the table given first; --table goes with a model file: give one",
        );
      }
      // The model file given, or one fitted on the table given (--target).
      const modelOf = () =>
        flags.target === undefined
          ? openModelFile(terminal, file, flags.analystFile)
          : fitFirst(terminal, file, { ...flags, target: flags.target });
      if (flags.posting === true) {
        checkPostingFlags(flags);
        const model = await modelOf();
        await postingAction(terminal, model, {
          ...flags,
          set: flags.set!,
          table: flags.table ?? (flags.target === undefined ? undefined : file),
        });
        return;
      }
      if (flags.set !== undefined) {
        throw new OptionError("--set describes a role for --posting; add --posting");
      }
      if (flags.target === undefined && flags.table === undefined) {
        throw new OptionError(
          "bands needs --table FILE: the model file holds no one's pay, and current pay " +
            "(the quartiles, who sits outside a band, the cost) comes from the table " +
            "(or give the pay table itself with --target COLUMN to fit first)",
        );
      }
      if (flags.coverage !== undefined && flags.spread !== undefined) {
        throw new OptionError("--coverage and --spread are two ways to build a band: give one");
      }
      const tablePath = flags.table ?? file;
      const outputs = [
        ["--out", flags.out],
        ["--report", flags.report],
        ["--people", flags.people],
      ] as const;
      for (const [option, path] of outputs) {
        if (path !== undefined) {
          await assertCanWrite(path, flags.force ?? false, option, [file, tablePath]);
        }
      }
      await assertApart(outputs);
      const model = await modelOf();
      const by = flags.by ?? ladderOf(model.features);
      // A level the model never saw in some rows: the others are banded, and
      // the screen says how many were left out (all refused: the refusal).
      const rows = await readTableForModel(model, tablePath, [], flags).catch(bandTheOthers);
      const table = bandTable(openModel(model), rows, {
        by,
        coverage: flags.coverage,
        spread: flags.spread,
        privacyMin: flags.privacyMin,
        newHire: flags.newHire === true,
      });
      const money = moneyStyle(model, { locale: flags.locale });
      if (flags.out !== undefined) {
        await writeFileAtomic(flags.out, bandsCsv(table), {
          force: flags.force ?? false,
          option: "--out",
        });
      }
      if (flags.people !== undefined) {
        await writeFileAtomic(
          flags.people,
          bandPositionsCsv(table.by, bandPositions(model, rows, table), rows.idColumn),
          { force: flags.force ?? false, option: "--people", private: true },
        );
      }
      if (flags.report !== undefined) {
        const created = new Date().toISOString();
        await writeFileAtomic(
          flags.report,
          isHtmlPath(flags.report)
            // Loaded for a report only: the chart library adds 0.14 s to every start-up.
            ? (await import("../render/html/bands_html.ts")).bandsHtml(table, money, created, [
              provenanceLine(model.provenance),
            ], ANSWER_CAUTIONS)
            : bandsMarkdown(forMarkdown(table), money, created),
          { force: flags.force ?? false, option: "--report" },
        );
      }
      printAnswer(
        terminal,
        flags.json === true,
        model.provenance,
        table,
        () => [
          ...renderBands(forTerminal(table), {
            style: terminal.style,
            width: terminal.width,
            money,
          }),
          ...[flags.out, flags.report].filter((p) => p !== undefined).map((p) =>
            `Written: ${terminalText(p!)}.`
          ),
          ...(flags.people === undefined ? [] : wrapAnsi(
            terminal.style.warn(
              `Written: ${terminalText(flags.people)}, one row per person with their pay ` +
                `(readable by you alone): keep it with the pay table, never share it.`,
            ),
            terminal.width,
          ).split("\n")),
        ],
      );
    });
}

function bandTheOthers(error: unknown): ModelRows {
  if (
    error instanceof RowsRefusedError && error.rows.refused !== undefined &&
    error.rows.refused.length < error.rows.rows
  ) return error.rows;
  throw error;
}

// `bands TABLE --target COLUMN`: a model fitted on the table first, with
// the default settings, as `fit` would (the same screening of pay).
async function fitFirst(
  terminal: Terminal,
  file: string,
  flags: ReadFlags & { target: string; trees: number; seed: number; workers?: number },
): Promise<Model> {
  const options = loadOptions(flags, file);
  const progress = progressBar(terminal);
  const read = await readTable(file, options, progress);
  Object.assign(flags, resolveColumnFlags(read, flags, terminal));
  const { table } = screenPayFlags(read, [{ column: flags.target, moneyOnly: true }], false);
  try {
    return await fitModel(table, {
      target: flags.target,
      trees: flags.trees,
      seed: flags.seed,
      workers: cappedWorkers(flags.workers, flags.trees, terminal.err),
      loadOptions: options,
      onProgress: (stage, done, total) => progress.update(stage, done, total),
    });
  } finally {
    progress.finish();
  }
}

// The ordinal ladder column (the first ordinal attribute), else a refusal
// that asks for --by.
function ladderOf(features: readonly { name: string; kind: string }[]): string[] {
  const ladder = features.find((f) => f.kind === "ordinal");
  if (ladder === undefined) {
    throw new OptionError(
      "bands needs --by COLUMN: the model has no level ladder (an ordinal attribute) to band by",
    );
  }
  return [ladder.name];
}

function collectSets(value: string, previous: string[] = []): string[] {
  return [...previous, value];
}

// What `--posting` needs and takes, checked before any fitting.
function checkPostingFlags(
  flags: {
    set?: string[];
    spread?: number;
    out?: string;
    report?: string;
    people?: string;
  },
): void {
  if (flags.set === undefined || flags.set.length === 0) {
    throw new OptionError(
      "--posting needs the role: --set level=G3 --set job_family=Sales (the attributes " +
        "that define it)",
    );
  }
  if (
    flags.spread !== undefined || flags.out !== undefined || flags.report !== undefined ||
    flags.people !== undefined
  ) {
    throw new OptionError("--posting takes --set, --table, --coverage and --json only");
  }
}

// `bands --posting --set ...`: the range to post for one role.
async function postingAction(
  terminal: Terminal,
  model: Model,
  flags: ReadFlags & {
    set: string[];
    table?: string;
    coverage?: number;
    spread?: number;
    privacyMin: number;
    locale?: string;
    analystFile?: string;
    json?: true;
    out?: string;
    report?: string;
  },
): Promise<void> {
  const { profile } = applySets(model, typicalProfile(model), flags.set);
  const named = flags.set.map((text) =>
    model.features[findFeature(model, text.split("=")[0], "--set")].name
  );
  const rows = flags.table === undefined
    ? null
    : await readTableForModel(model, flags.table, [], flags);
  const posting = postingRange(openModel(model), profile, named, rows, {
    coverage: flags.coverage,
    privacyMin: flags.privacyMin,
  });
  const money = moneyStyle(model, { locale: flags.locale });
  printAnswer(
    terminal,
    flags.json === true,
    model.provenance,
    posting,
    () =>
      renderPosting(forTerminal(posting), { style: terminal.style, width: terminal.width, money }),
  );
}
