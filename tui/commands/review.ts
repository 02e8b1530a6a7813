/**
 * `paygrove review TABLE --target COL`: every person's pay against the
 * range comparable people earn, from out-of-bag estimates; who is under or
 * over, and per category the cost of bringing those under range up to its
 * low end.
 *
 * @module
 */

import { resolveColumnFlags } from "../column_names.ts";
import wrapAnsi from "wrap-ansi";
import { Command, type CommandUnknownOpts } from "@commander-js/extra-typings";
import {
  assertCanWrite,
  OptionError,
  type PayReview,
  payReview,
  type ReviewPerson,
  writeFileAtomic,
} from "../../mod.ts";
import { progressBar } from "../progress.ts";
import { printTableAnswer } from "../render/cautions.ts";
import { formatNumber, formatPay, formatPercent, type NumberStyle } from "../render/numbers.ts";
import type { Style } from "../render/style.ts";
import { fitTable, leftOutNote } from "../render/fit_table.ts";
import type { Terminal } from "../terminal.ts";
import { cappedWorkers } from "../workers.ts";
import { csvCell, forTerminal, terminalText } from "../render/safe_text.ts";
import { columnList, list, loadOptions, readTable, withTableFlags } from "../table_flags.ts";
import { collectWhere } from "./fit.ts";
import { coverageOption, MAX_TREES, seedOption, wholeNumber } from "../option_values.ts";
import { assertFiniteFigures, dataCheckLines, leftOutJson, screenPayFlags } from "../data_check.ts";

/** How many people under and over range the text output lists. */
export const REVIEW_LISTED = 10;
const SHOWN_ID = 40;
const TOO_FEW = "too few to report";

/**
 * Every person as CSV (RFC 4180), one row each, in table order; text cells
 * through {@linkcode csvCell}, so no identifier runs as a formula.
 */
export function reviewCsv(review: PayReview): string {
  const num = (x: number | null, digits: number) =>
    x === null || !Number.isFinite(x) ? "" : String(Number(x.toFixed(digits)));
  const lines = ["id,line,pay,estimate,range_low,range_high,range_position,status,shortfall"];
  for (const p of review.people) {
    lines.push([
      csvCell(p.id),
      String(p.line),
      num(p.pay, 2),
      num(p.estimate, 2),
      num(p.low, 2),
      num(p.high, 2),
      num(p.position, 4),
      csvCell(p.status ?? ""),
      num(p.shortfall, 2),
    ].join(","));
  }
  return lines.join("\n") + "\n";
}

/** The review as terminal lines (without the cautions). */
export function renderReview(
  review: PayReview,
  view: { style: Style; width: number; numbers: NumberStyle },
): string[] {
  const { style, width, numbers } = view;
  const wrap = (t: string) => wrapAnsi(t, width).split("\n");
  const money = (x: number) => formatPay(x, numbers, true);
  const lines: string[] = [];
  const share = formatPercent(review.coverage, false, numbers).replace(".0%", "%");
  const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;
  lines.push(
    ...wrap(
      style.bold(`Pay review: ${review.target} against the ${share} range of comparable people`),
    ),
    ...wrap(style.dim(
      `Each person's estimate comes from trees that never saw them (out of bag), so their own ` +
        `pay does not pull it. Compared on: ${review.features.join(", ")}.`,
    )),
    "",
  );
  const per = review.money?.period ? ` a ${review.money.period}` : "";
  if (!review.overall.suppressed) {
    const o = review.overall;
    lines.push(
      ...wrap(
        `The range leaves about ${
          formatPercent((1 - review.coverage) / 2, false, numbers).replace(".0%", "%")
        } of people under it and as many over it by construction: that many outside is ` +
          `expected; who they are, and by how much, is the finding. Here, of ` +
          `${formatNumber(o.people, numbers, 0)} people, ${
            plural(o.under, "is paid", "are paid")
          } under their range (bringing each to its low end would cost ${money(o.cost)}${per} ` +
          `in total) and ${o.over} over it.`,
      ),
      "",
    );
  }
  if (review.categories.length > 0) {
    const rows = [["", "people", "under", "over", "cost to low end"]];
    for (const c of review.categories) {
      rows.push(
        c.suppressed
          ? [c.name, TOO_FEW, "", "", ""]
          : [c.name, String(c.people), String(c.under), String(c.over), money(c.cost)],
      );
    }
    const [head, ...body] = rows;
    const table = fitTable({
      width,
      head,
      rows: body,
      borders: "none",
      spanning: TOO_FEW,
      styleHead: style.bold,
    });
    lines.push(...table.lines, "");
  }
  const listed = (title: string, people: ReviewPerson[]) => {
    if (people.length === 0) return;
    lines.push(...wrap(style.bold(title)));
    const rows: string[][] = [];
    for (const p of people.slice(0, REVIEW_LISTED)) {
      rows.push([
        // An identifier is shown to 40 characters (the CSV keeps it whole).
        p.id.length > SHOWN_ID ? `${p.id.slice(0, SHOWN_ID - 3)}...` : p.id,
        money(p.pay),
        money(p.estimate!),
        `${money(p.low!)}-${money(p.high!)}`,
        p.position === null ? "-" : formatPercent(p.position, false, numbers),
      ]);
    }
    // Narrow screens: the estimate goes first, then the range (the position
    // in it stays); then a list, one block per person.
    const table = fitTable({
      width,
      head: ["", "pay", "estimate", "range", "position"],
      rows,
      drop: [2, 3],
      borders: "none",
    });
    const said = leftOutNote(table.dropped, "--json and --out FILE have");
    if (said !== null) lines.push(...wrap(style.dim(said)));
    lines.push(...table.lines);
    if (people.length > REVIEW_LISTED) {
      lines.push(
        ...wrap(
          style.dim(`... and ${people.length - REVIEW_LISTED} more (--out FILE lists everyone)`),
        ),
      );
    }
    lines.push("");
  };
  // Both lists by position in the range, so they read alike.
  // (A range of no width has no position: such people come last.)
  const under = review.people.filter((p) => p.status === "under")
    .sort((a, b) => (a.position ?? Infinity) - (b.position ?? Infinity));
  const over = review.people.filter((p) => p.status === "over")
    .sort((a, b) => (b.position ?? -Infinity) - (a.position ?? -Infinity));
  listed("Furthest under their range, by position (0% = the range's low end)", under);
  listed("Furthest over their range, by position (100% = the range's high end)", over);
  for (const note of review.notes) lines.push(...wrap(style.warn(note)));
  const missing = review.people.filter((p) => p.status === null).length;
  if (missing > 0) {
    lines.push(
      ...wrap(
        style.dim(`${missing} people were drawn by every tree and have no out-of-bag estimate.`),
      ),
    );
  }
  return lines;
}

/**
 * Builds the `review` command.
 *
 * @param terminal Where output goes.
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
    .option("--force", "replace an existing --out file")
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
      const check = { style: terminal.style, width: terminal.width };
      // Everything the screen says about the data is in the JSON too.
      const doc = {
        ...review,
        leftOutImplausible: leftOutJson(leftOut),
        dataWarnings: table.warnings,
      };
      printTableAnswer(
        terminal,
        flags.json ?? false,
        doc,
        () => [
          ...dataCheckLines(table, leftOut, file, check),
          ...renderReview(forTerminal(review), { ...check, numbers }),
          ...(flags.out ? [`Everyone written to ${terminalText(flags.out)}.`, ""] : []),
        ],
      );
    });
}
