/**
 * Saving the model and the session report (Markdown and JSON) from the
 * flow, never over a file without asking.
 *
 * @module
 */

import { existsSync } from "node:fs";
import {
  type CompareAnswer,
  GAP_CAUTIONS,
  type GapReport,
  type ImplausiblePay,
  type Model,
  writeFileAtomic,
  writeModelFile,
} from "../../mod.ts";
import { jsonText, terminalText } from "../render/safe_text.ts";
import { gapJson } from "../render/report_notes.ts";
import { gapMarkdown } from "../render/gap_view.ts";
import { moneyStyle } from "../render/model_view.ts";
import { ANSWER_CAUTIONS, provenanceLine } from "../render/cautions.ts";
import { htmlPage, isHtmlPath, paragraph } from "../render/html/page.ts";
import type { FlowIO } from "./flow_io.ts";
import { reportJson, reportMarkdown, type Scenario } from "./report.ts";
import { leftOutJson, leftOutSentence } from "../data_check.ts";
import type { SessionOptions } from "./guided_flow.ts";

/**
 * Asks where to save the model and the report, and writes them (never over a file unasked).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import {
 *   demoCompanyCsv, estimateProfile, fitModel, loadTable, openModel, readModelFile, typicalProfile,
 * } from "../../mod.ts";
 * import { makeStyle } from "../render/style.ts";
 * import type { FlowIO } from "./flow_io.ts";
 * import { save } from "./save_step.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }));
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * const answer = estimateProfile(openModel(model), typicalProfile(model));
 * const dir = Deno.makeTempDirSync();
 * const io: FlowIO = {
 *   say: () => {}, style: makeStyle(false), width: 80, ascii: false,
 *   choose: () => Promise.resolve(false as never), // never asked: nothing is there yet
 *   tick: () => Promise.resolve([]),
 *   ask: (message) =>
 *     Promise.resolve(message === "Save the model as:" ? `${dir}/m.json` : `${dir}/r.md`),
 * };
 * const options = { demoPath: "", gap: null, leftOut: null, written: new Set<string>() };
 * await save(io, model, [{ name: "current", answer }], [], options);
 * assert.equal((await readModelFile(`${dir}/m.json`)).rows.used, 120);
 * assert.equal(JSON.parse(Deno.readTextFileSync(`${dir}/r.json`)).scenarios[0].name, "current");
 * assert.deepEqual([...options.written], [`${dir}/r.md`]);
 * Deno.removeSync(dir, { recursive: true });
 * ```
 */
export async function save(
  io: FlowIO,
  model: Model,
  scenarios: Scenario[],
  whatIfs: CompareAnswer[],
  options: SessionOptions,
) {
  const path = await io.ask("Save the model as:", { default: "paygrove-model.json" });
  let force = false;
  if (existsSync(path)) {
    force = await io.choose(`${path} exists. Replace it?`, [
      { name: "No, keep it", value: false },
      { name: "Yes, replace it", value: true },
    ]);
    if (!force) return;
  }
  const { bytes } = await writeModelFile(path, model, force, "save");
  io.say(
    io.style.dim(`Saved the model to ${terminalText(path)} (${(bytes / 1e6).toFixed(1)} MB).`),
  );
  if (options.report !== undefined) {
    await writeReport(
      io,
      model,
      scenarios,
      whatIfs,
      options.report,
      options.gap,
      options.leftOut,
      (options.force ?? false) || options.written.has(options.report),
    );
    options.written.add(options.report);
    return;
  }
  const report = await io.ask(
    "Save a report of the scenarios as (.html or .md):",
    {
      default: "paygrove-report.html",
      validate: (text) =>
        isReportPath(text.trim())
          ? true
          : "A report's name ends in .html or .md (the .json goes beside it)",
    },
  );
  // Neither the report nor the .json beside it replaces a file unasked.
  const taken = [report.trim(), reportJsonPath(report.trim())].filter((p) => existsSync(p));
  let replace = false;
  if (taken.length > 0) {
    replace = await io.choose(`${taken.map(terminalText).join(" and ")} exist. Replace?`, [
      { name: "No, keep them", value: false },
      { name: "Yes, replace them", value: true },
    ]);
    if (!replace) return;
  }
  await writeReport(
    io,
    model,
    scenarios,
    whatIfs,
    report.trim(),
    options.gap,
    options.leftOut,
    replace,
  );
  options.written.add(report.trim());
}

/**
 * The .json written beside a Markdown report.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { reportJsonPath } from "./save_step.ts";
 * assert.equal(reportJsonPath("out/session.md"), "out/session.json");
 * assert.equal(reportJsonPath("out/session.html"), "out/session.json");
 * ```
 */
export function reportJsonPath(path: string): string {
  return path.replace(/\.(?:md|html?)$/i, "") + ".json";
}

/**
 * Whether a session report's name says its format: .html (or .htm) for a
 * page to open in any browser, .md for Markdown.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { isReportPath } from "./save_step.ts";
 * assert(isReportPath("r.html") && isReportPath("r.md") && !isReportPath("r.txt"));
 * ```
 */
export function isReportPath(path: string): boolean {
  return /\.md$/.test(path) || isHtmlPath(path);
}

/**
 * Writes the session report (Markdown, and JSON beside it) and says where.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import {
 *   demoCompanyCsv, estimateProfile, fitModel, loadTable, openModel, typicalProfile,
 * } from "../../mod.ts";
 * import { makeStyle } from "../render/style.ts";
 * import type { FlowIO } from "./flow_io.ts";
 * import { reportMarkdown } from "./report.ts";
 * import { writeReport } from "./save_step.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }));
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * const answer = estimateProfile(openModel(model), typicalProfile(model));
 * const scenarios = [{ name: "current", answer }];
 * const said: string[] = [];
 * const io = { say: (text: string) => void said.push(text), style: makeStyle(false) } as FlowIO;
 * const dir = Deno.makeTempDirSync();
 * await writeReport(io, model, scenarios, [], `${dir}/r.md`, null, null, false);
 * assert.equal(Deno.readTextFileSync(`${dir}/r.md`), reportMarkdown(model, scenarios));
 * assert.deepEqual(JSON.parse(Deno.readTextFileSync(`${dir}/r.json`)).leftOutImplausible, []);
 * assert.deepEqual(said, [`Wrote the report to ${dir}/r.md and ${dir}/r.json.`]);
 * Deno.removeSync(dir, { recursive: true });
 * ```
 */
export async function writeReport(
  io: FlowIO,
  model: Model,
  scenarios: Scenario[],
  whatIfs: CompareAnswer[],
  path: string,
  gap: GapReport | null,
  leftOut: ImplausiblePay | null,
  force: boolean,
) {
  const jsonPath = reportJsonPath(path);
  // The gap check, when one was run in the session, follows the scenarios.
  // Rows left out for implausible pay are said right after the scenarios.
  const money = moneyStyle(model, {});
  const markdown = isHtmlPath(path)
    ? htmlPage({
      title: "What-if session",
      question: "What would our pay structure pay the people of these scenarios, and what do " +
        "the changes asked about do to it?",
      created: new Date().toISOString(),
      provenance: [provenanceLine(model.provenance)],
      cautions: [ANSWER_CAUTIONS, ...(gap ? [GAP_CAUTIONS] : [])],
      sections: [
        // Loaded for a report only: the chart library adds 0.14 s to every start-up.
        ...(await import("../render/html/session_html.ts")).sessionSections(
          scenarios,
          whatIfs,
          gap,
          money,
        ),
        ...(leftOut
          ? [{ title: "Data", body: paragraph(leftOutSentence(leftOut, ", as you chose")) }]
          : []),
      ],
    })
    : reportMarkdown(model, scenarios, whatIfs) +
      (leftOut ? `${leftOutSentence(leftOut, ", as you chose")}\n` : "") +
      (gap ? "\n" + gapMarkdown(gap, money, new Date().toISOString()) : "");
  const json = {
    ...reportJson(model, scenarios, whatIfs),
    leftOutImplausible: leftOutJson(leftOut ? [leftOut] : []),
    ...(gap ? { gap: gapJson(gap) } : {}),
  };
  await writeFileAtomic(path, markdown, { force, option: "report" });
  await writeFileAtomic(jsonPath, jsonText(json), { force, option: "report" });
  io.say(
    io.style.dim(`Wrote the report to ${terminalText(path)} and ${terminalText(jsonPath)}.`),
  );
}
