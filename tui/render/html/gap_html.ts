/**
 * A pay-gap check as an HTML report: the gap each group's pay shows and
 * the gap the other factors do not explain, overall and per category, as
 * intervals around zero with their flags; the pay quartiles' shares; and
 * the gap split by factor. Categories too small to report show nothing but
 * their name, as everywhere.
 *
 * @module
 */

import type { GapFigure, GapReport } from "../../../mod.ts";
import { formatLevel, formatNumber, formatPercent, type NumberStyle } from "../numbers.ts";
import { barsChart, type IntervalRow, intervalsChart } from "./charts.ts";
import { figureTable, type HtmlCell, type HtmlSection, paragraph } from "./page.ts";

/**
 * The sections of a gap check's report.
 *
 * @param notes The report's notes in words (`gapJson`).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, gapCheck, loadTable } from "../../../mod.ts";
 * import { gapSections } from "./gap_html.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 400, seed: 2 }));
 * const report = await gapCheck(table, { target: "base_pay_eur", group: "gender", trees: 10, workers: 1 });
 * const sections = gapSections(report, [], {});
 * assert.equal(sections[0].title, "The gap overall");
 * if (!report.overall.suppressed) {
 *   assert(sections[0].body.includes(`data-value="${report.overall.gaps[0].rawMean}"`));
 * }
 * ```
 */
export function gapSections(
  report: GapReport,
  notes: string[],
  numbers: NumberStyle,
): HtmlSection[] {
  const pct = (v: number) => formatPercent(v, true, numbers);
  const figure = (
    v: number | null,
  ): HtmlCell => (v === null ? { text: "" } : { text: pct(v), value: v });
  const level = formatLevel(report.confidence, numbers);
  const sections: HtmlSection[] = [];
  const explain = paragraph(
    `A gap is how much less a group is paid than ${report.reference} (${report.referenceReason}), ` +
      `as a share of ${report.reference}'s pay: positive, the group is paid less. Raw gaps compare ` +
      `mean and median pay as they are; the unexplained gap is what remains after ` +
      `${report.features.join(", ")} are taken into account, with its ${level} interval. A raw ` +
      `gap of ${formatPercent(report.threshold, false, numbers)} or more is flagged, and an ` +
      `unexplained gap whose interval lies beyond ${
        formatPercent(report.materiality, false, numbers)
      }.`,
  );
  const gapRows = (label: string, gaps: GapFigure[]): HtmlCell[][] =>
    gaps.map((g) => [
      { text: label === "" ? g.group : `${label}: ${g.group}` },
      { text: formatNumber(g.rows, numbers, 0), value: g.rows },
      { text: pct(g.rawMean), value: g.rawMean },
      { text: pct(g.rawMedian), value: g.rawMedian },
      figure(g.adjusted),
      figure(g.low),
      figure(g.high),
      {
        text: [g.rawFlag ? "raw gap" : "", g.unexplainedFlag ? "unexplained gap" : ""]
          .filter((f) => f !== "").join(", "),
      },
    ]);
  const head = [
    "group",
    "people",
    "raw mean gap",
    "raw median gap",
    "unexplained",
    `${level} low`,
    "high",
    "flagged",
  ];
  // A gap without an unexplained figure (too few to adjust) has no interval to draw.
  const intervals = (label: string, gaps: GapFigure[]): IntervalRow[] =>
    gaps.filter((g) => g.low !== null && g.high !== null && g.adjusted !== null).map((g) => ({
      label: label === "" ? g.group : `${label}: ${g.group}`,
      low: g.low!,
      high: g.high!,
      mid: g.adjusted!,
      flagged: g.unexplainedFlag,
    }));
  if (report.overall.suppressed) {
    sections.push({
      title: "The gap overall",
      body: paragraph(
        `Withheld: fewer than ${report.privacyMin} people in a group.`,
        "warning",
      ),
    });
  } else {
    const gaps = report.overall.gaps;
    sections.push({
      title: "The gap overall",
      body: [
        explain,
        ...notes.map((n) => paragraph(n, "note")),
        intervalsChart({
          rows: intervals("", gaps),
          axis: "unexplained gap (positive: paid less)",
          format: pct,
          zero: true,
          caption:
            `Each group's unexplained gap (the black tick) with its ${level} interval; the ` +
            `dashed line is no gap; a flagged gap is drawn thicker and darker, and named in the ` +
            `table below, which has the same figures.`,
        }).html,
        figureTable(`Gaps against ${report.reference}, everyone`, head, gapRows("", gaps)),
      ].join("\n"),
    });
  }
  const shownCategories = report.categories.filter((c) => !c.suppressed);
  if (report.categories.length > 0) {
    const rows: HtmlCell[][] = [];
    const drawn: IntervalRow[] = [];
    for (const c of report.categories) {
      if (c.suppressed) {
        rows.push([{ text: c.name }, { text: "too few to report" }]);
        continue;
      }
      rows.push(...gapRows(c.name, c.gaps));
      drawn.push(...intervals(c.name, c.gaps));
    }
    sections.push({
      title: `The gap per category (${report.within.join(" x ")})`,
      body: [
        drawn.length === 0 ? "" : intervalsChart({
          rows: drawn,
          axis: "unexplained gap (positive: paid less)",
          format: pct,
          zero: true,
          caption: `Each category's unexplained gap per group with its ${level} interval; ` +
            `categories too small to report are left out. The table below has the same figures.`,
        }).html,
        figureTable(
          `Gaps against ${report.reference} per category (${shownCategories.length} of ` +
            `${report.categories.length} shown)`,
          head,
          rows,
        ),
      ].join("\n"),
    });
  }
  if (report.quartiles !== null) {
    const groups = [report.reference, ...report.groups];
    sections.push({
      title: "Pay quartiles",
      body: [
        barsChart({
          items: report.quartiles.flatMap((q) =>
            groups.map((g) => ({ label: `quartile ${q.quartile}: ${g}`, value: q.shares[g] ?? 0 }))
          ),
          axis: "share of the quartile's people",
          format: (v) => formatPercent(v, false, numbers),
          caption: "Each group's share of the people in each quarter of the pay scale, lowest " +
            "paid first. The table below has the same figures.",
        }).html,
        figureTable(
          "Each group's share of each pay quartile",
          ["quartile", "people", ...groups],
          report.quartiles.map((q) => [
            { text: String(q.quartile) },
            { text: formatNumber(q.rows, numbers, 0), value: q.rows },
            ...groups.map((g) => ({
              text: formatPercent(q.shares[g] ?? 0, false, numbers),
              value: q.shares[g] ?? 0,
            })),
          ]),
        ),
      ].join("\n"),
    });
  }
  if (report.decomposition !== null) {
    for (const d of report.decomposition.groups) {
      sections.push({
        title: `The gap split by factor: ${d.group}`,
        body: [
          barsChart({
            items: [
              ...d.explained.map((e) => ({ label: e.attribute, value: e.part })),
              { label: "not explained", value: d.unexplained.value },
              { label: "rest", value: d.rest },
            ],
            axis: "part of the raw gap in log pay",
            format: (v) => formatNumber(v, numbers, 3),
            caption: `The raw gap in mean log pay between ${report.reference} and ${d.group} ` +
              `(${formatNumber(d.rawLog, numbers, 3)}) split into the part each factor explains, ` +
              `the part none explains, and the rest; the parts add up to the raw gap. The table ` +
              `below has the same figures.`,
          }).html,
          figureTable(
            `The raw log gap of ${d.group}, factor by factor`,
            ["part", "log pay", `${level} low`, "high"],
            [
              ...d.explained.map((e): HtmlCell[] => [
                { text: e.attribute },
                {
                  text: formatNumber(e.part, numbers, 4),
                  value: e.part,
                },
                { text: "" },
                { text: "" },
              ]),
              [
                { text: "not explained" },
                { text: formatNumber(d.unexplained.value, numbers, 4), value: d.unexplained.value },
                { text: formatNumber(d.unexplained.low, numbers, 4), value: d.unexplained.low },
                { text: formatNumber(d.unexplained.high, numbers, 4), value: d.unexplained.high },
              ],
              [{ text: "rest" }, { text: formatNumber(d.rest, numbers, 4), value: d.rest }, {
                text: "",
              }, { text: "" }],
              [{ text: "raw gap" }, { text: formatNumber(d.rawLog, numbers, 4), value: d.rawLog }, {
                text: "",
              }, { text: "" }],
            ],
          ),
        ].join("\n"),
      });
    }
  }
  if (report.proxies.length > 0) {
    sections.push({
      title: "Possible proxies",
      body: figureTable(
        `Factors that on their own predict ${report.group} (balanced accuracy; 0.5 is chance ` +
          `for two groups)`,
        ["factor", "balanced accuracy"],
        report.proxies.map((p) => [{ text: p.feature }, {
          text: formatNumber(p.balancedAccuracy, numbers, 3),
          value: p.balancedAccuracy,
        }]),
      ),
    });
  }
  return sections;
}
