/**
 * `paygrove batch MODEL PROFILES.csv`: scores every row of a CSV, with the
 * offer's position in the range when an offer column is named.
 *
 * @module
 */

import { Command, type CommandUnknownOpts } from "@commander-js/extra-typings";
import {
  assertCanWrite,
  batchAnswer,
  type BatchRow,
  isTrainingTable,
  type Model,
  openModel,
  OptionError,
  writeFileAtomic,
} from "../../mod.ts";
import type { Terminal } from "../terminal.ts";
import { readTableForModel } from "../profile_flags.ts";
import { withReadFlags } from "../table_flags.ts";
import { ANALYST_FILE_OPTION, openModelFile } from "../open_model.ts";
import { coverageOption } from "../option_values.ts";
import { csvCell, jsonText, terminalText } from "../render/safe_text.ts";
import { PROTECTED_CAUTION } from "./fit.ts";
import { dataWarningLines } from "../data_check.ts";

/** The columns batch adds, in order. */
export const BATCH_COLUMNS = [
  "estimate",
  "estimate_source",
  "reference_tree",
  "ci_low",
  "ci_high",
  "range_low",
  "range_high",
] as const;

/** The columns added with `--offer`. */
export const OFFER_COLUMNS = ["offer_to_estimate", "range_position", "offer_position"] as const;

function provenanceText(model: Model): string {
  const p = model.provenance;
  return `paygrove ${p.paygrove}; model format ${p.format}; model sha256 ` +
    `${p.modelFile?.sha256 ?? "unknown"}; table sha256 ${p.table.sha256}; seed ${p.seed}`;
}

function money(x: number | null | undefined): string {
  return x === null || x === undefined || !Number.isFinite(x) ? "" : x.toFixed(2);
}

function share(x: number | null | undefined): string {
  return x === null || x === undefined || !Number.isFinite(x) ? "" : String(Number(x.toFixed(6)));
}

/**
 * Builds the `batch` command.
 *
 * @param terminal Where output goes.
 */
export function batchCommand(terminal: Terminal): CommandUnknownOpts {
  // The reading options: the model's own settings are the defaults.
  return withReadFlags(new Command("batch"))
    .description(
      "Score every row of a CSV with the model's columns: estimate, intervals and, with --offer, " +
        "where each offer sits in the range",
    )
    .argument("<model>", "model file written by paygrove fit")
    .argument("<profiles>", "CSV with the model's attribute columns")
    .option("--offer <column>", "column of offers (pay amounts) to place in the range")
    .option(
      "--coverage <share>",
      "coverage of the intervals, from 0.5 to 0.99",
      coverageOption,
      0.9,
    )
    .option(...ANALYST_FILE_OPTION)
    .option("--out <file>", "write the scored CSV here instead of standard output")
    .option("--force", "replace an existing --out file")
    .option("--json", "print one JSON document on stdout instead of CSV")
    .action(async (modelFile, profilesFile, flags) => {
      if (flags.out !== undefined) {
        await assertCanWrite(flags.out, flags.force ?? false, "--out", [
          modelFile,
          profilesFile,
          ...(flags.analystFile !== undefined ? [flags.analystFile] : []),
        ]);
      }
      const model = await openModelFile(terminal, modelFile, flags.analystFile);
      if (model.settings.allowProtected) {
        terminal.err(terminal.errStyle.caution(PROTECTED_CAUTION));
      }
      const session = openModel(model);
      const rows = await readTableForModel(
        model,
        profilesFile,
        flags.offer === undefined ? [] : [flags.offer],
        flags,
      );
      let offers: Float64Array | null = null;
      if (flags.offer !== undefined) {
        const column = rows.table.columns.find((c) => c.name === flags.offer);
        if (column === undefined) {
          throw new OptionError(
            `--offer: ${profilesFile} has no column "${flags.offer}"; its columns are: ` +
              rows.raw.header.join(", "),
          );
        }
        if (column.type !== "numeric") {
          throw new OptionError(
            `--offer: "${flags.offer}" must hold amounts; it reads as ${column.type}`,
          );
        }
        offers = column.values;
      }
      const scored = batchAnswer(session, rows, flags.coverage, offers);
      // The profiles table's data-quality warnings, on stderr (stdout may be the CSV).
      const dataWarnings = rows.table.warnings;
      if (!flags.json) {
        for (
          const line of dataWarningLines(dataWarnings, profilesFile, {
            style: terminal.errStyle,
            width: terminal.width,
          })
        ) terminal.err(line);
      }
      const counts = {
        scored: scored.length,
        outOfBag: scored.filter((r) => r.estimateSource === "out-of-bag").length,
        // Without the analyst's file no row can be told to be a training row.
        trainingRowsRecognised: model.analyst !== null,
        // The very table the model was fitted on: its people are the model's own.
        trainingTable: isTrainingTable(model, rows),
      };
      if (flags.json) {
        terminal.out(
          jsonText({
            rows: scored.map((r, i) => ({ input: inputRow(rows.raw, i), ...r })),
            ...counts,
            dataWarnings,
            provenance: model.provenance,
          }),
        );
        return;
      }
      const csv = toCsv(rows.raw, scored, offers !== null, provenanceText(model));
      if (flags.out !== undefined) {
        // Per-person pay: a new file is its owner's alone (0600).
        await writeFileAtomic(flags.out, csv, {
          force: flags.force ?? false,
          option: "--out",
          private: true,
        });
        const flagged = scored.filter((r) => r.warnings !== "").length;
        terminal.err(
          `paygrove batch: ${counts.scored} rows scored (${
            counts.trainingRowsRecognised
              ? `${counts.outOfBag} training rows given their out-of-bag estimate`
              : counts.trainingTable
              ? "this is the table the model was fitted on: every row's estimate includes that " +
                "person's own pay; --analyst-file gives the estimates of trees that never saw them"
              : "rows of the table the model learned from are not recognised without " +
                "--analyst-file, so their estimates include their own pay"
          }; ${flagged} unusual for the data, see the warnings column) -> ${
            terminalText(flags.out)
          }`,
        );
      } else {
        terminal.out(csv.replace(/\n$/, ""));
      }
    });
}

function inputRow(raw: { header: string[]; cells: string[][] }, r: number): Record<string, string> {
  return Object.fromEntries(raw.header.map((h, c) => [h, raw.cells[c][r]]));
}

function toCsv(
  raw: { header: string[]; cells: string[][] },
  scored: BatchRow[],
  withOffer: boolean,
  provenance: string,
): string {
  const header = [
    ...raw.header,
    ...BATCH_COLUMNS,
    ...(withOffer ? OFFER_COLUMNS : []),
    "provenance",
  ];
  const lines = [header.map(csvCell).join(",")];
  scored.forEach((row, r) => {
    const cells = [
      ...raw.header.map((_, c) => raw.cells[c][r]),
      money(row.estimate),
      row.estimateSource,
      money(row.referenceTree),
      money(row.ciLow),
      money(row.ciHigh),
      money(row.rangeLow),
      money(row.rangeHigh),
      ...(withOffer
        ? [share(row.offerToEstimate), share(row.rangePosition), row.offerPosition ?? ""]
        : []),
      provenance,
    ];
    lines.push(cells.map(csvCell).join(","));
  });
  return lines.join("\n") + "\n";
}
