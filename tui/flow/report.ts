/**
 * The report of a guided session: the scenarios kept, as Markdown for
 * people and JSON for scripts, with the cautions and the provenance.
 *
 * @module
 */

import type { EstimateAnswer, Model } from "../../mod.ts";
import { formatPay } from "../render/numbers.ts";

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
 * The report as Markdown.
 *
 * @example
 * ```ts ignore
 * const text = reportMarkdown(model, [{ name: "offer", answer }]);
 * ```
 */
export function reportMarkdown(model: Model, scenarios: Scenario[]): string {
  const money = { currency: model.target.money?.currency };
  const pay = (x: number | undefined) => (x === undefined ? "-" : formatPay(x, money));
  const p = model.provenance;
  const lines = [
    `# paygrove report: ${model.target.name}`,
    "",
    `> ${CAUTION}`,
    "",
    "| scenario | estimate | how sure (90%) | range for comparable people (90%) | profile |",
    "| --- | ---: | ---: | ---: | --- |",
    ...scenarios.map((s) => {
      const a = s.answer;
      const sure = a.confidence ? `${pay(a.confidence.low)} - ${pay(a.confidence.high)}` : "-";
      const range = a.range ? `${pay(a.range.low)} - ${pay(a.range.high)}` : "-";
      const profile = Object.entries(a.profile).map(([k, v]) => `${k} ${v ?? "missing"}`).join(
        ", ",
      );
      return `| ${s.name} | ${pay(a.estimate)} | ${sure} | ${range} | ${profile} |`;
    }),
    "",
    `Model: ${model.ensemble?.trees.length ?? 0} trees on ${p.table.file} (sha256 ` +
    `${p.table.sha256}), fitted ${p.created} by paygrove ${p.paygrove} (model format ` +
    `${p.format}), seed ${p.seed}.`,
    "",
  ];
  return lines.join("\n");
}

/** The report as a JSON document. */
export function reportJson(model: Model, scenarios: Scenario[]): Record<string, unknown> {
  return {
    target: model.target,
    caution: CAUTION,
    scenarios: scenarios.map((s) => ({ name: s.name, ...s.answer })),
    provenance: model.provenance,
  };
}
