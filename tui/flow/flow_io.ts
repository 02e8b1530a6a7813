/**
 * What the guided flow talks through: prompts (from @inquirer/prompts) and
 * screen output bound to one pair of streams, so tests drive the flow with
 * injected input and read exactly what a person would see.
 *
 * @module
 */

import { checkbox, input, select } from "@inquirer/prompts";
import wrapAnsi from "wrap-ansi";
import { terminalGuard, terminalText } from "../render/safe_text.ts";
import type { Style } from "../render/style.ts";
import type { ModelSession, Profile } from "../../mod.ts";
import type { NumberStyle } from "../render/numbers.ts";
import { type ExploreIO, type ExploreResult, exploreSession } from "../explore/explore_loop.ts";

/**
 * Choices a select prompt shows at once (more scroll): it takes one line
 * for its question and one per choice shown.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { PassThrough } from "node:stream";
 * import { makeStyle } from "../render/style.ts";
 * import { CHOOSE_PAGE_SIZE, streamFlowIO } from "./flow_io.ts";
 * const input = new PassThrough();
 * const output = new PassThrough();
 * let screen = "";
 * output.on("data", (chunk) => (screen += chunk));
 * const io = streamFlowIO({ input, output }, { style: makeStyle(false), width: 80, ascii: true });
 * const choices = Array.from({ length: 12 }, (_, i) => ({ name: `choice ${i + 1}`, value: i }));
 * const picked = io.choose("Pick one", choices);
 * for (let i = 0; i < 200 && !screen.includes("enter select"); i++) {
 *   await new Promise((resolve) => setTimeout(resolve, 5));
 * }
 * assert.equal(screen.match(/choice \d+/g)!.length, CHOOSE_PAGE_SIZE); // 12 choices, 10 in view
 * input.write("\r");
 * assert.equal(await picked, 0);
 * ```
 */
export const CHOOSE_PAGE_SIZE = 10;

/** A choice of a select prompt. */
export interface Choice<T> {
  /** What is shown. */
  name: string;
  /** What is returned. */
  value: T;
  /** A line of help shown while the choice is highlighted. */
  description?: string;
  /** Shown but not choosable, with this reason. */
  disabled?: string | boolean;
}

/** The streams and terminal facts of a flow. */
export interface FlowIO {
  /** Writes lines to the screen. */
  say(text: string): void;
  /** Styling of the screen. */
  style: Style;
  /** Screen width in characters. */
  width: number;
  /** Screen height in lines, when known (a flow assumes 24 when not). */
  rows?: number;
  /** Plain ASCII only (no box drawing or arrows). */
  ascii: boolean;
  /** Redraws one progress line in place, if the screen can. */
  progress?: (text: string) => void;
  /**
   * Asks to pick one of `choices`; `brief` leaves out the key help line and
   * shows every choice (for a menu asked again and again, under a result
   * that needs the room: its question and one line per choice).
   */
  choose<T>(message: string, choices: Choice<T>[], defaultValue?: T, brief?: boolean): Promise<T>;
  /** Asks to tick some of `choices`. */
  tick<T>(message: string, choices: (Choice<T> & { checked: boolean })[]): Promise<T[]>;
  /**
   * Runs the explore screen on the flow's own streams (absent where the
   * flow has no terminal streams to hand it).
   */
  explore?(session: ModelSession, start: Profile, money: NumberStyle): Promise<ExploreResult>;
  /** Asks for a line of text, checked by `validate` (a message, or true). */
  ask(
    message: string,
    options?: { default?: string; validate?: (text: string) => string | true },
  ): Promise<string>;
}

// Key names of the prompts' help line, in ASCII.
const ASCII_KEYS: Record<string, string> = {
  "↑↓": "up/down",
  "⏎": "enter",
  "space": "space",
};

/** Node-style streams the prompts read and write. */
export interface PromptStreams {
  /** Keys come from here (a TTY, or a PassThrough in tests). */
  input: NodeJS.ReadableStream;
  /** The screen. */
  output: NodeJS.WritableStream;
}

/**
 * A flow I/O over node streams.
 *
 * @param clearPromptOnDone Whether answered prompts are erased (on a real
 * terminal they stay, so the screen keeps the record of choices).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { PassThrough } from "node:stream";
 * import { makeStyle } from "../render/style.ts";
 * import { streamFlowIO } from "./flow_io.ts";
 * const input = new PassThrough();
 * const output = new PassThrough();
 * let screen = "";
 * output.on("data", (chunk) => (screen += chunk));
 * const io = streamFlowIO({ input, output }, { style: makeStyle(false), width: 80, ascii: true });
 * io.say("Hello\x07"); // a control character from the data is shown, not sent
 * const named = io.ask("Name of this scenario:", { default: "scenario 1" });
 * input.write("\r"); // enter: the default
 * assert.equal(await named, "scenario 1");
 * assert(screen.startsWith("Hello\\x07\n? Name of this scenario: (scenario 1)"));
 * ```
 */
export function streamFlowIO(
  streams: PromptStreams,
  options: {
    style: Style;
    width: number;
    rows?: number;
    ascii: boolean;
    progress?: (text: string) => void;
  },
): FlowIO {
  // Esc alone (not the start of an arrow key's sequence, which arrives in
  // the same chunk) stops the prompt, as Ctrl-C does.
  const withEsc = <T>(ask: (context: Record<string, unknown>) => Promise<T>): Promise<T> => {
    const controller = new AbortController();
    const onData = (chunk: Uint8Array | string) => {
      const text = typeof chunk === "string" ? chunk : new TextDecoder().decode(chunk);
      if (text === "\x1b") controller.abort();
    };
    streams.input.on("data", onData);
    return ask({
      input: streams.input,
      output: streams.output,
      clearPromptOnDone: false,
      signal: controller.signal,
    }).finally(() => streams.input.removeListener("data", onData));
  };
  const prefix = { idle: "?", done: "+" };
  const help = (keys: [string, string][]) =>
    keys.map(([key, action]) => `${ASCII_KEYS[key] ?? key} ${action}`).join(", ");
  // Under --ascii: no arrows, circles or check marks.
  const theme = options.ascii ? { prefix } : undefined;
  const selectTheme = options.ascii
    ? { prefix, icon: { cursor: ">" }, style: { keysHelpTip: help } }
    : undefined;
  const tickTheme = options.ascii
    ? {
      prefix,
      icon: { cursor: ">", checked: "[x]", unchecked: "[ ]" },
      style: { keysHelpTip: help },
    }
    : undefined;
  // Questions and choices quote names from the data: shown with their
  // control characters visible, whatever the caller passed (the values
  // returned are the choices' own).
  const shown = <C extends Choice<unknown>>(choices: C[]): C[] =>
    choices.map((c) => ({
      ...c,
      name: terminalText(c.name),
      ...(c.description !== undefined ? { description: terminalText(c.description) } : {}),
      ...(typeof c.disabled === "string" ? { disabled: terminalText(c.disabled) } : {}),
    }));
  return {
    // The last check on the screen: only paygrove's own styles get through.
    // Lines longer than the screen are wrapped at spaces here, the one
    // place every sentence passes (a long warning broke "10,000" in two at
    // 80 columns); shorter lines, indents and tables are left as they are.
    say: (text) => {
      const safe = wrapAnsi(terminalGuard(text, options.style.enabled), options.width, {
        trim: false,
        hard: false,
      }).replace(/ +\n/g, "\n");
      streams.output.write(safe.endsWith("\n") ? safe : `${safe}\n`);
    },
    // Every screen of the flow draws with the glyphs --ascii chose.
    style: { ...options.style, ascii: options.ascii },
    width: options.width,
    rows: options.rows,
    ascii: options.ascii,
    progress: options.progress,
    explore: (session, start, money) =>
      exploreSession(
        {
          input: streams.input as ExploreIO["input"],
          output: streams.output,
          width: options.width,
          height: options.rows ?? 24,
          style: options.style,
          money,
          ascii: options.ascii,
        },
        session,
        start,
      ),
    choose: (message, choices, defaultValue, brief) =>
      withEsc((context) =>
        select({
          message: terminalText(message),
          choices: shown(choices),
          default: defaultValue,
          // A menu under a result shows all its choices (it has at most a dozen).
          pageSize: brief ? Math.max(CHOOSE_PAGE_SIZE, choices.length) : CHOOSE_PAGE_SIZE,
          // A help line of "" is dropped with the blank line above it.
          theme: brief ? { ...selectTheme, style: { keysHelpTip: () => "" } } : selectTheme,
        }, context)
      ),
    tick: (message, choices) =>
      withEsc((context) =>
        checkbox(
          {
            message: terminalText(message),
            choices: shown(choices),
            pageSize: 14,
            theme: tickTheme,
          },
          context,
        )
      ),
    ask: (message, o = {}) =>
      withEsc((context) =>
        input({
          message: terminalText(message),
          default: o.default,
          validate: o.validate === undefined ? undefined : (text: string) => {
            const verdict = o.validate!(text);
            return verdict === true ? true : terminalText(verdict);
          },
          theme,
        }, context)
      ),
  };
}
