/**
 * The flow's first steps: which data (the demo, a CSV of one's own, a saved
 * model), the brief schema, the column to estimate and the attributes, then
 * the fit and its summary with the one-sentence answer last.
 *
 * @module
 */

import { errorWords, wordedSchema } from "../option_words.ts";
import { REBUILDS_PAY_WARNING } from "../open_model.ts";
import { existsSync } from "node:fs";
import {
  DataError,
  DEMO_COMPANY,
  demoCompanyCsv,
  describeSchema,
  fitModel,
  type ImplausiblePay,
  ImplausiblePayError,
  isPayColumn,
  isPayName,
  loadTable,
  type LoadTableOptions,
  MAX_CLASSES,
  MAX_SPLIT_LEVELS,
  type Model,
  readModelFile,
  readTableText,
  screenPay,
  type Table,
} from "../../mod.ts";
import { progressBar } from "../progress.ts";
import { forTerminal, terminalText } from "../render/safe_text.ts";
import { inShort, renderModelSummary } from "../render/model_view.ts";
import { formatNumber } from "../render/numbers.ts";
import { renderSchemaBrief } from "../render/schema_view.ts";
import type { FlowIO } from "./flow_io.ts";
import type { TableSource } from "./gap_step.ts";
import { droppedReason, leftOutSentence } from "../data_check.ts";
import { askDecimalMark } from "./decimal_step.ts";
import { wrapped } from "./screen_room.ts";
import { DEMO_READ, type FlowOptions } from "./guided_flow.ts";

/**
 * Asks for the data and returns a fitted (or loaded) model.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv } from "../../mod.ts";
 * import { makeStyle } from "../render/style.ts";
 * import type { FlowIO } from "./flow_io.ts";
 * import { chooseAndFit } from "./fit_step.ts";
 * const path = `${Deno.makeTempDirSync()}/pay.csv`;
 * Deno.writeTextFileSync(path, demoCompanyCsv({ rows: 120, seed: 1 }));
 * // A CSV of one's own; every other question answered with its default.
 * const said: string[] = [];
 * const io: FlowIO = {
 *   say: (text) => void said.push(text), style: makeStyle(false), width: 80, ascii: false,
 *   choose: (message, choices, d) =>
 *     Promise.resolve((message === "What do you want to work with?" ? "csv" : d) as never),
 *   tick: (_m, choices) => Promise.resolve(choices.filter((c) => c.checked).map((c) => c.value)),
 *   ask: () => Promise.resolve(path),
 * };
 * const { model, source } = await chooseAndFit(io, { demoPath: "", trees: 3, workers: 1 });
 * assert.equal(model.target.name, "base_pay_eur");
 * assert.equal(model.ensemble!.trees.length, 3);
 * assert.equal(source!.table.rows, 120);
 * assert.match(said.at(-1)!, /In short: for one person, the estimate is typically off by/);
 * Deno.removeSync(path);
 * ```
 */
export async function chooseAndFit(
  io: FlowIO,
  options: FlowOptions,
): Promise<
  {
    model: Model;
    tableText: string | null;
    source: TableSource | null;
    leftOut: ImplausiblePay | null;
  }
> {
  const { style } = io;
  const start = await io.choose("What do you want to work with?", [
    {
      name: `The demo company (${DEMO_COMPANY}, 2,000 people)`,
      value: "demo" as const,
      description: "An invented pay table, to try paygrove without your own data",
    },
    { name: "A CSV pay table of your own", value: "csv" as const },
    { name: "A model saved earlier with paygrove", value: "model" as const },
  ]);

  let model: Model;
  let table: Table | null = null;
  let tableText: string | null = null;
  let source: TableSource | null = null;
  let leftOut: ImplausiblePay | null = null;
  if (start === "model") {
    const path = await io.ask("Path of the model file:", { validate: fileExists });
    model = await readModelFile(path);
    io.say(style.dim(
      `Loaded ${terminalText(path)}: ${terminalText(model.target.name)}, ` +
        `${formatNumber(model.rows.used, {}, 0)} people.`,
    ));
    if (model.fileNotes?.some((n) => n.kind === "rebuildsPay")) {
      io.say(style.caution(REBUILDS_PAY_WARNING));
    }
  } else {
    let readOptions: LoadTableOptions;
    let label: string;
    if (start === "demo") {
      tableText = existsSync(options.demoPath)
        ? await Deno.readTextFile(options.demoPath)
        : demoCompanyCsv();
      readOptions = { ...DEMO_READ, file: "demo company (invented)" };
      label = "demo company (invented)";
    } else {
      const path = await io.ask("Path of the CSV file:", { validate: fileExists });
      // Piece by piece, up to a stated size: a wrong path stops with a sentence.
      tableText = await readTableText(path, options.read?.encoding);
      readOptions = { ...options.read, file: path };
      label = path;
    }
    table = loadTable(tableText, readOptions);
    if (table.source.decimal?.how === "ambiguous") {
      readOptions = { ...readOptions, decimal: await askDecimalMark(io, table.source.decimal) };
      table = loadTable(tableText, readOptions);
    }

    io.say(
      renderSchemaBrief(forTerminal(wordedSchema(describeSchema(table))), {
        file: terminalText(label),
        style,
        width: io.width,
        numbers: { locale: options.locale, currency: readOptions.currency, ascii: io.style.ascii },
      }).join("\n"),
    );
    const { target, features, allowProtected } = await chooseColumns(io, table);
    if (allowProtected) {
      io.say(style.caution(
        "Caution: you ticked a protected attribute. Setting pay on it risks unlawful " +
          "discrimination; use such a model only to study gaps, with counsel.",
      ));
    }
    // The target named, the table is read again so that rows missing it are left out.
    table = loadTable(tableText, { ...readOptions, target });
    // Pay no pay table holds is said with its lines; the rows are left out
    // only when the person says so (the flow's --drop-implausible).
    try {
      ({ table, leftOut } = screenPay(table, target, { moneyOnly: true }));
    } catch (error) {
      if (!(error instanceof ImplausiblePayError)) throw error;
      io.say(style.warn(`! ${errorWords(error)}.`));
      const n = error.finding.count;
      const go = await io.choose(`Leave ${n} row${n === 1 ? "" : "s"} out and go on?`, [
        { name: `Yes, leave ${n === 1 ? "it" : "them"} out`, value: true },
        { name: "No, choose again (correct the table first)", value: false },
      ]);
      if (!go) throw new DataError("nothing was fitted: the table has implausible pay");
      ({ table, leftOut } = screenPay(table, target, { moneyOnly: true, leaveOut: true }));
    }
    source = { table, path: start === "demo" ? options.demoPath : label };
    const bar = progressBar({ progress: io.progress, width: io.width });
    try {
      model = await fitModel(table, {
        target,
        features,
        allowProtected,
        trees: options.trees,
        workers: options.workers,
        loadOptions: readOptions,
        onProgress: (stage, done, total) => bar.update(stage, done, total),
      });
    } finally {
      bar.finish();
    }
    const shown = forTerminal({
      ...model,
      dropped: model.dropped.map((d) => ({ ...d, reason: droppedReason(d) })),
      // Rows left out for implausible pay are said below, apart.
      rows: { ...model.rows, dropped: model.rows.dropped - (leftOut?.count ?? 0) },
    });
    const numbers = { locale: options.locale, ascii: io.style.ascii };
    const summary = renderModelSummary(shown, { style, width: io.width, numbers });
    // The summary's one-sentence answer comes last, right above the next
    // question, where a 24-line terminal still shows it.
    const sentence = inShort(shown, numbers);
    const short = sentence === null ? [] : wrapped(io, `${style.bold("In short:")} ${sentence}`);
    const leads = short.length > 0 && short.every((line, i) => summary[i] === line);
    io.say(
      [
        "",
        style.bold(`Fitted in ${model.seconds.toFixed(1)} s`),
        ...(leads ? summary.slice(short.length) : summary),
        ...wrapped(
          io,
          style.dim(
            "The tree beside the ensemble is the reference tree whose decision path you will " +
              "see; the ensemble averages many such trees for steadier estimates.",
          ),
        ),
        ...(leftOut ? wrapped(io, style.warn(leftOutSentence(leftOut, ", as you chose"))) : []),
        ...short,
      ].join("\n"),
    );
  }
  return { model, tableText, source, leftOut };
}

/**
 * Asks for the target and the features.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, loadTable } from "../../mod.ts";
 * import { makeStyle } from "../render/style.ts";
 * import type { FlowIO } from "./flow_io.ts";
 * import { chooseColumns } from "./fit_step.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 60, seed: 1 }));
 * // Every question answered with its default: the suggested pay column, the ticked attributes.
 * const shown: string[] = [];
 * const io: FlowIO = {
 *   say: () => {}, style: makeStyle(false), width: 80, ascii: false,
 *   choose: (_m, choices, d) => Promise.resolve(d ?? choices[0].value),
 *   tick: (_m, choices) => {
 *     shown.push(...choices.map((c) => c.name));
 *     return Promise.resolve(choices.filter((c) => c.checked).map((c) => c.value));
 *   },
 *   ask: () => Promise.resolve(""),
 * };
 * const chosen = await chooseColumns(io, table);
 * assert.equal(chosen.target, "base_pay_eur");
 * assert(!chosen.features.includes("gender") && chosen.allowProtected === false);
 * assert(shown.includes("gender (protected attribute; unticked by default)"));
 * ```
 */
export async function chooseColumns(
  io: FlowIO,
  table: Table,
): Promise<{ target: string; features: string[]; allowProtected: boolean }> {
  const usable = table.columns.filter((c) => c.type !== "identifier" && c.type !== "constant");
  const numeric = usable.filter((c) => c.type === "numeric");
  const payLike = numeric.filter((c) => c.type === "numeric" && (c.money || isPayName(c.name)));
  const suggested = payLike[0]?.name ?? numeric[0]?.name;
  const targets = [
    ...payLike,
    ...numeric.filter((c) => !payLike.includes(c)),
    // A class target has at most MAX_CLASSES levels.
    ...usable.filter((c) =>
      (c.type === "categorical" || c.type === "ordinal") && !c.protected &&
      c.levels.length <= MAX_CLASSES
    ),
  ];
  const target = await io.choose(
    "Which column should paygrove estimate?",
    targets.map((c) => ({
      name: c.name === suggested ? `${c.name} (looks like pay)` : c.name,
      value: c.name,
      description: c.type === "numeric"
        ? "a number: pay is estimated"
        : "levels: the likeliest one is estimated",
    })),
    suggested,
  );
  const candidates = usable.filter((c) => c.name !== target);
  // Unticked by default, with the reason: protected attributes, and level
  // columns the default features leave out (identifier-like, too many levels).
  const why = (c: Table["columns"][number]): string | undefined => {
    if (isPayColumn(c)) return "pay: never an attribute";
    if (c.protected) return "protected attribute; unticked by default";
    if (c.type !== "categorical" && c.type !== "ordinal") return undefined;
    if (c.identifierLike) {
      return `looks like an identifier: ${c.identifierLike.levels} levels in ` +
        `${c.identifierLike.rows} rows`;
    }
    if (c.type === "categorical" && c.levels.length > MAX_SPLIT_LEVELS) {
      return `${c.levels.length} levels; at most ${MAX_SPLIT_LEVELS} can be used`;
    }
    return undefined;
  };
  const features = await io.tick(
    "Which attributes may explain it? (space to tick, enter to go on)",
    candidates.map((c) => ({
      name: why(c) ? `${c.name} (${why(c)})` : c.name,
      value: c.name,
      checked: why(c) === undefined,
      // Pay cannot be ticked: the library refuses it (make_dataset.ts).
      ...(isPayColumn(c) ? { disabled: true } : {}),
    })),
  );
  if (features.length === 0) {
    io.say(io.style.warn("No attribute ticked: every usable non-protected attribute is used."));
    return {
      target,
      features: candidates.filter((c) => why(c) === undefined).map((c) => c.name),
      allowProtected: false,
    };
  }
  const allowProtected = candidates.some((c) => c.protected && features.includes(c.name));
  return { target, features, allowProtected };
}

/**
 * Whether a typed path names a file: true, or what to say instead.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { fileExists } from "./fit_step.ts";
 * assert.equal(fileExists(" "), "Type a path, e.g. data/pay.csv");
 * assert.match(String(fileExists("/")), /is a folder, not a file/);
 * assert.equal(fileExists(new URL(import.meta.url).pathname), true);
 * ```
 */
export function fileExists(path: string): string | true {
  if (path.trim() === "") return "Type a path, e.g. data/pay.csv";
  try {
    return Deno.statSync(path.trim()).isFile ? true : `${path} is a folder, not a file`;
  } catch {
    return `No file at ${path} (paths are relative to ${Deno.cwd()})`;
  }
}
