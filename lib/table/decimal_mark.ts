/**
 * The decimal mark of a file, read from its cells where they settle it: a
 * semicolon-delimited export whose number-like cells read only with a
 * comma (`31.940,00 €`, `0,1`) is a decimal-comma file; one whose cells
 * read only with a point (`40.10`) is a decimal-point file. Where no cell
 * settles it (`1.500` reads as 1.5 or 1,500) or cells disagree, the point
 * stays, and the reading says it is ambiguous so that a caller can ask.
 *
 * Only semicolon files are judged: in a comma-delimited file a comma inside
 * a number must be quoted, and `"85,000"` there is grouping far more often
 * than a decimal.
 *
 * @module
 */

import { type DecimalMark, parseAmount } from "./amount.ts";

/**
 * How a table's decimal mark was chosen: given as an option, settled by the
 * file's cells, the point because nothing needed settling (or the file is
 * not semicolon-delimited), or the point although cells read differently
 * under the two marks and none settles which.
 */
export type DecimalMarkHow = "given" | "detected" | "default" | "ambiguous";

/** The decimal mark a table was read with, and how it was chosen. */
export interface DecimalMarkReading {
  /** The mark used. */
  mark: DecimalMark;
  /** How it was chosen. */
  how: DecimalMarkHow;
  /** A cell that settled it (detected) or that reads either way (ambiguous). */
  example?: string;
}

/**
 * Judges the decimal mark from number-like cell texts (each distinct text
 * once is enough).
 *
 * @param cells Texts of the file's cells (those with a digit and a point or comma matter).
 * @param delimiter The file's field delimiter; only `;` files are judged.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { judgeDecimalMark } from "./decimal_mark.ts";
 * assert.deepEqual(judgeDecimalMark(["31.940,00 €", "12"], ";"), {
 *   mark: ",", how: "detected", example: "31.940,00 €",
 * });
 * assert.deepEqual(judgeDecimalMark(["1.500"], ";"), { mark: ".", how: "ambiguous", example: "1.500" });
 * assert.deepEqual(judgeDecimalMark(["0,1"], ","), { mark: ".", how: "default" });
 * ```
 */
export function judgeDecimalMark(cells: Iterable<string>, delimiter: string): DecimalMarkReading {
  if (delimiter !== ";") return { mark: ".", how: "default" };
  let commaOnly: string | undefined;
  let pointOnly: string | undefined;
  let differ: string | undefined;
  for (const text of cells) {
    const comma = parseAmount(text, ",");
    const point = parseAmount(text, ".");
    if (comma !== undefined && point === undefined) commaOnly ??= text;
    else if (point !== undefined && comma === undefined) pointOnly ??= text;
    else if (comma !== undefined && point !== undefined && comma.value !== point.value) {
      differ ??= text;
    }
    if (commaOnly !== undefined && pointOnly !== undefined) break;
  }
  if (commaOnly !== undefined && pointOnly === undefined) {
    return { mark: ",", how: "detected", example: commaOnly };
  }
  if (pointOnly !== undefined && commaOnly === undefined) {
    return { mark: ".", how: "detected", example: pointOnly };
  }
  if (commaOnly !== undefined) return { mark: ".", how: "ambiguous", example: commaOnly };
  if (differ !== undefined) return { mark: ".", how: "ambiguous", example: differ };
  return { mark: ".", how: "default" };
}
