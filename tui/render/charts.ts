/**
 * Small text charts: horizontal bars for importance, bars either side of a
 * line for signed parts, intervals drawn on a common axis, and a histogram
 * of the trees' estimates. Plain characters
 * only, so they survive any SSH session and copy-paste.
 *
 * @module
 */

/**
 * Bars that go left of a centre line for a negative value ("-" cells) and
 * right of it for a positive one ("+" cells), scaled to the largest size;
 * a value that is not 0 gets at least one cell. The sign reads from the
 * cells as well as the side, so nothing depends on colour.
 *
 * @param half Cells on each side of the line.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { signedBarChart } from "./charts.ts";
 * const lines = signedBarChart([
 *   { label: "level G5", value: 0.2, text: "+22%" },
 *   { label: "site", value: -0.05, text: "-5%" },
 *   { label: "remote", value: 0, text: "0%" },
 * ], 4);
 * assert.deepEqual(lines, [
 *   "level G5      |++++ +22%",
 *   "site         -|     -5%",
 *   "remote        |     0%",
 * ]);
 * ```
 */
export function signedBarChart(
  items: readonly { label: string; value: number; text: string }[],
  half: number,
): string[] {
  const labelWidth = Math.max(0, ...items.map((i) => i.label.length));
  const top = Math.max(0, ...items.map((i) => Math.abs(i.value)));
  return items.map((item) => {
    const size = top > 0 ? Math.round((Math.abs(item.value) / top) * half) : 0;
    const n = item.value === 0 ? 0 : Math.max(1, size);
    const left = item.value < 0 ? "-".repeat(n) : "";
    const right = item.value > 0 ? "+".repeat(n) : "";
    return `${item.label.padEnd(labelWidth)}  ${left.padStart(half)}|${
      right.padEnd(half)
    } ${item.text}`;
  });
}

/**
 * Horizontal bars, one per item, scaled to the largest value.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { barChart } from "./charts.ts";
 * const lines = barChart([{ label: "level", value: 2, text: "2.0" }, { label: "site", value: 1, text: "1.0" }], 20);
 * assert(lines[0] === "level  ########## 2.0" && lines[1] === "site   #####      1.0");
 * ```
 */
export function barChart(
  items: readonly { label: string; value: number; text: string }[],
  barWidth: number,
): string[] {
  const labelWidth = Math.max(...items.map((i) => i.label.length));
  const top = Math.max(...items.map((i) => i.value), 0);
  const cells = Math.max(4, Math.floor(barWidth / 2));
  return items.map((item) => {
    const n = top > 0 ? Math.round((Math.max(0, item.value) / top) * cells) : 0;
    return `${item.label.padEnd(labelWidth)}  ${"#".repeat(n).padEnd(cells)} ${item.text}`;
  });
}

/** One interval to draw. */
export interface IntervalRow {
  /** Label on the left. */
  label: string;
  /** Lower end. */
  low: number;
  /** Upper end. */
  high: number;
  /** Text on the right (e.g. the two ends formatted). */
  text: string;
}

/** A value marked on an interval chart's axis, on a line of its own (an offer). */
export interface ChartMark {
  /** Label on the left. */
  label: string;
  /** The value. */
  value: number;
  /** Text on the right. */
  text: string;
}

/**
 * Intervals on one axis, with the estimate marked `|`: each line shows
 * where its interval lies relative to the others. With `mark`, a last line
 * puts `^` under its value; the axis stretches to hold it up to the
 * intervals' own span on either side, and a value beyond that is drawn at
 * the edge as `<` or `>` (its text says the figure).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { intervalChart } from "./charts.ts";
 * const lines = intervalChart([
 *   { label: "sure", low: 45, high: 55, text: "45-55" },
 *   { label: "range", low: 0, high: 100, text: "0-100" },
 * ], 50, 21);
 * assert(lines[0] === "sure            [|]           45-55");
 * assert(lines[1] === "range  [=========|=========]  0-100");
 * ```
 *
 * @example An offer marked under the range, and one far beyond it
 * ```ts
 * import assert from "node:assert/strict";
 * import { intervalChart } from "./charts.ts";
 * const range = [{ label: "range", low: 0, high: 100, text: "0-100" }];
 * const [, under] = intervalChart(range, 50, 21, { label: "offer", value: 25, text: "25" });
 * assert.equal(under, "offer       ^                 25");
 * const [squeezed, far] = intervalChart(range, 50, 21, { label: "offer", value: 1e6, text: "1e6" });
 * assert.equal(squeezed, "range  [====|====]            0-100");
 * assert.equal(far, "offer                      >  1e6");
 * ```
 */
export function intervalChart(
  rows: readonly IntervalRow[],
  estimate: number,
  axisWidth: number,
  mark?: ChartMark,
): string[] {
  let low = Math.min(...rows.map((r) => r.low), estimate);
  let high = Math.max(...rows.map((r) => r.high), estimate);
  const own = high - low || 1;
  if (mark !== undefined) {
    low = Math.min(low, Math.max(mark.value, low - own));
    high = Math.max(high, Math.min(mark.value, high + own));
  }
  const span = high - low || 1;
  const at = (x: number) => Math.round(((x - low) / span) * (axisWidth - 1));
  const labelWidth = Math.max(...rows.map((r) => r.label.length), mark?.label.length ?? 0);
  const lines = rows.map((r) => {
    const cells = new Array(axisWidth).fill(" ");
    const a = at(r.low);
    const b = at(r.high);
    for (let i = a; i <= b; i++) cells[i] = "=";
    cells[a] = "[";
    cells[b] = "]";
    const e = at(estimate);
    if (e > a && e < b) cells[e] = "|";
    return `${r.label.padEnd(labelWidth)}  ${cells.join("")}  ${r.text}`;
  });
  if (mark !== undefined) {
    const cells = new Array(axisWidth).fill(" ");
    if (mark.value < low) cells[0] = "<";
    else if (mark.value > high) cells[axisWidth - 1] = ">";
    else cells[at(mark.value)] = "^";
    lines.push(`${mark.label.padEnd(labelWidth)}  ${cells.join("")}  ${mark.text}`);
  }
  return lines;
}

/**
 * A histogram of values in `bins` columns of height `height`, with the
 * lowest and highest value under it.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { histogram } from "./charts.ts";
 * const lines = histogram([1, 2, 2, 3, 3, 3], 3, 3, (x) => String(x));
 * assert(lines[0] === "    #" && lines[2] === "  ###" && lines[3].startsWith("1"));
 * ```
 */
export function histogram(
  values: readonly number[],
  bins: number,
  height: number,
  format: (x: number) => string,
): string[] {
  if (values.length === 0) return [];
  const { low, high, counts } = histogramCounts(values, bins);
  const top = Math.max(...counts);
  const lines: string[] = [];
  for (let level = height; level >= 1; level--) {
    const line = counts.map((c) => (c / top) * height >= level - 0.5 ? "#" : " ").join("");
    lines.push(`  ${line}`.replace(/\s+$/, ""));
  }
  const left = format(low);
  const right = format(high);
  const gap = Math.max(1, bins + 2 - left.length - right.length);
  lines.push(`${left}${" ".repeat(gap)}${right}`);
  return lines;
}

/**
 * Values counted into `bins` equal columns from the lowest to the highest,
 * for a drawn histogram (the terminal's or a report's).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { histogramCounts } from "./charts.ts";
 * assert.deepEqual(histogramCounts([1, 2, 2, 3, 3, 3], 3), { low: 1, high: 3, counts: [1, 2, 3] });
 * ```
 */
export function histogramCounts(
  values: readonly number[],
  bins: number,
): { low: number; high: number; counts: number[] } {
  let low = Infinity;
  let high = -Infinity;
  for (const v of values) {
    if (v < low) low = v;
    if (v > high) high = v;
  }
  const counts = new Array(bins).fill(0);
  for (const v of values) {
    const k = high > low ? Math.min(bins - 1, Math.floor(((v - low) / (high - low)) * bins)) : 0;
    counts[k]++;
  }
  return { low, high, counts };
}

/** One band to draw: its ends and midpoint, and a second span beside it (current pay). */
export interface BandRow {
  /** Label on the left. */
  label: string;
  /** The band's minimum, midpoint and maximum. */
  min: number;
  mid: number;
  max: number;
  /** A span drawn under the band (the current pay's quartiles), or null. */
  inner: { low: number; middle: number; high: number } | null;
}

/**
 * Floating bars on one axis shared by every row: each band as `[===|===]`
 * with `|` at its midpoint, and under it, where given, the inner span as
 * `(---o---)` with `o` at its middle. Plain characters only.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { bandChart } from "./charts.ts";
 * const lines = bandChart([
 *   { label: "G1", min: 40, mid: 50, max: 60, inner: { low: 45, middle: 50, high: 55 } },
 *   { label: "G2", min: 60, mid: 70, max: 80, inner: null },
 * ], 21);
 * assert.deepEqual(lines, [
 *   "G1  [====|====]",
 *   "       (-o--)",
 *   "G2            [====|====]",
 * ]);
 * ```
 */
export function bandChart(rows: readonly BandRow[], axisWidth: number): string[] {
  const low = Math.min(...rows.map((r) => Math.min(r.min, r.inner?.low ?? r.min)));
  const high = Math.max(...rows.map((r) => Math.max(r.max, r.inner?.high ?? r.max)));
  const span = high - low || 1;
  const at = (v: number) => Math.round(((v - low) / span) * (axisWidth - 1));
  const labelWidth = Math.max(...rows.map((r) => r.label.length));
  const draw = (
    from: number,
    middle: number,
    to: number,
    ends: string,
    fill: string,
    mark: string,
  ) => {
    const cells = Array.from({ length: axisWidth }, () => " ");
    const a = at(from);
    const b = at(to);
    for (let i = a; i <= b; i++) cells[i] = fill;
    cells[a] = ends[0];
    cells[b] = ends[1];
    const m = at(middle);
    if (m > a && m < b) cells[m] = mark;
    return cells.join("").trimEnd();
  };
  return rows.flatMap((r) => [
    `${r.label.padEnd(labelWidth)}  ${draw(r.min, r.mid, r.max, "[]", "=", "|")}`,
    ...(r.inner === null ? [] : [
      `${"".padEnd(labelWidth)}  ${
        draw(r.inner.low, r.inner.middle, r.inner.high, "()", "-", "o")
      }`,
    ]),
  ]);
}
