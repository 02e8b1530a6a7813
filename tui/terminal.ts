/**
 * The terminal as the commands see it: two output streams, a style and a
 * width. Tests pass their own to capture output.
 *
 * @module
 */

import { terminalGuard } from "./render/safe_text.ts";
import { makeStyle, type Style, styleFor } from "./render/style.ts";

/** Output streams and their properties. */
export interface Terminal {
  /** Writes a line (or lines) to standard output. */
  out(text: string): void;
  /** Writes a line (or lines) to standard error. */
  err(text: string): void;
  /** Styling for standard output. */
  style: Style;
  /** Styling for standard error. */
  errStyle: Style;
  /** Width of standard output in characters. */
  width: number;
  /** Height of standard output in lines, when it is a terminal whose size is known. */
  rows?: number;
  /**
   * Whether standard output is a terminal (a person reads it) rather than a
   * pipe or a file; undefined counts as not.
   */
  outIsTerminal?: boolean;
  /**
   * Whether standard error is a terminal: its long messages are then
   * wrapped to the width, never at a figure; undefined counts as not.
   */
  errIsTerminal?: boolean;
  /**
   * Redraws one progress line in place on standard error; undefined when
   * standard error is not a terminal (progress is then not shown at all).
   */
  progress?: (text: string) => void;
}

// Width used when output is not a terminal (a pipe or a file).
const DEFAULT_WIDTH = 100;

/**
 * The process's own terminal.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { processTerminal } from "./terminal.ts";
 * const terminal = processTerminal();
 * assert.equal(terminal.outIsTerminal, Deno.stdout.isTerminal());
 * assert.equal(terminal.style.enabled, Deno.stdout.isTerminal() && !Deno.noColor);
 * // Progress is redrawn in place only where standard error is a terminal.
 * assert.equal(terminal.progress !== undefined, Deno.stderr.isTerminal());
 * // Not a terminal (a pipe or a file): 100 columns.
 * if (!Deno.stdout.isTerminal()) assert.equal(terminal.width, 100);
 * ```
 */
export function processTerminal(): Terminal {
  const encoder = new TextEncoder();
  const write = (stream: { writeSync(b: Uint8Array): number }, text: string) => {
    const bytes = encoder.encode(text.endsWith("\n") ? text : `${text}\n`);
    let written = 0;
    try {
      while (written < bytes.length) written += stream.writeSync(bytes.subarray(written));
    } catch (error) {
      // The reader has gone (`paygrove ... | head`): nothing more can be
      // said, and that is no error of the user's. Exit quietly, as Unix
      // tools do; outputs to files are written atomically, so none is half done.
      if (error instanceof Deno.errors.BrokenPipe) Deno.exit(0);
      throw error;
    }
  };
  let width = DEFAULT_WIDTH;
  let rows: number | undefined;
  if (Deno.stdout.isTerminal()) {
    try {
      ({ columns: width, rows } = Deno.consoleSize());
    } catch {
      // Keep the default when the size cannot be read.
    }
  }
  const style = styleFor(Deno.stdout);
  const errStyle = styleFor(Deno.stderr);
  // The last check: no control character but paygrove's own styles and
  // line breaks reaches the streams, whatever a renderer let through.
  const terminal: Terminal = {
    out: (text) => write(Deno.stdout, terminalGuard(text, style.enabled)),
    err: (text) => write(Deno.stderr, terminalGuard(text, errStyle.enabled)),
    style,
    errStyle,
    width,
    ...(rows !== undefined ? { rows } : {}),
    outIsTerminal: Deno.stdout.isTerminal(),
    errIsTerminal: Deno.stderr.isTerminal(),
  };
  if (Deno.stderr.isTerminal()) {
    terminal.progress = (text) => {
      // Carriage return and erase-line, so each update replaces the last.
      const bytes = encoder.encode(`\r\x1b[K${terminalGuard(text, errStyle.enabled)}`);
      let written = 0;
      while (written < bytes.length) written += Deno.stderr.writeSync(bytes.subarray(written));
    };
  }
  return terminal;
}

/**
 * A terminal that records what is written, for tests.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { recordingTerminal } from "./terminal.ts";
 * const t = recordingTerminal();
 * t.out("a");
 * assert(t.stdout.join("") === "a\n");
 * ```
 */
export function recordingTerminal(width = DEFAULT_WIDTH): Terminal & {
  stdout: string[];
  stderr: string[];
} {
  const stdout: string[] = [];
  const stderr: string[] = [];
  const line = (text: string) => (text.endsWith("\n") ? text : `${text}\n`);
  return {
    stdout,
    stderr,
    out: (text) => stdout.push(line(text)),
    err: (text) => stderr.push(line(text)),
    style: makeStyle(false),
    errStyle: makeStyle(false),
    width,
  };
}
