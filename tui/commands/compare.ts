/**
 * `paygrove compare MODEL --change COLUMN=VALUE`: a profile before and
 * after a change, with the paired difference.
 *
 * @module
 */

import { Command, type CommandUnknownOpts } from "@commander-js/extra-typings";
import { applyChanges, compareAnswer, openModel, OptionError } from "../../mod.ts";
import { openModelFile } from "../open_model.ts";
import { profileFromFlags, withProfileFlags } from "../profile_flags.ts";
import { renderCompare } from "../render/answer_view.ts";
import { printAnswer } from "../render/cautions.ts";
import { wordedNotes } from "../render/answer_notes.ts";
import { forTerminal, terminalText } from "../render/safe_text.ts";
import { checkHtmlReport, withHtmlReport, writeHtmlReport } from "../report_file.ts";
import { moneyStyle } from "../render/model_view.ts";
import type { Terminal } from "../terminal.ts";

/**
 * Builds the `compare` command.
 *
 * @param terminal Where output goes.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable, writeModelFile } from "../../mod.ts";
 * import { recordingTerminal } from "../terminal.ts";
 * import { compareCommand } from "./compare.ts";
 * const model = await fitModel(loadTable(demoCompanyCsv({ rows: 120, seed: 1 })), {
 *   target: "base_pay_eur", trees: 3, folds: 3, workers: 1,
 * });
 * const path = `${Deno.makeTempDirSync()}/m.json`;
 * await writeModelFile(path, model);
 * const terminal = recordingTerminal();
 * await compareCommand(terminal)
 *   .parseAsync([path, "--set", "level=G2", "--change", "level=+1", "--json"], { from: "user" });
 * const answer = JSON.parse(terminal.stdout.join(""));
 * assert.deepEqual(answer.changes.map((c: { from: string; to: string }) => [c.from, c.to]), [
 *   ["G2", "G3"],
 * ]);
 * assert.equal(answer.difference.estimate, answer.changed.estimate - answer.base.estimate);
 * Deno.removeSync(path);
 * ```
 */
export function compareCommand(terminal: Terminal): CommandUnknownOpts {
  return withHtmlReport(withProfileFlags(
    new Command("compare")
      .description(
        "Compare a profile before and after a change (level=+1 is a promotion): the change in " +
          "pay with its interval, and where the decision path changes",
      )
      .argument("<model>", "model file written by paygrove fit"),
  ))
    .option(
      "--change <column=value>",
      "the change to make; +N or -N moves an ordinal N steps, adds to a number (repeatable)",
      (text: string, previous: string[] = []) => [...previous, text],
    )
    .action(async (file, flags) => {
      if (flags.change === undefined || flags.change.length === 0) {
        throw new OptionError("compare needs at least one --change COLUMN=VALUE");
      }
      if (flags.report !== undefined) {
        await checkHtmlReport(flags.report, flags.force ?? false, [file, flags.table ?? file]);
      }
      const model = await openModelFile(terminal, file, flags.analystFile);
      const session = openModel(model);
      const { profile, warnings } = await profileFromFlags(model, flags, terminal);
      const changed = applyChanges(model, profile, flags.change);
      const answer = compareAnswer(session, profile, changed.profile, flags.coverage, [
        ...warnings,
        ...changed.warnings,
      ]);
      const money = moneyStyle(model, { locale: flags.locale });
      const json = {
        ...wordedNotes(answer, money),
        base: wordedNotes(answer.base, money),
        changed: wordedNotes(answer.changed, money),
      };
      if (flags.report !== undefined) {
        await writeHtmlReport(flags.report, flags.force ?? false, model.provenance, {
          title: "What a change does to estimated pay",
          question:
            "What does this change (a promotion, a move, more years) do to the expected pay " +
            "of this profile?",
          // Loaded for a report only: the chart library adds 0.14 s to every start-up.
          sections: (await import("../render/html/compare_html.ts")).compareSections(
            answer,
            [...json.warnings, ...json.base.warnings, ...json.changed.warnings],
            money,
          ),
        });
      }
      printAnswer(
        terminal,
        flags.json === true,
        model.provenance,
        json,
        () => [
          ...renderCompare(forTerminal(answer), {
            style: terminal.style,
            width: terminal.width,
            money,
          }),
          ...(flags.report === undefined
            ? []
            : [`Report written to ${terminalText(flags.report)}.`]),
        ],
      );
    });
}
