/**
 * `paygrove review TABLE --target COL`: every person's pay against the
 * range comparable people earn, from out-of-bag estimates; who is under or
 * over, and per category the cost of bringing those under range up to its
 * low end.
 *
 * @module
 */

import { resolveColumnFlags } from "../column_names.ts";
import { Command, type CommandUnknownOpts } from "@commander-js/extra-typings";
import {
  assertCanWrite,
  GAP_CAUTIONS,
  OptionError,
  type PayReview,
  payReview,
  writeFileAtomic,
} from "../../mod.ts";
import { tableProvenanceLine } from "../render/cautions.ts";
import { htmlPage } from "../render/html/page.ts";
import { assertApart, checkHtmlReport } from "../report_file.ts";
import { progressBar } from "../progress.ts";
import { printTableAnswer } from "../render/cautions.ts";
import { reviewJson } from "../render/report_notes.ts";
import type { Terminal } from "../terminal.ts";
import { wordedWarnings } from "../option_words.ts";
import { cappedWorkers } from "../workers.ts";
import { forTerminal, terminalText } from "../render/safe_text.ts";
import { columnList, list, loadOptions, readTable, withTableFlags } from "../table_flags.ts";
import { collectWhere } from "../option_values.ts";
import { coverageOption, MAX_TREES, seedOption, wholeNumber } from "../option_values.ts";
import { assertFiniteFigures, dataCheckLines, leftOutJson, screenPayFlags } from "../data_check.ts";

import { renderReview, reviewCsv } from "../render/review_view.ts";

/**
 * Builds the `review` command.
 *
 * @param terminal Where output goes.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv } from "../../mod.ts";
 * import { recordingTerminal } from "../terminal.ts";
 * import { reviewCommand } from "./review.ts";
 * const path = `${Deno.makeTempDirSync()}/pay.csv`;
 * Deno.writeTextFileSync(path, demoCompanyCsv({ rows: 150, seed: 2 }));
 * const terminal = recordingTerminal();
 * await reviewCommand(terminal).parseAsync([
 *   path, "--target", "base_pay_eur", "--trees", "10", "--workers", "1", "--json",
 * ], { from: "user" });
 * const review = JSON.parse(terminal.stdout.join(""));
 * assert.equal(review.people.length, 150);
 * const under = review.people.filter((p: { status: string }) => p.status === "under");
 * assert.equal(review.overall.under, under.length);
 * Deno.removeSync(path);
 * ```
 */
export function reviewCommand(terminal: Terminal): CommandUnknownOpts {
  return withTableFlags(
    new Command("review")
      .description(
        "Each person's pay against the range comparable people earn (out-of-bag estimates): " +
          "who is under or over, and the cost of bringing those under up to the range",
      )
      .argument("<table>", "CSV pay table"),
    "the pay column; rows where it is missing are left out",
  )
    .option(
      "--features <columns>",
      "the factors people are compared on (default: all usable)",
      columnList,
    )
    .option("--drop <columns>", "factors to leave out, comma-separated", list)
    .option(
      "--where <column=value>",
      "keep only rows with this value (repeat: values of one column are alternatives)",
      collectWhere,
    )
    .option(
      "--within <columns>",
      "summarise per category: combinations of these columns (e.g. job_family, or gender to see " +
        "who is under range)",
      list,
    )
    .option(
      "--coverage <share>",
      "share of comparable people's pay the range covers",
      coverageOption,
      0.9,
    )
    .option(
      "--privacy-min <n>",
      "fewest people in a category for its summary to be shown (at least 3)",
      wholeNumber(3),
      5,
    )
    .option(
      "--drop-implausible",
      "leave out rows whose pay no pay table holds (more than 10,000 times from the median, " +
        "beyond 10^15, or not finite) instead of stopping",
    )
    .option("--trees <n>", "trees in the ensemble", wholeNumber(10, MAX_TREES), 200)
    .option("--seed <s>", "seed of resamples", seedOption, 1)
    .option("--workers <n>", "parallel workers (default: one per core)", wholeNumber(1))
    .option("--out <file>", "write every person as CSV")
    .option(
      "--report <file>",
      "also write a report to send on (HTML; name it .html): counts and costs, no one's pay",
    )
    .option("--force", "replace an existing --out or --report file")
    .option("--json", "print one JSON document on stdout instead of text")
    .action(async (file, flags) => {
      if (flags.target === undefined) {
        throw new OptionError(
          "review needs --target COLUMN: the pay column (e.g. --target base_pay)",
        );
      }
      if (flags.out !== undefined) {
        await assertCanWrite(flags.out, flags.force ?? false, "--out", [file]);
      }
      if (flags.report !== undefined) {
        await assertApart([["--out", flags.out], ["--report", flags.report]]);
        await checkHtmlReport(flags.report, flags.force ?? false, [file]);
      }
      const options = loadOptions(flags, file);
      const progress = progressBar(terminal);
      const read = await readTable(file, options, progress);
      // Every option naming a column: matched without case (with a note) or refused
      // with the nearest column.
      Object.assign(flags, resolveColumnFlags(read, flags, terminal));
      const { table, leftOut } = screenPayFlags(
        read,
        [{ column: flags.target }],
        flags.dropImplausible ?? false,
      );
      let review: PayReview;
      try {
        review = await payReview(table, {
          target: flags.target,
          features: flags.features,
          drop: flags.drop,
          where: flags.where,
          within: flags.within,
          coverage: flags.coverage,
          privacyMin: flags.privacyMin,
          trees: flags.trees,
          seed: flags.seed,
          workers: cappedWorkers(flags.workers, flags.trees, terminal.err),
          onProgress: (done, total) => progress.update("trees", done, total),
        });
      } finally {
        progress.finish();
      }
      // No infinite or undefined figure is written or shown.
      assertFiniteFigures(review, flags.target);
      if (flags.out !== undefined) {
        // Per-person pay: a new file is its owner's alone (0600).
        await writeFileAtomic(flags.out, reviewCsv(review), {
          force: flags.force ?? false,
          option: "--out",
          private: true,
        });
      }
      const numbers = { locale: flags.locale, currency: review.money?.currency };
      if (flags.report !== undefined) {
        await writeFileAtomic(
          flags.report,
          htmlPage({
            title: `Pay review of ${review.target}`,
            question: "Who is paid outside the range comparable people earn, and what would " +
              "bringing pay up to it cost?",
            created: new Date().toISOString(),
            provenance: [tableProvenanceLine(review.provenance)],
            cautions: [GAP_CAUTIONS],
            // Loaded for a report only: the chart library adds 0.14 s to every start-up.
            sections: (await import("../render/html/review_html.ts")).reviewSections(
              review,
              reviewJson(review).notes,
              numbers,
            ),
          }),
          { force: flags.force ?? false, option: "--report" },
        );
      }
      const check = { style: terminal.style, width: terminal.width };
      // Everything the screen says about the data is in the JSON too.
      const doc = {
        ...reviewJson(review),
        leftOutImplausible: leftOutJson(leftOut),
        dataWarnings: wordedWarnings(table.warnings),
      };
      printTableAnswer(
        terminal,
        flags.json ?? false,
        doc,
        () => [
          ...dataCheckLines(table, leftOut, file, check),
          ...renderReview(forTerminal(review), { ...check, numbers }),
          ...(flags.out ? [`Everyone written to ${terminalText(flags.out)}.`, ""] : []),
          ...(flags.report ? [`Report written to ${terminalText(flags.report)}.`, ""] : []),
        ],
      );
    });
}
