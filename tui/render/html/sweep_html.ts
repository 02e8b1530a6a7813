/**
 * A sweep as an HTML report: the estimate as one attribute walks its
 * values, as a line with its two bands, and the table of the same figures.
 *
 * @module
 */

import type { SweepAnswer } from "../../../mod.ts";
import { formatLevel, formatNumber, formatPay, type NumberStyle } from "../numbers.ts";
import { sweepChart } from "./charts.ts";
import { figureTable, type HtmlCell, type HtmlSection, paragraph } from "./page.ts";

/**
 * The sections of a sweep's report.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import {
 *   demoCompanyCsv, findFeature, fitModel, loadTable, openModel, sweepAnswer, sweepValues, typicalProfile,
 * } from "../../../mod.ts";
 * import { sweepSections } from "./sweep_html.ts";
 * const model = await fitModel(loadTable(demoCompanyCsv({ rows: 300, seed: 1 })), {
 *   target: "base_pay_eur", trees: 10, folds: 3, workers: 1,
 * });
 * const level = findFeature(model, "level", "--vary");
 * const answer = sweepAnswer(openModel(model), typicalProfile(model), level, sweepValues(model, level, {}), 0.9, null, []);
 * const sections = sweepSections(answer, [], {});
 * assert(sections[0].body.includes(`data-value="${answer.points[0].estimate}"`));
 * ```
 */
export function sweepSections(
  answer: SweepAnswer,
  warnings: string[],
  money: NumberStyle,
): HtmlSection[] {
  const pay = (v: number) => formatPay(v, money);
  const percent = formatLevel(answer.coverage, money);
  const levels = answer.points.some((p) => typeof p.value === "string");
  const drawn = answer.points.filter((p) => p.confidence !== null && p.range !== null);
  const chart = drawn.length < 2 ? "" : sweepChart({
    points: drawn.map((p) => ({
      x: levels ? answer.points.indexOf(p) : Number(p.value),
      estimate: p.estimate,
      sureLow: p.confidence!.low,
      sureHigh: p.confidence!.high,
      rangeLow: p.range!.low,
      rangeHigh: p.range!.high,
    })),
    axis: answer.feature,
    format: pay,
    caption: `The estimate (the line) as ${answer.feature} varies, the rest of the profile held; ` +
      `the darker band is how sure each estimate is (${percent}), the light band the range one ` +
      `such person's pay falls in (${percent}). The table below has the same figures.`,
    ...(levels ? { labels: answer.points.map((p) => String(p.value)) } : {}),
  }).html;
  const cell = (v: number | undefined): HtmlCell =>
    v === undefined ? { text: "" } : { text: pay(v), value: v };
  const withAverage = answer.points.some((p) => p.average !== undefined);
  return [{
    title: `Estimate as ${answer.feature} varies`,
    body: [
      ...warnings.map((w) => paragraph(`Note: ${w}.`, "warning")),
      chart,
      figureTable(
        `The estimate at each ${answer.feature}` +
          (withAverage ? ", with the table's average" : ""),
        [
          answer.feature,
          "estimate",
          `how sure, low`,
          "high",
          `range, low`,
          "high",
          ...(withAverage ? ["average over the table"] : []),
          "unusual",
        ],
        answer.points.map((p) => [
          typeof p.value === "number"
            ? { text: formatNumber(p.value, money), value: p.value }
            : { text: p.value },
          cell(p.estimate),
          cell(p.confidence?.low),
          cell(p.confidence?.high),
          cell(p.range?.low),
          cell(p.range?.high),
          ...(withAverage ? [cell(p.average)] : []),
          { text: p.unusual ? "few comparable people" : "" },
        ]),
      ),
      paragraph(
        "The rest of the profile: " +
          Object.entries(answer.profile).filter(([name]) => name !== answer.feature)
            .map(([name, value]) => `${name} ${value ?? "missing"}`).join(", ") +
          ".",
        "note",
      ),
    ].join("\n"),
  }];
}
