/**
 * `paygrove sweep MODEL --vary COLUMN`: estimates and intervals over one
 * attribute, as a line chart and a table.
 *
 * @module
 */

import {
  Command,
  type CommandUnknownOpts,
  InvalidArgumentError,
} from "@commander-js/extra-typings";
import { findFeature, openModel, OptionError, sweepAnswer, sweepValues } from "../../mod.ts";
import { profileFromFlags, readTableForModel, withProfileFlags } from "../profile_flags.ts";
import { renderSweep } from "../render/answer_view.ts";
import { printAnswer } from "../render/cautions.ts";
import { terminalText } from "../render/safe_text.ts";
import { checkHtmlReport, withHtmlReport, writeHtmlReport } from "../report_file.ts";
import { wordedNotes } from "../render/answer_notes.ts";
import { forTerminal } from "../render/safe_text.ts";
import { moneyStyle } from "../render/model_view.ts";
import type { Terminal } from "../terminal.ts";
import { wholeNumber } from "../option_values.ts";
import { openModelFile } from "../open_model.ts";

function finiteNumber(text: string): number {
  const value = Number(text);
  if (!Number.isFinite(value)) throw new InvalidArgumentError(`expected a number, got "${text}"`);
  return value;
}

/**
 * Builds the `sweep` command.
 *
 * @param terminal Where output goes.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable, writeModelFile } from "../../mod.ts";
 * import { recordingTerminal } from "../terminal.ts";
 * import { sweepCommand } from "./sweep.ts";
 * const model = await fitModel(loadTable(demoCompanyCsv({ rows: 120, seed: 1 })), {
 *   target: "base_pay_eur", trees: 3, folds: 3, workers: 1,
 * });
 * const path = `${Deno.makeTempDirSync()}/m.json`;
 * await writeModelFile(path, model);
 * const terminal = recordingTerminal();
 * await sweepCommand(terminal).parseAsync([path, "--vary", "level", "--json"], { from: "user" });
 * const answer = JSON.parse(terminal.stdout.join(""));
 * const levels = model.features.find((f) => f.name === "level")!.levels;
 * assert.deepEqual(answer.points.map((p: { value: string }) => p.value), levels);
 * Deno.removeSync(path);
 * ```
 */
export function sweepCommand(terminal: Terminal): CommandUnknownOpts {
  return withHtmlReport(withProfileFlags(
    new Command("sweep")
      .description(
        "Walk one attribute over a range (or every level) with the rest of the profile fixed, " +
          "and chart the estimate with both intervals",
      )
      .argument("<model>", "model file written by paygrove fit"),
  ))
    .requiredOption("--vary <column>", "the attribute to vary")
    .option("--from <a>", "first value of a numeric attribute (default: 1% quantile)", finiteNumber)
    .option("--to <b>", "last value of a numeric attribute (default: 99% quantile)", finiteNumber)
    .option("--steps <n>", "points of a numeric attribute", wholeNumber(2, 1000), 20)
    .option("--average", "also average the estimate over the rows of --table (partial dependence)")
    .action(async (file, flags) => {
      if (flags.report !== undefined) {
        await checkHtmlReport(flags.report, flags.force ?? false, [file, flags.table ?? file]);
      }
      const model = await openModelFile(terminal, file, flags.analystFile);
      const session = openModel(model);
      const feature = findFeature(model, flags.vary, "--vary");
      if (
        model.features[feature].kind !== "numeric" &&
        (flags.from !== undefined || flags.to !== undefined)
      ) {
        throw new OptionError(
          `--from and --to apply to numeric attributes; "${flags.vary}" has levels`,
        );
      }
      if (flags.average && flags.table === undefined) {
        throw new OptionError(
          "--average needs --table: the model file keeps no rows to average over",
        );
      }
      const { profile, warnings, rows } = await profileFromFlags(
        model,
        flags,
        terminal,
        flags.average === true,
      );
      const grid = sweepValues(model, feature, {
        from: flags.from,
        to: flags.to,
        steps: flags.steps,
      });
      const answer = sweepAnswer(
        session,
        profile,
        feature,
        grid,
        flags.coverage,
        flags.average ? rows ?? await readTableForModel(model, flags.table!, [], flags) : null,
        warnings,
      );
      const money = moneyStyle(model, { locale: flags.locale });
      const json = wordedNotes(answer, money);
      if (flags.report !== undefined) {
        await writeHtmlReport(flags.report, flags.force ?? false, model.provenance, {
          title: `Estimated pay as ${model.features[feature].name} varies`,
          question: `What does ${
            model.features[feature].name
          } do to the estimated pay of this profile?`,
          // Loaded for a report only: the chart library adds 0.14 s to every start-up.
          sections: (await import("../render/html/sweep_html.ts")).sweepSections(
            answer,
            json.warnings,
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
          ...renderSweep(forTerminal(answer), {
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
