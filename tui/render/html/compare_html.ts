/**
 * A what-if as an HTML report: the base and the changed profile's
 * estimates with their intervals on one axis, the change with its paired
 * interval around zero, the change attribute by attribute, and where the
 * decision path changes; each chart with a table of the same figures.
 *
 * @module
 */

import type { CompareAnswer } from "../../../mod.ts";
import { sureOfWhat } from "../answer_view.ts";
import {
  formatLevel,
  formatPay,
  formatPercent,
  formatSignedPay,
  type NumberStyle,
} from "../numbers.ts";
import { barsChart, type IntervalRow, intervalsChart } from "./charts.ts";
import { figureTable, type HtmlCell, type HtmlSection, paragraph } from "./page.ts";

/**
 * The sections of a what-if's report.
 *
 * @param warnings The change's notes and both profiles', in words.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { applyChanges, compareAnswer, demoCompanyCsv, fitModel, loadTable, openModel, typicalProfile } from "../../../mod.ts";
 * import { compareSections } from "./compare_html.ts";
 * const model = await fitModel(loadTable(demoCompanyCsv({ rows: 300, seed: 1 })), {
 *   target: "base_pay_eur", trees: 10, folds: 3, workers: 1,
 * });
 * const base = typicalProfile(model);
 * const answer = compareAnswer(openModel(model), base, applyChanges(model, base, ["level=+1"]).profile);
 * const sections = compareSections(answer, [], {});
 * assert.equal(sections[0].title, "The change");
 * assert(sections[0].body.includes(`data-value="${answer.difference.estimate}"`));
 * ```
 */
export function compareSections(
  answer: CompareAnswer,
  warnings: string[],
  money: NumberStyle,
): HtmlSection[] {
  const pay = (v: number) => formatPay(v, money);
  const signedPay = (v: number) => formatSignedPay(v, money);
  const percent = (share: number) => formatLevel(share, money);
  const what = answer.changes.map((c) =>
    `${c.feature} ${c.from ?? "missing"} to ${c.to ?? "missing"}`
  )
    .join(", ");
  const d = answer.difference;
  const rows: IntervalRow[] = [];
  const table: HtmlCell[][] = [];
  for (const [name, a] of [["base", answer.base], ["changed", answer.changed]] as const) {
    table.push([{ text: `${name}: estimate` }, { text: pay(a.estimate), value: a.estimate }, {
      text: "",
    }, { text: "" }]);
    if (a.confidence !== null) {
      const label = `${name}, ${sureOfWhat(a)} ${percent(a.confidence.coverage)} sure`;
      rows.push({ label, low: a.confidence.low, high: a.confidence.high, mid: a.estimate });
      table.push([{ text: label }, { text: "" }, {
        text: pay(a.confidence.low),
        value: a.confidence.low,
      }, { text: pay(a.confidence.high), value: a.confidence.high }]);
    }
    if (a.range !== null) {
      const label = `${name}, one person, ${percent(a.range.coverage)} range`;
      rows.push({ label, low: a.range.low, high: a.range.high, mid: a.estimate });
      table.push([{ text: label }, { text: "" }, { text: pay(a.range.low), value: a.range.low }, {
        text: pay(a.range.high),
        value: a.range.high,
      }]);
    }
  }
  table.push([
    { text: `change, ${percent(d.coverage)} sure` },
    { text: signedPay(d.estimate), value: d.estimate },
    d.low === null ? { text: "" } : { text: signedPay(d.low), value: d.low },
    d.high === null ? { text: "" } : { text: signedPay(d.high), value: d.high },
  ]);
  table.push([
    { text: "change as a share of the base" },
    { text: formatPercent(d.relative.estimate, true, money), value: d.relative.estimate },
    d.relative.low === null
      ? { text: "" }
      : { text: formatPercent(d.relative.low, true, money), value: d.relative.low },
    d.relative.high === null
      ? { text: "" }
      : { text: formatPercent(d.relative.high, true, money), value: d.relative.high },
  ]);
  const sections: HtmlSection[] = [{
    title: "The change",
    body: [
      paragraph(
        `What-if: ${what}. Change: ${signedPay(d.estimate)} ` +
          `(${formatPercent(d.relative.estimate, true, money)})` +
          (d.low === null || d.high === null
            ? "."
            : `, ${percent(d.coverage)} sure from ${signedPay(d.low)} to ${signedPay(d.high)}.`),
      ),
      ...warnings.map((w) => paragraph(`Note: ${w}.`, "warning")),
      rows.length === 0 ? "" : intervalsChart({
        rows,
        axis: "pay",
        format: pay,
        caption: "The base and the changed profile: each estimate (the black tick) with how sure " +
          "it is and the range one such person's pay falls in. The table below has the same figures.",
      }).html,
      d.low === null || d.high === null ? "" : intervalsChart({
        rows: [{ label: "change", low: d.low, high: d.high, mid: d.estimate }],
        axis: "change in pay",
        format: signedPay,
        zero: true,
        caption: "The change with its interval from each tree's paired estimates (errors the two " +
          "profiles share cancel, so it is narrower than the intervals above suggest); the " +
          "dashed line is no change.",
      }).html,
      figureTable(
        "The base, the changed profile and the change",
        ["", "estimate", "low", "high"],
        table,
      ),
      paragraph(`How sure the change is: ${d.method}.`, "note"),
    ].join("\n"),
  }];
  const parts = answer.parts?.parts ?? [];
  if (answer.parts !== null && parts.length > 0) {
    sections.push({
      title: "The change, attribute by attribute",
      body: [
        barsChart({
          items: parts.map((p) => ({
            label: `${p.feature} ${
              p.from === p.value ? `${p.value ?? ""} (same)` : `${p.from} to ${p.value}`
            }`,
            value: p.percent ?? p.money,
          })),
          axis: answer.parts.scale === "log" ? "part of the change (%)" : "part of the change",
          format: answer.parts.scale === "log" ? (v) => formatPercent(v, true, money) : pay,
          caption: "Each attribute's part of the change; an attribute left as it was can have a " +
            "part too, since the trees use attributes together. The table below has the same figures.",
        }).html,
        figureTable(
          "Each attribute's part of the change",
          ["attribute", "from", "to", "part", "in money"],
          parts.map((p) => [
            { text: p.feature },
            { text: String(p.from ?? "missing") },
            { text: String(p.value ?? "missing") },
            p.percent !== null
              ? { text: formatPercent(p.percent, true, money), value: p.percent }
              : { text: pay(p.part), value: p.part },
            { text: signedPay(p.money), value: p.money },
          ]),
        ),
      ].join("\n"),
    });
  }
  sections.push({
    title: "Decision path",
    body: paragraph(
      answer.pathChange === null
        ? "The reference tree's decision path is the same for both profiles."
        : `The reference tree's path changes at condition ${answer.pathChange.step}: from ` +
          `"${answer.pathChange.base ?? "none"}" to "${answer.pathChange.changed ?? "none"}".`,
    ),
  });
  return sections;
}
