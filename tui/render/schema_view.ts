/**
 * The schema of a table as lines of text: a summary line, a table of
 * columns, then notes, data-quality warnings and the protected-attribute
 * caution.
 *
 * @module
 */

import Table from "cli-table3";
import wrapAnsi from "wrap-ansi";
import type { ColumnSummary, SchemaSummary } from "../../mod.ts";
import { describeUnit, formatMoney, formatNumber, type NumberStyle } from "./numbers.ts";
import type { Style } from "./style.ts";
import { tableChars } from "./glyphs.ts";

/** What {@linkcode renderSchema} needs besides the summary. */
export interface SchemaViewOptions {
  /** The file name shown in the first line. */
  file: string;
  /** Styling (colour on or off). */
  style: Style;
  /** Width of the terminal in characters. */
  width: number;
  /** Locale and currency for numbers and money. */
  numbers: NumberStyle;
}

/**
 * Renders a schema summary.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { describeSchema, loadTable } from "../../mod.ts";
 * import { renderSchema } from "./schema_view.ts";
 * import { makeStyle } from "./style.ts";
 * const summary = describeSchema(loadTable("level,pay\nL1,50000\nL2,61000\n"));
 * const lines = renderSchema(summary, { file: "t.csv", style: makeStyle(false), width: 80, numbers: {} });
 * assert(lines[0].startsWith("t.csv: 2 rows, 2 columns"));
 * ```
 */
export function renderSchema(summary: SchemaSummary, options: SchemaViewOptions): string[] {
  const { style } = options;
  const lines: string[] = [];
  const columnCount = summary.columns.length;
  lines.push(
    style.bold(
      `${options.file}: ${formatNumber(summary.rows, options.numbers)} rows, ${columnCount} ` +
        `column${columnCount === 1 ? "" : "s"}`,
    ),
  );
  if (summary.target !== undefined) lines.push(`target: ${summary.target}`);
  lines.push("");

  // Fixed columns take what they need; "levels or range" takes the rest.
  const fixed = [
    Math.max(6, ...summary.columns.map((c) => c.name.length)),
    11,
    7,
    9,
  ];
  const rest = Math.max(16, options.width - fixed.reduce((a, b) => a + b, 0) - 3 * 5 - 1);
  if (fixed.reduce((a, b) => a + b, 0) + 3 * 5 + 1 + rest > options.width) {
    // Too narrow for the table: one block per column, its values wrapped at spaces below it.
    lines.push(...schemaList(summary, options));
  } else {
    lines.push(...schemaTable(summary, options, fixed, rest));
  }
  return [...lines, ...schemaNotes(summary, options)];
}

// The columns as a bordered table, "levels or range" wrapped within its cell.
function schemaTable(
  summary: SchemaSummary,
  options: SchemaViewOptions,
  fixed: number[],
  rest: number,
): string[] {
  const { style } = options;
  const lines: string[] = [];
  const table = new Table({
    head: ["column", "type", "missing", "levels or range", "protected"].map(style.bold),
    colWidths: [fixed[0] + 2, fixed[1] + 2, fixed[2] + 2, rest + 2, fixed[3] + 2],
    colAligns: ["left", "left", "right", "left", "left"],
    style: { head: [], border: [], compact: true },
    ...(tableChars(style.ascii) ? { chars: tableChars(style.ascii) } : {}),
    wordWrap: true,
  });
  for (const column of summary.columns) {
    table.push([
      column.name,
      column.type,
      formatNumber(column.missing, options.numbers),
      // Long level lists wrap over at most three lines, then are cut.
      clip(describeValues(column, options.numbers), rest * 3 - 6),
      column.protected ? style.caution("yes") : "",
    ]);
  }
  lines.push(...table.toString().split("\n"));
  return lines;
}

// The columns as a list: name, type, missing count and "protected" on one
// line, the levels or range below it (at most three lines).
function schemaList(summary: SchemaSummary, options: SchemaViewOptions): string[] {
  const { style } = options;
  const lines: string[] = [];
  const indent = "    ";
  for (const column of summary.columns) {
    lines.push(
      `${style.bold(column.name)}  ${column.type}, ` +
        `${formatNumber(column.missing, options.numbers)} missing` +
        (column.protected ? `, ${style.caution("protected")}` : ""),
    );
    const room = Math.max(20, options.width - indent.length);
    const values = wrapAnsi(clip(describeValues(column, options.numbers), room * 3 - 6), room, {
      hard: false,
    }).split("\n");
    lines.push(...values.map((l) => indent + l));
  }
  return lines;
}

function schemaNotes(summary: SchemaSummary, options: SchemaViewOptions): string[] {
  const { style } = options;
  const lines: string[] = [];
  const notes = [
    ...summary.notes,
    ...summary.columns.flatMap((c) => c.notes.map((n) => `${c.name}: ${n}`)),
  ];
  const width = options.width;
  if (notes.length > 0) {
    lines.push("", style.bold("Notes"));
    for (const note of notes) lines.push(...bullet("-", note, width).map(style.dim));
  }
  if (summary.warnings.length > 0) {
    lines.push("", style.bold(style.warn("Data-quality warnings")));
    for (const warning of summary.warnings) {
      lines.push(...bullet("!", warning.message, width).map(style.warn));
    }
  }
  const protectedNames = summary.columns.filter((c) => c.protected).map((c) => c.name);
  if (protectedNames.length > 0) {
    const caution = `Protected attributes (${protectedNames.join(", ")}) are kept out of pay ` +
      `estimates by default; they belong in the pay-gap check only.`;
    lines.push("", ...wrapAnsi(caution, width, { hard: true }).split("\n").map(style.caution));
  }
  return lines;
}

// A list item wrapped to the width, continuation lines indented under its text.
function bullet(mark: string, text: string, width: number): string[] {
  const indent = "    ";
  const wrapped = wrapAnsi(text, Math.max(20, width - indent.length), { hard: true }).split("\n");
  return wrapped.map((line, i) => (i === 0 ? `  ${mark} ${line}` : `${indent}${line}`));
}

function describeValues(column: ColumnSummary, numbers: NumberStyle): string {
  switch (column.type) {
    case "numeric": {
      if (column.min === undefined || column.max === undefined) return "";
      if (column.unit) {
        const money = { ...numbers, currency: numbers.currency ?? column.unit.currency };
        return `${formatMoney(column.min, money)} to ${formatMoney(column.max, money)} ` +
          `(${describeUnit(column.unit, money.currency)})`;
      }
      return `${formatNumber(column.min, numbers)} to ${formatNumber(column.max, numbers)}`;
    }
    case "ordinal":
      return `${column.levels!.length} levels: ${column.levels!.map(quoted).join(" < ")}`;
    case "categorical":
      return `${column.levels!.length} levels: ${column.levels!.map(quoted).join(", ")}`;
    case "identifier":
      return "one per row";
    case "constant":
      return column.value === undefined ? "all missing" : `always "${column.value}"`;
  }
}

// A level holding the list's separator is quoted: "Austin, TX".
function quoted(level: string): string {
  return /[,<]/.test(level) ? `"${level}"` : level;
}

function clip(text: string, width: number): string {
  return text.length <= width ? text : `${text.slice(0, width - 3)}...`;
}

/**
 * The schema in one line per column, for the guided flow's data check:
 * name, type, missing count and values (cut to the width), protected mark;
 * then the count of data-quality warnings and where to read them.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { describeSchema, loadTable } from "../../mod.ts";
 * import { renderSchemaBrief } from "./schema_view.ts";
 * import { makeStyle } from "./style.ts";
 * const summary = describeSchema(loadTable("level,pay\nL1,50000\nL2,61000\n"));
 * const lines = renderSchemaBrief(summary, { file: "t.csv", style: makeStyle(false), width: 80, numbers: {} });
 * assert(lines[1].startsWith("  level  ordinal") && lines.length === 3);
 * ```
 */
export function renderSchemaBrief(summary: SchemaSummary, options: SchemaViewOptions): string[] {
  const { style } = options;
  const name = Math.max(...summary.columns.map((c) => c.name.length));
  const lines = [
    style.bold(
      `${options.file}: ${formatNumber(summary.rows, options.numbers)} rows, ` +
        `${summary.columns.length} columns`,
    ),
  ];
  for (const column of summary.columns) {
    const missing = column.missing > 0
      ? `, ${formatNumber(column.missing, options.numbers)} missing`
      : "";
    const mark = column.protected ? style.caution(" [protected]") : "";
    const head = `  ${column.name.padEnd(name)}  ${column.type}${missing}: `;
    const room = Math.max(10, options.width - head.length - (column.protected ? 13 : 1));
    const values = describeValues(column, options.numbers);
    lines.push(
      `${head}${values.length > room ? `${values.slice(0, room - 3)}...` : values}${mark}`,
    );
  }
  if (summary.warnings.length > 0) {
    lines.push(
      style.warn(
        `! ${summary.warnings.length} data-quality warning${
          summary.warnings.length > 1 ? "s" : ""
        }` +
          ` (paygrove schema FILE lists them with line numbers)`,
      ),
    );
  }
  return lines;
}
