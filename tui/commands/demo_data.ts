/**
 * `paygrove demo-data`: writes the invented demo company's pay table.
 *
 * @module
 */

import { Command, type CommandUnknownOpts } from "@commander-js/extra-typings";
import { DEMO_COMPANY, demoCompanyCsv, writeFileAtomic } from "../../mod.ts";
import type { Terminal } from "../terminal.ts";
import { MAX_DEMO_ROWS, seedOption, wholeNumber } from "../option_values.ts";

/**
 * Builds the `demo-data` command.
 *
 * @param terminal Where output goes.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv } from "../../mod.ts";
 * import { recordingTerminal } from "../terminal.ts";
 * import { demoDataCommand } from "./demo_data.ts";
 * const terminal = recordingTerminal();
 * await demoDataCommand(terminal).parseAsync(["--rows", "5", "--seed", "7"], { from: "user" });
 * assert.equal(terminal.stdout.join(""), demoCompanyCsv({ rows: 5, seed: 7 }));
 * ```
 */
export function demoDataCommand(terminal: Terminal): CommandUnknownOpts {
  return new Command("demo-data")
    .description(`Write the pay table of ${DEMO_COMPANY}, an invented company, as CSV`)
    .option("--rows <n>", "people in the table", wholeNumber(1, MAX_DEMO_ROWS), 2000)
    .option("--seed <s>", "seed of the generator", seedOption, 2026)
    .option("--out <file>", "write here instead of standard output")
    .option("--force", "replace an existing --out file")
    .action(async (flags) => {
      const text = demoCompanyCsv({ rows: flags.rows, seed: flags.seed });
      if (flags.out === undefined) {
        terminal.out(text.replace(/\n$/, ""));
        return;
      }
      await writeFileAtomic(flags.out, text, { force: flags.force ?? false });
      terminal.err(
        `paygrove demo-data: ${flags.rows} invented people (${DEMO_COMPANY}) -> ${flags.out}`,
      );
    });
}
