/**
 * `paygrove schema TABLE`: prints the inferred schema of a pay table.
 *
 * @module
 */

import { Command, type CommandUnknownOpts } from "@commander-js/extra-typings";
import { describeSchema, loadTableFile } from "../../mod.ts";
import { forTerminal, jsonText, terminalText } from "../render/safe_text.ts";
import { renderSchema } from "../render/schema_view.ts";
import type { Terminal } from "../terminal.ts";
import { loadOptions, withTableFlags } from "../table_flags.ts";
import { withWordedNotes } from "../data_check.ts";
import { wordedSchema } from "../option_words.ts";

/**
 * Builds the `schema` command.
 *
 * @param terminal Where output goes.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { recordingTerminal } from "../terminal.ts";
 * import { schemaCommand } from "./schema.ts";
 * const path = `${Deno.makeTempDirSync()}/pay.csv`;
 * Deno.writeTextFileSync(path, "level,site,pay\nL1,North,50000\nL2,South,61000\nL1,South,52000\n");
 * const terminal = recordingTerminal();
 * await schemaCommand(terminal).parseAsync([path, "--json"], { from: "user" });
 * const schema = JSON.parse(terminal.stdout.join(""));
 * assert.deepEqual(
 *   schema.columns.map((c: { name: string; type: string }) => [c.name, c.type]),
 *   [["level", "ordinal"], ["site", "categorical"], ["pay", "numeric"]],
 * );
 * Deno.removeSync(path);
 * ```
 */
export function schemaCommand(terminal: Terminal): CommandUnknownOpts {
  return withTableFlags(
    new Command("schema")
      .description(
        "Read a pay table (CSV) and show each column's type, missing values, levels or range, " +
          "and protected flag, with data-quality warnings",
      )
      .argument("<table>", "CSV file to read"),
  )
    .option("--json", "print one JSON document on stdout instead of text")
    .action(async (file, flags) => {
      const table = await loadTableFile(file, loadOptions(flags, file));
      const summary = wordedSchema(describeSchema(table));
      if (flags.json) {
        terminal.out(jsonText({ file, ...summary }));
        return;
      }
      const lines = renderSchema(forTerminal(withWordedNotes(summary)), {
        file: terminalText(file),
        style: terminal.style,
        width: terminal.width,
        numbers: { locale: flags.locale, currency: flags.currency },
      });
      terminal.out(lines.join("\n"));
    });
}
