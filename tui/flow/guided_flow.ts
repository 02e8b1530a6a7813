/**
 * The guided what-if flow: from a pay table (or a saved model) to an
 * estimate with how sure it is, and what-if changes, one question at a
 * time. Every figure comes from the same library calls as the scriptable
 * commands; the flow adds questions and screens, no computation.
 *
 * @module
 */

import { REBUILDS_PAY_WARNING } from "../open_model.ts";
import { existsSync } from "node:fs";
import {
  applyChanges,
  applySets,
  checkOffer,
  type CompareAnswer,
  compareAnswer,
  DataError,
  DEMO_COMPANY,
  demoCompanyCsv,
  describeProfile,
  describeSchema,
  estimateProfile,
  fitModel,
  type GapReport,
  type ImplausiblePay,
  ImplausiblePayError,
  isPayColumn,
  isPayName,
  loadTable,
  type LoadTableOptions,
  MAX_CLASSES,
  MAX_SPLIT_LEVELS,
  type Model,
  type ModelSession,
  openModel,
  OptionError,
  outOfBagEstimate,
  parseOffer,
  type Profile,
  readForModel,
  readModelFile,
  type ReadOverrides,
  readTableText,
  rowProfile,
  screenPay,
  sweepAnswer,
  sweepValues,
  type Table,
  typicalProfile,
  writeFileAtomic,
  writeModelFile,
} from "../../mod.ts";
import { progressBar } from "../progress.ts";
import {
  fitResult,
  renderCompare,
  renderOffer,
  renderSweep,
  sureOfWhat,
} from "../render/answer_view.ts";
import { cautionLines } from "../render/cautions.ts";
import { forTerminal, jsonText, terminalGuard, terminalText } from "../render/safe_text.ts";
import { gapJson } from "../render/report_notes.ts";
import { gapMarkdown } from "../render/gap_view.ts";
import { inShort, moneyStyle, renderModelSummary } from "../render/model_view.ts";
import { formatNumber, formatPay, type NumberStyle } from "../render/numbers.ts";
import wrapAnsi from "wrap-ansi";
import { fitTable } from "../render/fit_table.ts";
import { renderSchemaBrief } from "../render/schema_view.ts";
import type { FlowIO } from "./flow_io.ts";
import { reportJson, reportMarkdown, type Scenario } from "./report.ts";
import { offerGapCheck, type TableSource } from "./gap_step.ts";
import { droppedReason, leftOutJson, leftOutSentence } from "../data_check.ts";
import { askDecimalMark } from "./decimal_step.ts";

/** Settings of a flow run. */
export interface FlowOptions {
  /** The committed demo table, used when present (else generated in memory). */
  demoPath: string;
  /** Where to write the session report, if given on the command line. */
  report?: string;
  /**
   * Replace an existing report (and its .json) given on the command line.
   * @default {false}
   */
  force?: boolean;
  /** Locale of numbers. */
  locale?: string;
  /** Trees of the ensemble (tests use fewer). */
  trees?: number;
  /** Workers for fitting. */
  workers?: number;
  /** How to read a CSV of one's own (the command line's reading options). */
  read?: ReadOverrides;
}

/** How the demo table is read: its pay is in EUR a year. */
export const DEMO_READ: LoadTableOptions = {
  currency: "EUR",
  periods: { base_pay_eur: "year" },
};

// What the what-if loop and saving share: the gap check and rows left out,
// to put in the report, and the report files this session wrote (which it
// may write again without asking).
type SessionOptions = FlowOptions & {
  gap: GapReport | null;
  leftOut: ImplausiblePay | null;
  written: Set<string>;
};

/** Runs the flow until the person quits. */
export async function guidedFlow(io: FlowIO, options: FlowOptions): Promise<void> {
  const { style } = io;
  io.say(
    wrapped(io, style.bold("paygrove: what would our pay structure pay a person like this?"))
      .join("\n"),
  );
  io.say([...cautionLines(style, io.width), ""].join("\n"));

  let model: Model | undefined;
  let tableText: string | null = null;
  let source: TableSource | null = null;
  let leftOut: ImplausiblePay | null = null;
  // Until a model is in hand: a file that cannot be used is said, and the
  // first question comes again.
  while (model === undefined) {
    try {
      ({ model, tableText, source, leftOut } = await chooseAndFit(io, options));
    } catch (error) {
      if (!(error instanceof DataError || error instanceof OptionError)) throw error;
      io.say(io.style.warn(`! ${terminalGuard(error.message, false)}`));
      io.say(io.style.dim("Choose again, or Ctrl-C to stop."));
    }
  }
  const session = openModel(model);
  const money = moneyStyle(model, { locale: options.locale });
  const gap = tableText !== null && source !== null
    ? await offerGapCheck(io, model, source, money)
    : null;
  await whatIfLoop(io, session, tableText, money, {
    ...options,
    gap,
    leftOut,
    written: new Set(),
  });
}

// Text wrapped at spaces to the screen's width.
function wrapped(io: FlowIO, text: string): string[] {
  return wrapAnsi(text, io.width).split("\n");
}

/** Lines of the screen: as the terminal says, else 24. */
export function screenRows(io: Pick<FlowIO, "rows">): number {
  return io.rows !== undefined && io.rows > 0 ? io.rows : 24;
}

/** Asks for the data and returns a fitted (or loaded) model. */
async function chooseAndFit(
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
      renderSchemaBrief(forTerminal(describeSchema(table)), {
        file: terminalText(label),
        style,
        width: io.width,
        numbers: { locale: options.locale, currency: readOptions.currency },
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
      io.say(style.warn(`! ${error.message}.`));
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
    const numbers = { locale: options.locale };
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

/** Asks for the target and the features. */
async function chooseColumns(
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

function fileExists(path: string): string | true {
  if (path.trim() === "") return "Type a path, e.g. data/pay.csv";
  try {
    return Deno.statSync(path.trim()).isFile ? true : `${path} is a folder, not a file`;
  } catch {
    return `No file at ${path} (paths are relative to ${Deno.cwd()})`;
  }
}

type Next =
  | "change"
  | "whole"
  | "promote"
  | "offer"
  | "sweep"
  | "keep"
  | "list"
  | "undo"
  | "restart"
  | "save"
  | "quit";

/** The profile, its history, the scenarios kept, until quit. */
async function whatIfLoop(
  io: FlowIO,
  session: ModelSession,
  tableText: string | null,
  money: NumberStyle,
  options: SessionOptions,
): Promise<void> {
  const { model } = session;
  const view = { style: io.style, width: io.width, money };
  const result = { ...view, compact: true };
  let built = await buildProfile(io, model, tableText);
  let profile = built.profile;
  const history: Profile[] = [];
  const scenarios: Scenario[] = [];
  const whatIfs: CompareAnswer[] = [];
  let answer = estimateProfile(session, profile, 0.9);
  const ladder = promotionFeature(model);
  const typical = describeProfile(model, typicalProfile(model));
  // The menu under every screen of the loop; `whole` when the result was
  // shortened to fit the screen above it.
  const menu = (whole: boolean) => [
    { name: "Change one attribute", value: "change" as const },
    ...(ladder >= 0
      ? [{ name: `Promote one ${model.features[ladder].name}`, value: "promote" as const }]
      : []),
    { name: "Sweep one attribute (chart)", value: "sweep" as const },
    { name: "Keep this profile as a scenario", value: "keep" as const },
    { name: `Show the scenarios side by side (${scenarios.length})`, value: "list" as const },
    // Always listed, so the choices keep their places; off until there is a change.
    {
      name: "Undo the last change",
      value: "undo" as const,
      ...(history.length === 0 ? { disabled: "(nothing to undo yet)" } : {}),
    },
    // After undo, so that the choices above keep their places.
    ...(model.target.kind === "regression"
      ? [{ name: "Check an offer against this profile", value: "offer" as const }]
      : []),
    ...(whole
      ? [{ name: "Show the whole profile and decision path", value: "whole" as const }]
      : []),
    { name: "Start over with a new profile", value: "restart" as const },
    { name: "Save the model and a report", value: "save" as const },
    { name: "Quit", value: "quit" as const },
  ];
  // Lines the menu takes (its question, the choices in view), so that
  // what is shown above it can stay in view on a screen of `rows`.
  const menuLines = 1 + menu(true).length;
  const room = () => screenRows(io) - menuLines;
  // The result within the room the menu leaves (less the lines said beside it).
  const fitted = (extra: number) =>
    fitResult(forTerminal(answer), {
      ...result,
      maxLines: room() - extra,
      typical: forTerminal(typical),
    });
  // Said under the estimate's line: the person's own pay, and a caution.
  const beside = (): string[] => {
    const lines: string[] = [];
    if (built.person) {
      // The person is one of the model's own: their estimate leans toward
      // their pay, so the one from trees that never saw them is said beside
      // it; after a change the pay is theirs as they are, not the changed
      // profile's.
      const who = terminalText(built.person.id);
      const own = profile === built.profile;
      const oob = own ? outOfBagEstimate(session, built.person.id, profile) : null;
      lines.push(
        ...wrapAnsi(
          io.style.dim(
            own
              ? `${who}'s pay in the table: ${formatPay(built.person.pay, money)}; ` +
                (oob !== null
                  ? `from trees that never saw ${who}: ${formatPay(oob, money)}`
                  : "the estimate includes their own pay")
              : `${who} as they are (before the changes) is paid ` +
                formatPay(built.person.pay, money),
          ),
          io.width - 2,
        ).split("\n").map((l) => `  ${l}`),
      );
    }
    if (model.settings.allowProtected) {
      lines.push(io.style.caution("Caution: a protected attribute shapes this estimate."));
    }
    return lines;
  };
  const showResult = () => {
    const said = beside();
    const lines = fitted(said.length).lines;
    lines.splice(1, 0, ...said);
    io.say(["", ...lines].join("\n"));
  };
  showResult();
  for (;;) {
    // The whole result is offered whenever the current one would not fit.
    const cut = fitted(beside().length).cut;
    const next: Next = await io.choose("What next?", menu(cut), undefined, true);
    if (next === "quit") break;
    try {
      await act(next);
    } catch (error) {
      // Esc inside an action goes back to this menu; a file that cannot be
      // written is said, and nothing of the session is lost.
      if ((error as Error).name === "AbortPromptError") {
        io.say(io.style.dim("(cancelled)"));
        continue;
      }
      if (error instanceof DataError || error instanceof OptionError) {
        io.say(io.style.warn(`! ${terminalGuard(error.message, false)}`));
        continue;
      }
      throw error;
    }
  }
  if (options.report !== undefined) {
    await writeReport(
      io,
      model,
      scenarios.length > 0 ? scenarios : [{ name: "current", answer }],
      whatIfs,
      options.report,
      options.gap,
      options.leftOut,
      (options.force ?? false) || options.written.has(options.report),
    );
  }
  io.say(
    wrapped(
      io,
      io.style.dim("Done. Figures describe the current pay structure; see the cautions above."),
    ).join("\n"),
  );

  async function act(next: Next): Promise<void> {
    if (next === "change" || next === "promote") {
      let changed: Profile;
      if (next === "promote") {
        const f = model.features[ladder];
        if (profile[ladder] >= f.levels!.length - 1) {
          io.say(
            io.style.warn(
              `${terminalText(f.levels![profile[ladder]])} is the top ${terminalText(f.name)}: ` +
                `there is no promotion to show.`,
            ),
          );
          return;
        }
        changed = applyChanges(model, profile, [`${f.name}=+1`]).profile;
      } else {
        changed = applySets(model, profile, [await editOne(io, model, profile)]).profile;
      }
      const what = compareAnswer(session, profile, changed, 0.9);
      const shown = renderCompare(forTerminal(what), { ...view, compact: true, maxLines: room() });
      io.say(["", ...shown].join("\n"));
      whatIfs.push(what);
      history.push(profile);
      profile = changed;
      answer = what.changed;
    } else if (next === "offer") {
      const text = await io.ask("Offer (e.g. 61000, 61k or 61,000):", {
        validate: (t: string) => {
          try {
            parseOffer(model, t);
            return true;
          } catch (error) {
            if (error instanceof OptionError) return error.message.replace(/^--offer:? /, "");
            throw error;
          }
        },
      });
      const offer = parseOffer(model, text);
      const checked = { ...answer, offer: checkOffer(session, profile, answer, offer) };
      io.say(["", ...renderOffer(forTerminal(checked), view)].join("\n"));
    } else if (next === "sweep") {
      const f = await io.choose(
        "Sweep which attribute?",
        levers(model).map((i) => ({ name: model.features[i].name, value: i })),
      );
      const sweep = sweepAnswer(session, profile, f, sweepValues(model, f, { steps: 12 }), 0.9);
      // The table first, then the chart, sized to stay in view with the menu.
      io.say(["", ...renderSweep(forTerminal(sweep), { ...view, chartLines: room() })].join("\n"));
    } else if (next === "whole") {
      io.say(["", ...fitResult(forTerminal(answer), result).lines].join("\n"));
    } else if (next === "keep") {
      const name = await io.ask("Name of this scenario:", {
        default: `scenario ${scenarios.length + 1}`,
      });
      scenarios.push({ name, answer });
      io.say(io.style.dim(`Kept "${terminalText(name)}" (${scenarios.length} kept).`));
    } else if (next === "list") {
      io.say(renderScenarios(forTerminal(scenarios), money, io).join("\n"));
    } else if (next === "undo") {
      profile = history.pop()!;
      answer = estimateProfile(session, profile, 0.9);
      showResult();
    } else if (next === "restart") {
      history.length = 0;
      built = await buildProfile(io, model, tableText);
      profile = built.profile;
      answer = estimateProfile(session, profile, 0.9);
      showResult();
    } else if (next === "save") {
      await save(
        io,
        model,
        scenarios.length > 0 ? scenarios : [{ name: "current", answer }],
        whatIfs,
        options,
      );
    }
  }
}

/** The ordinal feature a promotion moves: the first named like a level, else the first ordinal. */
export function promotionFeature(model: Model): number {
  const ordinals = model.features.map((f, i) => ({ f, i })).filter(({ f }) => f.kind === "ordinal");
  const named = ordinals.find(({ f }) => /level|grade|band|rank/i.test(f.name));
  return (named ?? ordinals[0])?.i ?? -1;
}

/** Asks how to start the profile, and builds it. */
async function buildProfile(
  io: FlowIO,
  model: Model,
  tableText: string | null,
): Promise<{ profile: Profile; person?: { id: string; pay: number } }> {
  const id = model.read.identifier;
  const how = await io.choose("Start the profile from", [
    {
      name: "A typical person (median number, most common level of each attribute)",
      value: "typical" as const,
    },
    ...(id !== undefined && tableText !== null
      ? [{ name: `An existing person, by ${id}`, value: "row" as const }]
      : []),
    { name: "Step through every attribute", value: "step" as const },
  ]);
  let profile = typicalProfile(model);
  if (how === "row") {
    const rows = readForModel(model, tableText!, "the table");
    // Case does not matter; the question shows what an id looks like.
    const find = (text: string) =>
      rows.ids.findIndex((v) => v.toLowerCase() === text.trim().toLowerCase());
    const answer = await io.ask(`${id} of the person (e.g. ${rows.ids[0]}):`, {
      validate: (text) => find(text) >= 0 ? true : `No one has ${id} "${text.trim()}" in the table`,
    });
    const r = find(answer);
    profile = rowProfile(rows, r);
    const pay = rows.target?.[r];
    if (pay !== undefined && !Number.isNaN(pay)) {
      return { profile, person: { id: rows.ids[r], pay } };
    }
  } else if (how === "step") {
    // Values are set as typed (a negative number is a value, not a step).
    for (let f = 0; f < model.features.length; f++) {
      profile = applySets(model, profile, [
        `${model.features[f].name}=${await askValue(io, model, profile, f)}`,
      ]).profile;
    }
  }
  return { profile };
}

/**
 * The attributes offered as what-if levers: never a protected attribute,
 * even in a model fitted with one.
 */
export function levers(model: Model): number[] {
  return model.features.flatMap((f, i) => (f.protected ? [] : [i]));
}

/** Asks which attribute to change and its new value; returns `name=value`. */
async function editOne(io: FlowIO, model: Model, profile: Profile): Promise<string> {
  const shown = describeProfile(model, profile);
  const f = await io.choose(
    "Change which attribute?",
    levers(model).map((i) => ({
      name: `${model.features[i].name} (now ${shown[model.features[i].name] ?? "missing"})`,
      value: i,
    })),
  );
  return `${model.features[f].name}=${await askValue(io, model, profile, f)}`;
}

/** Asks a value with the prompt that fits the attribute; the current value is the default. */
async function askValue(io: FlowIO, model: Model, profile: Profile, f: number): Promise<string> {
  const feature = model.features[f];
  const current = profile[f];
  if (feature.kind === "numeric") {
    const range = feature.range!;
    // A line of text, so that "NA" can say "not known" (a new hire has no
    // rating); anything else must read as a number.
    const missing = feature.missing > 0 ? "; NA if not known" : "";
    const text = await io.ask(
      `${feature.name} (the data runs from ${range.min} to ${range.max}${missing}):`,
      {
        default: Number.isNaN(current) ? "NA" : String(Number(current.toPrecision(10))),
        validate: (t) =>
          t.trim().toUpperCase() === "NA" || Number.isFinite(Number(t.trim())) && t.trim() !== ""
            ? true
            : `Type a number such as ${range.min}${missing ? ", or NA" : ""}`,
      },
    );
    return text.trim().toUpperCase() === "NA" ? "NA" : text.trim();
  }
  const levels = feature.levels!;
  const order = feature.kind === "ordinal" ? " (lowest first)" : "";
  return await io.choose(
    `${feature.name}${order}:`,
    levels.map((level) => ({ name: level, value: level })),
    Number.isNaN(current) ? undefined : levels[current],
  );
}

function renderScenarios(scenarios: Scenario[], money: NumberStyle, io: FlowIO): string[] {
  if (scenarios.length === 0) {
    return [io.style.dim('No scenario kept yet: choose "Keep this profile".')];
  }
  const pay = (x: number) => formatPay(x, money);
  // Side by side: one column per scenario (the last four at most),
  // the attributes that differ first, then the figures.
  const shown = scenarios.slice(-4);
  const names = Object.keys(shown[0].answer.profile);
  const differs = names.filter((n) =>
    shown.some((s) => String(s.answer.profile[n]) !== String(shown[0].answer.profile[n]))
  );
  const rows: string[][] = differs.map((n) => [
    n,
    ...shown.map((s) => String(s.answer.profile[n] ?? "missing")),
  ]);
  rows.push(["estimate", ...shown.map((s) => pay(s.answer.estimate))]);
  rows.push([
    `${sureOfWhat(shown[0].answer)}, 90% sure`,
    ...shown.map((s) =>
      s.answer.confidence ? `${pay(s.answer.confidence.low)}-${pay(s.answer.confidence.high)}` : "-"
    ),
  ]);
  rows.push([
    "one person, 90% range",
    ...shown.map((s) =>
      s.answer.range ? `${pay(s.answer.range.low)}-${pay(s.answer.range.high)}` : "-"
    ),
  ]);
  // Too wide for the screen: one block per row, no figure wrapped.
  const table = fitTable({
    width: io.width,
    head: ["", ...shown.map((s) => s.name)],
    rows,
    styleHead: io.style.bold,
  });
  const lines = [io.style.bold(`Scenarios${scenarios.length > 4 ? " (the last four)" : ""}`)];
  lines.push(...table.lines);
  if (differs.length === 0) lines.push(io.style.dim("The scenarios have the same attributes."));
  return lines;
}

async function save(
  io: FlowIO,
  model: Model,
  scenarios: Scenario[],
  whatIfs: CompareAnswer[],
  options: SessionOptions,
) {
  const path = await io.ask("Save the model as:", { default: "paygrove-model.json" });
  let force = false;
  if (existsSync(path)) {
    force = await io.choose(`${path} exists. Replace it?`, [
      { name: "No, keep it", value: false },
      { name: "Yes, replace it", value: true },
    ]);
    if (!force) return;
  }
  const { bytes } = await writeModelFile(path, model, force, "save");
  io.say(
    io.style.dim(`Saved the model to ${terminalText(path)} (${(bytes / 1e6).toFixed(1)} MB).`),
  );
  if (options.report !== undefined) {
    await writeReport(
      io,
      model,
      scenarios,
      whatIfs,
      options.report,
      options.gap,
      options.leftOut,
      (options.force ?? false) || options.written.has(options.report),
    );
    options.written.add(options.report);
    return;
  }
  const report = await io.ask("Save a report of the scenarios as (Markdown; a .json beside it):", {
    default: "paygrove-report.md",
    validate: (text) =>
      text.trim().endsWith(".md") ? true : "A report's name ends in .md (the .json goes beside it)",
  });
  // Neither the report nor the .json beside it replaces a file unasked.
  const taken = [report.trim(), reportJsonPath(report.trim())].filter((p) => existsSync(p));
  let replace = false;
  if (taken.length > 0) {
    replace = await io.choose(`${taken.map(terminalText).join(" and ")} exist. Replace?`, [
      { name: "No, keep them", value: false },
      { name: "Yes, replace them", value: true },
    ]);
    if (!replace) return;
  }
  await writeReport(
    io,
    model,
    scenarios,
    whatIfs,
    report.trim(),
    options.gap,
    options.leftOut,
    replace,
  );
  options.written.add(report.trim());
}

/**
 * The .json written beside a Markdown report.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { reportJsonPath } from "./guided_flow.ts";
 * assert.equal(reportJsonPath("out/session.md"), "out/session.json");
 * ```
 */
export function reportJsonPath(path: string): string {
  return path.replace(/\.md$/, "") + ".json";
}

async function writeReport(
  io: FlowIO,
  model: Model,
  scenarios: Scenario[],
  whatIfs: CompareAnswer[],
  path: string,
  gap: GapReport | null,
  leftOut: ImplausiblePay | null,
  force: boolean,
) {
  const jsonPath = reportJsonPath(path);
  // The gap check, when one was run in the session, follows the scenarios.
  // Rows left out for implausible pay are said right after the scenarios.
  const markdown = reportMarkdown(model, scenarios, whatIfs) +
    (leftOut ? `${leftOutSentence(leftOut, ", as you chose")}\n` : "") +
    (gap ? "\n" + gapMarkdown(gap, moneyStyle(model, {}), new Date().toISOString()) : "");
  const json = {
    ...reportJson(model, scenarios, whatIfs),
    leftOutImplausible: leftOutJson(leftOut ? [leftOut] : []),
    ...(gap ? { gap: gapJson(gap) } : {}),
  };
  await writeFileAtomic(path, markdown, { force, option: "report" });
  await writeFileAtomic(jsonPath, jsonText(json), { force, option: "report" });
  io.say(
    io.style.dim(`Wrote the report to ${terminalText(path)} and ${terminalText(jsonPath)}.`),
  );
}
