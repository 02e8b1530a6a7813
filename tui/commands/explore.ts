/**
 * `paygrove explore MODEL [--set ...] [--table T --row ID]`: a profile on
 * the left, the answer on the right, and every arrow key a new what-if,
 * redrawn at once (tui/explore/explore_loop.ts). Needs a terminal; in
 * scripts, `compare --json` gives the same figures.
 *
 * @module
 */

import process from "node:process";
import { Command, type CommandUnknownOpts } from "@commander-js/extra-typings";
import { compareAnswer, estimateProfile, openModel, OptionError } from "../../mod.ts";
import { openModelFile } from "../open_model.ts";
import { profileFromFlags, withProfileFlags } from "../profile_flags.ts";
import { moneyStyle } from "../render/model_view.ts";
import { formatPay, formatPercent } from "../render/numbers.ts";
import { terminalText } from "../render/safe_text.ts";
import type { Terminal } from "../terminal.ts";
import { exploreSession } from "../explore/explore_loop.ts";
import { KeyInterrupt } from "../stop_signals.ts";

/**
 * Builds the `explore` command.
 *
 * @param terminal Where output goes.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { recordingTerminal } from "../terminal.ts";
 * import { exploreCommand } from "./explore.ts";
 * const command = exploreCommand(recordingTerminal());
 * assert.equal(command.name(), "explore");
 * // In a script (no terminal) it refuses, naming what to use instead.
 * await assert.rejects(command.parseAsync(["m.json", "--json"], { from: "user" }), /compare --json/);
 * ```
 */
export function exploreCommand(terminal: Terminal): CommandUnknownOpts {
  return withProfileFlags(
    new Command("explore")
      .description(
        "Move an attribute with the arrow keys and see the estimate, its intervals and the " +
          "change from the start redrawn at once (needs a terminal)",
      )
      .argument("<model>", "model file written by paygrove fit"),
  ).action(async (file, flags) => {
    if (flags.json === true || !Deno.stdin.isTerminal() || !Deno.stdout.isTerminal()) {
      throw new OptionError(
        "explore needs a terminal for its keys; in scripts, paygrove compare --json gives " +
          "the same figures for a start and its changes",
      );
    }
    const model = await openModelFile(terminal, file, flags.analystFile);
    const session = openModel(model);
    const { profile, start } = await profileFromFlags(model, flags, terminal);
    const money = moneyStyle(model, { locale: flags.locale });
    const size = () => Deno.consoleSize();
    // SIGTERM or SIGHUP while exploring: the stop handler exits the process;
    // on the way out the screen and the cursor are given back.
    const restore = () => {
      try {
        Deno.stdin.setRaw(false);
        Deno.stdout.writeSync(new TextEncoder().encode("\x1b[?25h\x1b[?1049l"));
      } catch {
        // The terminal has gone.
      }
    };
    globalThis.addEventListener("unload", restore);
    const result = await exploreSession(
      {
        input: process.stdin,
        output: process.stdout,
        width: Math.max(40, size().columns),
        height: Math.max(12, size().rows),
        style: terminal.style,
        money,
        ascii: false,
        onResize: (resized) => {
          const listener = () => resized(Math.max(40, size().columns), Math.max(12, size().rows));
          Deno.addSignalListener("SIGWINCH", listener);
          return () => Deno.removeSignalListener("SIGWINCH", listener);
        },
      },
      session,
      profile,
      flags.coverage,
    ).finally(() => globalThis.removeEventListener("unload", restore));
    // What was found, on the normal screen: where it ended, and what was kept.
    const pay = (v: number) => formatPay(v, money);
    const said = (name: string, p: Float64Array) => {
      if (model.target.kind !== "regression") {
        const c = estimateProfile(session, p, flags.coverage).classes!;
        return `${name}: likeliest ${c.predicted} (${
          formatPercent(c.shares[c.predicted], false, money)
        })`;
      }
      const a = compareAnswer(session, profile, p, flags.coverage);
      const changes = a.changes.map((c) => `${c.feature} ${c.from} -> ${c.to}`).join(", ");
      return `${name}: ${pay(a.changed.estimate)} (${
        formatPercent(a.difference.relative.estimate, true, money)
      } from the start)${changes === "" ? ", the start itself" : `, ${changes}`}`;
    };
    terminal.out(`Explored from ${terminalText(start)}.`);
    terminal.out(terminalText(said("Ended at", result.profile)));
    for (const k of result.kept) terminal.out(terminalText(said(`Kept ${k.name}`, k.profile)));
    if (result.status === 130) throw new KeyInterrupt();
  });
}
