/**
 * `paygrove` with no subcommand: the guided flow on the process's own
 * terminal, or a pointer to the subcommands where there is no terminal.
 *
 * @module
 */

import { Command } from "@commander-js/extra-typings";
import process from "node:process";
import { assertCanWrite, OptionError } from "../../mod.ts";
import type { Terminal } from "../terminal.ts";
import { localeTag, readOverrides, withReadFlags } from "../table_flags.ts";
import { MAX_TREES, wholeNumber } from "../option_values.ts";
import { streamFlowIO } from "./flow_io.ts";
import { guidedFlow } from "./guided_flow.ts";
import { isReportPath, reportJsonPath } from "./save_step.ts";
import { KeyInterrupt, listenForStop } from "../stop_signals.ts";

/**
 * The committed demo table, relative to this module.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv } from "../../mod.ts";
 * import { DEMO_TABLE } from "./start_flow.ts";
 * // The committed demo table is the generator's default output (fixtures/README.md).
 * assert.equal(Deno.readTextFileSync(DEMO_TABLE), demoCompanyCsv());
 * ```
 */
export const DEMO_TABLE = new URL("../../fixtures/demo_company.csv", import.meta.url).pathname;

/**
 * Runs the guided flow; returns the exit status: 0 when the person quits
 * (the menu's Quit, or Esc at a question), 130 when they stop it with
 * Ctrl-C (as every command does, and as a shell reports a process ended by
 * SIGINT), 2 without a terminal to talk to.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { recordingTerminal } from "../terminal.ts";
 * import { startFlow } from "./start_flow.ts";
 * const terminal = recordingTerminal();
 * // A report that could not be written is said before any question.
 * await assert.rejects(startFlow(["--report", "session.txt"], terminal), /should end in \.html .* or \.md/);
 * // Without a terminal to ask on, it points to the subcommands (not run on a terminal,
 * // where it would start asking).
 * if (!Deno.stdin.isTerminal()) {
 *   assert.equal(await startFlow([], terminal), 2);
 *   assert.match(terminal.stderr.join(""), /the guided flow needs a terminal/);
 * }
 * ```
 */
export async function startFlow(args: string[], terminal: Terminal): Promise<number> {
  // The reading options apply to a CSV of one's own.
  const options = withReadFlags(new Command("paygrove"))
    .option("--ascii", "plain ASCII only: no box drawing or arrows")
    .option(
      "--report <file>",
      "write the session's scenarios to FILE (.html for any browser, .md for Markdown) and a " +
        ".json beside it",
    )
    .option("--locale <tag>", "locale for numbers and money, e.g. de-DE", localeTag)
    .option("--force", "replace an existing --report file and its .json")
    .option("--trees <n>", "trees in the ensemble", wholeNumber(10, MAX_TREES))
    .exitOverride()
    .configureOutput({
      writeOut: (text) => terminal.out(text.replace(/\n$/, "")),
      writeErr: (text) => terminal.err(text.replace(/\n$/, "")),
      getOutHasColors: () => terminal.style.enabled,
      getErrHasColors: () => terminal.errStyle.enabled,
    })
    .parse(args, { from: "user" })
    .opts();
  // A report that could not be written is said now, not after the session.
  if (options.report !== undefined) {
    if (!isReportPath(options.report)) {
      throw new OptionError(
        `--report: ${options.report} should end in .html (a page for any browser) or .md ` +
          `(Markdown); its .json goes beside it`,
      );
    }
    for (const path of [options.report, reportJsonPath(options.report)]) {
      await assertCanWrite(path, options.force ?? false, "--report", [DEMO_TABLE]);
    }
  }
  if (!Deno.stdin.isTerminal()) {
    terminal.err(
      "paygrove: the guided flow needs a terminal to ask its questions, and standard input is " +
        "not one. In scripts use the subcommands: paygrove fit, estimate, compare, sweep, batch, " +
        "inspect (paygrove --help, or deno task paygrove --help, lists them).",
    );
    return 2;
  }
  const io = streamFlowIO(
    { input: process.stdin, output: process.stdout },
    {
      style: terminal.style,
      width: terminal.width,
      rows: terminal.rows,
      ascii: options.ascii ?? false,
      progress: terminal.progress,
    },
  );
  // Ctrl-C while fitting (no question is being asked, so the terminal is
  // in its normal mode and sends a signal), SIGTERM or SIGHUP: a write in
  // progress is undone; said as at a question.
  const stopListening = listenForStop(() => io.say("\nStopped. Nothing more was written."));
  try {
    await guidedFlow(io, {
      demoPath: DEMO_TABLE,
      report: options.report,
      force: options.force ?? false,
      locale: options.locale,
      trees: options.trees,
      read: readOverrides(options),
    });
  } catch (error) {
    // Ctrl-C or Esc at a prompt, or Ctrl-C on the explore screen: each
    // restores the terminal; say so and stop. Ctrl-C (ExitPromptError,
    // KeyInterrupt) is an interruption, Esc a way to leave.
    const name = (error as Error).name;
    if (
      name === "ExitPromptError" || name === "AbortPromptError" || error instanceof KeyInterrupt
    ) {
      io.say("\nStopped. Nothing more was written.");
      return name === "AbortPromptError" ? 0 : 130;
    }
    throw error;
  } finally {
    await stopListening();
  }
  return 0;
}
