/**
 * `paygrove batch MODEL PROFILES.csv`: scores every row of a CSV, with the
 * offer's position in the range when an offer column is named.
 *
 * @module
 */

import wrapAnsi from "wrap-ansi";
import { Command, type CommandUnknownOpts } from "@commander-js/extra-typings";
import {
  assertCanWrite,
  batchAnswer,
  batchAnswerWithParts,
  type BatchRow,
  isTrainingTable,
  type Model,
  type ModelRows,
  openModel,
  OptionError,
  type RefusedRow,
  RowsRefusedError,
  type SupportReason,
  writeFileAtomic,
} from "../../mod.ts";
import type { Terminal } from "../terminal.ts";
import { wordedWarnings } from "../option_words.ts";
import { readTableForModel } from "../profile_flags.ts";
import { withReadFlags } from "../table_flags.ts";
import { ANALYST_FILE_OPTION, openModelFile } from "../open_model.ts";
import { coverageOption, wholeNumber } from "../option_values.ts";
import { cappedWorkers } from "../workers.ts";
import { csvCell, jsonText, terminalText } from "../render/safe_text.ts";
import { PROTECTED_CAUTION } from "../render/cautions.ts";
import { dataWarningLines } from "../data_check.ts";
import { formatPay, type NumberStyle } from "../render/numbers.ts";
import { fitTable, leftOutNote } from "../render/fit_table.ts";
import { moneyStyle } from "../render/model_view.ts";
import { supportReasonText } from "../render/answer_notes.ts";

/**
 * The columns batch adds, in order.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable, writeModelFile } from "../../mod.ts";
 * import { recordingTerminal } from "../terminal.ts";
 * import { BATCH_COLUMNS, batchCommand } from "./batch.ts";
 * const model = await fitModel(loadTable(demoCompanyCsv({ rows: 120, seed: 1 })), {
 *   target: "base_pay_eur", trees: 3, folds: 3, workers: 1,
 * });
 * const dir = Deno.makeTempDirSync();
 * await writeModelFile(`${dir}/m.json`, model);
 * Deno.writeTextFileSync(`${dir}/people.csv`, demoCompanyCsv({ rows: 3, seed: 9 }));
 * const terminal = recordingTerminal();
 * await batchCommand(terminal)
 *   .parseAsync([`${dir}/m.json`, `${dir}/people.csv`], { from: "user" });
 * const [header, first] = terminal.stdout.join("").split("\n");
 * const at = header.split(",").indexOf("estimate");
 * assert.deepEqual(header.split(",").slice(at, at + BATCH_COLUMNS.length), [...BATCH_COLUMNS]);
 * assert.equal(first.split(",")[at + 1], "ensemble"); // estimate_source
 * Deno.removeSync(dir, { recursive: true });
 * ```
 */
export const BATCH_COLUMNS = [
  "estimate",
  "estimate_source",
  "reference_tree",
  "ci_low",
  "ci_high",
  "range_low",
  "range_high",
] as const;

/**
 * The columns added with `--offer`.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable, writeModelFile } from "../../mod.ts";
 * import { recordingTerminal } from "../terminal.ts";
 * import { batchCommand, OFFER_COLUMNS } from "./batch.ts";
 * const model = await fitModel(loadTable(demoCompanyCsv({ rows: 120, seed: 1 })), {
 *   target: "base_pay_eur", trees: 3, folds: 3, workers: 1,
 * });
 * const dir = Deno.makeTempDirSync();
 * await writeModelFile(`${dir}/m.json`, model);
 * // The people's own pay as the offer column.
 * const people = `${dir}/people.csv`;
 * Deno.writeTextFileSync(people, demoCompanyCsv({ rows: 3, seed: 9 }));
 * const terminal = recordingTerminal();
 * await batchCommand(terminal)
 *   .parseAsync([`${dir}/m.json`, people, "--offer", "base_pay_eur"], { from: "user" });
 * const [header, ...rows] = terminal.stdout.join("").trim().split("\n");
 * const at = header.split(",").indexOf(OFFER_COLUMNS[0]);
 * assert.deepEqual(header.split(",").slice(at, at + 4), [...OFFER_COLUMNS]);
 * for (const row of rows) assert.match(row.split(",")[at + 2], /^(under|within|over)$/);
 * Deno.removeSync(dir, { recursive: true });
 * ```
 */
export const OFFER_COLUMNS = [
  "offer_to_estimate",
  "range_position",
  "offer_position",
  "share_paid_less",
] as const;

/**
 * The last columns: why a row is unusual (or was refused), and the model it was scored with.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable, writeModelFile } from "../../mod.ts";
 * import { recordingTerminal } from "../terminal.ts";
 * import { batchCommand, TRAILING_COLUMNS } from "./batch.ts";
 * const model = await fitModel(loadTable(demoCompanyCsv({ rows: 120, seed: 1 })), {
 *   target: "base_pay_eur", trees: 3, folds: 3, workers: 1,
 * });
 * const dir = Deno.makeTempDirSync();
 * const { sha256 } = await writeModelFile(`${dir}/m.json`, model);
 * Deno.writeTextFileSync(`${dir}/people.csv`, demoCompanyCsv({ rows: 2, seed: 9 }));
 * const terminal = recordingTerminal();
 * await batchCommand(terminal)
 *   .parseAsync([`${dir}/m.json`, `${dir}/people.csv`], { from: "user" });
 * const [header, first] = terminal.stdout.join("").split("\n");
 * assert(header.endsWith(`,${TRAILING_COLUMNS.join(",")}`));
 * assert(first.endsWith(`,${sha256.slice(0, 12)}`));
 * Deno.removeSync(dir, { recursive: true });
 * ```
 */
export const TRAILING_COLUMNS = ["warnings", "model_sha256"] as const;

/**
 * The model's fingerprint in every row: the first 12 hex digits of the
 * model file's SHA-256 (the full provenance is in the provenance file).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { modelFingerprint } from "./batch.ts";
 * const model = { provenance: { modelFile: { path: "m.json", sha256: "b22a86edd9df2ee8ecd7" } } };
 * assert.equal(modelFingerprint(model as never), "b22a86edd9df");
 * ```
 */
export function modelFingerprint(model: Model): string {
  return model.provenance.modelFile?.sha256.slice(0, 12) ?? "unknown";
}

/**
 * Where the provenance of a scored CSV is written: beside it, `.csv`
 * replaced by `.provenance.json`.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { provenancePath } from "./batch.ts";
 * assert.equal(provenancePath("out/scored.csv"), "out/scored.provenance.json");
 * assert.equal(provenancePath("scored"), "scored.provenance.json");
 * ```
 */
export function provenancePath(out: string): string {
  return `${out.replace(/\.csv$/i, "")}.provenance.json`;
}

/**
 * Thrown by `batch` after its output is written when some rows were
 * refused: the program then ends with status 3 (`EXIT.rowsRefused`)
 * without another message.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { SomeRowsRefused } from "./batch.ts";
 * assert.equal(new SomeRowsRefused(2).refused, 2);
 * ```
 */
export class SomeRowsRefused extends Error {
  /** How many rows were refused. */
  readonly refused: number;

  /** @param refused How many rows were refused. */
  constructor(refused: number) {
    super(`${refused} rows refused`);
    this.name = "SomeRowsRefused";
    this.refused = refused;
  }
}

// `short`: each SHA-256 to its first 12 digits, said (a terminal too narrow
// for 64 digits on a line would cut them in two).
function provenanceText(model: Model, short = false): string {
  const p = model.provenance;
  const hash = (h: string) => (short ? `${h.slice(0, 12)}...` : h);
  return `paygrove ${p.paygrove}; model format ${p.format}; model sha256 ` +
    `${p.modelFile ? hash(p.modelFile.sha256) : "unknown"}; table sha256 ` +
    `${hash(p.table.sha256)}; seed ${p.seed}` +
    (short ? " (sha256 shortened to fit the width; --json has them whole)" : "");
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
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable, writeModelFile } from "../../mod.ts";
 * import { recordingTerminal } from "../terminal.ts";
 * import { batchCommand } from "./batch.ts";
 * const model = await fitModel(loadTable(demoCompanyCsv({ rows: 120, seed: 1 })), {
 *   target: "base_pay_eur", trees: 3, folds: 3, workers: 1,
 * });
 * const dir = Deno.makeTempDirSync();
 * await writeModelFile(`${dir}/m.json`, model);
 * Deno.writeTextFileSync(`${dir}/people.csv`, demoCompanyCsv({ rows: 3, seed: 9 }));
 * const terminal = recordingTerminal();
 * await batchCommand(terminal)
 *   .parseAsync([`${dir}/m.json`, `${dir}/people.csv`, "--json"], { from: "user" });
 * const doc = JSON.parse(terminal.stdout.join(""));
 * assert.equal(doc.scored, 3);
 * assert.equal(doc.rows.length, 3);
 * assert(doc.rows.every((r: { estimate: number }) => r.estimate > 0));
 * Deno.removeSync(dir, { recursive: true });
 * ```
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
      "--contributions",
      "add each attribute's part of the estimate (parts_from, then part_COLUMN for each " +
        "attribute: a percentage as a fraction on a log-pay model, money otherwise)",
    )
    .option(
      "--coverage <share>",
      "coverage of the intervals, from 0.5 to 0.99",
      coverageOption,
      0.9,
    )
    .option(
      "--workers <n>",
      "parallel workers for --contributions (default: one per core)",
      wholeNumber(1),
    )
    .option(...ANALYST_FILE_OPTION)
    .option("--out <file>", "write the scored CSV here instead of standard output")
    .option("--force", "replace an existing --out file")
    .option("--json", "print one JSON document on stdout instead of CSV")
    .action(async (modelFile, profilesFile, flags) => {
      if (flags.out !== undefined && !flags.json) {
        await assertCanWrite(provenancePath(flags.out), flags.force ?? false, "--out", [
          modelFile,
          profilesFile,
        ]);
      }
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
      ).catch(scoreTheOthers);
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
      const scored = flags.contributions === true
        ? await batchAnswerWithParts(
          session,
          rows,
          cappedWorkers(flags.workers, 0, terminal.err) ?? navigator.hardwareConcurrency ?? 1,
          flags.coverage,
          offers,
        )
        : batchAnswer(session, rows, flags.coverage, offers);
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
      const refused = rows.refused ?? [];
      const summary = summarize(scored);
      const counts = {
        scored: summary.scored,
        refused: refused.length,
        outOfBag: scored.filter((r) => r.estimateSource === "out-of-bag").length,
        // Without the analyst's file no row can be told to be a training row.
        trainingRowsRecognised: model.analyst !== null,
        // The very table the model was fitted on: its people are the model's own.
        trainingTable: isTrainingTable(model, rows),
      };
      if (flags.json) {
        terminal.out(
          jsonText({
            rows: scored.map(({ reasons, ...r }, i) => ({
              input: inputRow(rows.raw, i),
              ...r,
              warnings: reasonsText(reasons),
              warningCodes: reasons,
            })),
            ...counts,
            refusedRows: refused,
            summary,
            dataWarnings: wordedWarnings(dataWarnings),
            provenance: model.provenance,
          }),
        );
        if (refused.length > 0) throw new SomeRowsRefused(refused.length);
        return;
      }
      const withOffer = offers !== null;
      const fingerprint = modelFingerprint(model);
      let provenanceFile: string | null = null;
      if (flags.out !== undefined) {
        const csv = toCsv(
          rows.raw,
          scored,
          withOffer,
          fingerprint,
          partColumns(model, flags.contributions),
        );
        // Per-person pay: a new file is its owner's alone (0600).
        await writeFileAtomic(flags.out, csv, {
          force: flags.force ?? false,
          option: "--out",
          private: true,
        });
        provenanceFile = provenancePath(flags.out);
        await writeFileAtomic(
          provenanceFile,
          jsonText({
            kind: "paygrove-batch-provenance",
            scoredFile: flags.out,
            modelSha256Column: fingerprint,
            profiles: { file: profilesFile, sha256: rows.table.source.sha256, rows: rows.rows },
            coverage: flags.coverage,
            offerColumn: flags.offer ?? null,
            ...counts,
            summary,
            provenance: model.provenance,
          }) + "\n",
          { force: flags.force ?? false, option: "--out" },
        );
      } else if (terminal.outIsTerminal === true) {
        const style: NumberStyle = moneyStyle(model, {});
        for (const line of readableRows(rows, scored, style, withOffer, terminal.width)) {
          terminal.out(line);
        }
      } else {
        terminal.out(
          toCsv(rows.raw, scored, withOffer, fingerprint, partColumns(model, flags.contributions))
            .replace(/\n$/, ""),
        );
      }
      // On a terminal, stderr's lines are wrapped at spaces (never inside a figure).
      const say = (text: string) => {
        if (terminal.errIsTerminal !== true) return terminal.err(text);
        const indent = /^ */.exec(text)![0];
        const wrapped = wrapAnsi(text.slice(indent.length), terminal.width - indent.length - 2);
        terminal.err(
          wrapped.split("\n").map((l, i) => `${indent}${i > 0 ? "  " : ""}${l}`).join("\n"),
        );
      };
      for (const line of refusedLines(refused, rows.ids, profilesFile)) say(line);
      const training = counts.trainingRowsRecognised
        ? `${counts.outOfBag} training rows given their out-of-bag estimate`
        : counts.trainingTable
        ? "this is the table the model was fitted on: every row's estimate includes that " +
          "person's own pay; --analyst-file gives the estimates of trees that never saw them"
        : "rows of the table the model learned from are not recognised without " +
          "--analyst-file, so their estimates include their own pay";
      const pct = `${Math.round(flags.coverage * 100)}%`;
      say(
        `paygrove batch: ${counts.scored} rows scored` +
          (refused.length > 0 ? `, ${refused.length} refused (listed above)` : "") +
          ` (${training})` +
          (withOffer
            ? `; offers: ${summary.under} under, ${summary.within} within, ${summary.over} over ` +
              `the ${pct} range` +
              (summary.noOffer > 0 ? `, ${summary.noOffer} without an offer` : "")
            : "") +
          `; ${summary.unusual} unusual for the data${
            summary.unusual > 0 && terminal.outIsTerminal !== true
              ? ", see the warnings column"
              : ""
          }` +
          (flags.out !== undefined
            ? ` -> ${terminalText(flags.out)}; provenance in ${terminalText(provenanceFile!)}`
            : `; model ${fingerprint} is ${
              provenanceText(model, terminal.errIsTerminal === true && terminal.width < 68)
            }`),
      );
      if (refused.length > 0) throw new SomeRowsRefused(refused.length);
    });
}

// Why a row is unusual for the data, as the warnings column says it.
function reasonsText(reasons: readonly SupportReason[]): string {
  return reasons.map(supportReasonText).join("; ");
}

// A table with levels the model never saw in some rows: the other rows are
// scored (all refused is the whole table refused, as before).
function scoreTheOthers(error: unknown): ModelRows {
  if (
    error instanceof RowsRefusedError && error.rows.refused !== undefined &&
    error.rows.refused.length < error.rows.rows
  ) return error.rows;
  throw error;
}

/** Batch's closing counts: rows scored, offers under, within and over the range, unusual rows. */
export interface BatchSummary {
  /** Rows scored. */
  scored: number;
  /** Offers under the range. */
  under: number;
  /** Offers within the range. */
  within: number;
  /** Offers over the range. */
  over: number;
  /** Scored rows without an offer (or without a range to place it in). */
  noOffer: number;
  /** Scored rows unusual for the data (their warnings column is not empty). */
  unusual: number;
}

/**
 * Counts scored rows by where their offers sit, and the unusual ones.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { summarize } from "./batch.ts";
 * const rows = [
 *   { estimateSource: "ensemble", offerPosition: "under", reasons: [] },
 *   { estimateSource: "ensemble", offerPosition: "within", reasons: [{ kind: "outsideData", feature: "years" }] },
 *   { estimateSource: "not-scored", offerPosition: null, reasons: [] },
 * ];
 * assert.deepEqual(summarize(rows as never), {
 *   scored: 2, under: 1, within: 1, over: 0, noOffer: 0, unusual: 1,
 * });
 * ```
 */
export function summarize(scored: readonly BatchRow[]): BatchSummary {
  const out: BatchSummary = { scored: 0, under: 0, within: 0, over: 0, noOffer: 0, unusual: 0 };
  for (const row of scored) {
    if (row.estimateSource === "not-scored") continue;
    out.scored++;
    if (row.offerPosition === "under") out.under++;
    else if (row.offerPosition === "within") out.within++;
    else if (row.offerPosition === "over") out.over++;
    else out.noOffer++;
    if (row.reasons.length > 0) out.unusual++;
  }
  return out;
}

// The refused rows on stderr: line, identifier, why (the first 20).
function refusedLines(refused: readonly RefusedRow[], ids: string[], file: string): string[] {
  if (refused.length === 0) return [];
  const lines = [
    `paygrove batch: ${refused.length} row${refused.length > 1 ? "s" : ""} of ` +
    `${terminalText(file)} not scored:`,
  ];
  for (const row of refused.slice(0, 20)) {
    const id = ids[row.row] ? ` (${terminalText(ids[row.row])})` : "";
    lines.push(`  line ${row.line}${id}: ${terminalText(row.reasons.join("; "))}`);
  }
  if (refused.length > 20) lines.push(`  ... and ${refused.length - 20} more (--json lists all)`);
  return lines;
}

// One line per row for a person at a terminal: id, estimate, range, offer,
// and a mark for rows unusual for the data. A row not scored says so; why is
// listed below it, on stderr. Narrow screens: the marks go first, then the
// range (both said in a line above the table); then a list.
function readableRows(
  rows: ModelRows,
  scored: BatchRow[],
  style: NumberStyle,
  withOffer: boolean,
  width: number,
): string[] {
  const pay = (x: number | null) => (x === null ? "" : formatPay(x, style));
  const table = scored.map((row, r) => {
    const id = terminalText(rows.ids[r] || `row ${r + 1}`);
    if (row.estimateSource === "not-scored") {
      return [id, "not scored", "", ...(withOffer ? [""] : []), "see below"];
    }
    const offer = row.offerPosition === undefined || row.offerPosition === null
      ? ""
      : `${row.offerPosition} (${row.rangePosition!.toFixed(2)})`;
    return [
      id,
      pay(row.estimate),
      row.rangeLow === null ? "" : `${pay(row.rangeLow)} - ${pay(row.rangeHigh)}`,
      ...(withOffer ? [offer] : []),
      row.reasons.length > 0 ? "! unusual" : "",
    ];
  });
  const head = ["id", "estimate", "range", ...(withOffer ? ["offer (range position)"] : []), ""];
  const fitted = fitTable({
    width,
    head,
    rows: table,
    aligns: head.map((_, c) => (c === 1 ? "right" : "left")),
    drop: [head.length - 1, 2],
    borders: "none",
  });
  const said = leftOutNote(fitted.dropped.map((d) => d === "" ? "the unusual marks" : d));
  return [...(said === null ? [] : wrapAnsi(said, width).split("\n")), ...fitted.lines];
}

function inputRow(raw: { header: string[]; cells: string[][] }, r: number): Record<string, string> {
  return Object.fromEntries(raw.header.map((h, c) => [h, raw.cells[c][r]]));
}

// With --contributions: the model's attributes, in its order (each row's
// parts are listed largest first, so they are looked up by name).
function partColumns(
  model: { features: { name: string }[] },
  wanted: boolean | undefined,
): string[] {
  return wanted === true ? model.features.map((f) => f.name) : [];
}

// One row's parts: the starting figure in money, then each attribute's part
// as a fraction (log pay: exp(part) - 1) or in money (raw scale).
function partCells(row: BatchRow, features: readonly string[]): string[] {
  if (features.length === 0) return [];
  const c = row.contributions;
  if (c === null || c === undefined) return ["", ...features.map(() => "")];
  const byName = new Map(c.parts.map((p) => [p.feature, p]));
  return [
    money(c.base),
    ...features.map((f) => {
      const p = byName.get(f)!;
      return p.percent === null ? money(p.money) : share(p.percent);
    }),
  ];
}

function toCsv(
  raw: { header: string[]; cells: string[][] },
  scored: BatchRow[],
  withOffer: boolean,
  fingerprint: string,
  parts: readonly string[] = [],
): string {
  const header = [
    ...raw.header,
    ...BATCH_COLUMNS,
    ...(withOffer ? OFFER_COLUMNS : []),
    ...(parts.length > 0 ? ["parts_from", ...parts.map((f) => `part_${f}`)] : []),
    ...TRAILING_COLUMNS,
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
        ? [
          share(row.offerToEstimate),
          share(row.rangePosition),
          row.offerPosition ?? "",
          share(row.shareBelow),
        ]
        : []),
      ...partCells(row, parts),
      row.refused !== null ? `not scored: ${row.refused}` : reasonsText(row.reasons),
      fingerprint,
    ];
    lines.push(cells.map(csvCell).join(","));
  });
  return lines.join("\n") + "\n";
}
