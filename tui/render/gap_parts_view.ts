/**
 * The gap split by factor (lib/gap/decompose_gap.ts), in words and signed
 * bars for the terminal and as a Markdown table for the report. Parts are
 * shown in points of mean log pay (0.01 each, about 1%).
 *
 * @module
 */

import wrapAnsi from "wrap-ansi";
import type { GapDecomposition, GapReport } from "../../mod.ts";
import { signedBarChart } from "./charts.ts";
import { formatNumber, formatPercent, type NumberStyle } from "./numbers.ts";
import type { Style } from "./style.ts";

/** How to draw the parts. */
export interface GapPartsView {
  style: Style;
  width: number;
  numbers: NumberStyle;
}

// A part in points (0.01 of log pay), one decimal, signed.
function points(value: number, numbers: NumberStyle): string {
  return new Intl.NumberFormat(numbers.locale ?? "en-US", {
    minimumFractionDigits: 1,
    maximumFractionDigits: 1,
    signDisplay: "exceptZero",
  }).format(100 * value);
}

/** The parts of one group's gap in the order shown: factors by size, then the two others. */
function partRows(
  d: GapDecomposition,
): { label: string; value: number; kind: "factor" | "unexplained" | "rest" }[] {
  const factors = [...d.explained].sort((a, b) => Math.abs(b.part) - Math.abs(a.part));
  return [
    ...factors.map((f) => ({ label: f.attribute, value: f.part, kind: "factor" as const })),
    { label: "unexplained", value: d.unexplained.value, kind: "unexplained" },
    { label: "rest", value: d.rest, kind: "rest" },
  ];
}

/** What the parts are, in one paragraph. */
function partsMeaning(report: GapReport, confidence: number): string {
  return `Points of mean log pay (1 point = 0.01, about 1%). One set of trees fitted with ` +
    `${report.group} among the factors reads each person (trees that did not draw them): a factor's ` +
    `part is how much more it adds to the ${report.reference} group's estimates than to the ` +
    `other group's; unexplained is what ${report.group} itself changes in the estimates with the ` +
    `factors held, corrected for the trees' shrinkage, with its ${
      formatNumber(100 * confidence, {}, 0)
    }% interval; rest is what the estimates miss. The parts add up to the raw gap. Its linear ` +
    `analogue is the Oaxaca-Blinder decomposition with pooled coefficients.`;
}

/**
 * The terminal's lines for the gap split by factor, one block per group
 * compared (nothing when the report has no decomposition).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, gapCheck, loadTable } from "../../mod.ts";
 * import { renderGapParts } from "./gap_parts_view.ts";
 * import { makeStyle } from "./style.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 400, seed: 3 }), { target: "base_pay_eur" });
 * const report = await gapCheck(table, {
 *   target: "base_pay_eur", group: "gender", compare: ["Woman"], trees: 20, workers: 1,
 * });
 * const lines = renderGapParts(report, { style: makeStyle(false), width: 80, numbers: {} });
 * assert.match(lines[0], /^Woman's raw gap split by factor/);
 * const d = report.decomposition!.groups[0];
 * assert(lines.some((l) => l.startsWith("raw gap") && l.includes((100 * d.rawLog).toFixed(1))));
 * assert(lines.every((l) => l.length <= 80));
 * ```
 */
export function renderGapParts(report: GapReport, view: GapPartsView): string[] {
  const decomposition = report.decomposition;
  if (decomposition === null) return [];
  const { style, width, numbers } = view;
  const wrap = (text: string) => wrapAnsi(text, width).split("\n");
  const lines: string[] = [];
  for (const d of decomposition.groups) {
    const rows = partRows(d);
    const labelWidth = Math.max(...rows.map((r) => r.label.length), "explained".length, 7);
    const texts = rows.map((r) => points(r.value, numbers));
    const textWidth = Math.max(...texts.map((t) => t.length));
    const interval = `  (${points(d.unexplained.low, numbers)} to ${
      points(d.unexplained.high, numbers)
    })`;
    // Bars in what is left of the line after the label, the figure and the interval.
    const room = width - labelWidth - textWidth - interval.length - 5;
    const half = Math.max(3, Math.min(12, Math.floor(room / 2)));
    const items = rows.map((r, i) => ({
      label: r.label.padEnd(labelWidth),
      // The bar's size as the figure reads (0.0 draws none).
      value: Number((100 * r.value).toFixed(1)),
      text: texts[i].padStart(textWidth) + (r.kind === "unexplained" ? interval : ""),
    }));
    const total = (label: string, value: number) =>
      `${label.padEnd(labelWidth)}  ${" ".repeat(2 * half + 1)} ${
        points(value, numbers).padStart(textWidth)
      }`;
    // One chart, so factors and the two other parts share a scale; the
    // totals go between, without bars.
    const bars = signedBarChart(items, half);
    const factors = rows.length - 2;
    lines.push(
      ...wrap(style.bold(`${d.group}'s raw gap split by factor, against ${report.reference}`)),
      ...bars.slice(0, factors),
      total("explained", d.explainedTotal),
      ...bars.slice(factors),
      total("raw gap", d.rawLog),
      ...wrap(style.dim(
        `Raw gap: ${d.group}'s geometric mean pay ${
          formatPercent(Math.abs(d.geometricGap), false, numbers)
        } ${d.geometricGap >= 0 ? "below" : "above"} ${report.reference}'s.`,
      )),
      "",
    );
  }
  lines.push(...wrap(style.dim(partsMeaning(report, decomposition.confidence))), "");
  return lines;
}

/**
 * The Markdown section of the gap split by factor (empty when the report
 * has no decomposition).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, gapCheck, loadTable } from "../../mod.ts";
 * import { gapPartsMarkdown } from "./gap_parts_view.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 400, seed: 3 }), { target: "base_pay_eur" });
 * const report = await gapCheck(table, { target: "base_pay_eur", group: "gender", trees: 20, workers: 1 });
 * const md = gapPartsMarkdown(report, {});
 * assert.equal(md[0], "## The raw gap split by factor");
 * assert(md.some((l) => l.startsWith("| Woman | unexplained |")));
 * ```
 */
export function gapPartsMarkdown(report: GapReport, numbers: NumberStyle): string[] {
  const decomposition = report.decomposition;
  if (decomposition === null) return [];
  const md = [
    "## The raw gap split by factor",
    "",
    "| group | part | points | interval |",
    "| --- | --- | ---: | --- |",
  ];
  for (const d of decomposition.groups) {
    for (const row of partRows(d)) {
      md.push(
        `| ${d.group} | ${row.label} | ${points(row.value, numbers)} | ${
          row.kind === "unexplained"
            ? `${points(d.unexplained.low, numbers)} to ${points(d.unexplained.high, numbers)}`
            : ""
        } |`,
      );
    }
    md.push(
      `| ${d.group} | raw gap | ${points(d.rawLog, numbers)} | geometric mean pay ${
        formatPercent(Math.abs(d.geometricGap), false, numbers)
      } ${d.geometricGap >= 0 ? "lower" : "higher"} |`,
    );
  }
  md.push("", partsMeaning(report, decomposition.confidence), "");
  return md;
}
