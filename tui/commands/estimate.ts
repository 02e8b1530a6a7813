/**
 * `paygrove estimate MODEL`: what the model says about one profile.
 *
 * @module
 */

import wrapAnsi from "wrap-ansi";
import { Command, type CommandUnknownOpts } from "@commander-js/extra-typings";
import {
  checkOffer,
  estimateProfile,
  isTrainingTable,
  openModel,
  outOfBagEstimate,
  parseOffer,
} from "../../mod.ts";
import { openModelFile } from "../open_model.ts";
import { wordedNotes } from "../render/answer_notes.ts";
import { profileFromFlags, withProfileFlags } from "../profile_flags.ts";
import { renderEstimate } from "../render/answer_view.ts";
import { printAnswer } from "../render/cautions.ts";
import { checkHtmlReport, withHtmlReport, writeHtmlReport } from "../report_file.ts";
import { forTerminal, terminalText } from "../render/safe_text.ts";
import { moneyStyle } from "../render/model_view.ts";
import type { Terminal } from "../terminal.ts";

/**
 * Builds the `estimate` command.
 *
 * @param terminal Where output goes.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import {
 *   demoCompanyCsv, estimateProfile, fitModel, loadTable, openModel, readModelFile, typicalProfile,
 *   writeModelFile,
 * } from "../../mod.ts";
 * import { recordingTerminal } from "../terminal.ts";
 * import { estimateCommand } from "./estimate.ts";
 * const model = await fitModel(loadTable(demoCompanyCsv({ rows: 120, seed: 1 })), {
 *   target: "base_pay_eur", trees: 3, folds: 3, workers: 1,
 * });
 * const path = `${Deno.makeTempDirSync()}/m.json`;
 * await writeModelFile(path, model);
 * const terminal = recordingTerminal();
 * await estimateCommand(terminal).parseAsync([path, "--json"], { from: "user" });
 * const answer = JSON.parse(terminal.stdout.join(""));
 * // The typical person, as the library answers for the model read back.
 * const read = await readModelFile(path);
 * assert.equal(answer.estimate, estimateProfile(openModel(read), typicalProfile(read)).estimate);
 * assert.match(answer.start, /^the typical person/);
 * Deno.removeSync(path);
 * ```
 */
export function estimateCommand(terminal: Terminal): CommandUnknownOpts {
  return withHtmlReport(withProfileFlags(
    new Command("estimate")
      .description(
        "Estimate pay for one profile: how sure the estimate is, the range for comparable " +
          "people, the decision path and how many people support it",
      )
      .argument("<model>", "model file written by paygrove fit")
      .option(
        "--offer <amount>",
        "an offer to place in the range, read like the table's amounts (61000, 61k, €61,000)",
      ),
  )).action(async (file, flags) => {
    if (flags.report !== undefined) {
      await checkHtmlReport(flags.report, flags.force ?? false, [file, flags.table ?? file]);
    }
    const model = await openModelFile(terminal, file, flags.analystFile);
    const session = openModel(model);
    // A bad offer is said before any table is read.
    const offer = flags.offer === undefined ? null : parseOffer(model, flags.offer);
    const { profile, warnings, start, id, rows } = await profileFromFlags(model, flags, terminal);
    const answer = estimateProfile(session, profile, flags.coverage, warnings);
    if (offer !== null) answer.offer = checkOffer(session, profile, answer, offer);
    const oob = outOfBagEstimate(session, id, profile);
    if (oob !== null) {
      answer.warnings.unshift({ kind: "ownPayIncluded", id, outOfBag: oob });
    } else if (id !== "" && rows !== null && isTrainingTable(model, rows)) {
      answer.warnings.unshift({ kind: "inTrainingTable", id });
    }
    const money = moneyStyle(model, { locale: flags.locale });
    const json = { start, ...wordedNotes(answer, money) };
    if (flags.report !== undefined) {
      await writeHtmlReport(flags.report, flags.force ?? false, model.provenance, {
        title: "Estimated pay for one profile",
        question: "What would our pay structure pay a person like this?",
        // Loaded for a report only: the chart library adds 0.14 s to every start-up.
        sections: (await import("../render/html/estimate_html.ts")).estimateSections(answer, {
          warnings: json.warnings,
          start,
        }, money),
      });
    }
    printAnswer(terminal, flags.json === true, model.provenance, json, () => [
      ...renderEstimate(forTerminal(answer), {
        style: terminal.style,
        width: terminal.width,
        money,
      }),
      ...wrapAnsi(terminal.style.dim(`Started from ${terminalText(start)}.`), terminal.width)
        .split("\n"),
      ...(flags.report === undefined ? [] : [`Report written to ${terminalText(flags.report)}.`]),
    ]);
  });
}
