/**
 * Drives the guided flow through injected streams: waits until the screen
 * shows a text, then types keys, as a person reading the screen would.
 *
 * @module
 */

import { PassThrough } from "node:stream";
import { makeStyle } from "../../tui/render/style.ts";
import { type FlowIO, streamFlowIO } from "../../tui/flow/flow_io.ts";

/** Keys as a terminal sends them. */
export const KEY = { enter: "\r", down: "\x1b[B", up: "\x1b[A", space: " " } as const;

/** A flow I/O whose screen is recorded and whose keyboard is scripted. */
export interface FlowDriver {
  /** The I/O to pass to the flow. */
  io: FlowIO;
  /** Everything written so far, without ANSI control sequences. */
  screen(): string;
  /** Everything written so far, exactly as written. */
  raw(): string;
  /** Waits (bounded) until `text` appears after the last wait, then types `keys`. */
  when(text: string | RegExp, ...keys: string[]): Promise<void>;
}

// Cursor moves and colours removed, so the text reads as on screen.
function plain(text: string): string {
  // deno-lint-ignore no-control-regex
  return text.replace(/\x1b\[[0-9;?]*[A-Za-z]/g, "");
}

/** A driver with an 80-column, colourless screen. */
export function flowDriver(timeoutMs = 60000, ascii = false): FlowDriver {
  const input = new PassThrough();
  const output = new PassThrough();
  // Each prompt ends the stream it draws on when it closes (harmless on a
  // real terminal, whose standard output cannot end); a screen stays open.
  output.end = (() => output) as typeof output.end;
  let recorded = "";
  let seen = 0;
  output.on("data", (chunk: Uint8Array) => (recorded += new TextDecoder().decode(chunk)));
  const io = streamFlowIO({ input, output }, { style: makeStyle(false), width: 80, ascii });
  return {
    io,
    screen: () => plain(recorded),
    raw: () => recorded,
    async when(text, ...keys) {
      const started = Date.now();
      for (;;) {
        const rest = plain(recorded).slice(seen);
        const at = typeof text === "string" ? rest.indexOf(text) : rest.search(text);
        if (at >= 0) {
          seen += at + 1;
          break;
        }
        if (Date.now() - started > timeoutMs) {
          throw new Error(`the screen never showed ${text}; it ends with:\n${rest.slice(-800)}`);
        }
        await new Promise((resolve) => setTimeout(resolve, 10));
      }
      // Let the prompt finish drawing before the keys arrive.
      await new Promise((resolve) => setTimeout(resolve, 20));
      for (const key of keys) input.write(key);
    },
  };
}
