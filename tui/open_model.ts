/**
 * Reading a model file for a command: the model, joined to the analyst's
 * file when one is named, with what reading found said on standard error
 * (a format-1 file rebuilds pay; an analyst's file is private).
 *
 * @module
 */

import { type Model, readAnalystFile, readModelFile } from "../mod.ts";
import type { Terminal } from "./terminal.ts";

/**
 * The option that names an analyst's file, and its help.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { Command } from "@commander-js/extra-typings";
 * import { ANALYST_FILE_OPTION } from "./open_model.ts";
 * const command = new Command("estimate").option(...ANALYST_FILE_OPTION);
 * command.parse(["--analyst-file", "m.analyst"], { from: "user" });
 * assert.equal(command.opts().analystFile, "m.analyst");
 * ```
 */
export const ANALYST_FILE_OPTION = [
  "--analyst-file <file>",
  "the analyst's file written by fit --analyst-file: training rows then get their " +
  "out-of-bag estimate (it can rebuild everyone's pay: never share it)",
] as const;

/**
 * What a format-1 file is, said whenever one is read.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { recordingTerminal } from "./terminal.ts";
 * import { openModelFile, REBUILDS_PAY_WARNING } from "./open_model.ts";
 * // A model file of format 1, committed for the tests (fixtures/README.md).
 * const legacy = new URL("../fixtures/legacy/format1_demo300.json", import.meta.url).pathname;
 * const terminal = recordingTerminal();
 * await openModelFile(terminal, legacy);
 * assert.deepEqual(terminal.stderr, [`${REBUILDS_PAY_WARNING}\n`]);
 * ```
 */
export const REBUILDS_PAY_WARNING = "Warning: this model file was written by paygrove 0.1 " +
  "(format 1). It keeps each tree's resampling seed and the training rows' keys: with a staff " +
  "list they rebuild every person's pay. Do not share it; fit the model again with this " +
  "version and delete the old file.";

/**
 * Reads `path` (and `analystPath` when given) and says what the files need
 * their reader to know.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable, writeModelFile } from "../mod.ts";
 * import { recordingTerminal } from "./terminal.ts";
 * import { openModelFile } from "./open_model.ts";
 * const fitted = await fitModel(loadTable(demoCompanyCsv({ rows: 120, seed: 1 })), {
 *   target: "base_pay_eur", trees: 3, folds: 3, workers: 1,
 * });
 * const path = `${Deno.makeTempDirSync()}/m.json`;
 * const { sha256 } = await writeModelFile(path, fitted);
 * const terminal = recordingTerminal();
 * const model = await openModelFile(terminal, path);
 * assert.equal(model.provenance.modelFile!.sha256, sha256);
 * assert.deepEqual(model.features.map((f) => f.name), fitted.features.map((f) => f.name));
 * assert.deepEqual(terminal.stderr, []); // a file of this version needs no warning
 * Deno.removeSync(path);
 * ```
 */
export async function openModelFile(
  terminal: Terminal,
  path: string,
  analystPath?: string,
): Promise<Model> {
  let model = await readModelFile(path);
  for (const note of model.fileNotes ?? []) {
    if (note.kind === "rebuildsPay") terminal.err(terminal.errStyle.caution(REBUILDS_PAY_WARNING));
  }
  if (analystPath !== undefined) model = await readAnalystFile(analystPath, model);
  return model;
}
