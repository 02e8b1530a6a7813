/**
 * The guided flow's session as an HTML report: the scenarios kept, side by
 * side on one axis and then each in full, every what-if asked, and the gap
 * check when one was run.
 *
 * @module
 */

import type { CompareAnswer, EstimateAnswer, GapReport } from "../../../mod.ts";
import { answerNoteText } from "../answer_notes.ts";
import { sureOfWhat } from "../answer_view.ts";
import { formatLevel, formatPay, type NumberStyle } from "../numbers.ts";
import { gapNoteText } from "../report_notes.ts";
import { intervalsChart } from "./charts.ts";
import { compareSections } from "./compare_html.ts";
import { estimateSections } from "./estimate_html.ts";
import { gapSections } from "./gap_html.ts";
import { figureTable, type HtmlCell, type HtmlSection } from "./page.ts";

/**
 * The sections of a session's report.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, estimateProfile, fitModel, loadTable, openModel, typicalProfile } from "../../../mod.ts";
 * import { sessionSections } from "./session_html.ts";
 * const model = await fitModel(loadTable(demoCompanyCsv({ rows: 200, seed: 1 })), {
 *   target: "base_pay_eur", trees: 10, folds: 3, workers: 1,
 * });
 * const answer = estimateProfile(openModel(model), typicalProfile(model));
 * const sections = sessionSections([{ name: "<b>offer</b>", answer }], [], null, {});
 * assert.equal(sections[0].title, "The scenarios side by side");
 * assert(sections[0].body.includes("&lt;b&gt;offer&lt;/b&gt;"));
 * ```
 */
export function sessionSections(
  scenarios: { name: string; answer: EstimateAnswer }[],
  whatIfs: CompareAnswer[],
  gap: GapReport | null,
  money: NumberStyle,
): HtmlSection[] {
  const pay = (v: number) => formatPay(v, money);
  const sections: HtmlSection[] = [];
  if (scenarios.length > 0) {
    const rows: HtmlCell[][] = scenarios.map(({ name, answer: a }) => [
      { text: name },
      { text: pay(a.estimate), value: a.estimate },
      ...(a.confidence === null
        ? [{ text: "" }, { text: "" }]
        : [{ text: pay(a.confidence.low), value: a.confidence.low }, {
          text: pay(a.confidence.high),
          value: a.confidence.high,
        }]),
      ...(a.range === null
        ? [{ text: "" }, { text: "" }]
        : [{ text: pay(a.range.low), value: a.range.low }, {
          text: pay(a.range.high),
          value: a.range.high,
        }]),
    ]);
    const drawn = scenarios.filter((s) => s.answer.range !== null);
    const coverage = scenarios[0].answer.range?.coverage ?? 0.9;
    const percent = formatLevel(coverage, money);
    sections.push({
      title: "The scenarios side by side",
      body: [
        drawn.length === 0 ? "" : intervalsChart({
          rows: drawn.map((s) => ({
            label: s.name,
            low: s.answer.range!.low,
            high: s.answer.range!.high,
            mid: s.answer.estimate,
          })),
          axis: "pay",
          format: pay,
          caption: `Each scenario's estimate (the black tick) and the ${percent} range one such ` +
            `person's pay falls in, on one axis. The table below has the same figures, with how ` +
            `sure each estimate is.`,
        }).html,
        figureTable(
          "The scenarios",
          [
            "scenario",
            "estimate",
            `${sureOfWhat(scenarios[0].answer)}, low`,
            "high",
            `one person, low`,
            "high",
          ],
          rows,
        ),
      ].join("\n"),
    });
    for (const { name, answer } of scenarios) {
      const words = {
        warnings: answer.warnings.map((n) => answerNoteText(n, money)),
        start: `the scenario "${name}"`,
      };
      for (const section of estimateSections(answer, words, money)) {
        sections.push({ ...section, title: `${name} — ${section.title}` });
      }
    }
  }
  for (const whatIf of whatIfs) {
    const words = [...whatIf.warnings, ...whatIf.base.warnings, ...whatIf.changed.warnings].map((
      n,
    ) => answerNoteText(n, money));
    const what = whatIf.changes.map((c) =>
      `${c.feature} ${c.from ?? "missing"} to ${c.to ?? "missing"}`
    )
      .join(", ");
    for (const section of compareSections(whatIf, words, money)) {
      sections.push({ ...section, title: `What-if (${what}) — ${section.title}` });
    }
  }
  if (gap !== null) {
    for (const section of gapSections(gap, gap.notes.map(gapNoteText), money)) {
      sections.push({ ...section, title: `Gap check — ${section.title}` });
    }
  }
  return sections;
}
