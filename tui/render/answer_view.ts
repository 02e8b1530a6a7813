/**
 * Answers as text for a terminal: one profile's estimate, a what-if
 * comparison and a sweep (an asciichart line chart with the interval bands).
 *
 * @module
 */

import asciichart from "asciichart";
import Table from "cli-table3";
import wrapAnsi from "wrap-ansi";
import type { CompareAnswer, EstimateAnswer, OfferAnswer, SweepAnswer } from "../../mod.ts";
import { barChart, histogram, intervalChart } from "./charts.ts";
import { renderChangeParts, renderContributions } from "./contributions_view.ts";
import {
  formatNumber,
  formatPay,
  formatPercent,
  formatSignedPay,
  type NumberStyle,
} from "./numbers.ts";
import type { Style } from "./style.ts";
import { chartSymbols } from "./glyphs.ts";
import { answerNoteText } from "./answer_notes.ts";
import { fitTable } from "./fit_table.ts";

/** What the views need. */
export interface AnswerViewOptions {
  /** Styling. */
  style: Style;
  /** Terminal width. */
  width: number;
  /** Locale and currency of money. */
  money: NumberStyle;
  /** Fewer lines (the guided flow's result screen, under a menu). */
  compact?: boolean;
  /** Coverage of the intervals (for labels). */
  coverage?: number;
}

const PERIOD: Record<string, string> = {
  hour: "an hour",
  week: "a week",
  month: "a month",
  year: "a year",
};

function unitText(answer: EstimateAnswer, money: NumberStyle): string {
  const currency = money.currency ?? answer.target.currency;
  const period = answer.target.period ? ` ${PERIOD[answer.target.period]}` : "";
  // No currency known: say so rather than "units a year".
  return currency === undefined || currency === null
    ? `pay${period}, currency not stated`
    : `${currency}${period}`;
}

function profileText(profile: Record<string, string | number | null>): string {
  return Object.entries(profile)
    .map(([k, v]) =>
      `${k} ${
        v === null ? "(missing)" : typeof v === "number" ? String(Number(v.toPrecision(6))) : v
      }`
    )
    .join(", ");
}

// What the estimate is, in the words of its heading.
const ESTIMATE_WORDS: Record<"median" | "geometric-mean" | "mean", string> = {
  median: "median pay of people like this",
  "geometric-mean": "geometric mean pay",
  mean: "mean pay",
};

// What the "how sure" interval locates.
const WHAT_IS_SURE: Record<"median" | "geometric-mean" | "mean", string> = {
  median: "median pay",
  "geometric-mean": "geometric mean pay",
  mean: "mean pay",
};

/**
 * What the "how sure" interval locates, in two words for table headings
 * and labels ("median pay" for an estimate shifted to a measured median).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { sureOfWhat } from "./answer_view.ts";
 * assert.equal(sureOfWhat({ center: { kind: "median" } }), "median pay");
 * assert.equal(sureOfWhat({ center: null }), "mean pay");
 * ```
 */
export function sureOfWhat(answer: { center: { kind: keyof typeof WHAT_IS_SURE } | null }): string {
  return WHAT_IS_SURE[answer.center?.kind ?? "mean"];
}

// Mean pay beside a median estimate, where pay is skewed enough to matter
// (a gap of at least 0.5%).
function meanPayLines(
  answer: EstimateAnswer,
  pay: (x: number) => string,
  wrap: (text: string, indent?: string) => string[],
): string[] {
  const c = answer.center;
  if (c === null || c.meanPay === null || c.meanOverEstimate === null) return [];
  const gap = c.meanOverEstimate - 1;
  if (Math.abs(gap) < 0.005) return [];
  const why = gap > 0
    ? "above the median: a few high earners pull the mean up"
    : "below the median: a few low earners pull the mean down";
  return wrap(
    `Mean pay of such people: about ${pay(c.meanPay)} (${formatPercent(Math.abs(gap))} ${why})`,
  );
}

/**
 * The estimate screen.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import {
 *   demoCompanyCsv, estimateProfile, fitModel, loadTable, openModel, typicalProfile,
 * } from "../../mod.ts";
 * import { formatPay } from "./numbers.ts";
 * import { renderEstimate } from "./answer_view.ts";
 * import { makeStyle } from "./style.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }), { currency: "EUR" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * const answer = estimateProfile(openModel(model), typicalProfile(model));
 * const money = { currency: "EUR" };
 * const lines = renderEstimate(answer, { style: makeStyle(false), width: 200, money });
 * assert.equal(
 *   lines[0],
 *   `Estimate of base_pay_eur (EUR, median pay of people like this): ${
 *     formatPay(answer.estimate, money)
 *   }`,
 * );
 * const { low, high } = answer.range!;
 * const range = `${formatPay(low, money)} to ${formatPay(high, money)}`;
 * assert(lines.some((l) => l.startsWith(`Range for comparable people (90%): ${range}`)));
 * assert(lines.includes("Decision path of the reference tree"));
 * ```
 */
export function renderEstimate(answer: EstimateAnswer, options: AnswerViewOptions): string[] {
  const { style, money } = options;
  const pay = (x: number) => formatPay(x, money);
  const wrap = (text: string, indent = "") =>
    wrapAnsi(text, options.width - indent.length, { hard: true }).split("\n").map((l) =>
      indent + l
    );
  const lines: string[] = [];
  if (answer.classes) {
    lines.push(
      `${style.bold(`Most likely ${answer.target.name}:`)} ${answer.classes.predicted} ` +
        `(${formatPercent(answer.estimate)} of the trees' votes)`,
    );
    // Each class's share as a bar, with the interval of the trees' shares.
    const shares = Object.entries(answer.classes.shares).sort((a, b) => b[1] - a[1]);
    const intervals = answer.classes.intervals;
    const pct = formatPercent(options.coverage ?? 0.9).replace(".0", "");
    lines.push(
      ...barChart(
        shares.map(([c, share]) => ({
          label: c,
          value: share,
          text: `${formatPercent(share)}` +
            (intervals
              ? ` (${pct}: ${formatPercent(intervals[c].low)} - ${
                formatPercent(intervals[c].high)
              })`
              : ""),
        })),
        Math.min(40, options.width - 40),
      ).map((l) => `  ${l}`),
    );
  } else {
    const what = ESTIMATE_WORDS[answer.center?.kind ?? "mean"];
    lines.push(
      ...wrap(
        `${style.bold(`Estimate of ${answer.target.name}`)} (${
          unitText(answer, money)
        }, ${what}): ` +
          style.bold(pay(answer.estimate)),
      ),
    );
  }
  lines.push(...wrap(style.dim(`for: ${profileText(answer.profile)}`), "  "));
  // Warnings come before the figures they qualify.
  for (const w of answer.warnings) lines.push(...wrap(style.warn(`! ${answerNoteText(w, money)}`)));
  if (answer.confidence && answer.range) {
    const c = answer.confidence;
    const r = answer.range;
    const pct = formatPercent(c.coverage).replace(".0", "");
    lines.push(
      "",
      ...wrap(
        `${style.bold(`How sure (${pct}):`)} ${pay(c.low)} to ${pay(c.high)}` +
          style.dim(
            `  where the ${WHAT_IS_SURE[answer.center?.kind ?? "mean"]} of such a profile lies`,
          ),
      ),
      ...wrap(
        `${style.bold(`Range for comparable people (${pct}):`)} ${pay(r.low)} to ${pay(r.high)}` +
          style.dim("  where one such person's pay falls"),
      ),
      ...meanPayLines(answer, pay, wrap),
    );
    const axis = Math.max(20, Math.min(50, options.width - 40));
    lines.push(
      ...intervalChart(
        [
          { label: "how sure", low: c.low, high: c.high, text: `${pay(c.low)} - ${pay(c.high)}` },
          { label: "range", low: r.low, high: r.high, text: `${pay(r.low)} - ${pay(r.high)}` },
        ],
        answer.estimate,
        axis,
        answer.offer &&
          { label: "offer", value: answer.offer.amount, text: pay(answer.offer.amount) },
      ).map((l) => `  ${l}`),
    );
    if (answer.offer) lines.push(...offerWords(answer.offer, options).map((l) => `  ${l}`));
    if (answer.jackknife) {
      lines.push(
        ...wrap(
          style.dim(
            `Jackknife (leaves bias out): ${pay(answer.jackknife.low)} to ${
              pay(answer.jackknife.high)
            }`,
          ),
          "  ",
        ),
      );
    } else if (answer.jackknifeNeedsAnalystFile) {
      lines.push(
        ...wrap(
          style.dim(
            "Jackknife: not shown. It needs the trees' draws, which only the analyst's file " +
              "holds (--analyst-file).",
          ),
          "  ",
        ),
      );
    }
  }
  if (answer.contributions) {
    lines.push(
      "",
      ...renderContributions(answer.contributions, { style, width: options.width, money }),
    );
  }
  lines.push("", style.bold(`Decision path of the reference tree`));
  if (answer.path.length === 0) lines.push("  (the tree has one leaf: everyone)");
  const table = new Table({
    chars: NO_BORDERS,
    style: { head: [], border: [], "padding-left": 0, "padding-right": 2 },
    colAligns: ["right", "left", "right", "right"],
  });
  for (const { step, i } of shownSteps(answer.path)) {
    if (step === null) {
      table.push(["", `... ${formatNumber(i, money)} more (--json lists them all)`, "", ""]);
      continue;
    }
    table.push([
      `${i + 1}.`,
      step.condition,
      `${formatNumber(step.rows, money)} people`,
      step.value === null
        ? "too few to show"
        : answer.classes
        ? formatPercent(step.value)
        : pay(step.value),
    ]);
  }
  if (answer.path.length > 0) lines.push(...table.toString().split("\n").map((l) => `  ${l}`));
  if (!answer.classes) {
    lines.push(
      ...wrap(
        style.dim(
          `This one tree, shown because it can be read, ends at ${pay(answer.referenceTree)} ` +
            `(its last group holds ${
              formatNumber(answer.leaf.rows, money)
            } people); the estimate ` +
            `above averages ${answer.trees.length || 1} such trees.`,
        ),
        "  ",
      ),
    );
  }
  const s = answer.support;
  const peers = s.peers
    ? `; ${formatNumber(s.peers.rows, money)} share ${s.peers.features[0]} ${s.peers.levels[0]} ` +
      `and ${s.peers.features[1]} ${s.peers.levels[1]}`
    : "";
  lines.push(
    "",
    ...wrap(
      `${style.bold("Support:")} ${
        formatNumber(s.rows, money)
      } people in the reference leaf${peers}.`,
    ),
  );
  if (answer.trees.length > 1) {
    lines.push("", style.bold(`The ${answer.trees.length} trees' estimates`));
    lines.push(
      ...histogram(answer.trees, Math.min(40, options.width - 10), options.compact ? 2 : 4, pay)
        .map((l) => `  ${l}`),
    );
  }
  return lines;
}

const POSITION_WORDS = { under: "under", within: "inside", over: "above" } as const;

// The offer's figures in words, wrapped to the width less an indent of 2.
function offerWords(offer: OfferAnswer, options: AnswerViewOptions) {
  const { style, money } = options;
  const pay = (x: number) => formatPay(x, money);
  const lines: string[] = [];
  const say = (text: string) =>
    lines.push(...wrapAnsi(text, options.width - 2, { hard: true }).split("\n"));
  const ratio = offer.offerToEstimate - 1;
  const vsEstimate = Math.abs(ratio) < 0.0005
    ? "the estimate itself"
    : `${formatPercent(Math.abs(ratio))} ${ratio < 0 ? "below" : "above"} the estimate`;
  if (offer.position === null) {
    say(
      `${style.bold(`Offer ${pay(offer.amount)}:`)} ${vsEstimate} (no range: the model has ` +
        `no ensemble).`,
    );
  } else {
    const pct = formatPercent(offer.coverage!).replace(".0", "");
    say(
      `${style.bold(`Offer ${pay(offer.amount)}:`)} ${POSITION_WORDS[offer.position]} the ` +
        `${pct} range, at range position ${formatNumber(offer.rangePosition!, money, 2)} ` +
        `(0 its low end, 1 its high end); ${vsEstimate}.`,
    );
    const share = offer.shareBelow!;
    say(
      share === 0
        ? `It is below the pay of every comparable person the model kept.`
        : share === 1
        ? `It is above the pay of every comparable person the model kept.`
        : `About ${formatPercent(share)} of comparable people are paid less than this offer.`,
    );
  }
  const reach = (what: string, target: { offer: number; change: number }) =>
    target.change > 0
      ? `${what} ${pay(target.offer)} (${pay(target.change)} more)`
      : `${what} ${pay(target.offer)} (the offer is ${pay(-target.change)} above it)`;
  say(
    reach("To reach the estimate:", offer.reach.estimate) +
      (offer.reach.rangeLow ? `; ${reach("the range's low end:", offer.reach.rangeLow)}.` : "."),
  );
  if (offer.readAs !== null) say(style.dim(`(${offer.readAs})`));
  return lines;
}

/**
 * The offer check on its own (the guided flow's "Check an offer"): the
 * range with the offer marked, then the figures in words.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { renderOffer } from "./answer_view.ts";
 * import { makeStyle } from "./style.ts";
 * const answer = {
 *   estimate: 64000,
 *   range: { coverage: 0.9, low: 57000, high: 71000, method: "" },
 *   offer: {
 *     amount: 61000, text: "61k", readAs: null, position: "within", rangePosition: 4 / 14,
 *     offerToEstimate: 61 / 64, shareBelow: 0.31, coverage: 0.9,
 *     reach: { estimate: { offer: 64000, change: 3000 }, rangeLow: { offer: 57000, change: -4000 } },
 *     method: "",
 *   },
 * } as unknown as import("../../mod.ts").EstimateAnswer;
 * const lines = renderOffer(answer, { style: makeStyle(false), width: 80, money: { currency: "EUR" } });
 * assert.match(lines.join("\n"), /Offer €61,000: inside the 90% range, at range position 0\.29/);
 * assert.match(lines.join("\n"), /About 31\.0% of comparable people are paid less/);
 * assert.match(lines.join("\n"), /To reach the estimate: €64,000 \(€3,000 more\)/);
 * assert(lines.some((l) => l.includes("^")));
 * ```
 */
export function renderOffer(answer: EstimateAnswer, options: AnswerViewOptions): string[] {
  const offer = answer.offer;
  if (offer === undefined) return [];
  const pay = (x: number) => formatPay(x, options.money);
  const lines: string[] = [];
  if (answer.range) {
    const r = answer.range;
    const axis = Math.max(20, Math.min(40, options.width - 30));
    lines.push(
      ...intervalChart(
        [{ label: "range", low: r.low, high: r.high, text: `${pay(r.low)} - ${pay(r.high)}` }],
        answer.estimate,
        axis,
        { label: "offer", value: offer.amount, text: pay(offer.amount) },
      ).map((l) => `  ${l}`),
    );
  }
  lines.push(...offerWords(offer, options).map((l) => `  ${l}`));
  return lines;
}

const NO_BORDERS = {
  top: "",
  "top-mid": "",
  "top-left": "",
  "top-right": "",
  bottom: "",
  "bottom-mid": "",
  "bottom-left": "",
  "bottom-right": "",
  left: "",
  "left-mid": "",
  mid: "",
  "mid-mid": "",
  right: "",
  "right-mid": "",
  middle: " ",
};

/**
 * The what-if screen: base vs changed, the paired change, the path step that
 * changed. With `maxLines` (the flow's room above its menu), a screen
 * longer than that draws its table without borders, three lines fewer.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import {
 *   applyChanges, compareAnswer, demoCompanyCsv, fitModel, loadTable, openModel, typicalProfile,
 * } from "../../mod.ts";
 * import { renderCompare } from "./answer_view.ts";
 * import { makeStyle } from "./style.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }), { currency: "EUR" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * const base = typicalProfile(model);
 * const changed = applyChanges(model, base, ["level=+1"]).profile;
 * const answer = compareAnswer(openModel(model), base, changed);
 * const options = { style: makeStyle(false), width: 100, money: { currency: "EUR" } };
 * const boxed = renderCompare(answer, options);
 * const [from, to] = [answer.changes[0].from, answer.changes[0].to];
 * assert.equal(boxed[0], `What-if: level ${from} -> ${to}`);
 * assert(boxed.some((l) => l.startsWith("Change: +€")));
 * // Within fewer lines than the boxed table takes, the table loses its borders.
 * const plain = renderCompare(answer, { ...options, maxLines: boxed.length - 1 });
 * assert.equal(plain.length, boxed.length - 3);
 * ```
 */
export function renderCompare(
  answer: CompareAnswer,
  options: AnswerViewOptions & { maxLines?: number },
): string[] {
  // Within maxLines: the table loses its borders first, then the change
  // loses its split by attribute.
  const max = options.maxLines ?? Infinity;
  const boxed = compareLines(answer, options, "box", true);
  if (boxed.length <= max) return boxed;
  const plain = compareLines(answer, options, "none", true);
  return plain.length <= max || answer.parts === null
    ? plain
    : compareLines(answer, options, "none", false);
}

function compareLines(
  answer: CompareAnswer,
  options: AnswerViewOptions,
  borders: "box" | "none",
  withParts: boolean,
): string[] {
  const { style, money } = options;
  // Changes of a salary (base from 100 up) in whole units, like the salaries.
  const whole = Math.abs(answer.base.estimate) >= 100;
  const pay = (x: number) => formatPay(x, money, whole);
  const wrap = (text: string) => wrapAnsi(text, options.width, { hard: true }).split("\n");
  const d = answer.difference;
  const pct = formatPercent(d.coverage).replace(".0", "");
  const lines: string[] = [];
  lines.push(
    ...wrap(
      style.bold("What-if: ") +
        answer.changes.map((c) => `${c.feature} ${c.from ?? "(missing)"} -> ${c.to ?? "(missing)"}`)
          .join(", "),
    ),
  );
  const compared: string[][] = [];
  for (const [name, a] of [["base", answer.base], ["changed", answer.changed]] as const) {
    compared.push([
      name,
      pay(a.estimate),
      a.confidence ? `${pay(a.confidence.low)} - ${pay(a.confidence.high)}` : "-",
      a.range ? `${pay(a.range.low)} - ${pay(a.range.high)}` : "-",
    ]);
  }
  // Narrow terminals: "how sure" goes first, then the range; then a list.
  const table = fitTable({
    width: options.width,
    head: ["", "estimate", `${sureOfWhat(answer.base)}, ${pct} sure`, `one person, ${pct} range`],
    rows: compared,
    drop: [2],
    styleHead: style.bold,
    ascii: style.ascii,
    borders,
  });
  lines.push(...table.lines);
  if (answer.changes.length === 0) {
    lines.push("", ...wrap("No change: the changed profile is the same as the base."));
    return lines;
  }
  const sign = d.estimate >= 0 ? "+" : "-";
  // When most trees see no change at all, the interval is one value and the
  // average may lie outside it: say what the trees say instead.
  const interval = d.low !== null && d.high !== null && d.low === d.high
    ? ` (in ${pct} of the trees the change is ${
      formatSignedPay(d.low, money, whole)
    }; the average comes from the ` +
      `few trees that see one)`
    : d.low !== null && d.high !== null
    ? ` (${pct}: ${formatSignedPay(d.low, money, whole)} to ${
      formatSignedPay(d.high, money, whole)
    }; ` +
      `${formatPercent(d.relative.low!, true)} to ${formatPercent(d.relative.high!, true)})`
    : " (no interval: the model has no ensemble)";
  lines.push(
    "",
    ...wrap(
      `${style.bold("Change:")} ${sign}${pay(Math.abs(d.estimate))} ` +
        `(${formatPercent(d.relative.estimate, true)})${interval}`,
    ),
    ...(d.low !== null && !options.compact
      ? wrap(
        style.dim(
          "How sure the change is: each tree estimates both profiles, so errors the two share " +
            "cancel; the interval is narrower than the two intervals above suggest.",
        ),
      )
      : []),
  );
  if (answer.parts !== null && withParts) {
    lines.push(
      "",
      ...renderChangeParts(answer.parts, {
        style,
        width: options.width,
        money,
        most: options.compact ? 3 : 6,
        brief: options.compact,
      }),
    );
  }
  const p = answer.pathChange;
  lines.push(
    "",
    ...wrap(
      p === null
        ? "Decision path: the same leaf for both; the reference tree sees no difference."
        : `Decision path: condition ${p.step} changes from "${p.base ?? "(the leaf)"}" to ` +
          `"${p.changed ?? "(the leaf)"}".`,
    ),
  );
  const warnings = [
    ...new Set(
      [...answer.warnings, ...answer.base.warnings, ...answer.changed.warnings].map((w) =>
        answerNoteText(w, options.money)
      ),
    ),
  ];
  for (const w of warnings) lines.push(...wrap(style.warn(`! ${w}`)));
  // Under the flow's menu, blank lines cost the screen room.
  return options.compact ? lines.filter((l) => l !== "") : lines;
}

/** How the flow lays a sweep out under its menu. */
export interface SweepLayout {
  /**
   * The table first and the chart last, the chart (from its title to its
   * legend) in this many lines at most, so that it stays in view above a
   * menu; the chart keeps at least 4 rows. @default {the chart first, 11 rows}
   */
  chartLines?: number;
}

/**
 * The sweep screen: a line chart of the estimate and both intervals, then a
 * table (or, with `chartLines`, the table, then a chart of that many lines).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import {
 *   demoCompanyCsv, findFeature, fitModel, loadTable, openModel, sweepAnswer, sweepValues,
 *   typicalProfile,
 * } from "../../mod.ts";
 * import { formatPay } from "./numbers.ts";
 * import { renderSweep } from "./answer_view.ts";
 * import { makeStyle } from "./style.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }), { currency: "EUR" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * const level = findFeature(model, "level", "vary");
 * const answer = sweepAnswer(
 *   openModel(model), typicalProfile(model), level, sweepValues(model, level),
 * );
 * const money = { currency: "EUR" };
 * const lines = renderSweep(answer, { style: makeStyle(false), width: 80, money });
 * assert.equal(lines[0], "Estimate as level varies (the rest held at the profile)");
 * // The table has one row per level, with the estimate the library gives.
 * const top = lines.find((l) => l.includes(" G7 "))!;
 * assert(top.includes(formatPay(answer.points.at(-1)!.estimate, money)));
 * ```
 */
export function renderSweep(
  answer: SweepAnswer,
  options: AnswerViewOptions & SweepLayout,
): string[] {
  const { style, money } = options;
  const pay = (x: number) => formatPay(x, money);
  const points = answer.points;
  const lines: string[] = [];
  const pct = formatPercent(answer.coverage).replace(".0", "");
  lines.push(
    ...wrapAnsi(
      style.bold(`Estimate as ${answer.feature} varies`) +
        style.dim(` (the rest held at the profile)`),
      options.width,
    ).split("\n"),
  );
  const hasIntervals = points.every((p) => p.range !== null);
  const series = [points.map((p) => p.estimate)];
  // The chart carries the estimate and the range; "how sure" is in the
  // table below (five lines would blur together on a monochrome terminal).
  if (hasIntervals) {
    series.push(points.map((p) => p.range!.low), points.map((p) => p.range!.high));
  }
  if (points.some((p) => p.average !== undefined)) series.push(points.map((p) => p.average ?? NaN));
  // asciichart draws one column per point: exactly `width` columns, short
  // grids stretched and long ones sampled, so the chart never wraps.
  const width = Math.max(20, Math.min(60, options.width - 16));
  const stretch = (values: number[]) =>
    Array.from(
      { length: width },
      (_, i) => values[Math.min(values.length - 1, Math.floor((i * values.length) / width))],
    );
  const all = series.flat().filter(Number.isFinite);
  const labelWidth = Math.max(pay(Math.min(...all)).length, pay(Math.max(...all)).length) + 1;
  const legend = wrapAnsi(
    style.dim(
      hasIntervals
        ? `middle line: estimate; outer lines: range for comparable people (${pct})` +
          (points.some((p) => p.average !== undefined) ? "; fourth: averaged over the table" : "")
        : "estimate only (the model has no ensemble)",
    ),
    options.width,
  ).split("\n");
  // asciichart draws height + 1 rows; the title, the x axis's labels and
  // the legend take the rest.
  const height = options.chartLines === undefined
    ? 10
    : Math.max(3, options.chartLines - lines.length - 2 - legend.length);
  const chart = asciichart.plot(series.map(stretch), {
    height,
    ...(chartSymbols(style.ascii) ? { symbols: chartSymbols(style.ascii) } : {}),
    // Every label as wide as the widest, so the axis stays in one column.
    format: (x: number) => pay(x).padStart(labelWidth),
    colors: style.enabled
      ? [
        asciichart.default,
        asciichart.blue,
        asciichart.blue,
        asciichart.green,
        asciichart.green,
        asciichart.magenta,
      ]
      : undefined,
  });
  lines.push(...chart.split("\n"));
  const label = (v: string | number) => typeof v === "number" ? formatNumber(v, money, 2) : v;
  const first = label(points[0].value);
  const last = label(points[points.length - 1].value);
  lines.push(
    `${" ".repeat(12)}${first}${
      " ".repeat(Math.max(1, width - first.length - last.length))
    }${last}`,
  );
  lines.push(...legend);
  const swept: string[][] = points.map((p) => [
    typeof p.value === "number" ? formatNumber(p.value, money, 2) : p.value,
    pay(p.estimate),
    p.confidence ? `${pay(p.confidence.low)} - ${pay(p.confidence.high)}` : "-",
    p.range ? `${pay(p.range.low)} - ${pay(p.range.high)}` : "-",
    ...(p.average !== undefined ? [pay(p.average)] : []),
  ]);
  // Narrow terminals: "how sure" goes first, then the averaged column; then a list.
  const table = fitTable({
    width: options.width,
    head: [
      answer.feature,
      "estimate",
      `how sure (${pct})`,
      `range (${pct})`,
      ...(points[0].average !== undefined ? ["averaged over table"] : []),
    ],
    rows: swept,
    drop: points[0].average !== undefined ? [2, 4] : [2],
    styleHead: style.bold,
    ascii: style.ascii,
  });
  const warnings = answer.warnings.flatMap((w) =>
    wrapAnsi(style.warn(`! ${answerNoteText(w, money)}`), options.width).split("\n")
  );
  return options.chartLines === undefined
    ? [...lines, "", ...table.lines, ...warnings]
    : [...table.lines, ...warnings, "", ...lines];
}

/**
 * A one-line histogram (a sparkline) of values between their lowest and
 * highest: block heights, or ASCII steps under `--ascii`.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { sparkline } from "./answer_view.ts";
 * assert(sparkline([1, 2, 2, 3, 3, 3], 3) === "▃▅█");
 * ```
 */
export function sparkline(values: readonly number[], bins: number, ascii = false): string {
  const steps = ascii ? " .:-=+*#" : " ▁▂▃▄▅▆▇█";
  const low = Math.min(...values);
  const high = Math.max(...values);
  const counts = new Array(bins).fill(0);
  for (const v of values) {
    counts[high > low ? Math.min(bins - 1, Math.floor(((v - low) / (high - low)) * bins)) : 0]++;
  }
  const top = Math.max(...counts);
  return counts.map((c) =>
    steps[c === 0 ? 0 : Math.max(1, Math.round((c / top) * (steps.length - 1)))]
  )
    .join("");
}

/** What {@linkcode renderResult} may leave out to fit a screen. */
export interface ResultFit {
  /**
   * Lines the result may take, from the estimate's line down (the flow's
   * screen less its menu). The profile is then said by what differs from
   * `typical`, and the path shows its first and last conditions; at the
   * least the estimate, one profile line, the intervals and the path's last
   * condition are shown. @default {no limit}
   */
  maxLines?: number;
  /** The typical profile, as described, that a shortened profile is said against. */
  typical?: Record<string, string | number | null>;
}

/**
 * The guided flow's result screen: the same answer as
 * {@linkcode renderEstimate} in about 14 lines, so that it and the next
 * question fit an 80 x 24 terminal.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import {
 *   demoCompanyCsv, estimateProfile, fitModel, loadTable, openModel, typicalProfile,
 * } from "../../mod.ts";
 * import { fitResult, renderResult } from "./answer_view.ts";
 * import { makeStyle } from "./style.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }), { currency: "EUR" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * const answer = estimateProfile(openModel(model), typicalProfile(model));
 * const options = { style: makeStyle(false), width: 80, money: { currency: "EUR" } };
 * const lines = renderResult(answer, options);
 * assert.match(lines[0], /^Estimate of base_pay_eur: €[\d,]+ \(median pay of people like/);
 * assert(lines.some((l) => l.startsWith("  one person, 90% range")));
 * assert.deepEqual(lines, fitResult(answer, options).lines);
 * ```
 */
export function renderResult(answer: EstimateAnswer, options: AnswerViewOptions): string[] {
  return fitResult(answer, options).lines;
}

/**
 * The result screen within `maxLines`, and whether it left anything out
 * (the profile said in part, conditions of the path left out), so that the
 * flow can offer the whole of it.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { fitResult } from "./answer_view.ts";
 * import { makeStyle } from "./style.ts";
 * const step = (condition: string, rows: number, value: number) => ({
 *   condition, rows, value, splits: [],
 * });
 * const answer = {
 *   target: { name: "pay", scale: "log", period: "year" },
 *   estimate: 61000,
 *   profile: { grade: "G4", site: "North", years: 12, department: "Assembly" },
 *   warnings: [],
 *   path: [
 *     step("grade G4", 900, 60000), step("site North", 400, 61000),
 *     step("years above 10", 150, 62000), step("years up to 14", 80, 61500),
 *   ],
 *   support: { rows: 80, peers: null },
 *   trees: [],
 * } as unknown as import("../../mod.ts").EstimateAnswer;
 * const options = { style: makeStyle(false), width: 50, money: { currency: "EUR" } };
 * const whole = fitResult(answer, options);
 * assert.equal(whole.cut, false);
 * assert.equal(whole.lines.length, 9);
 * const typical = { grade: "G4", site: "North", years: 10, department: "Assembly" };
 * const { lines, cut } = fitResult(answer, { ...options, maxLines: 7, typical });
 * assert.equal(cut, true);
 * assert.equal(lines.length, 7);
 * assert.equal(lines[1], "  for the typical person with years 12");
 * assert.match(lines[4], /^ +1 +grade G4 +900 +€60,000$/);
 * assert.match(lines[5], /^ +\.\.\. 2 more conditions$/);
 * assert.match(lines[6], /^ +4 +years up to 14 +80 +€61,500$/);
 * ```
 */
export function fitResult(
  answer: EstimateAnswer,
  options: AnswerViewOptions & ResultFit,
): { lines: string[]; cut: boolean } {
  if (answer.classes) {
    return { lines: renderEstimate(answer, { ...options, compact: true }), cut: false };
  }
  const { style, money } = options;
  const pay = (x: number) => formatPay(x, money);
  const wrap = (text: string, indent = "") =>
    wrapAnsi(text, options.width - indent.length).split("\n").map((l) => indent + l);
  const what = ESTIMATE_WORDS[answer.center?.kind ?? "mean"];
  const period = answer.target.period ? ` ${PERIOD[answer.target.period]}` : "";
  const max = options.maxLines ?? Infinity;
  const head = wrap(
    `${style.bold(`Estimate of ${answer.target.name}:`)} ${style.bold(pay(answer.estimate))}` +
      `${period} (${what})`,
  );
  let profile = wrap(style.dim(`for ${profileText(answer.profile)}`), "  ");
  const warnings = answer.warnings.flatMap((w) =>
    wrap(style.warn(`! ${answerNoteText(w, money)}`))
  );
  const intervals: string[] = [];
  if (answer.confidence && answer.range) {
    const c = answer.confidence;
    const r = answer.range;
    const pct = formatPercent(c.coverage).replace(".0", "");
    const a = `${pay(c.low)} - ${pay(c.high)}`;
    const b = `${pay(r.low)} - ${pay(r.high)}`;
    const width = Math.max(a.length, b.length);
    // The bands take what the labels and figures leave of the width.
    const axis = Math.max(8, Math.min(32, options.width - 27 - width));
    const [sure, range] = intervalChart(
      [
        { label: "", low: c.low, high: c.high, text: "" },
        { label: "", low: r.low, high: r.high, text: "" },
      ],
      answer.estimate,
      axis,
    ).map((l) => l.slice(2).trimEnd());
    const low = pay(Math.min(...answer.trees));
    const high = pay(Math.max(...answer.trees));
    const bins = Math.max(8, Math.min(20, options.width - 27 - low.length - high.length));
    intervals.push(
      // Labels that say what each band is about, in place of a legend
      // (the trees' line last: the first line a short screen leaves out).
      `  ${`${sureOfWhat(answer)}, ${pct} sure`.padEnd(21)}  ${a.padEnd(width)}  ${sure}`,
      `  ${`one person, ${pct} range`.padEnd(21)}  ${b.padEnd(width)}  ${range}`,
      `  ${`the ${answer.trees.length} trees`.padEnd(21)}  ${low} ` +
        `${sparkline(answer.trees, bins, style.ascii)} ${high}`,
    );
  }
  // Each attribute's part as a bar: up to three, fewer when room is short.
  let partsShown = answer.contributions ? 3 : 0;
  const parts = () =>
    partsShown === 0 ? [] : renderContributions(answer.contributions!, {
      style,
      width: options.width,
      money,
      most: partsShown,
      brief: true,
    });
  // The last step shows the leaf's people and pay; the header says how
  // many people share the profile's two most important levels.
  const peers = answer.support.peers;
  let withPeers = peers !== null;
  let withHead = answer.path.length > 0;
  const pathHead = () =>
    wrap(
      style.bold("Decision path of one readable tree") +
        (peers && withPeers
          ? style.dim(
            ` (${formatNumber(peers.rows, money)} people share ${peers.levels[0]} and ${
              peers.levels[1]
            })`,
          )
          : ""),
    );
  // Lines but the path's steps.
  const fixed = () =>
    head.length + profile.length + warnings.length + intervals.length + parts().length +
    pathHead().length + (withHead ? 1 : 0);
  const steps = shownSteps(answer.path);
  // At the least, the path shows a count of the conditions left out and its last.
  const least = Math.min(steps.length, 2);
  let cut = false;
  // Too long, in this order: the profile by what differs from the typical
  // person, on one line; the path's first conditions (below); the people
  // sharing the profile's levels; the path's column headings; the third and
  // second parts; the trees' line; the parts.
  if (fixed() + steps.length > max && profile.length > 1) {
    profile = wrap(style.dim(`for ${shortProfile(answer.profile, options.typical)}`), "  ");
    if (profile.length > 1) profile = [`${profile[0].replace(/,[^,]*$/, "")}, ...`];
    cut = true;
  }
  const shorter = [
    () => (withPeers = false),
    () => (withHead = false),
    () => (partsShown = Math.min(partsShown, 2)),
    () => (partsShown = Math.min(partsShown, 1)),
    () => intervals.length > 0 && intervals.pop(),
    () => (partsShown = 0),
  ];
  for (const drop of shorter) {
    if (fixed() + least <= max) break;
    drop();
    cut = true;
  }
  // The path's first conditions that fit, a count of those left out, and
  // its last (the group the person falls in).
  let shown: { step: PathAnswer | null; i: number }[] = steps;
  const room = max - fixed();
  if (answer.path.length > 2 && steps.length > room) {
    const first = Math.max(0, room - 2);
    shown = [
      ...answer.path.slice(0, first).map((step, i) => ({ step, i })),
      { step: null, i: answer.path.length - first - 1 },
      { step: answer.path[answer.path.length - 1], i: answer.path.length - 1 },
    ];
    cut = true;
  }
  const table = new Table({
    chars: NO_BORDERS,
    ...(withHead
      ? {
        head: ["", "", "people", answer.target.scale === "log" ? "typical pay" : "mean pay"].map(
          style.dim,
        ),
      }
      : {}),
    style: { head: [], border: [], "padding-left": 0, "padding-right": 2 },
    colAligns: ["right", "left", "right", "right"],
  });
  for (const { step, i } of shown) {
    table.push(
      step === null
        ? ["", `... ${formatNumber(i, money)} more condition${i === 1 ? "" : "s"}`, "", ""]
        : [
          `${i + 1}`,
          step.condition,
          formatNumber(step.rows, money),
          step.value === null ? "too few" : pay(step.value),
        ],
    );
  }
  const lines = [...head, ...profile, ...warnings, ...intervals, ...parts(), ...pathHead()];
  if (answer.path.length > 0) {
    lines.push(...table.toString().split("\n").map((l) => `  ${l.trimEnd()}`));
  }
  return { lines, cut };
}

type PathAnswer = EstimateAnswer["path"][number];

// A profile by what differs from the typical one (all of it without one).
function shortProfile(
  profile: Record<string, string | number | null>,
  typical: Record<string, string | number | null> | undefined,
): string {
  if (typical === undefined) return profileText(profile);
  const differs = Object.fromEntries(
    Object.entries(profile).filter(([k, v]) => String(v) !== String(typical[k])),
  );
  return Object.keys(differs).length === 0
    ? "the typical person"
    : `the typical person with ${profileText(differs)}`;
}

/**
 * Steps of a decision path drawn in full; a longer path shows its ends.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { PATH_STEPS_SHOWN, shownSteps } from "./answer_view.ts";
 * const path = Array.from({ length: PATH_STEPS_SHOWN + 1 }, (_, k) => k);
 * assert.equal(shownSteps(path.slice(0, PATH_STEPS_SHOWN)).length, 30); // all drawn
 * assert.deepEqual(shownSteps(path)[15], { step: null, i: 1 }); // one step left out
 * ```
 */
export const PATH_STEPS_SHOWN = 30;

/**
 * The steps of a path to draw: all of them up to {@linkcode PATH_STEPS_SHOWN},
 * else the first and last halves with one marker between (`step: null`,
 * `i` the number of steps left out), so that a tree of any depth draws in
 * time proportional to the screen, not to the tree.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { shownSteps } from "./answer_view.ts";
 * const path = Array.from({ length: 100 }, (_, k) => k);
 * const shown = shownSteps(path);
 * assert.equal(shown.length, 31);
 * assert.deepEqual(shown[15], { step: null, i: 70 });
 * assert.deepEqual(shown[16], { step: 85, i: 85 });
 * assert.equal(shownSteps([1, 2]).length, 2);
 * ```
 */
export function shownSteps<T>(path: readonly T[]): { step: T | null; i: number }[] {
  if (path.length <= PATH_STEPS_SHOWN) return path.map((step, i) => ({ step, i }));
  const half = PATH_STEPS_SHOWN / 2;
  return [
    ...path.slice(0, half).map((step, i) => ({ step, i })),
    { step: null, i: path.length - 2 * half },
    ...path.slice(path.length - half).map((step, k) => ({ step, i: path.length - half + k })),
  ];
}
