/**
 * Reading a model file for a command: the model, joined to the analyst's
 * file when one is named, with what reading found said on standard error
 * (a format-1 file rebuilds pay; an analyst's file is private).
 *
 * @module
 */

import { type Model, readAnalystFile, readModelFile } from "../mod.ts";
import type { Terminal } from "./terminal.ts";

/** The option that names an analyst's file, and its help. */
export const ANALYST_FILE_OPTION = [
  "--analyst-file <file>",
  "the analyst's file written by fit --analyst-file: training rows then get their " +
  "out-of-bag estimate (it can rebuild everyone's pay: never share it)",
] as const;

/** What a format-1 file is, said whenever one is read. */
export const REBUILDS_PAY_WARNING = "Warning: this model file was written by paygrove 0.1 " +
  "(format 1). It keeps each tree's resampling seed and the training rows' keys: with a staff " +
  "list they rebuild every person's pay. Do not share it; fit the model again with this " +
  "version and delete the old file.";

/**
 * Reads `path` (and `analystPath` when given) and says what the files need
 * their reader to know.
 *
 * @example
 * ```ts ignore
 * import { openModelFile } from "./open_model.ts";
 * const model = await openModelFile(terminal, "model.json");
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
