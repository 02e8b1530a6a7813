/**
 * One profile's estimate as an HTML report: the estimate with both
 * intervals on one axis, the offer where one was checked, each attribute's
 * part, the reference tree's path as a step list, and the trees' estimates
 * as a histogram; each chart with a table of the same figures.
 *
 * @module
 */

import type { EstimateAnswer } from "../../../mod.ts";
import { sureOfWhat } from "../answer_view.ts";
import { histogramCounts } from "../charts.ts";
import {
  formatLevel,
  formatNumber,
  formatPay,
  formatPercent,
  type NumberStyle,
} from "../numbers.ts";
import { barsChart, histogramChart, intervalsChart } from "./charts.ts";
import { figureTable, type HtmlCell, type HtmlSection, paragraph } from "./page.ts";

/** An estimate's figures in words for the page (from `wordedNotes`). */
export interface EstimateWords {
  /** The warnings, as sentences. */
  warnings: string[];
  /** Where the profile started from ("the typical person", "row E12 of pay.csv"). */
  start: string;
}

/**
 * The sections of an estimate's report (a compare or the guided flow's
 * report reuses them for each profile).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, estimateProfile, fitModel, loadTable, openModel, typicalProfile } from "../../../mod.ts";
 * import { estimateSections } from "./estimate_html.ts";
 * const model = await fitModel(loadTable(demoCompanyCsv({ rows: 200, seed: 1 })), {
 *   target: "base_pay_eur", trees: 10, folds: 3, workers: 1,
 * });
 * const answer = estimateProfile(openModel(model), typicalProfile(model));
 * const sections = estimateSections(answer, { warnings: [], start: "the typical person" }, {});
 * assert.equal(sections[0].title, "The estimate");
 * assert(sections[0].body.includes(`data-value="${answer.estimate}"`));
 * ```
 */
export function estimateSections(
  answer: EstimateAnswer,
  words: EstimateWords,
  money: NumberStyle,
): HtmlSection[] {
  const pay = (v: number) => formatPay(v, money);
  const whole = (share: number) => formatLevel(share, money);
  const sections: HtmlSection[] = [];
  const profile = figureTable(
    `The profile (started from ${words.start})`,
    ["attribute", "value"],
    Object.entries(answer.profile).map(([name, value]) => [
      { text: name },
      typeof value === "number"
        ? { text: formatNumber(value, money), value }
        : { text: value ?? "missing" },
    ]),
  );
  const warnings = words.warnings.map((w) => paragraph(`Note: ${w}.`, "warning"));
  if (answer.classes !== undefined) {
    const shares = Object.entries(answer.classes.shares);
    sections.push({
      title: "The estimate",
      body: [
        paragraph(`Likeliest: ${answer.classes.predicted}.`),
        ...warnings,
        barsChart({
          items: shares.map(([label, value]) => ({ label, value })),
          axis: "share of the trees' votes",
          format: (v) => formatPercent(v, false, money),
          caption: "Each class's share for this profile. The table below has the same figures.",
        }).html,
        figureTable(
          "Each class's share",
          ["class", "share"],
          shares.map(([label, value]) => [
            { text: label },
            { text: formatPercent(value, false, money), value },
          ]),
        ),
        profile,
      ].join("\n"),
    });
    return sections;
  }
  const rows: HtmlCell[][] = [[{ text: "estimate" }, {
    text: pay(answer.estimate),
    value: answer.estimate,
  }, {
    text: "",
  }, { text: "" }]];
  const intervalRows = [];
  const sure = sureOfWhat(answer);
  if (answer.confidence !== null) {
    const c = answer.confidence;
    const label = `${sure}, ${whole(c.coverage)} sure`;
    intervalRows.push({ label, low: c.low, high: c.high, mid: answer.estimate });
    rows.push([{ text: label }, { text: "" }, { text: pay(c.low), value: c.low }, {
      text: pay(c.high),
      value: c.high,
    }]);
  }
  if (answer.range !== null) {
    const r = answer.range;
    const label = `one person, ${whole(r.coverage)} range`;
    intervalRows.push({ label, low: r.low, high: r.high, mid: answer.estimate });
    rows.push([{ text: label }, { text: "" }, { text: pay(r.low), value: r.low }, {
      text: pay(r.high),
      value: r.high,
    }]);
  }
  sections.push({
    title: "The estimate",
    body: [
      paragraph(`Estimate (${sure} of people like this): ${pay(answer.estimate)}.`),
      ...warnings,
      intervalRows.length === 0 ? "" : intervalsChart({
        rows: intervalRows,
        axis: "pay",
        format: pay,
        caption: `The estimate (the black tick) with how sure it is (where the ${sure} of such a ` +
          `profile lies) and the range one such person's pay falls in. The table below has the ` +
          `same figures.`,
      }).html,
      figureTable("The estimate and its intervals", ["", "estimate", "low", "high"], rows),
      ...(answer.confidence === null ? [] : [paragraph(
        `How sure: ${answer.confidence.method}. Range: ${answer.range?.method ?? ""}.`,
        "note",
      )]),
      profile,
    ].join("\n"),
  });
  if (answer.offer !== undefined) {
    const o = answer.offer;
    const where = o.position === null
      ? ""
      : ` It is ${{ under: "under", within: "inside", over: "above" }[o.position]} the range.`;
    sections.push({
      title: "The offer",
      body: [
        paragraph(`Offer ${pay(o.amount)} (given as ${o.text}).${where}`),
        figureTable("Where the offer sits", ["measure", "value"], [
          [{ text: "offer / estimate" }, {
            text: formatNumber(o.offerToEstimate, money, 3),
            value: o.offerToEstimate,
          }],
          ...(o.rangePosition === null
            ? []
            : [[{ text: "range position (0 low end, 1 high end)" }, {
              text: formatNumber(o.rangePosition, money, 3),
              value: o.rangePosition,
            }]]),
          ...(o.shareBelow === null ? [] : [[{ text: "comparable people paid less" }, {
            text: formatPercent(o.shareBelow, false, money),
            value: o.shareBelow,
          }]]),
          [{ text: "offer that reaches the estimate" }, {
            text: pay(o.reach.estimate.offer),
            value: o.reach.estimate.offer,
          }],
        ]),
      ].join("\n"),
    });
  }
  const parts = answer.contributions?.parts ?? [];
  if (answer.contributions != null && parts.length > 0) {
    const c = answer.contributions;
    sections.push({
      title: "Why this estimate",
      body: [
        paragraph(
          `Each attribute's part, starting from ${pay(c.base)} (the geometric mean of the ` +
            `estimates over the table)${
              c.scale === "log" ? "; the parts add up on log pay, so in money they multiply" : ""
            }.`,
        ),
        barsChart({
          items: parts.map((p) => ({
            label: `${p.feature} ${p.value ?? ""}`.trim(),
            value: p.percent ?? p.money,
          })),
          axis: c.scale === "log" ? "part of the estimate (%)" : "part of the estimate",
          format: c.scale === "log" ? (v) => formatPercent(v, true, money) : pay,
          caption: "Each attribute's part of the estimate; bars left of zero lower it. The " +
            "table below has the same figures.",
        }).html,
        figureTable(
          "Each attribute's part",
          ["attribute", "value", "part", "in money"],
          parts.map((p) => [
            { text: p.feature },
            { text: String(p.value ?? "missing") },
            p.percent !== null
              ? { text: formatPercent(p.percent, true, money), value: p.percent }
              : { text: pay(p.part), value: p.part },
            { text: pay(p.money), value: p.money },
          ]),
        ),
      ].join("\n"),
    });
  }
  sections.push({
    title: "Decision path of the reference tree",
    body: [
      figureTable(
        "Each condition the profile meets, the people who meet it and so far, and their estimate",
        ["step", "condition", "people", "estimate"],
        answer.path.map((step, i) => [
          { text: String(i + 1) },
          { text: step.condition },
          { text: formatNumber(step.rows, money, 0), value: step.rows },
          step.value === null ? { text: "" } : { text: pay(step.value), value: step.value },
        ]),
      ),
      paragraph(
        `This one tree, shown because it can be read, ends in a group of ${answer.leaf.rows} ` +
          `people; the estimate averages ${answer.trees.length} such trees.`,
        "note",
      ),
    ].join("\n"),
  });
  if (answer.trees.length > 1) {
    const bins = 20;
    const { low, high, counts } = histogramCounts(answer.trees, bins);
    const step = (high - low) / bins;
    const binned = counts.map((count, k) => ({
      low: low + k * step,
      high: k === bins - 1 ? high : low + (k + 1) * step,
      count,
    }));
    sections.push({
      title: "The trees' estimates",
      body: [
        histogramChart({
          bins: binned,
          axis: "one tree's estimate",
          format: pay,
          caption: `How many of the ${answer.trees.length} trees gave each estimate: the wider ` +
            `the spread, the less sure the estimate. The table below has the same counts.`,
        }).html,
        figureTable(
          "Trees per span of estimates",
          ["from", "to", "trees"],
          binned.filter((b) => b.count > 0).map((b) => [
            { text: pay(b.low), value: b.low },
            { text: pay(b.high), value: b.high },
            { text: String(b.count), value: b.count },
          ]),
        ),
      ].join("\n"),
    });
  }
  return sections;
}
