/**
 * The band table as an HTML report: the bands as floating bars with the
 * current pay's inner quartiles, the table of the same figures (each in a
 * `data-value`), the measures along the ladder, the definitions and the
 * cautions. A hidden cell shows "too few to report" in the table and has no
 * mark in the chart, nor any figure in the markup.
 *
 * @module
 */

import type { BandCell, BandTable } from "../../../mod.ts";
import { bandCellTexts, bandMethodWords, BANDS_CAUTIONS, leftOutWords } from "../bands_view.ts";
import { formatPay, formatPercent, type NumberStyle } from "../numbers.ts";
import { bandsChart } from "./charts.ts";
import { figureTable, type HtmlCell, htmlPage, paragraph } from "./page.ts";

type Shown = Extract<BandCell, { suppressed: false }>;

// Bands in one chart at most: 30 px each, about a printed page's height.
const BANDS_PER_CHART = 28;

/**
 * The band table's HTML page.
 *
 * @param provenance Where the figures come from (the model's line).
 * @param cautions The usual cautions of every answer.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { bandsHtml } from "./bands_html.ts";
 * const table = {
 *   by: ["level"], method: { kind: "coverage" as const, coverage: 0.8 }, privacyMin: 5,
 *   newHire: false, smoothed: false, withoutPay: 0, notScored: { rows: 0, first: null },
 *   ladders: [{ key: [], levels: ["G1", "<G2>"], progression: [0.2], overlap: [0.1] }],
 *   cells: [
 *     { key: ["G1"], suppressed: false as const, people: 12, currentPay: { p25: 35, median: 38, p75: 40 },
 *       typicalEstimate: 38, typicalProfile: {}, band: { min: 34, mid: 38, max: 42 }, spread: 8 / 34,
 *       rawMid: 38, outside: { below: 1, above: 2, costToMinimum: null } },
 *     { key: ["<G2>"], suppressed: true as const },
 *   ],
 * };
 * const html = bandsHtml(table, {}, "2026-12-03T10:00:00Z", ["paygrove 0.1.0"], "Cautions.");
 * assert.match(html, /data-value="42"/);
 * assert.match(html, /&lt;G2&gt;<\/td><td>too few to report/);
 * assert.doesNotMatch(html, /<G2>/);
 * ```
 */
export function bandsHtml(
  table: BandTable,
  money: NumberStyle,
  created: string,
  provenance: string[],
  cautions: string,
): string {
  const pay = (v: number) => formatPay(v, money);
  const shown = table.cells.filter((c): c is Shown => !c.suppressed);
  const by = table.by.join(" x ");
  const valueCells = (c: BandCell): HtmlCell[] => {
    const texts = bandCellTexts(c, money);
    if (c.suppressed) return [{ text: texts[0] }, { text: texts[1] }];
    const values = [
      c.people,
      c.currentPay.p25,
      c.currentPay.median,
      c.currentPay.p75,
      c.band.min,
      c.band.mid,
      c.band.max,
      c.spread,
      c.outside.below,
      c.outside.above,
    ];
    return [{ text: texts[0] }, ...values.map((value, i) => ({ text: texts[i + 1], value }))];
  };
  const table1 = figureTable(
    `The bands by ${by}, with current pay (each quartile the mean of the ${table.privacyMin} ` +
      `people nearest it)`,
    [
      "cell",
      "people",
      "current p25",
      "median",
      "p75",
      "min",
      "mid",
      "max",
      "spread",
      "below",
      "above",
    ],
    table.cells.map(valueCells),
  );
  // One chart per combination of the other attributes once there are more
  // bands than a printed page holds in one chart (the ladder within each).
  const groups = new Map<string, Shown[]>();
  for (const c of shown) {
    const rest = shown.length > BANDS_PER_CHART ? c.key.slice(1).join(" / ") : "";
    groups.set(rest, [...(groups.get(rest) ?? []), c]);
  }
  const charts = [...groups].map(([rest, cells]) =>
    bandsChart({
      bands: cells.map((c) => ({
        label: c.key.join(" / "),
        min: c.band.min,
        mid: c.band.mid,
        max: c.band.max,
        p25: c.currentPay.p25,
        median: c.currentPay.median,
        p75: c.currentPay.p75,
      })),
      format: pay,
      caption: (rest === "" ? "" : `${rest}: `) +
        `each band from its minimum to its maximum (the bar), its midpoint the black tick; ` +
        `under it, current pay from the 25th to the 75th percentile (the thin line), the median ` +
        `the dot. Cells too small to report are left out. The table below has the same figures.`,
    }).html
  ).join("\n");

  const ladderRows: HtmlCell[][] = [];
  for (const ladder of table.ladders) {
    ladder.levels.slice(1).forEach((level, k) => {
      ladderRows.push([
        { text: [...ladder.key, `${ladder.levels[k]} to ${level}`].join(" / ") },
        { text: formatPercent(ladder.progression[k], true, money), value: ladder.progression[k] },
        { text: formatPercent(ladder.overlap[k], false, money), value: ladder.overlap[k] },
      ]);
    });
  }
  const withCost = shown.filter((c) => c.outside.costToMinimum !== null);
  const sections = [
    {
      title: "The bands",
      body: [
        paragraph(`${bandMethodWords(table, money)}.`),
        ...leftOutWords(table).map((t) => paragraph(t, "warning")),
        ...(table.smoothed
          ? [paragraph(
            `Some midpoints did not rise with ${table.by[0]}: they were smoothed (isotonic, ` +
              `weighted by people, on log pay) and each band moved with its midpoint.`,
            "warning",
          )]
          : []),
        charts,
        table1,
        paragraph(
          `A cell of fewer than ${table.privacyMin} people shows no figure, and enough other ` +
            `cells are hidden with it that no hidden figure can be worked out from the others.`,
          "note",
        ),
      ].join("\n"),
    },
    ...(ladderRows.length === 0 ? [] : [{
      title: "Along the ladder",
      body: figureTable(
        "Midpoint progression and overlap with the next band",
        ["step", "midpoint progression", "overlap"],
        ladderRows,
      ),
    }]),
    ...(withCost.length === 0 ? [] : [{
      title: "Bringing pay up to the minimum",
      body: figureTable(
        `The yearly cost of raising everyone below a band's minimum to it (withheld where ` +
          `fewer than ${table.privacyMin} are below)`,
        ["cell", "people below", "cost"],
        withCost.map((c) => [
          { text: c.key.join(" / ") },
          { text: String(c.outside.below), value: c.outside.below },
          { text: pay(c.outside.costToMinimum!), value: c.outside.costToMinimum! },
        ]),
      ),
    }]),
    {
      title: "Definitions",
      body: [
        paragraph("Range spread: maximum / minimum - 1."),
        paragraph("Midpoint progression: the next level's midpoint / this level's - 1."),
        paragraph(
          "Overlap with the next band: the part of this band that the next one also covers, " +
            "max(0, this maximum - next minimum) / (this maximum - this minimum).",
        ),
        paragraph(
          "These are measures of common compensation practice; no single source defines them.",
          "note",
        ),
      ].join("\n"),
    },
  ];
  return htmlPage({
    title: `Pay bands by ${by}`,
    question: "What pay ranges does our current pay structure imply, and who sits outside them?",
    created,
    provenance,
    cautions: [BANDS_CAUTIONS, cautions],
    sections,
  });
}
