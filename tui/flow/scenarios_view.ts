/**
 * The scenarios kept, side by side (a list when too wide).
 *
 * @module
 */

import { sureOfWhat } from "../render/answer_view.ts";
import { formatPay, type NumberStyle } from "../render/numbers.ts";
import { fitTable } from "../render/fit_table.ts";
import type { FlowIO } from "./flow_io.ts";
import type { Scenario } from "./report.ts";

/**
 * The scenarios kept, side by side: the attributes that differ, then the
 * figures (the last four scenarios; a list when the table is too wide).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import {
 *   applySets, demoCompanyCsv, estimateProfile, fitModel, loadTable, openModel, typicalProfile,
 * } from "../../mod.ts";
 * import { formatPay } from "../render/numbers.ts";
 * import { makeStyle } from "../render/style.ts";
 * import type { FlowIO } from "./flow_io.ts";
 * import { renderScenarios } from "./scenarios_view.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }), { currency: "EUR" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * const session = openModel(model);
 * const typical = typicalProfile(model);
 * const senior = applySets(model, typical, ["level=G6"]).profile;
 * const scenarios = [
 *   { name: "typical", answer: estimateProfile(session, typical) },
 *   { name: "senior", answer: estimateProfile(session, senior) },
 * ];
 * const io = { style: makeStyle(false, true), width: 80 } as FlowIO;
 * const money = { currency: "EUR" };
 * const lines = renderScenarios(scenarios, money, io);
 * // Only the attribute that differs is listed, then the figures.
 * const level = lines.find((l) => l.includes(" level "))!;
 * assert.match(level, /G6/);
 * assert(!lines.some((l) => l.includes(" site ")));
 * const estimate = lines.find((l) => l.includes(" estimate "))!;
 * assert(estimate.includes(formatPay(scenarios[1].answer.estimate, money)));
 * ```
 */
export function renderScenarios(scenarios: Scenario[], money: NumberStyle, io: FlowIO): string[] {
  if (scenarios.length === 0) {
    return [io.style.dim('No scenario kept yet: choose "Keep this profile".')];
  }
  const pay = (x: number) => formatPay(x, money);
  // Side by side: one column per scenario (the last four at most),
  // the attributes that differ first, then the figures.
  const shown = scenarios.slice(-4);
  const names = Object.keys(shown[0].answer.profile);
  const differs = names.filter((n) =>
    shown.some((s) => String(s.answer.profile[n]) !== String(shown[0].answer.profile[n]))
  );
  const rows: string[][] = differs.map((n) => [
    n,
    ...shown.map((s) => String(s.answer.profile[n] ?? "missing")),
  ]);
  rows.push(["estimate", ...shown.map((s) => pay(s.answer.estimate))]);
  rows.push([
    `${sureOfWhat(shown[0].answer)}, 90% sure`,
    ...shown.map((s) =>
      s.answer.confidence ? `${pay(s.answer.confidence.low)}-${pay(s.answer.confidence.high)}` : "-"
    ),
  ]);
  rows.push([
    "one person, 90% range",
    ...shown.map((s) =>
      s.answer.range ? `${pay(s.answer.range.low)}-${pay(s.answer.range.high)}` : "-"
    ),
  ]);
  // Too wide for the screen: one block per row, no figure wrapped.
  const table = fitTable({
    width: io.width,
    head: ["", ...shown.map((s) => s.name)],
    rows,
    styleHead: io.style.bold,
    ascii: io.style.ascii,
  });
  const lines = [io.style.bold(`Scenarios${scenarios.length > 4 ? " (the last four)" : ""}`)];
  lines.push(...table.lines);
  if (differs.length === 0) lines.push(io.style.dim("The scenarios have the same attributes."));
  return lines;
}
