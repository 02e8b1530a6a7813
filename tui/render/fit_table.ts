/**
 * Tables that fit the terminal: drawn whole when they fit, else with columns
 * dropped in a stated order, else as a list (one block per row, one
 * `heading: value` line per cell), so that no number is ever wrapped.
 *
 * @module
 */

import Table from "cli-table3";
import wrapAnsi from "wrap-ansi";
import { tableChars } from "./glyphs.ts";

/** Options of {@linkcode fitTable}. */
export interface FitTableOptions {
  /** The terminal width. */
  width: number;
  /** Column headings (plain text; `styleHead` styles them). */
  head: string[];
  /** The rows, one cell per heading. */
  rows: string[][];
  /** Alignment per column. @default {left for the first column, right for the others} */
  aligns?: ("left" | "right")[];
  /** Columns (indices) that may be left out, the first to go first. @default {[]} */
  drop?: number[];
  /** Styles a heading (e.g. bold). @default {no styling} */
  styleHead?: (text: string) => string;
  /** Borders: box drawing (or ASCII) or none. @default {"box"} */
  borders?: "box" | "none";
}

/** What {@linkcode fitTable} drew. */
export interface FittedTable {
  /** The lines. */
  lines: string[];
  /** The headings of the columns left out (empty when the table is whole or a list). */
  dropped: string[];
  /** Whether the table became a list. */
  list: boolean;
}

// deno-lint-ignore no-control-regex
const ANSI = /\x1b\[[0-9;]*m/g;
const visible = (line: string) => line.replace(ANSI, "").length;

const NONE = {
  top: "",
  "top-mid": "",
  "top-left": "",
  "top-right": "",
  bottom: "",
  "bottom-mid": "",
  "bottom-left": "",
  "bottom-right": "",
  left: "",
  "left-mid": "",
  mid: "",
  "mid-mid": "",
  right: "",
  "right-mid": "",
  middle: " ",
};

/**
 * Draws a table within `width`: whole if it fits; else without the columns of
 * `drop`, one at a time in that order, until it fits; else as a list, each
 * row's first cell on a line and the other cells below it as
 * `heading: value` (text wrapped at spaces, never inside a number).
 *
 * @example A table too wide for 30 columns loses its optional column, then becomes a list
 * ```ts
 * import assert from "node:assert/strict";
 * import { fitTable } from "./fit_table.ts";
 * const options = {
 *   head: ["level", "estimate", "range (90%)"],
 *   rows: [["G1", "€41,550", "€35,120 - €48,900"]],
 *   drop: [2],
 *   borders: "none" as const,
 * };
 * assert.deepEqual(fitTable({ ...options, width: 60 }).dropped, []);
 * const narrow = fitTable({ ...options, width: 20 });
 * assert.deepEqual(narrow.dropped, ["range (90%)"]);
 * assert.ok(narrow.lines.every((l) => l.length <= 20));
 * const list = fitTable({ ...options, width: 12 });
 * assert.ok(list.list && list.lines.every((l) => l.length <= 12));
 * ```
 */
export function fitTable(options: FitTableOptions): FittedTable {
  const { width, head, rows } = options;
  const styleHead = options.styleHead ?? ((s: string) => s);
  const aligns = options.aligns ?? head.map((_, j) => (j === 0 ? "left" : "right"));
  const drop = options.drop ?? [];
  let kept = head.map((_, j) => j);
  for (let k = 0; k <= drop.length; k++) {
    const lines = draw(kept, head, rows, aligns, styleHead, options.borders ?? "box");
    if (lines.every((l) => visible(l) <= width)) {
      return { lines, dropped: head.filter((_, j) => !kept.includes(j)), list: false };
    }
    if (k < drop.length) kept = kept.filter((j) => j !== drop[k]);
  }
  return { lines: listForm(head, rows, width, styleHead), dropped: [], list: true };
}

function draw(
  kept: number[],
  head: string[],
  rows: string[][],
  aligns: ("left" | "right")[],
  styleHead: (s: string) => string,
  borders: "box" | "none",
): string[] {
  const chars = borders === "none" ? NONE : tableChars();
  const table = new Table({
    head: kept.map((j) => styleHead(head[j])),
    colAligns: kept.map((j) => aligns[j]),
    style: borders === "none"
      ? { head: [], border: [], "padding-left": 0, "padding-right": 2 }
      : { head: [], border: [], compact: true },
    ...(chars ? { chars } : {}),
  });
  for (const row of rows) table.push(kept.map((j) => row[j]));
  return table.toString().split("\n").map((l) => (borders === "none" ? l.trimEnd() : l));
}

function listForm(
  head: string[],
  rows: string[][],
  width: number,
  styleHead: (s: string) => string,
): string[] {
  const lines: string[] = [];
  const wrap = (text: string, indent: string) =>
    // Not hard: a word (a number) longer than the line stays whole.
    wrapAnsi(text, Math.max(8, width - indent.length), { hard: false, trim: true })
      .split("\n").map((l) => indent + l);
  for (const row of rows) {
    lines.push(...wrap(row[0] === "" ? "-" : row[0], ""));
    for (let j = 1; j < head.length; j++) {
      if (row[j] === "") continue;
      const label = head[j] === "" ? "" : `${styleHead(head[j])}: `;
      const one = `  ${label}${row[j]}`;
      if (visible(one) <= width) lines.push(one);
      else lines.push(...wrap(`${label}`, "  "), ...wrap(row[j], "    "));
    }
  }
  return lines;
}
