/**
 * `paygrove gap TABLE --target COL --group COL`: raw, median and adjusted
 * pay gaps between groups, overall and per category of workers, with pay
 * quartiles, flags, proxies, small-group suppression and a Markdown report.
 *
 * @module
 */

import { resolveColumnFlags } from "../column_names.ts";
import { Command, type CommandUnknownOpts } from "@commander-js/extra-typings";
import {
  assertCanWrite,
  GAP_CAUTIONS,
  gapCheck,
  type GapReport,
  OptionError,
  writeFileAtomic,
} from "../../mod.ts";
import { progressBar } from "../progress.ts";
import { gapMarkdown, renderGap } from "../render/gap_view.ts";
import { printTableAnswer } from "../render/cautions.ts";
import { gapJson } from "../render/report_notes.ts";
import type { Terminal } from "../terminal.ts";
import { wordedWarnings } from "../option_words.ts";
import { cappedWorkers } from "../workers.ts";
import { forTerminal, terminalText } from "../render/safe_text.ts";
import { columnList, list, loadOptions, readTable, withTableFlags } from "../table_flags.ts";
import { collectWhere } from "../option_values.ts";
import { MAX_TREES, seedOption, shareOption, wholeNumber } from "../option_values.ts";
import { assertFiniteFigures, dataCheckLines, leftOutJson, screenPayFlags } from "../data_check.ts";
import { makeStyle } from "../render/style.ts";
import { tableProvenanceLine } from "../render/cautions.ts";
import { htmlPage, isHtmlPath, paragraph } from "../render/html/page.ts";

/**
 * Builds the `gap` command.
 *
 * @param terminal Where output goes.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, GAP_CAUTIONS } from "../../mod.ts";
 * import { recordingTerminal } from "../terminal.ts";
 * import { gapCommand } from "./gap.ts";
 * const path = `${Deno.makeTempDirSync()}/pay.csv`;
 * Deno.writeTextFileSync(path, demoCompanyCsv({ rows: 200, seed: 3 }));
 * const terminal = recordingTerminal();
 * await gapCommand(terminal).parseAsync([
 *   path, "--target", "base_pay_eur", "--group", "gender", "--trees", "10", "--workers", "1",
 *   "--json",
 * ], { from: "user" });
 * const report = JSON.parse(terminal.stdout.join(""));
 * assert.equal(report.reference, "Man");
 * assert(report.groups.includes("Woman"));
 * assert.equal(report.cautions, GAP_CAUTIONS);
 * Deno.removeSync(path);
 * ```
 */
export function gapCommand(terminal: Terminal): CommandUnknownOpts {
  return withTableFlags(
    new Command("gap")
      .description(
        "Pay gaps between groups (e.g. gender): raw mean and median gaps, pay quartiles and the " +
          "gap the other factors do not explain, overall and per category of workers",
      )
      .argument("<table>", "CSV pay table"),
    "the pay column; rows where it is missing are left out",
  )
    .option("--group <column>", "the column of groups to compare, e.g. gender")
    .option(
      "--reference <group>",
      "the group others are compared with (default: men for a sex or gender column, else the largest)",
    )
    .option(
      "--groups <names>",
      "compare only these groups with the reference, comma-separated (others are left out)",
      list,
    )
    .option(
      "--within <columns>",
      "categories of workers: combinations of these columns, e.g. job_family,level",
      list,
    )
    .option(
      "--features <columns>",
      "the factors to adjust for (default: all usable)",
      columnList,
    )
    .option("--drop <columns>", "factors to leave out, comma-separated", list)
    .option(
      "--where <column=value>",
      "keep only rows with this value (repeat: values of one column are alternatives)",
      collectWhere,
    )
    .option("--variable <column>", "a variable-pay column, gapped beside base pay")
    .option(
      "--drop-implausible",
      "leave out rows whose pay no pay table holds (more than 10,000 times from the median, " +
        "beyond 10^15, or not finite) instead of stopping",
    )
    .option("--threshold <share>", "raw mean gap that is flagged (0.05 or 5%)", shareOption, 0.05)
    .option(
      "--materiality <share>",
      "smallest significant adjusted gap that is flagged (0.02 or 2%)",
      shareOption,
      0.02,
    )
    .option(
      "--privacy-min <n>",
      "fewest people of any group for a category to be shown (at least 3)",
      wholeNumber(3),
      5,
    )
    .option("--trees <n>", "trees in each ensemble", wholeNumber(10, MAX_TREES), 200)
    .option("--seed <s>", "seed of resamples", seedOption, 1)
    .option("--workers <n>", "parallel workers (default: one per core)", wholeNumber(1))
    .option("--report <file>", "also write a report: HTML for a .html name, else Markdown")
    .option("--force", "replace an existing report")
    .option("--json", "print one JSON document on stdout instead of text")
    .action(async (file, flags) => {
      if (flags.target === undefined) {
        throw new OptionError("gap needs --target COLUMN: the pay column (e.g. --target base_pay)");
      }
      if (flags.group === undefined) {
        throw new OptionError(
          "gap needs --group COLUMN: the groups to compare (e.g. --group gender)",
        );
      }
      if (flags.report !== undefined) {
        await assertCanWrite(flags.report, flags.force ?? false, "--report", [file]);
      }
      const options = loadOptions(flags, file);
      const progress = progressBar(terminal);
      const read = await readTable(file, options, progress);
      // Every option naming a column: matched without case (with a note) or refused
      // with the nearest column.
      Object.assign(flags, resolveColumnFlags(read, flags, terminal));
      const { table, leftOut } = screenPayFlags(
        read,
        [
          { column: flags.target },
          // Variable pay: zero (no bonus) is common, so no distance from the median.
          ...(flags.variable !== undefined ? [{ column: flags.variable, ratio: false }] : []),
        ],
        flags.dropImplausible ?? false,
      );
      let report: GapReport;
      try {
        report = await gapCheck(table, {
          target: flags.target,
          group: flags.group,
          reference: flags.reference,
          compare: flags.groups,
          within: flags.within,
          features: flags.features,
          drop: flags.drop,
          where: flags.where,
          variable: flags.variable,
          threshold: flags.threshold,
          materiality: flags.materiality,
          privacyMin: flags.privacyMin,
          trees: flags.trees,
          seed: flags.seed,
          workers: cappedWorkers(flags.workers, flags.trees, terminal.err),
          onProgress: (stage, done, total) => progress.update(stage, done, total),
        });
      } finally {
        progress.finish();
      }
      // No infinite or undefined figure is written or shown.
      assertFiniteFigures(report, flags.target);
      const numbers = { locale: flags.locale, currency: report.currency ?? undefined };
      const check = { style: terminal.style, width: terminal.width };
      if (flags.report !== undefined) {
        // The report says what the screen says about the data first.
        const plain = { ...check, style: makeStyle(false), width: 100 };
        const said = dataCheckLines(table, leftOut, file, plain).filter((l) => l !== "");
        await writeFileAtomic(
          flags.report,
          isHtmlPath(flags.report)
            ? htmlPage({
              title: `Pay gaps by ${report.group}`,
              question: `Is there a gap in ${report.target} between ${report.group} groups that ` +
                `the other factors do not explain?`,
              created: new Date().toISOString(),
              provenance: [tableProvenanceLine(report.provenance)],
              cautions: [GAP_CAUTIONS],
              sections: [
                // Loaded for a report only: the chart library adds 0.14 s to every start-up.
                ...(await import("../render/html/gap_html.ts")).gapSections(
                  report,
                  gapJson(report).notes,
                  numbers,
                ),
                ...(said.length > 0
                  ? [{ title: "Data", body: said.map((l) => paragraph(l)).join("\n") }]
                  : []),
              ],
            })
            : gapMarkdown(report, numbers, new Date().toISOString()) +
              (said.length > 0 ? `\n## Data\n\n${said.join("\n")}\n` : ""),
          { force: flags.force ?? false, option: "--report" },
        );
      }
      const view = { ...check, numbers };
      // Everything the screen says about the data is in the JSON too.
      const doc = {
        ...gapJson(report),
        leftOutImplausible: leftOutJson(leftOut),
        dataWarnings: wordedWarnings(table.warnings),
      };
      printTableAnswer(
        terminal,
        flags.json ?? false,
        doc,
        () => [
          ...dataCheckLines(table, leftOut, file, check),
          ...renderGap(forTerminal(report), view),
          "",
        ],
        flags.report ? [`Report written to ${terminalText(flags.report)}.`] : [],
      );
    });
}
