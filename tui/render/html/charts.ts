/**
 * Charts for HTML reports, drawn as SVG by Observable Plot on a DOM that
 * linkedom provides (no browser). Chosen by measurement against vega-lite
 * with vega's SVG renderer and ECharts' server-side SVG
 * (bench/results/html_charts.md): the smallest install of the three, the
 * fastest render, and the same bytes for the same input (needed for tests);
 * ECharts gave different bytes on each render.
 *
 * Every chart sits in a fixed box ({@linkcode CHART_WIDTH} wide, a height
 * the chart states), so a browser test knows where to look; carries a
 * caption; and reads in greyscale: meaning is carried by position, labels
 * and line weight, and the colours (Okabe and Ito's palette, safe for
 * colour-blind readers) differ in lightness too.
 *
 * These functions draw figures they are given; they compute none.
 *
 * @module
 */

import * as Plot from "@observablehq/plot";
import { parseHTML } from "linkedom";
import { escapeHtml } from "./page.ts";

/**
 * The width of every chart's box, in CSS pixels: the page's column less
 * its padding, about 170 mm printed, inside an A4 or Letter page's margins.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { barsChart, CHART_WIDTH } from "./charts.ts";
 * const chart = barsChart({ items: [{ label: "a", value: 1 }], axis: "x", format: String, caption: "c" });
 * assert.match(chart.html, new RegExp(`width="${CHART_WIDTH}"`));
 * ```
 */
export const CHART_WIDTH = 640;

// Okabe & Ito (2008), "Color Universal Design": blue, vermillion, bluish
// green, orange; dark to light in greyscale in that order of use.
const INK = { dark: "#0b3c5d", blue: "#0072B2", vermillion: "#D55E00", light: "#9ecae1" };

// Plot draws into this document; Deno's own types have no DOM, hence the cast.
const { document } = parseHTML("<!DOCTYPE html><html><body></body></html>") as unknown as {
  document: unknown;
};

/** A chart ready for a page: its markup and its box's height. */
export interface Chart {
  /** `<figure>` with the SVG in a fixed box and the caption. */
  html: string;
  /** The box's height in CSS pixels. */
  height: number;
}

// Wraps Plot's SVG in the figure with its fixed box and caption.
function figure(kind: string, svg: { outerHTML: string }, height: number, caption: string): Chart {
  const box = `<div class="box" style="height:${height}px">${svg.outerHTML}</div>`;
  return {
    html: `<figure class="chart" data-chart="${kind}" data-height="${height}">${box}` +
      `<figcaption>${escapeHtml(caption)}</figcaption></figure>`,
    height,
  };
}

const baseOptions = (height: number, marginLeft: number) => ({
  document,
  width: CHART_WIDTH,
  height,
  marginLeft,
  marginRight: 24,
  marginBottom: 46,
  style: { fontSize: "12px", background: "#fff", color: "#1a1a1a" },
});

// Room for the longest label at 12 px (about 7 px a character), within reason.
const labelMargin = (labels: readonly string[]) =>
  Math.min(260, Math.max(60, 12 + 7 * Math.max(0, ...labels.map((l) => l.length))));

/**
 * Horizontal bars, one per label (e.g. each attribute's importance).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { barsChart } from "./charts.ts";
 * const chart = barsChart({
 *   items: [{ label: "level", value: 0.6 }, { label: "<b>site", value: 0.1 }],
 *   axis: "importance", format: (v) => v.toFixed(1), caption: "Importance",
 * });
 * assert.match(chart.html, /^<figure class="chart" data-chart="bars"/);
 * assert.match(chart.html, /&lt;b&gt;site/);
 * assert.doesNotMatch(chart.html, /<b>site/);
 * ```
 */
export function barsChart(input: {
  items: { label: string; value: number }[];
  axis: string;
  format: (v: number) => string;
  caption: string;
}): Chart {
  const height = 60 + 26 * input.items.length;
  const labels = input.items.map((i) => i.label);
  const svg = Plot.plot({
    ...baseOptions(height, labelMargin(labels)),
    x: { label: input.axis, labelAnchor: "center", grid: true, tickFormat: input.format, ticks: 5 },
    y: { label: null, domain: labels },
    marks: [
      Plot.barX(input.items, { x: "value", y: "label", fill: INK.blue }),
      Plot.ruleX([0]),
    ],
  });
  return figure("bars", svg, height, input.caption);
}

/** One interval of an {@linkcode intervalsChart}. */
export interface IntervalRow {
  /** What the interval is, on the axis beside it. */
  label: string;
  /** Its ends. */
  low: number;
  high: number;
  /** The point inside it (an estimate, a change), marked with a tick. */
  mid?: number;
  /** Flagged rows are drawn darker and thicker (a flag is also said in words). */
  flagged?: boolean;
}

/**
 * Intervals on one axis, one per row, with their points: an estimate's two
 * intervals, a change's, or gaps around zero (`zero: true` draws the zero
 * line).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { intervalsChart } from "./charts.ts";
 * const chart = intervalsChart({
 *   rows: [{ label: "typical pay", low: 60, high: 70, mid: 65 }, { label: "one person", low: 50, high: 80, mid: 65 }],
 *   axis: "pay", format: String, caption: "Estimate", zero: false,
 * });
 * assert.match(chart.html, /data-chart="intervals"/);
 * assert.equal(chart.height, 60 + 2 * 34);
 * ```
 */
export function intervalsChart(input: {
  rows: IntervalRow[];
  axis: string;
  format: (v: number) => string;
  caption: string;
  zero?: boolean;
}): Chart {
  const height = 60 + 34 * input.rows.length;
  const labels = input.rows.map((r) => r.label);
  const plain = input.rows.filter((r) => !r.flagged);
  const flagged = input.rows.filter((r) => r.flagged);
  const svg = Plot.plot({
    ...baseOptions(height, labelMargin(labels)),
    x: { label: input.axis, labelAnchor: "center", grid: true, tickFormat: input.format, ticks: 5 },
    y: { label: null, domain: labels },
    marks: [
      ...(input.zero ? [Plot.ruleX([0], { stroke: "#555", strokeDasharray: "4,3" })] : []),
      Plot.ruleY(plain, { y: "label", x1: "low", x2: "high", stroke: INK.blue, strokeWidth: 6 }),
      Plot.ruleY(flagged, {
        y: "label",
        x1: "low",
        x2: "high",
        stroke: INK.vermillion,
        strokeWidth: 9,
      }),
      Plot.tickX(input.rows.filter((r) => r.mid !== undefined), {
        x: "mid",
        y: "label",
        stroke: "#000",
        strokeWidth: 3,
      }),
    ],
  });
  return figure("intervals", svg, height, input.caption);
}

/** One band of a {@linkcode bandsChart}. */
export interface BandBar {
  label: string;
  min: number;
  mid: number;
  max: number;
  /** The current pay's inner quantiles (none is one person's pay). */
  p25: number;
  median: number;
  p75: number;
}

/**
 * Bands as floating bars (minimum to maximum, the midpoint a black tick),
 * each with the current pay's inner quantiles as a thin line below it (the
 * median a dot); no mark is one person's pay.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { bandsChart } from "./charts.ts";
 * const chart = bandsChart({
 *   bands: [{ label: "G1", min: 34, mid: 38, max: 42, p25: 35, median: 38, p75: 40 }],
 *   format: String, caption: "Bands",
 * });
 * assert.match(chart.html, /data-chart="bands"/);
 * ```
 */
export function bandsChart(input: {
  bands: BandBar[];
  format: (v: number) => string;
  caption: string;
}): Chart {
  const height = 66 + 30 * input.bands.length;
  const labels = input.bands.map((b) => b.label);
  const svg = Plot.plot({
    ...baseOptions(height, labelMargin(labels)),
    x: { label: "pay", labelAnchor: "center", grid: true, tickFormat: input.format, ticks: 5 },
    y: { label: null, domain: labels, padding: 0.35 },
    marks: [
      Plot.barX(input.bands, {
        x1: "min",
        x2: "max",
        y: "label",
        fill: INK.light,
        stroke: INK.dark,
      }),
      Plot.tickX(input.bands, { x: "mid", y: "label", stroke: "#000", strokeWidth: 3 }),
      Plot.ruleY(input.bands, {
        y: "label",
        x1: "p25",
        x2: "p75",
        dy: 12,
        stroke: INK.vermillion,
        strokeWidth: 2,
      }),
      Plot.dot(input.bands, {
        x: "median",
        y: "label",
        dy: 12,
        r: 3,
        fill: INK.vermillion,
      }),
    ],
  });
  return figure("bands", svg, height, input.caption);
}

/**
 * A histogram of values already counted into bins (e.g. the trees' estimates).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { histogramChart } from "./charts.ts";
 * const chart = histogramChart({
 *   bins: [{ low: 0, high: 1, count: 2 }, { low: 1, high: 2, count: 5 }],
 *   axis: "estimate", format: String, caption: "Trees",
 * });
 * assert.match(chart.html, /data-chart="histogram"/);
 * ```
 */
export function histogramChart(input: {
  bins: { low: number; high: number; count: number }[];
  axis: string;
  format: (v: number) => string;
  caption: string;
}): Chart {
  const height = 220;
  const svg = Plot.plot({
    ...baseOptions(height, 48),
    x: { label: input.axis, labelAnchor: "center", tickFormat: input.format, ticks: 5 },
    y: { label: "trees", grid: true },
    marks: [
      Plot.rectY(input.bins, { x1: "low", x2: "high", y: "count", fill: INK.blue, inset: 0.5 }),
      Plot.ruleY([0]),
    ],
  });
  return figure("histogram", svg, height, input.caption);
}

/** One step of a {@linkcode sweepChart}. */
export interface SweepPoint {
  /** The attribute's value (a number, or a level's position when `labels` are given). */
  x: number;
  estimate: number;
  sureLow: number;
  sureHigh: number;
  rangeLow: number;
  rangeHigh: number;
}

/**
 * A sweep: the estimate as a line, "how sure" as a darker band around it
 * and the range of comparable people as a light band.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { sweepChart } from "./charts.ts";
 * const chart = sweepChart({
 *   points: [0, 1, 2].map((x) => ({ x, estimate: 10 + x, sureLow: 9 + x, sureHigh: 11 + x, rangeLow: 8 + x, rangeHigh: 12 + x })),
 *   axis: "years", format: String, caption: "Sweep", labels: ["G1", "G2", "G3"],
 * });
 * assert.match(chart.html, /data-chart="sweep"/);
 * ```
 */
export function sweepChart(input: {
  points: SweepPoint[];
  axis: string;
  format: (v: number) => string;
  caption: string;
  labels?: string[];
}): Chart {
  const height = 280;
  const labels = input.labels;
  const svg = Plot.plot({
    ...baseOptions(height, 72),
    x: {
      label: input.axis,
      labelAnchor: "center",
      ...(labels === undefined
        ? {}
        : { ticks: labels.map((_, i) => i), tickFormat: (i: number) => labels[i] ?? "" }),
    },
    y: { label: "pay", grid: true, tickFormat: input.format },
    marks: [
      Plot.areaY(input.points, { x: "x", y1: "rangeLow", y2: "rangeHigh", fill: INK.light }),
      Plot.areaY(input.points, { x: "x", y1: "sureLow", y2: "sureHigh", fill: INK.blue }),
      Plot.lineY(input.points, { x: "x", y: "estimate", stroke: "#000", strokeWidth: 2 }),
    ],
  });
  return figure("sweep", svg, height, input.caption);
}
