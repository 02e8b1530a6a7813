/**
 * The signals that stop paygrove (Ctrl-C's SIGINT, SIGTERM from a process
 * manager or `kill`, SIGHUP when the terminal closes), each handled alike:
 * the temporary files of writes in progress are removed, one line says
 * what happened, and the exit status is 128 + the signal's number (130,
 * 143, 129), as shells report a process the signal ended.
 *
 * @module
 */

import { removePendingFiles } from "../mod.ts";

/**
 * The stop signals, with their numbers and how a person knows them.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { constants } from "node:os";
 * import { STOP_SIGNALS } from "./stop_signals.ts";
 * // The numbers as the platform knows them (Node's os.constants.signals), so
 * // the exit statuses are 130, 143 and 129 as shells report them.
 * for (const { signal, number } of STOP_SIGNALS) assert.equal(constants.signals[signal], number);
 * assert.deepEqual(STOP_SIGNALS.map((s) => 128 + s.number), [130, 143, 129]);
 * ```
 */
export const STOP_SIGNALS = [
  { signal: "SIGINT", number: 2, name: "Ctrl-C" },
  { signal: "SIGTERM", number: 15, name: "SIGTERM" },
  { signal: "SIGHUP", number: 1, name: "SIGHUP" },
] as const;

/**
 * How long stopping to listen waits for a signal already sent (milliseconds).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { listenForStop, SIGNAL_WAIT_MS } from "./stop_signals.ts";
 * // Stopping to listen waits a turn of the timers: a timer due sooner fires first.
 * const order: string[] = [];
 * const stop = listenForStop(() => {});
 * setTimeout(() => order.push("sooner"), SIGNAL_WAIT_MS / 5);
 * await stop();
 * order.push("stopped");
 * assert.deepEqual(order, ["sooner", "stopped"]);
 * ```
 */
export const SIGNAL_WAIT_MS = 25;

/**
 * Listens for the stop signals: on one, removes the pending temporary
 * files, calls `say` with the signal's name (a failure to say it, as on a
 * closed terminal, is ignored) and exits with 128 + its number.
 *
 * @returns A function that stops listening, once a signal that arrived
 * while synchronous work held the thread has been handled: Deno delivers a
 * signal only when the event loop turns, so without that turn a SIGTERM
 * sent during the last busy stretch was dropped and the run ended in 0.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { listenForStop } from "./stop_signals.ts";
 * const said: string[] = [];
 * const stop = listenForStop((name) => said.push(name));
 * await stop();
 * assert.deepEqual(said, []);
 * ```
 */
export function listenForStop(
  say: (name: string) => void,
  exit: (status: number) => void = Deno.exit,
): () => Promise<void> {
  const added: [Deno.Signal, () => void][] = [];
  for (const { signal, number, name } of STOP_SIGNALS) {
    const handler = () => {
      removePendingFiles();
      try {
        say(name);
      } catch {
        // Nowhere left to say it (the terminal has gone).
      }
      exit(128 + number);
    };
    try {
      Deno.addSignalListener(signal, handler);
      added.push([signal, handler]);
    } catch {
      // Not a signal of this platform (Windows has SIGINT only).
    }
  }
  return async () => {
    // A timer of 0 ms can fire without the runtime ever waiting on its
    // reactor, where a pending signal is read; a wait of a few milliseconds
    // parks it there, so a signal already sent is handled first.
    await new Promise((resolve) => setTimeout(resolve, SIGNAL_WAIT_MS));
    for (const [signal, handler] of added) Deno.removeSignalListener(signal, handler);
  };
}

/**
 * Ctrl-C read as a key (a screen in raw mode, where the terminal sends no
 * SIGINT): thrown up to the command's end, which ends with status 130 as
 * SIGINT would.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { KeyInterrupt, STOP_SIGNALS } from "./stop_signals.ts";
 * assert.equal(new KeyInterrupt().status, 128 + STOP_SIGNALS[0].number);
 * ```
 */
export class KeyInterrupt extends Error {
  /** The exit status, as for SIGINT. */
  readonly status = 128 + STOP_SIGNALS[0].number;

  constructor() {
    super("stopped with Ctrl-C");
    this.name = "KeyInterrupt";
  }
}
