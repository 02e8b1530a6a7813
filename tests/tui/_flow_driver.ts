/**
 * Drives the guided flow through injected streams: waits until the screen
 * shows a text, then types keys, as a person reading the screen would.
 * The screen is also kept as a terminal of a given size would show it
 * (cursor moves and erased lines applied), so tests can ask what is still
 * in view.
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
  /**
   * The lines of the terminal so far, as a terminal of the driver's size
   * holds them (scrollback first; the last `rows` are in view).
   */
  lines(): string[];
  /** The lines in view: the last `rows` of {@linkcode lines}. */
  inView(): string[];
  /** Lines a terminal of the driver's width had to wrap (text written past its last column). */
  overflowed(): string[];
  /** Waits (bounded) until `text` appears after the last wait, then types `keys`. */
  when(text: string | RegExp, ...keys: string[]): Promise<void>;
  /** Types keys now. */
  type(...keys: string[]): void;
}

// Cursor moves and colours removed, so the text reads as on screen.
function plain(text: string): string {
  // deno-lint-ignore no-control-regex
  return text.replace(/\x1b\[[0-9;?]*[A-Za-z]/g, "");
}

/**
 * A terminal's lines after `text` was written to it: line feeds (as a
 * terminal's output processing makes them, to the first column), carriage
 * returns, cursor up/down/column, erase line; colours ignored. Text past the
 * last column wraps, and the line it wrapped is kept in `overflowed`.
 */
export function terminalLines(
  text: string,
  columns: number,
): { lines: string[]; overflowed: string[] } {
  const lines: string[][] = [[]];
  const overflowed: string[] = [];
  let row = 0;
  let col = 0;
  const at = (r: number) => {
    while (lines.length <= r) lines.push([]);
    return lines[r];
  };
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    if (ch === "\x1b") {
      // deno-lint-ignore no-control-regex
      const m = /^\x1b\[([0-9;?]*)([A-Za-z])/.exec(text.slice(i, i + 16));
      if (m === null) continue;
      i += m[0].length - 1;
      const n = m[1] === "" || m[1].startsWith("?") ? NaN : Number(m[1].split(";")[0]);
      switch (m[2]) {
        case "A":
          row = Math.max(0, row - (Number.isNaN(n) ? 1 : n));
          break;
        case "B":
          row += Number.isNaN(n) ? 1 : n;
          at(row);
          break;
        case "G":
          col = (Number.isNaN(n) ? 1 : n) - 1;
          break;
        case "K":
          if (n === 2) lines[row] = [];
          else at(row).length = Math.min(at(row).length, col);
          break;
      }
      continue;
    }
    if (ch === "\n") {
      row++;
      col = 0;
      at(row);
    } else if (ch === "\r") {
      col = 0;
    } else {
      if (col >= columns) {
        overflowed.push(at(row).join(""));
        row++;
        col = 0;
      }
      const line = at(row);
      while (line.length < col) line.push(" ");
      line[col++] = ch;
    }
  }
  return { lines: lines.map((l) => l.join("").trimEnd()), overflowed };
}

/**
 * A driver with a colourless screen, 80 columns by 24 rows unless `size`
 * says otherwise (the prompts wrap at the same width).
 */
export function flowDriver(
  timeoutMs = 60000,
  ascii = false,
  size: { columns?: number; rows?: number } = {},
): FlowDriver {
  const columns = size.columns ?? 80;
  const rows = size.rows ?? 24;
  const input = new PassThrough();
  const output = new PassThrough();
  // The prompts break their lines at the output's width, as on a terminal.
  Object.assign(output, { columns, rows });
  // Each prompt ends the stream it draws on when it closes (harmless on a
  // real terminal, whose standard output cannot end); a screen stays open.
  output.end = (() => output) as typeof output.end;
  let recorded = "";
  let seen = 0;
  output.on("data", (chunk: Uint8Array) => (recorded += new TextDecoder().decode(chunk)));
  const io = streamFlowIO({ input, output }, {
    style: makeStyle(false),
    width: columns,
    rows,
    ascii,
  });
  return {
    io,
    screen: () => plain(recorded),
    raw: () => recorded,
    lines: () => terminalLines(recorded, columns).lines,
    inView: () => terminalLines(recorded, columns).lines.slice(-rows),
    overflowed: () => terminalLines(recorded, columns).overflowed,
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
    type(...keys) {
      for (const key of keys) input.write(key);
    },
  };
}
