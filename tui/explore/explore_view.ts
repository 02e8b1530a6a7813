/**
 * The explore screen as lines, from what the library answered: the
 * attributes on the left (the selected one marked with `>`, not by colour
 * alone), the answer on the right, the two intervals as bars on one money
 * axis fixed for the whole session (so a move shows as movement), each
 * attribute's part as a small bar, and the keys. Every line fits the width
 * and the whole fits the height given; nothing here computes a figure.
 *
 * @module
 */

import type { CompareAnswer, EstimateAnswer } from "../../mod.ts";
import { answerNoteText } from "../render/answer_notes.ts";
import {
  formatLevel,
  formatPay,
  formatPercent,
  formatSignedPay,
  type NumberStyle,
} from "../render/numbers.ts";
import type { Style } from "../render/style.ts";

/** What one frame shows. */
export interface ExploreFrame {
  /** The estimated column's name. */
  target: string;
  /** The levers with the current profile's values in words; `moved` where it differs from the start. */
  levers: { name: string; value: string; moved: boolean }[];
  /** The selected lever. */
  selected: number;
  /**
   * The start against the current profile: `compareAnswer` for pay; for a
   * model of a class, both profiles' answers (shares instead of pay).
   */
  answer: CompareAnswer | ClassAnswers;
  /** The money axis, fixed while exploring. */
  axis: { low: number; high: number };
  /** The step of the reference tree's path the last move changed, or null. */
  lastMove: { step: number; from: string | null; to: string | null } | null;
  /** A line under the screen: what was kept, a refusal, what is being typed. */
  message: string | null;
  /** Show the keys instead of the answer. */
  help: boolean;
}

/** A class model's answers for the start and the current profile. */
export interface ClassAnswers {
  kind: "classes";
  start: EstimateAnswer;
  now: EstimateAnswer;
}

/** How to draw a frame. */
export interface ExploreLook {
  width: number;
  height: number;
  style: Style;
  money: NumberStyle;
  ascii: boolean;
}

/**
 * The keys, as the help screen lists them.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { EXPLORE_KEYS } from "./explore_view.ts";
 * assert(EXPLORE_KEYS.some(([key]) => key === "u"));
 * ```
 */
export const EXPLORE_KEYS: [string, string][] = [
  ["up, down", "choose an attribute"],
  ["left, right", "move it: one level, the next level, or one step of a number"],
  ["shift+left/right", "a bigger move: two levels or five steps"],
  ["a digit, Enter", "type an exact value (Enter to apply, Esc to cancel)"],
  ["k", "keep this profile as a scenario"],
  ["u", "undo the last move"],
  ["r", "return to the start"],
  ["o", "check an offer against the range"],
  ["?", "show or hide these keys"],
  ["q, Esc", "leave (Ctrl-C stops)"],
];

// Pads or cuts plain text to exactly `n` characters.
function fit(text: string, n: number): string {
  if (n <= 0) return "";
  const chars = [...text];
  if (chars.length <= n) return text + " ".repeat(n - chars.length);
  return chars.slice(0, Math.max(0, n - 1)).join("") + "~";
}

/**
 * A bar of `width` characters on the axis: `[`, `=`, `]` over low to high,
 * `|` at the point; a part beyond the axis shows `<` or `>` at the edge.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { axisBar } from "./explore_view.ts";
 * assert.equal(axisBar(20, 30, 40, { low: 0, high: 100 }, 11), "  [|]      ");
 * assert.equal(axisBar(-10, 50, 150, { low: 0, high: 100 }, 11), "<====|====>");
 * ```
 */
export function axisBar(
  low: number,
  mid: number,
  high: number,
  axis: { low: number; high: number },
  width: number,
): string {
  const at = (v: number) => Math.round(((v - axis.low) / (axis.high - axis.low)) * (width - 1));
  const cells = Array<string>(width).fill(" ");
  const a = Math.max(0, Math.min(width - 1, at(low)));
  const b = Math.max(0, Math.min(width - 1, at(high)));
  for (let i = a; i <= b; i++) cells[i] = "=";
  cells[a] = at(low) < 0 ? "<" : "[";
  cells[b] = at(high) > width - 1 ? ">" : "]";
  const m = at(mid);
  if (m >= 0 && m <= width - 1) cells[m] = "|";
  return cells.join("");
}

/**
 * The frame's lines: at most `height`, each at most `width` characters.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, applyChanges, compareAnswer, fitModel, loadTable, openModel, typicalProfile } from "../../mod.ts";
 * import { makeStyle } from "../render/style.ts";
 * import { renderExplore } from "./explore_view.ts";
 * const model = await fitModel(loadTable(demoCompanyCsv({ rows: 300, seed: 1 })), {
 *   target: "base_pay_eur", trees: 10, folds: 3, workers: 1,
 * });
 * const start = typicalProfile(model);
 * const answer = compareAnswer(openModel(model), start, applyChanges(model, start, ["level=+1"]).profile);
 * const lines = renderExplore({
 *   target: "base_pay_eur", selected: 1, answer, axis: { low: 20000, high: 200000 }, lastMove: null,
 *   message: null, help: false,
 *   levers: [{ name: "job_family", value: "Sales", moved: false }, { name: "level", value: "G4", moved: true }],
 * }, { width: 80, height: 24, style: makeStyle(false), money: {}, ascii: true });
 * assert(lines.length <= 24 && lines.every((l) => l.length <= 80));
 * assert(lines.some((l) => l.startsWith("> level")));
 * ```
 */
export function renderExplore(frame: ExploreFrame, look: ExploreLook): string[] {
  const { width, height, style, money } = look;
  const pay = (v: number) => formatPay(v, money);
  const signed = (v: number) => formatSignedPay(v, money);
  const a = frame.answer;
  const lines: string[] = [];
  lines.push(style.bold(fit(`Explore ${frame.target}: what moves the estimate`, width)));
  if (frame.help) {
    for (const [keys, what] of EXPLORE_KEYS) lines.push(fit(`  ${fit(keys, 18)} ${what}`, width));
    lines.push("", fit("Press ? to go back.", width));
    return lines.slice(0, height);
  }
  // Left: the attributes; right: the answer.
  const leftWidth = Math.min(36, Math.max(22, Math.floor(width * 0.45)));
  // Names give way before values: a value is what a move changes.
  const nameWidth = Math.min(
    18,
    leftWidth - 14,
    Math.max(...frame.levers.map((l) => l.name.length)),
  );
  const rightWidth = width - leftWidth - 1;
  const left = frame.levers.map((l, i) => {
    const mark = i === frame.selected ? ">" : " ";
    const text = fit(
      `${mark} ${fit(l.name, nameWidth)} ${l.value}${l.moved ? " *" : ""}`,
      leftWidth,
    );
    return i === frame.selected ? style.bold(text) : text;
  });
  const now = "kind" in a ? a.now : a.changed;
  const share = (v: number) => formatPercent(v, false, money);
  const right: string[] = [];
  if ("kind" in a) {
    const was = a.start.classes!.predicted;
    right.push(
      `Likeliest ${now.classes!.predicted} (${share(now.classes!.shares[now.classes!.predicted])})`,
      `Start     ${was} (${share(a.start.classes!.shares[was])})`,
      `${was}: ${share(a.start.classes!.shares[was])} -> ${share(now.classes!.shares[was] ?? 0)}`,
    );
  } else {
    const d = a.difference;
    right.push(
      `Estimate ${pay(a.changed.estimate)}`,
      `Start    ${pay(a.base.estimate)}`,
      `Change   ${signed(d.estimate)} (${formatPercent(d.relative.estimate, true, money)})`,
      ...(d.low === null || d.high === null
        ? []
        : [`  ${formatLevel(d.coverage, money)} sure ${signed(d.low)} to ${signed(d.high)}`]),
    );
  }
  const peers = now.support.peers;
  if (peers !== null) {
    right.push(
      `${peers.rows} people share ${
        peers.features.map((f, i) => `${f} ${peers.levels[i]}`).join(", ")
      }`,
    );
  }
  if (frame.lastMove !== null) {
    right.push(
      `Path step ${frame.lastMove.step} now ${frame.lastMove.to ?? "ends"} (was ${
        frame.lastMove.from ?? "none"
      })`,
    );
  }
  for (const warning of now.warnings.slice(0, 1)) {
    right.push(style.warn(fit(`! ${answerNoteText(warning, money)}`, rightWidth)));
  }
  const rows = Math.max(left.length, right.length);
  for (let i = 0; i < rows; i++) {
    const l = left[i] ?? " ".repeat(leftWidth);
    const r = right[i] === undefined
      ? ""
      : right[i].includes("\x1b")
      ? right[i]
      : fit(right[i], rightWidth).trimEnd();
    lines.push(`${l} ${r}`.trimEnd());
  }
  lines.push("");
  const label = 16;
  const barWidth = Math.max(10, width - label - 1);
  if ("kind" in a) {
    // Each class's share with its interval, on 0% to 100%.
    const c = now.classes!;
    const room = height - lines.length - 3;
    for (const [name, value] of Object.entries(c.shares).slice(0, Math.max(0, room - 1))) {
      const interval = c.intervals?.[name] ?? { low: value, high: value };
      lines.push(
        `${fit(name, label)} ${
          axisBar(interval.low, value, interval.high, { low: 0, high: 1 }, barWidth)
        }`
          .trimEnd(),
      );
    }
    lines.push(
      `${" ".repeat(label + 1)}0%${" ".repeat(Math.max(1, barWidth - 6))}100%`.slice(0, width),
    );
    return closing(lines, frame, look);
  }
  // The intervals on the fixed axis.
  const percent = formatLevel(a.difference.coverage, money);
  const c = a.changed;
  if (c.confidence !== null) {
    lines.push(
      `${fit(`typical, ${percent}`, label)} ${
        axisBar(c.confidence.low, c.estimate, c.confidence.high, frame.axis, barWidth)
      }`.trimEnd(),
    );
  }
  if (c.range !== null) {
    lines.push(
      `${fit(`one person, ${percent}`, label)} ${
        axisBar(c.range.low, c.estimate, c.range.high, frame.axis, barWidth)
      }`.trimEnd(),
    );
  }
  const lowText = pay(frame.axis.low);
  const highText = pay(frame.axis.high);
  lines.push(
    `${" ".repeat(label + 1)}${lowText}${
      " ".repeat(Math.max(1, barWidth - lowText.length - highText.length))
    }${highText}`.slice(0, width),
  );
  // Each attribute's part, as room allows (two lines kept for the message and keys).
  const parts = [...(c.contributions?.parts ?? [])].sort((x, y) =>
    Math.abs(y.part) - Math.abs(x.part)
  );
  const room = height - lines.length - 3;
  if (room > 0 && parts.length > 0) {
    lines.push(fit("Each attribute's part of the estimate:", width));
    const top = Math.max(...parts.map((p) => Math.abs(p.part)), 1e-12);
    for (const p of parts.slice(0, room - 1)) {
      const n = Math.round((Math.abs(p.part) / top) * 10);
      const bar = (p.part >= 0 ? "+" : "-").repeat(n);
      const share = p.percent !== null ? formatPercent(p.percent, true, money) : signed(p.money);
      lines.push(
        fit(`  ${fit(`${p.feature} ${p.value ?? "-"}`, 26)} ${fit(bar, 10)} ${share}`, width)
          .trimEnd(),
      );
    }
  }
  return closing(lines, frame, look);
}

// The message line and the keys line, at the foot of the screen.
function closing(lines: string[], frame: ExploreFrame, look: ExploreLook): string[] {
  const { width, height, style } = look;
  while (lines.length < height - 2) lines.push("");
  lines.length = Math.min(lines.length, height - 2);
  lines.push(fit(frame.message ?? "", width).trimEnd());
  lines.push(
    style.dim(
      fit(
        "arrows: choose, move  k keep  u undo  r start  o offer  ? keys  q leave",
        width,
      ),
    ),
  );
  return lines;
}
