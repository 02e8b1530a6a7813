/**
 * The explore screen's loop: keys in, frames out, on any pair of Node
 * streams (the terminal's, or a test's). Each key is one what-if from the
 * start (`compareAnswer`), and only the lines that changed are written
 * again (cursor to the line, the line, erase to its end), so a redraw over
 * SSH is a few hundred bytes and never blanks the screen.
 *
 * Why not a prompt of @inquirer/core, which the guided flow's questions
 * use: its screen manager erases and rewrites the whole prompt on every
 * render, the flicker this screen is meant not to have; Node's own
 * readline parses the keys here, as it does under inquirer.
 *
 * The screen is drawn on the terminal's alternate screen with the cursor
 * hidden; every way out (q, Esc, Ctrl-C, an error) shows the cursor and
 * returns to the screen as it was.
 *
 * @module
 */

import { emitKeypressEvents } from "node:readline";
import {
  checkOffer,
  compareAnswer,
  describeProfile,
  estimateProfile,
  type Lever,
  levers,
  type ModelSession,
  moveLever,
  OptionError,
  parseOffer,
  type Profile,
  sweepAnswer,
  sweepValues,
  typicalProfile,
  valueOf,
} from "../../mod.ts";
import type { CompareAnswer } from "../../mod.ts";
import { formatPay, formatPercent, type NumberStyle } from "../render/numbers.ts";
import type { Style } from "../render/style.ts";
import { forTerminal, terminalText } from "../render/safe_text.ts";
import { type ClassAnswers, type ExploreFrame, renderExplore } from "./explore_view.ts";

/** The streams and terminal facts of an explore session. */
export interface ExploreIO {
  input: NodeJS.ReadableStream & { isTTY?: boolean; setRawMode?: (raw: boolean) => unknown };
  output: NodeJS.WritableStream;
  width: number;
  height: number;
  style: Style;
  money: NumberStyle;
  ascii: boolean;
  /** Registers a callback for a new terminal size; returns how to stop listening. */
  onResize?: (resized: (width: number, height: number) => void) => () => void;
}

/** How a session ended, and what was kept. */
export interface ExploreResult {
  /** 0 when left with q or Esc; 130 when stopped with Ctrl-C. */
  status: 0 | 130;
  /** The profile at the end. */
  profile: Profile;
  /** The profiles kept with `k`, by name. */
  kept: { name: string; profile: Profile }[];
}

/** A key as Node's readline reports it. */
export interface Key {
  name?: string;
  sequence?: string;
  ctrl?: boolean;
  shift?: boolean;
  meta?: boolean;
}

/**
 * The money axis of a session: from the lowest to the highest end of the
 * one-person range as the first ladder (ordinal lever) walks all its
 * levels from the start, with a twentieth of its span either side; without
 * a ladder, the start's range widened by half either side. Fixed for the
 * session, so a move shows as movement on it.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable, openModel, typicalProfile } from "../../mod.ts";
 * import { exploreAxis } from "./explore_loop.ts";
 * const model = await fitModel(loadTable(demoCompanyCsv({ rows: 300, seed: 1 })), {
 *   target: "base_pay_eur", trees: 10, folds: 3, workers: 1,
 * });
 * const axis = exploreAxis(openModel(model), typicalProfile(model));
 * assert(axis.low > 0 && axis.high > 2 * axis.low);
 * ```
 */
export function exploreAxis(session: ModelSession, start: Profile): { low: number; high: number } {
  const { model } = session;
  const ladder = levers(model).find((l) => l.kind === "ordinal");
  let low = Infinity;
  let high = -Infinity;
  if (ladder !== undefined) {
    const sweep = sweepAnswer(
      session,
      start,
      ladder.index,
      sweepValues(model, ladder.index, {}),
      0.9,
      null,
      [],
    );
    for (const p of sweep.points) {
      low = Math.min(low, p.range?.low ?? p.estimate);
      high = Math.max(high, p.range?.high ?? p.estimate);
    }
    const pad = (high - low) / 20;
    return { low: Math.max(0, low - pad), high: high + pad };
  }
  const answer = estimateProfile(session, start);
  const r = answer.range ?? { low: answer.estimate, high: answer.estimate };
  return { low: r.low / 1.5, high: r.high * 1.5 };
}

/** What the loop keeps between keys. */
interface State {
  profile: Profile;
  history: Profile[];
  selected: number;
  typing: { kind: "value" | "offer"; text: string } | null;
  help: boolean;
  message: string | null;
  kept: { name: string; profile: Profile }[];
  lastMove: ExploreFrame["lastMove"];
}

/**
 * Runs the explore screen until q, Esc or Ctrl-C.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { PassThrough } from "node:stream";
 * import { demoCompanyCsv, fitModel, loadTable, openModel, typicalProfile } from "../../mod.ts";
 * import { makeStyle } from "../render/style.ts";
 * import { exploreSession } from "./explore_loop.ts";
 * const model = await fitModel(loadTable(demoCompanyCsv({ rows: 300, seed: 1 })), {
 *   target: "base_pay_eur", trees: 10, folds: 3, workers: 1,
 * });
 * const input = new PassThrough();
 * const output = new PassThrough();
 * let written = "";
 * output.on("data", (chunk) => (written += chunk));
 * const done = exploreSession(
 *   { input, output, width: 80, height: 24, style: makeStyle(false), money: {}, ascii: true },
 *   openModel(model), typicalProfile(model),
 * );
 * input.write("k"); // keep the start as a scenario
 * input.write("q");
 * const result = await done;
 * assert.equal(result.status, 0);
 * assert.equal(result.kept.length, 1);
 * assert(written.endsWith("\x1b[?25h\x1b[?1049l")); // cursor shown, screen restored
 * ```
 */
export function exploreSession(
  io: ExploreIO,
  session: ModelSession,
  start: Profile,
  coverage = 0.9,
): Promise<ExploreResult> {
  const { model } = session;
  const all: Lever[] = levers(model);
  const typical = typicalProfile(model);
  const regression = model.target.kind === "regression";
  // A class's shares run from 0 to 1; pay has its own axis.
  const axis = regression ? exploreAxis(session, start) : { low: 0, high: 1 };
  let width = io.width;
  let height = io.height;
  const state: State = {
    profile: Float64Array.from(start),
    history: [],
    selected: 0,
    typing: null,
    help: false,
    message: null,
    kept: [],
    lastMove: null,
  };
  // The start's answer never changes: each key works out the moved profile's only.
  const startAnswer = estimateProfile(session, start, coverage);
  const answerOf = (profile: Profile): CompareAnswer | ClassAnswers =>
    regression
      ? compareAnswer(session, start, profile, coverage, [], startAnswer)
      : { kind: "classes", start: startAnswer, now: estimateProfile(session, profile, coverage) };
  let answer = answerOf(state.profile);
  const pathOf = (a: CompareAnswer | ClassAnswers) => ("kind" in a ? a.now : a.changed).path;
  let previous: string[] = [];

  const startWords = describeProfile(model, start);
  const frame = (): string[] => {
    const words = describeProfile(model, state.profile);
    // Names, levels and conditions come from the table: shown with their
    // control characters made visible, as on every screen.
    return renderExplore({
      target: terminalText(model.target.name),
      levers: all.map((l) => ({
        name: terminalText(l.name),
        value: terminalText(String(words[l.name] ?? "missing")),
        moved: words[l.name] !== startWords[l.name],
      })),
      selected: state.selected,
      answer: forTerminal(answer),
      axis,
      lastMove: state.lastMove === null ? null : forTerminal(state.lastMove),
      message: state.typing !== null
        ? `${state.typing.kind === "offer" ? "Offer" : `${all[state.selected].name} =`} ` +
          `${terminalText(state.typing.text)}_  (Enter to apply, Esc to cancel)`
        : state.message === null
        ? null
        : terminalText(state.message),
      help: state.help,
    }, { width, height, style: io.style, money: io.money, ascii: io.ascii });
  };

  // Writes only the lines that differ from the last frame.
  const draw = (full = false): void => {
    const lines = frame();
    let out = full ? "\x1b[H\x1b[2J" : "";
    for (let i = 0; i < lines.length; i++) {
      if (!full && lines[i] === previous[i]) continue;
      out += `\x1b[${i + 1};1H${lines[i]}\x1b[K`;
    }
    if (!full && lines.length < previous.length) out += `\x1b[${lines.length + 1};1H\x1b[J`;
    previous = lines;
    if (out !== "") io.output.write(out);
  };

  const answerFor = (profile: Profile): void => {
    const before = pathOf(answer);
    answer = answerOf(profile);
    const after = pathOf(answer);
    state.lastMove = null;
    for (let s = 0; s < Math.max(before.length, after.length); s++) {
      if (before[s]?.condition !== after[s]?.condition) {
        state.lastMove = {
          step: s + 1,
          from: before[s]?.condition ?? null,
          to: after[s]?.condition ?? null,
        };
        break;
      }
    }
  };

  const moveTo = (profile: Profile): void => {
    if (profile.every((v, i) => Object.is(v, state.profile[i]))) return;
    state.history.push(state.profile);
    state.profile = profile;
    answerFor(profile);
  };

  const apply = (typed: { kind: "value" | "offer"; text: string }): void => {
    try {
      if (typed.kind === "value") {
        const lever = all[state.selected];
        const profile = Float64Array.from(state.profile);
        profile[lever.index] = valueOf(model.features[lever.index], typed.text.trim(), "value");
        moveTo(profile);
        state.message = null;
      } else if ("kind" in answer) {
        state.message = `An offer is pay; "${model.target.name}" is a class.`;
      } else {
        const offer = checkOffer(
          session,
          state.profile,
          answer.changed,
          parseOffer(model, typed.text.trim()),
        );
        const pay = (v: number) => formatPay(v, io.money);
        state.message = `Offer ${pay(offer.amount)}: ` +
          (offer.position === null
            ? `${formatPercent(offer.offerToEstimate - 1, true, io.money)} from the estimate`
            : `${{ under: "under", within: "inside", over: "above" }[offer.position]} the range` +
              (offer.shareBelow === null
                ? ""
                : `; ${formatPercent(offer.shareBelow, false, io.money)} of comparable people ` +
                  `are paid less`));
      }
    } catch (error) {
      if (!(error instanceof OptionError)) throw error;
      state.message = error.message.replace(/\{value\}: /, "");
    }
  };

  return new Promise<ExploreResult>((resolve, reject) => {
    const raw = io.input.isTTY === true && typeof io.input.setRawMode === "function";
    const stopResize = io.onResize?.((w, h) => {
      width = w;
      height = h;
      draw(true);
    });
    const finish = (status: 0 | 130, error?: unknown) => {
      io.input.removeListener("keypress", onKey);
      stopResize?.();
      if (raw) io.input.setRawMode!(false);
      // Stop reading, so a terminal's input no longer keeps the process alive.
      io.input.pause();
      io.output.write("\x1b[?25h\x1b[?1049l");
      if (error !== undefined) reject(error);
      else resolve({ status, profile: state.profile, kept: state.kept });
    };
    const onKey = (text: string | undefined, key: Key | undefined) => {
      try {
        if (handle(text, key ?? {}, finish)) draw();
      } catch (error) {
        finish(0, error);
      }
    };
    // One key: true to redraw; quitting calls `finish`.
    const handle = (
      text: string | undefined,
      key: Key,
      end: (status: 0 | 130) => void,
    ): boolean => {
      if (key.ctrl && key.name === "c") {
        end(130);
        return false;
      }
      if (state.typing !== null) {
        if (key.name === "escape") state.typing = null;
        else if (key.name === "return" || key.name === "enter") {
          const typed = state.typing;
          state.typing = null;
          apply(typed);
        } else if (key.name === "backspace") state.typing.text = state.typing.text.slice(0, -1);
        else if (text !== undefined && text.length === 1 && text >= " ") state.typing.text += text;
        return true;
      }
      if (state.help) {
        if (text === "?" || key.name === "escape" || text === "q") state.help = false;
        return true;
      }
      state.message = null;
      switch (key.name) {
        case "up":
          state.selected = (state.selected + all.length - 1) % all.length;
          return true;
        case "down":
          state.selected = (state.selected + 1) % all.length;
          return true;
        case "left":
        case "right":
          moveTo(
            moveLever(
              state.profile,
              all[state.selected],
              key.name === "right" ? 1 : -1,
              key.shift === true,
              typical,
            ),
          );
          return true;
        case "return":
        case "enter":
          state.typing = { kind: "value", text: "" };
          return true;
        case "escape":
          end(0);
          return false;
      }
      switch (text) {
        case "q":
          end(0);
          return false;
        case "?":
          state.help = true;
          return true;
        case "k":
          state.kept.push({ name: `scenario ${state.kept.length + 1}`, profile: state.profile });
          state.message = `Kept as scenario ${state.kept.length}.`;
          return true;
        case "u": {
          const back = state.history.pop();
          if (back === undefined) state.message = "Nothing to undo.";
          else {
            state.profile = back;
            answerFor(back);
          }
          return true;
        }
        case "r":
          moveTo(Float64Array.from(start));
          return true;
        case "o":
          state.typing = { kind: "offer", text: "" };
          return true;
      }
      if (text !== undefined && /^[0-9.-]$/.test(text)) {
        state.typing = { kind: "value", text };
        return true;
      }
      return false;
    };
    emitKeypressEvents(io.input);
    if (raw) io.input.setRawMode!(true);
    io.input.on("keypress", onKey);
    // A prompt before (the guided flow's) leaves its input paused.
    io.input.resume();
    io.output.write("\x1b[?1049h\x1b[?25l");
    draw(true);
  });
}
