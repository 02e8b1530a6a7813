/**
 * "Why this estimate": each attribute's part of an estimate, and of a
 * what-if's change, as signed bars with the percentage and the money,
 * largest first, in words that say what the parts add up to.
 *
 * @module
 */

import wrapAnsi from "wrap-ansi";
import type { AttributePart, ChangeContributions, ContributionsAnswer } from "../../mod.ts";
import { signedBarChart } from "./charts.ts";
import {
  formatNumber,
  formatPay,
  formatPercent,
  formatSignedPay,
  type NumberStyle,
} from "./numbers.ts";
import type { Style } from "./style.ts";

/** How the parts are laid out. */
export interface PartsViewOptions {
  style: Style;
  width: number;
  money: NumberStyle;
  /** Most parts shown; the rest are counted in one line. @default {6} */
  most?: number;
  /**
   * A heading and the bars only (no count of the rest, no note), for a
   * screen with little room.
   */
  brief?: boolean;
}

/**
 * The parts of one estimate.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { renderContributions } from "./contributions_view.ts";
 * import { makeStyle } from "./style.ts";
 * const lines = renderContributions({
 *   scale: "log", base: 50000, estimate: 60000, moneyPartsMultiply: true, trees: 200,
 *   parts: [
 *     { feature: "level", value: "G5", part: 0.2231, percent: 0.25, money: 12000 },
 *     { feature: "site", value: "North", part: -0.0408, percent: -0.04, money: -2500 },
 *     { feature: "remote", value: "no", part: 0, percent: 0, money: 0 },
 *   ],
 * }, { style: makeStyle(false), width: 80, money: { currency: "EUR" } });
 * assert.match(lines[0], /^Why this estimate: /);
 * assert(lines.some((l) => /level G5 .*\|\+{8}.*\+25\.0%.*\+€12,000/.test(l)));
 * assert(lines.some((l) => /site North .*-\|.*-4\.0%.*-€2,500/.test(l)));
 * assert(!lines.some((l) => l.includes("remote"))); // no part at all
 * assert(lines.some((l) => l.includes("do not add up")));
 * ```
 */
export function renderContributions(
  answer: ContributionsAnswer,
  options: PartsViewOptions,
): string[] {
  const { style, money } = options;
  const pay = (x: number) => formatPay(x, money);
  if (options.brief) {
    return [
      ...wrapped(
        `${style.bold("Why this estimate:")} from ${pay(answer.base)} (the table's ` +
          `${answer.moneyPartsMultiply ? "geometric mean" : "mean"})`,
        options.width,
      ),
      ...partBars(answer.parts, options),
    ];
  }
  const lines = wrapped(
    `${style.bold("Why this estimate:")} each attribute's part, starting from ` +
      `${pay(answer.base)}, the ${
        answer.moneyPartsMultiply ? "geometric mean" : "mean"
      } of the estimates over the table`,
    options.width,
  );
  lines.push(...partBars(answer.parts, options));
  lines.push(
    ...wrapped(
      style.dim(sumWords(answer.moneyPartsMultiply, answer.trees, "estimate")),
      options.width,
      "  ",
    ),
  );
  return lines;
}

/**
 * The parts of a what-if's change.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { renderChangeParts } from "./contributions_view.ts";
 * import { makeStyle } from "./style.ts";
 * const lines = renderChangeParts({
 *   scale: "raw", fromEstimate: 50000, toEstimate: 56000, moneyPartsMultiply: false, trees: 200,
 *   parts: [{ feature: "level", from: "G4", value: "G5", part: 6000, percent: null, money: 6000 }],
 * }, { style: makeStyle(false), width: 80, money: { currency: "EUR" } });
 * assert.match(lines[0], /^The change, attribute by attribute/);
 * assert(lines.some((l) => /level G4 -> G5 .*\|\+.*\+€6,000/.test(l)));
 * assert(lines.some((l) => l.includes("add up to the change")));
 * ```
 */
export function renderChangeParts(
  answer: ChangeContributions,
  options: PartsViewOptions,
): string[] {
  const lines = wrapped(
    options.style.bold("The change, attribute by attribute") +
      (options.brief
        ? ":"
        : " (an attribute left as it was can have a part too: the trees use attributes " +
          "together)"),
    options.width,
  );
  if (answer.parts.length === 0) {
    lines.push("  (no attribute's part moves)");
    return lines;
  }
  lines.push(...partBars(answer.parts, options));
  if (options.brief) return lines;
  lines.push(
    ...wrapped(
      options.style.dim(sumWords(answer.moneyPartsMultiply, answer.trees, "change")),
      options.width,
      "  ",
    ),
  );
  return lines;
}

function partBars(parts: readonly AttributePart[], options: PartsViewOptions): string[] {
  const { money } = options;
  const shown = parts.filter((p) => p.part !== 0);
  const most = options.most ?? 6;
  const top = shown.slice(0, most);
  // Labels and figures take what they need; the bars what is left, at most
  // 10 cells a side and at least 3.
  const labels = top.map((p) => label(p, Math.max(12, Math.floor(options.width * 0.4))));
  // Percentages and amounts each in their own right-aligned column.
  const percents = top.map((p) => p.percent === null ? "" : formatPercent(p.percent, true, money));
  const amounts = top.map((p) => formatSignedPay(p.money, money, true));
  const percentWidth = Math.max(...percents.map((t) => t.length));
  const amountWidth = Math.max(...amounts.map((t) => t.length));
  const texts = top.map((_, i) =>
    [percents[i].padStart(percentWidth), amounts[i].padStart(amountWidth)]
      .filter((t) => t !== "").join("  ")
  );
  const labelWidth = Math.max(...labels.map((l) => l.length));
  const textWidth = Math.max(...texts.map((t) => t.length));
  const half = Math.max(
    3,
    Math.min(10, Math.floor((options.width - 2 - labelWidth - 4 - textWidth) / 2)),
  );
  const lines = signedBarChart(
    top.map((p, i) => ({ label: labels[i], value: p.part, text: texts[i] })),
    half,
  ).map((l) => `  ${l}`);
  const rest = shown.length - top.length;
  if (rest > 0 && !options.brief) {
    const next = shown[top.length];
    lines.push(
      `  ... ${formatNumber(rest, money)} more, each ${restSize(next, money)} ` +
        "(--json lists them all)",
    );
  }
  return lines;
}

function label(part: AttributePart, width: number): string {
  const value = (v: string | number | null | undefined) =>
    v === null || v === undefined ? "missing" : typeof v === "number" ? formatNumber(v) : v;
  const text = part.from === undefined
    ? `${part.feature} ${value(part.value)}`
    : Object.is(part.from, part.value)
    ? `${part.feature} ${value(part.value)} (same)`
    : `${part.feature} ${value(part.from)} -> ${value(part.value)}`;
  return text.length <= width ? text : `${text.slice(0, width - 3)}...`;
}

// The size of the largest part left out, as a bound the reader can use.
function restSize(part: AttributePart, money: NumberStyle): string {
  if (part.percent === null) return `at most ${formatPay(Math.abs(part.money), money, true)}`;
  const size = Math.abs(part.percent);
  return size < 0.001 ? "under 0.1%" : `at most ${formatPercent(size, false, money)}`;
}

function sumWords(multiply: boolean, trees: number, kind: "estimate" | "change"): string {
  const over = trees === 1 ? "one tree" : `${trees} trees`;
  const what = kind === "estimate" ? "the estimate" : "the change";
  if (multiply) {
    const [from, to] = kind === "estimate"
      ? ["the starting figure", "the estimate"]
      : ["the base estimate", "the changed estimate"];
    return `Exact Shapley parts averaged over ${over}. They add up on log pay, so in money they ` +
      `multiply: ${from} times (1 + each percentage) is ${to}, and the money amounts (what ` +
      `${to} would lose without each part) do not add up to ${what} exactly.`;
  }
  return `Exact Shapley parts averaged over ${over}: the amounts add up to ` +
    (kind === "estimate" ? "the estimate minus the starting figure." : "the change.");
}

function wrapped(text: string, width: number, indent = ""): string[] {
  return wrapAnsi(text, width - indent.length, { hard: true }).split("\n").map((l) => indent + l);
}
