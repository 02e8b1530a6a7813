/**
 * Plain aligned columns for tables drawn without borders: the first column
 * (a label) to the left, figures to the right.
 *
 * @module
 */

/** Options of {@linkcode alignColumns}. */
export interface AlignOptions {
  /** Spaces between columns. @default {2} */
  gap?: number;
  /** Whether the last column (e.g. flags) is aligned left too. @default {false} */
  lastLeft?: boolean;
  /**
   * A text that, alone after a row's label, spans the other columns and
   * does not widen them (e.g. "too few to report").
   */
  spanning?: string;
}

/**
 * Aligns rows of cells; trailing spaces are cut.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { alignColumns } from "./text_columns.ts";
 * const lines = alignColumns([["", "pay"], ["Sales", "50"], ["Kiln", "too few"]], { spanning: "too few" });
 * assert.deepEqual(lines, ["       pay", "Sales   50", "Kiln   too few"]);
 * ```
 */
export function alignColumns(rows: readonly string[][], options: AlignOptions = {}): string[] {
  const gap = " ".repeat(options.gap ?? 2);
  const spans = (r: readonly string[]) =>
    options.spanning !== undefined && r[1] === options.spanning &&
    r.slice(2).every((c) => c === "");
  const sized = rows.filter((r) => !spans(r));
  const widths = rows[0].map((_, j) =>
    Math.max(
      ...sized.map((r) => r[j].length),
      j === 0 ? Math.max(...rows.map((r) => r[0].length)) : 0,
    )
  );
  const left = (j: number) => j === 0 || (options.lastLeft === true && j === rows[0].length - 1);
  return rows.map((r) =>
    spans(r)
      ? `${r[0].padEnd(widths[0])}${gap}${r[1]}`
      : r.map((cell, j) => (left(j) ? cell.padEnd(widths[j]) : cell.padStart(widths[j])))
        // trimEnd, not a /\s+$/ replace: that regex is quadratic in a long
        // run of padding (a 10 MB cell took minutes).
        .join(gap).trimEnd()
  );
}
