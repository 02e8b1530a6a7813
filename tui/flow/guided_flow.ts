/**
 * The guided what-if flow: from a pay table (or a saved model) to an
 * estimate with how sure it is, and what-if changes, one question at a
 * time. Every figure comes from the same library calls as the scriptable
 * commands; the flow adds questions and screens, no computation.
 *
 * @module
 */

import { errorWords } from "../option_words.ts";
import {
  DataError,
  type GapReport,
  type ImplausiblePay,
  type LoadTableOptions,
  type Model,
  openModel,
  OptionError,
  type ReadOverrides,
} from "../../mod.ts";
import { cautionLines } from "../render/cautions.ts";
import { terminalGuard } from "../render/safe_text.ts";
import { moneyStyle } from "../render/model_view.ts";
import type { FlowIO } from "./flow_io.ts";
import { offerGapCheck, type TableSource } from "./gap_step.ts";
import { wrapped } from "./screen_room.ts";
import { chooseAndFit } from "./fit_step.ts";
import { whatIfLoop } from "./what_if_loop.ts";

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

/**
 * How the demo table is read: its pay is in EUR a year.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, loadTable } from "../../mod.ts";
 * import { DEMO_READ } from "./guided_flow.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 5, seed: 1 }), DEMO_READ);
 * const pay = table.columns.find((c) => c.name === "base_pay_eur")!;
 * assert(pay.type === "numeric");
 * assert.deepEqual(pay.money, { currency: "EUR", period: "year" });
 * ```
 */
export const DEMO_READ: LoadTableOptions = {
  currency: "EUR",
  periods: { base_pay_eur: "year" },
};

// What the what-if loop and saving share: the gap check and rows left out,
// to put in the report, and the report files this session wrote (which it
// may write again without asking).
export type SessionOptions = FlowOptions & {
  gap: GapReport | null;
  leftOut: ImplausiblePay | null;
  written: Set<string>;
};

/**
 * Runs the flow until the person quits.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable, writeModelFile } from "../../mod.ts";
 * import { makeStyle } from "../render/style.ts";
 * import type { FlowIO } from "./flow_io.ts";
 * import { guidedFlow } from "./guided_flow.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }), { currency: "EUR" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * const path = `${Deno.makeTempDirSync()}/m.json`;
 * await writeModelFile(path, model);
 * // A person who opens the saved model, takes the typical person and quits.
 * const answers: Record<string, unknown> = {
 *   "What do you want to work with?": "model",
 *   "Start the profile from": "typical",
 *   "What next?": "quit",
 * };
 * const said: string[] = [];
 * const io: FlowIO = {
 *   say: (text) => void said.push(text), style: makeStyle(false), width: 80, ascii: false,
 *   choose: (message) => Promise.resolve(answers[message] as never),
 *   tick: () => Promise.resolve([]),
 *   ask: () => Promise.resolve(path), // "Path of the model file:"
 * };
 * await guidedFlow(io, { demoPath: "" });
 * const screen = said.join("\n");
 * assert.match(screen, /Loaded .*m\.json: base_pay_eur, 120 people\./);
 * assert.match(screen, /Estimate of base_pay_eur: €[\d,]+ \(median pay of people like this\)/);
 * assert(said.at(-1)!.startsWith("Done."));
 * Deno.removeSync(path);
 * ```
 */
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
      io.say(io.style.warn(`! ${terminalGuard(errorWords(error), false)}`));
      io.say(io.style.dim("Choose again, or Ctrl-C to stop."));
    }
  }
  const session = openModel(model);
  const money = moneyStyle(model, { locale: options.locale, ascii: io.style.ascii });
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
