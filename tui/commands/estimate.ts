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
import { forTerminal, terminalText } from "../render/safe_text.ts";
import { moneyStyle } from "../render/model_view.ts";
import type { Terminal } from "../terminal.ts";

/**
 * Builds the `estimate` command.
 *
 * @param terminal Where output goes.
 */
export function estimateCommand(terminal: Terminal): CommandUnknownOpts {
  return withProfileFlags(
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
  ).action(async (file, flags) => {
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
    printAnswer(terminal, flags.json === true, model.provenance, json, () => [
      ...renderEstimate(forTerminal(answer), {
        style: terminal.style,
        width: terminal.width,
        money,
      }),
      ...wrapAnsi(terminal.style.dim(`Started from ${terminalText(start)}.`), terminal.width)
        .split("\n"),
    ]);
  });
}
