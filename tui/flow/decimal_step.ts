/**
 * The flow's question for a file whose cells do not settle the decimal
 * mark: what one such cell means, each answer shown as the number it makes.
 *
 * @module
 */

import { type DecimalMark, type DecimalMarkReading, parseAmount } from "../../mod.ts";
import { formatNumber } from "../render/numbers.ts";
import { terminalText } from "../render/safe_text.ts";
import type { FlowIO } from "./flow_io.ts";

/**
 * The choices for a cell that reads either way: the number under a point,
 * then under a comma.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { decimalChoices } from "./decimal_step.ts";
 * assert.deepEqual(decimalChoices("1.500").map((c) => c.name), [
 *   "1.5 (a decimal point)",
 *   "1,500 (the point groups thousands: a decimal comma)",
 * ]);
 * ```
 */
export function decimalChoices(example: string): { name: string; value: DecimalMark }[] {
  const asPoint = parseAmount(example, ".")?.value;
  const asComma = parseAmount(example, ",")?.value;
  const number = (value: number | undefined) =>
    value === undefined ? "not a number" : formatNumber(value, {}, 6);
  return [
    { name: `${number(asPoint)} (a decimal point)`, value: "." },
    {
      name: `${number(asComma)} (${
        example.includes(".") ? "the point groups thousands: " : ""
      }a decimal comma)`,
      value: ",",
    },
  ];
}

/**
 * Asks what a cell that reads either way means; returns the file's decimal mark.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "../../mod.ts";
 * import { makeStyle } from "../render/style.ts";
 * import type { FlowIO } from "./flow_io.ts";
 * import { askDecimalMark } from "./decimal_step.ts";
 * const table = loadTable("level;pay\nL1;1.500\nL2;2.250\nL1;1.750\n");
 * assert.equal(table.source.decimal!.how, "ambiguous");
 * const asked: string[] = [];
 * // A flow I/O that answers the second choice (a decimal comma).
 * const io: FlowIO = {
 *   say: () => {}, style: makeStyle(false), width: 80, ascii: false,
 *   choose: (message, choices) => (asked.push(message), Promise.resolve(choices[1].value)),
 *   tick: () => Promise.resolve([]),
 *   ask: () => Promise.resolve(""),
 * };
 * assert.equal(await askDecimalMark(io, table.source.decimal!), ",");
 * assert.deepEqual(asked, ['What is "1.500" in this file?']);
 * ```
 */
export function askDecimalMark(io: FlowIO, reading: DecimalMarkReading): Promise<DecimalMark> {
  const example = reading.example ?? "";
  return io.choose(`What is "${terminalText(example)}" in this file?`, decimalChoices(example));
}
