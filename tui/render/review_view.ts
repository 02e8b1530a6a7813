/**
 * The per-person review in words and as CSV: the headline counts and cost,
 * the categories' table, the lists of people under and over their range,
 * each within the width (columns dropped in a stated order).
 *
 * @module
 */

import wrapAnsi from "wrap-ansi";
import type { PayReview, ReviewPerson } from "../../mod.ts";
import { formatNumber, formatPay, formatPercent, type NumberStyle } from "./numbers.ts";
import type { Style } from "./style.ts";
import { fitTable, leftOutNote } from "./fit_table.ts";
import { csvCell } from "./safe_text.ts";
import { reviewNoteText } from "./report_notes.ts";

/**
 * How many people under and over range the text output lists.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { renderReview, REVIEW_LISTED } from "./review_view.ts";
 * import { makeStyle } from "./style.ts";
 * // Twelve people under their range.
 * const people = Array.from({ length: 12 }, (_, i) => ({
 *   id: `P${i + 1}`, line: i + 2, pay: 40000 + i, estimate: 50000, low: 45000, high: 58000,
 *   position: -0.4 + i / 100, status: "under" as const, shortfall: 5000 - i,
 * }));
 * const review = {
 *   target: "pay", coverage: 0.9, money: { currency: "EUR" }, features: ["level"],
 *   people, overall: { suppressed: true }, categories: [], notes: [],
 * } as unknown as import("../../mod.ts").PayReview;
 * const lines = renderReview(review, { style: makeStyle(false), width: 80, numbers: {} });
 * assert.equal(lines.filter((l) => /^P\d+ /.test(l)).length, REVIEW_LISTED);
 * assert(lines.includes("... and 2 more (--out FILE lists everyone)"));
 * ```
 */
export const REVIEW_LISTED = 10;
const SHOWN_ID = 40;
const TOO_FEW = "too few to report";

/**
 * Every person as CSV (RFC 4180), one row each, in table order; text cells
 * through {@linkcode csvCell}, so no identifier runs as a formula.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { reviewCsv } from "./review_view.ts";
 * const person = { id: "=HYPERLINK(1)", line: 2, pay: 40000, estimate: 50000, low: 45000.004, high: 58000, position: -0.38461, status: "under" as const, shortfall: 5000.004 };
 * const csv = reviewCsv({ people: [person] } as unknown as import("../../mod.ts").PayReview);
 * assert.equal(csv.split("\n")[1], `"'=HYPERLINK(1)",2,40000,50000,45000,58000,-0.3846,under,5000`);
 * ```
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

/**
 * The review as terminal lines (without the cautions).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { renderReview } from "./review_view.ts";
 * import { makeStyle } from "./style.ts";
 * const people = [
 *   { id: "A1", line: 2, pay: 40000, estimate: 50000, low: 45000, high: 58000, position: -0.3846, status: "under" as const, shortfall: 5000 },
 *   { id: "A2", line: 3, pay: 52000, estimate: 51000, low: 45000, high: 58000, position: 0.5385, status: "within" as const, shortfall: 0 },
 * ];
 * const review = {
 *   target: "pay", coverage: 0.9, money: { currency: "EUR", period: "year" }, features: ["level"],
 *   idColumn: "id", people, overall: { suppressed: false, people: 2, under: 1, over: 0, cost: 5000 },
 *   within: [], categories: [], privacyMin: 5, oobR2Log: 0.8, notes: [],
 *   provenance: { paygrove: "0", table: { file: "t.csv", sha256: "0" }, seed: 1 },
 * } as unknown as import("../../mod.ts").PayReview;
 * const lines = renderReview(review, { style: makeStyle(false), width: 80, numbers: {} });
 * assert(lines.some((l) => l.includes("A1")));
 * assert(lines.join(" ").includes("1 is paid under their range"));
 * ```
 */
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
      ascii: style.ascii,
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
  for (const note of review.notes) lines.push(...wrap(style.warn(reviewNoteText(note))));
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
