/**
 * A pay review as an HTML report for people other than the analyst: how
 * many people are paid under and over the range comparable people earn,
 * overall and per category, and the cost of bringing those under up to the
 * range's low end. It names no one and shows no one's pay: who they are is
 * in the analyst's own per-person file (`review --out`), never in a page
 * that is sent on; a category's cost is withheld where fewer than the
 * privacy minimum are under (it would be their shortfall).
 *
 * @module
 */

import type { PayReview } from "../../../mod.ts";
import { formatLevel, formatNumber, formatPay, type NumberStyle } from "../numbers.ts";
import { barsChart } from "./charts.ts";
import { figureTable, type HtmlCell, type HtmlSection, paragraph } from "./page.ts";

/**
 * The sections of a review's report.
 *
 * @param notes The review's notes in words (`reviewJson`).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, loadTable, payReview } from "../../../mod.ts";
 * import { reviewSections } from "./review_html.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 400, seed: 2 }));
 * const review = await payReview(table, { target: "base_pay_eur", trees: 10, workers: 1, within: ["level"] });
 * const html = reviewSections(review, [], {}).map((s) => s.body).join("");
 * // No one's identifier, and no one's pay.
 * assert(!review.people.some((p) => html.includes(`>${p.id}<`)));
 * ```
 */
export function reviewSections(
  review: PayReview,
  notes: string[],
  numbers: NumberStyle,
): HtmlSection[] {
  const pay = (v: number) => formatPay(v, numbers);
  const count = (v: number): HtmlCell => ({ text: formatNumber(v, numbers, 0), value: v });
  const percent = formatLevel(review.coverage, numbers);
  const sections: HtmlSection[] = [];
  const intro = [
    paragraph(
      `Each person's pay against the ${percent} range of comparable people (compared on ` +
        `${review.features.join(", ")}), from estimates by trees that never saw them. About ` +
        `${formatNumber((100 * (1 - review.coverage)) / 2, numbers, 1)}% of people fall under ` +
        `such a range and as many over it by construction: that many outside is expected.`,
    ),
    ...notes.map((n) => paragraph(n, "note")),
    paragraph(
      "This report names no one and shows no one's pay. Who is under or over, and by how much, " +
        "is in the analyst's own file, which stays with the pay table.",
      "note",
    ),
  ];
  if (review.overall.suppressed) {
    sections.push({
      title: "Under and over the range",
      body: [...intro, paragraph(`Withheld: fewer than ${review.privacyMin} people.`, "warning")]
        .join("\n"),
    });
    return sections;
  }
  const o = review.overall;
  const costShown = (under: number, cost: number): HtmlCell =>
    under >= review.privacyMin ? { text: pay(cost), value: cost } : { text: "withheld" };
  sections.push({
    title: "Under and over the range",
    body: [
      ...intro,
      paragraph(
        `Of ${formatNumber(o.people, numbers, 0)} people, ${
          formatNumber(o.under, numbers, 0)
        } are ` +
          `paid under their range and ${formatNumber(o.over, numbers, 0)} over it.`,
      ),
      figureTable("Everyone", ["people", "under", "over", "cost to the low end"], [[
        count(o.people),
        count(o.under),
        count(o.over),
        costShown(o.under, o.cost),
      ]]),
    ].join("\n"),
  });
  if (review.categories.length > 0) {
    const shown = review.categories.filter((c) => !c.suppressed);
    sections.push({
      title: `Per category (${review.within.join(" x ")})`,
      body: [
        shown.length === 0 ? "" : barsChart({
          items: shown.flatMap((c) =>
            c.suppressed ? [] : [
              { label: `${c.name}: under`, value: c.under / c.people },
              { label: `${c.name}: over`, value: c.over / c.people },
            ]
          ),
          axis: "share of the category's people",
          format: (v) => formatLevel(v, numbers),
          caption: `The share of each category's people paid under and over their range; about ` +
            `${
              formatNumber((100 * (1 - review.coverage)) / 2, numbers, 1)
            }% each way is expected. ` +
            `Categories too small to report are left out. The table below has the counts.`,
        }).html,
        figureTable(
          "Under and over the range per category (cost withheld where fewer than " +
            `${review.privacyMin} are under)`,
          ["category", "people", "under", "over", "cost to the low end"],
          review.categories.map((c) =>
            c.suppressed ? [{ text: c.name }, { text: "too few to report" }] : [
              { text: c.name },
              count(c.people),
              count(c.under),
              count(c.over),
              costShown(c.under, c.cost),
            ]
          ),
        ),
      ].join("\n"),
    });
  }
  return sections;
}
