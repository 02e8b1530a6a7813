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
  /** ASCII borders in place of box drawing (`--ascii`). @default {false} */
  ascii?: boolean;
  /** Borders: box drawing (or ASCII) or none. @default {"box"} */
  borders?: "box" | "none";
  /** Without borders, the spaces between columns. @default {2} */
  gap?: number;
  /**
   * A text that, alone after a row's first cell (the others empty), spans the
   * other columns without widening them (e.g. "too few to report"); in the
   * list form it is said under the row's name without a heading.
   */
  spanning?: string;
  /**
   * The name of each row's block in the list form (a row whose first cell is
   * empty continues the row above in the table, but needs its own name in a
   * list). @default {each row's first cell}
   */
  listTitles?: string[];
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
    const lines = options.borders === "none"
      ? drawPlain(kept, head, rows, aligns, styleHead, options.gap ?? 2, options.spanning)
      : draw(kept, head, rows, aligns, styleHead, options.ascii ?? false);
    if (lines.every((l) => visible(l) <= width)) {
      return { lines, dropped: head.filter((_, j) => !kept.includes(j)), list: false };
    }
    if (k < drop.length) kept = kept.filter((j) => j !== drop[k]);
  }
  return {
    lines: listForm(head, rows, width, styleHead, options.spanning, options.listTitles),
    dropped: [],
    list: true,
  };
}

function draw(
  kept: number[],
  head: string[],
  rows: string[][],
  aligns: ("left" | "right")[],
  styleHead: (s: string) => string,
  ascii: boolean,
): string[] {
  const chars = tableChars(ascii);
  const table = new Table({
    head: kept.map((j) => styleHead(head[j])),
    colAligns: kept.map((j) => aligns[j]),
    style: { head: [], border: [], compact: true },
    ...(chars ? { chars } : {}),
  });
  for (const row of rows) table.push(kept.map((j) => row[j]));
  return table.toString().split("\n");
}

// Without borders: columns `gap` spaces apart, widths measured on what is
// shown; a spanning row's text widens no column.
function drawPlain(
  kept: number[],
  head: string[],
  rows: string[][],
  aligns: ("left" | "right")[],
  styleHead: (s: string) => string,
  gap: number,
  spanning: string | undefined,
): string[] {
  const spans = (r: string[]) =>
    spanning !== undefined && r[1] === spanning && r.slice(2).every((c) => c === "");
  const sized = rows.filter((r) => !spans(r));
  const widths = kept.map((j, k) =>
    Math.max(
      visible(head[j]),
      ...sized.map((r) => visible(r[j])),
      ...(k === 0 ? rows.map((r) => visible(r[0])) : []),
    )
  );
  const pad = (text: string, k: number) => {
    const fill = " ".repeat(Math.max(0, widths[k] - visible(text)));
    return aligns[kept[k]] === "left" ? text + fill : fill + text;
  };
  const space = " ".repeat(gap);
  const line = (cells: string[]) => cells.map(pad).join(space).trimEnd();
  return [
    line(kept.map((j) => styleHead(head[j]))),
    ...rows.map((r) =>
      spans(r) && kept[0] === 0 ? `${pad(r[0], 0)}${space}${r[1]}` : line(kept.map((j) => r[j]))
    ),
  ];
}

function listForm(
  head: string[],
  rows: string[][],
  width: number,
  styleHead: (s: string) => string,
  spanning: string | undefined,
  titles: string[] | undefined,
): string[] {
  const lines: string[] = [];
  const wrap = (text: string, indent: string) =>
    // Not hard: a word (a number) longer than the line stays whole.
    wrapAnsi(text, Math.max(8, width - indent.length), { hard: false, trim: true })
      .split("\n").map((l) => indent + l);
  for (const [i, row] of rows.entries()) {
    const title = titles?.[i] ?? row[0];
    lines.push(...wrap(title === "" ? "-" : title, ""));
    if (spanning !== undefined && row[1] === spanning && row.slice(2).every((c) => c === "")) {
      lines.push(...wrap(spanning, "  "));
      continue;
    }
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

/**
 * The line that says which columns a table left out to fit the width, and
 * where they are whole; null when none was.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { leftOutNote } from "./fit_table.ts";
 * assert.equal(
 *   leftOutNote(["MAE", "log MAE"]),
 *   "(MAE and log MAE left out to fit the width; --json has them)",
 * );
 * assert.equal(leftOutNote([]), null);
 * ```
 */
export function leftOutNote(dropped: readonly string[], where = "--json has"): string | null {
  if (dropped.length === 0) return null;
  const names = dropped.length === 1
    ? dropped[0]
    : `${dropped.slice(0, -1).join(", ")} and ${dropped.at(-1)}`;
  return `(${names} left out to fit the width; ${where} ${dropped.length === 1 ? "it" : "them"})`;
}
