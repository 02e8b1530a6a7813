/**
 * The `paygrove` command: argument parsing, exit statuses, and turning
 * errors into one clear message.
 *
 * Exit statuses: 0 success; 1 the data cannot be used; 2 bad usage (an
 * unknown option, a bad option value, a column that does not exist);
 * 3 `batch` scored some rows and refused others (listed on stderr);
 * 70 an internal error (a bug in paygrove); 128 + the signal's number when
 * stopped by SIGINT (130), SIGTERM (143) or SIGHUP (129).
 *
 * @module
 */

// The root program has no options of its own to type, so it uses commander's
// plain types; subcommands use extra-typings for typed option values.
import { bandsCommand } from "./commands/bands.ts";
import { errorDocument, errorWords } from "./option_words.ts";
import { Command, CommanderError } from "commander";
import { DataError, OptionError, UnknownNameError, VERSION } from "../mod.ts";
import { unknownNameText } from "./column_names.ts";
import { schemaCommand } from "./commands/schema.ts";
import { fitCommand } from "./commands/fit.ts";
import { estimateCommand } from "./commands/estimate.ts";
import { compareCommand } from "./commands/compare.ts";
import { sweepCommand } from "./commands/sweep.ts";
import { batchCommand, SomeRowsRefused } from "./commands/batch.ts";
import { inspectCommand } from "./commands/inspect.ts";
import { processTerminal, type Terminal } from "./terminal.ts";
import { demoDataCommand } from "./commands/demo_data.ts";
import { gapCommand } from "./commands/gap.ts";
import { reviewCommand } from "./commands/review.ts";
import { exploreCommand } from "./commands/explore.ts";
import { clipLongRuns, jsonText, terminalGuard } from "./render/safe_text.ts";
import { KeyInterrupt, listenForStop } from "./stop_signals.ts";
import wrapAnsi from "wrap-ansi";

/**
 * Exit statuses of the `paygrove` command.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { recordingTerminal } from "./terminal.ts";
 * import { EXIT, run } from "./main.ts";
 * const terminal = recordingTerminal();
 * assert.equal(await run(["schema", "--no-such-option"], terminal), EXIT.usage);
 * const missing = `${Deno.makeTempDirSync()}/none.csv`;
 * assert.equal(await run(["schema", missing], terminal), EXIT.data);
 * assert.equal(await run(["--version"], terminal), EXIT.ok);
 * ```
 */
export const EXIT = { ok: 0, data: 1, usage: 2, rowsRefused: 3, internal: 70 } as const;

/**
 * Builds the program with all its subcommands.
 *
 * @param terminal Where output goes.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { recordingTerminal } from "./terminal.ts";
 * import { buildProgram } from "./main.ts";
 * const program = buildProgram(recordingTerminal());
 * assert.deepEqual(program.commands.map((c) => c.name()), [
 *   "schema", "fit", "estimate", "compare", "explore", "sweep", "batch", "inspect", "gap", "review",
 *   "bands", "demo-data",
 * ]);
 * ```
 */
export function buildProgram(terminal: Terminal): Command {
  const program = new Command("paygrove")
    .description(
      "Pay what-if analysis from your own pay table, on the command line. " +
        "Pay data never leaves this machine.\n\nWith no command, paygrove asks its questions " +
        "one at a time (the guided flow; options --ascii, --report FILE, --locale TAG, " +
        "--trees N).",
    )
    .version(VERSION, "-V, --version", "print paygrove's version");
  configure(program, terminal);
  for (
    const make of [
      schemaCommand,
      fitCommand,
      estimateCommand,
      compareCommand,
      exploreCommand,
      sweepCommand,
      batchCommand,
      inspectCommand,
      gapCommand,
      reviewCommand,
      bandsCommand,
      demoDataCommand,
    ]
  ) {
    const command = make(terminal) as unknown as Command;
    configure(command, terminal);
    program.addCommand(command);
  }
  return program;
}

// Settings every command needs; subcommands added with addCommand do not
// inherit them from the program.
function configure(command: Command, terminal: Terminal): void {
  command
    .helpOption("-h, --help", "show help")
    .showHelpAfterError("(add --help for usage)")
    .configureOutput({
      writeOut: (text) => terminal.out(text.replace(/\n$/, "")),
      writeErr: (text) => terminal.err(text.replace(/\n$/, "")),
      // Our own decision, so that commander does not probe a dozen
      // environment variables (each a Deno permission prompt on a terminal).
      getOutHasColors: () => terminal.style.enabled,
      getErrHasColors: () => terminal.errStyle.enabled,
    })
    .exitOverride();
}

/**
 * Runs paygrove with the given arguments and returns the exit status.
 * Never throws: every error becomes a message on standard error.
 *
 * @param args Arguments after the program name.
 * @param terminal Where output goes.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { VERSION } from "../mod.ts";
 * import { recordingTerminal } from "./terminal.ts";
 * import { run } from "./main.ts";
 * const terminal = recordingTerminal();
 * assert.equal(await run(["--version"], terminal), 0);
 * assert.equal(terminal.stdout.join(""), `${VERSION}\n`);
 * // An error is a message on standard error, never a throw.
 * const missing = `${Deno.makeTempDirSync()}/none.csv`;
 * assert.equal(await run(["schema", missing], terminal), 1);
 * assert.match(terminal.stderr.join(""), /^paygrove: .*none\.csv/);
 * ```
 */
export async function run(args: string[], terminal: Terminal): Promise<number> {
  const program = buildProgram(terminal);
  // No subcommand: the guided flow (its own few options only).
  const first = args[0];
  if (first === undefined || (first.startsWith("--") && !["--help", "--version"].includes(first))) {
    try {
      // The guided flow and its prompts load only when it starts (0.07 s of
      // every command's start-up otherwise).
      const { startFlow } = await import("./flow/start_flow.ts");
      return await startFlow(args, terminal);
    } catch (error) {
      return report(error, terminal);
    }
  }
  // Ctrl-C, SIGTERM or SIGHUP during long work: said in one line, nothing
  // half-written left (outputs are written whole at the end, and a write in
  // progress is undone).
  const stopListening = listenForStop((name) =>
    terminal.err(`paygrove: stopped (${name}); no output file was written`)
  );
  try {
    await program.parseAsync(args, { from: "user" });
    return EXIT.ok;
  } catch (error) {
    return report(error, terminal, args.includes("--json"));
  } finally {
    await stopListening();
  }
}

function report(error: unknown, terminal: Terminal, asJson = false): number {
  const style = terminal.errStyle;
  // The command has written its output and said which rows it refused.
  if (error instanceof SomeRowsRefused) return EXIT.rowsRefused;
  // Ctrl-C on the explore screen: the screen is restored, and the status is a SIGINT's.
  if (error instanceof KeyInterrupt) return error.status;
  if (error instanceof CommanderError) {
    // Commander has already printed its message (and help where asked).
    return error.exitCode === 0 ? EXIT.ok : EXIT.usage;
  }
  // Messages quote names from the data: shown with their control
  // characters visible (line breaks between listed items stay) and
  // overlong names cut to their ends.
  if (error instanceof OptionError) {
    // A name that matched nothing: worded here from what the lookup found.
    const message = error instanceof UnknownNameError ? unknownNameText(error) : errorWords(error);
    terminal.err(
      errorLines(
        `${style.bold("paygrove:")} ${terminalGuard(clipLongRuns(message), false)}`,
        terminal,
      ),
    );
    // With --json, the error as data too, on stdout where the answer would be.
    if (asJson) terminal.out(jsonText(errorDocument(error, message)));
    return EXIT.usage;
  }
  if (error instanceof DataError) {
    terminal.err(
      errorLines(
        `${style.bold("paygrove:")} ${terminalGuard(clipLongRuns(errorWords(error)), false)}`,
        terminal,
      ),
    );
    if (asJson) terminal.out(jsonText(errorDocument(error, errorWords(error))));
    return EXIT.data;
  }
  terminal.err(
    `${style.bold("paygrove: internal error")} (a bug in paygrove; please report it ` +
      `with the command you ran)\n${error instanceof Error ? error.stack : String(error)}`,
  );
  return EXIT.internal;
}

// A message for a person at a terminal, wrapped at spaces to its width (a
// long path or figure stays whole); for a pipe or a file, as it is, one
// line per item for scripts to read.
function errorLines(text: string, terminal: Terminal): string {
  return terminal.errIsTerminal === true ? wrapAnsi(text, terminal.width) : text;
}

if (import.meta.main) {
  // Leave by Deno.exit (every output is written by then, synchronously, and
  // the unload handlers run), not by letting the runtime wind down: after a
  // fit on this thread, winding down ended in a segmentation fault in 3 of
  // 60 runs of bench/fit_phases.ts on the demo table (1 in 60 before this
  // thread fitted small tables), and Deno.exit at the end in none of 100.
  // Crashes while the runtime shuts down are a known kind of Deno fault
  // (denoland/deno issue 12653).
  run(Deno.args, processTerminal()).then((code) => Deno.exit(code));
}
