/**
 * The report of a guided session: the scenarios kept and the what-ifs
 * asked, as Markdown for people and JSON for scripts, with the cautions and
 * the provenance.
 *
 * @module
 */

import type { AttributePart, CompareAnswer, EstimateAnswer, Model } from "../../mod.ts";
import { formatPay, formatPercent, type NumberStyle } from "../render/numbers.ts";
import { forMarkdown } from "../render/safe_text.ts";
import { wordedNotes } from "../render/answer_notes.ts";
import { moneyStyle } from "../render/model_view.ts";

/** A profile kept by name, with what the model said about it. */
export interface Scenario {
  /** The name given. */
  name: string;
  /** The answer for the profile. */
  answer: EstimateAnswer;
}

const CAUTION = "These figures describe what the current pay structure does, not what anyone " +
  "should be paid, nor a fair or legal wage. Protected attributes are kept out of estimates " +
  "unless the model allowed them. Defer to local law, counsel and licensed practice.";

/**
 * The report as Markdown; every text from the data (names, levels, the
 * scenario names typed, the file name) is written through
 * {@linkcode forMarkdown}, shown as typed and never as markup.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import {
 *   demoCompanyCsv, estimateProfile, fitModel, loadTable, openModel, typicalProfile,
 * } from "../../mod.ts";
 * import { formatPay } from "../render/numbers.ts";
 * import { reportMarkdown } from "./report.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }), { currency: "EUR" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * const answer = estimateProfile(openModel(model), typicalProfile(model));
 * const lines = reportMarkdown(model, [{ name: "<b>offer</b>", answer }]).split("\n");
 * assert.equal(lines[0], "# paygrove report: base_pay_eur");
 * // The typed name is shown as typed, never as HTML.
 * const row = lines.find((l) => l.startsWith("| &lt;b&gt;offer&lt;/b&gt; |"))!;
 * assert(row.includes(`| ${formatPay(answer.estimate, { currency: "EUR" })} |`));
 * ```
 */
export function reportMarkdown(
  model: Model,
  kept: Scenario[],
  asked: CompareAnswer[] = [],
): string {
  const { target, p, scenarios, whatIfs } = forMarkdown({
    target: model.target.name,
    p: model.provenance,
    scenarios: kept,
    whatIfs: asked,
  });
  const money = { currency: model.target.money?.currency };
  const pay = (x: number | undefined) => (x === undefined ? "-" : formatPay(x, money));
  const lines = [
    `# paygrove report: ${target}`,
    "",
    `> ${CAUTION}`,
    "",
    "| scenario | estimate | how sure (90%) | range for comparable people (90%) | largest parts | profile |",
    "| --- | ---: | ---: | ---: | --- | --- |",
    ...scenarios.map((s) => {
      const a = s.answer;
      const sure = a.confidence ? `${pay(a.confidence.low)} - ${pay(a.confidence.high)}` : "-";
      const range = a.range ? `${pay(a.range.low)} - ${pay(a.range.high)}` : "-";
      const profile = Object.entries(a.profile).map(([k, v]) => `${k} ${v ?? "missing"}`).join(
        ", ",
      );
      const parts = a.contributions ? largestParts(a.contributions.parts, money) : "-";
      return `| ${s.name} | ${pay(a.estimate)} | ${sure} | ${range} | ${parts} | ${profile} |`;
    }),
  ];
  if (whatIfs.length > 0) {
    lines.push(
      "",
      "| what-if | base | changed | change | how sure the change is (90%) | largest parts of the change |",
      "| --- | ---: | ---: | ---: | ---: | --- |",
      ...whatIfs.map((w) => {
        const d = w.difference;
        const change = `${d.estimate >= 0 ? "+" : ""}${pay(d.estimate)} (${
          formatPercent(d.relative.estimate, true)
        })`;
        const sure = d.low === null || d.high === null ? "-" : `${pay(d.low)} to ${pay(d.high)}`;
        const what = w.changes.map((c) => `${c.feature} ${c.from} -> ${c.to}`).join(", ");
        const parts = w.parts ? largestParts(w.parts.parts, money) : "-";
        return `| ${what} | ${pay(w.base.estimate)} | ${
          pay(w.changed.estimate)
        } | ${change} | ${sure} | ${parts} |`;
      }),
    );
  }
  if (scenarios.some((s) => s.answer.contributions) || whatIfs.some((w) => w.parts)) {
    lines.push(
      "",
      "Parts: each attribute's exact Shapley part, averaged over the trees; on log pay they are " +
        "percentages that multiply, so the money amounts do not add up exactly.",
    );
  }
  lines.push(
    "",
    `Model: ${model.ensemble?.trees.length ?? 0} trees on ${p.table.file} (sha256 ` +
      `${p.table.sha256}), fitted ${p.created} by paygrove ${p.paygrove} (model format ` +
      `${p.format}), seed ${p.seed}.`,
    "",
  );
  return lines.join("\n");
}

// The three largest parts, in a table cell: "level G5 +56.4%; site North -0.9%".
function largestParts(parts: readonly AttributePart[], money: NumberStyle): string {
  const shown = parts.filter((p) => p.part !== 0).slice(0, 3).map((p) => {
    const value = p.from !== undefined && !Object.is(p.from, p.value)
      ? `${p.from ?? "missing"} -> ${p.value ?? "missing"}`
      : `${p.value ?? "missing"}`;
    const size = p.percent !== null
      ? formatPercent(p.percent, true)
      : `${p.money >= 0 ? "+" : "-"}${formatPay(Math.abs(p.money), money, true)}`;
    return `${p.feature} ${value} ${size}`;
  });
  return shown.length === 0 ? "-" : shown.join("; ");
}

/**
 * The report as a JSON document.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import {
 *   applyChanges, compareAnswer, demoCompanyCsv, estimateProfile, fitModel, loadTable, openModel,
 *   typicalProfile,
 * } from "../../mod.ts";
 * import { reportJson } from "./report.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }));
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * const session = openModel(model);
 * const typical = typicalProfile(model);
 * const answer = estimateProfile(session, typical);
 * const promotion = applyChanges(model, typical, ["level=+1"]).profile;
 * const promoted = compareAnswer(session, typical, promotion);
 * const doc = reportJson(model, [{ name: "typical", answer }], [promoted]) as {
 *   scenarios: { name: string; estimate: number }[];
 *   whatIfs: { base: number; changed: number }[];
 * };
 * assert.deepEqual(doc.scenarios.map((s) => [s.name, s.estimate]), [["typical", answer.estimate]]);
 * assert.deepEqual(doc.whatIfs, [{
 *   changes: promoted.changes, base: promoted.base.estimate, changed: promoted.changed.estimate,
 *   difference: promoted.difference, parts: promoted.parts,
 * }]);
 * ```
 */
export function reportJson(
  model: Model,
  scenarios: Scenario[],
  whatIfs: CompareAnswer[] = [],
): Record<string, unknown> {
  return {
    target: model.target,
    caution: CAUTION,
    scenarios: scenarios.map((s) => ({
      name: s.name,
      ...wordedNotes(s.answer, moneyStyle(model, {})),
    })),
    whatIfs: whatIfs.map((w) => ({
      changes: w.changes,
      base: w.base.estimate,
      changed: w.changed.estimate,
      difference: w.difference,
      parts: w.parts,
    })),
    provenance: model.provenance,
  };
}
