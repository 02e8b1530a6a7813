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

/** Asks what a cell that reads either way means; returns the file's decimal mark. */
export function askDecimalMark(io: FlowIO, reading: DecimalMarkReading): Promise<DecimalMark> {
  const example = reading.example ?? "";
  return io.choose(`What is "${terminalText(example)}" in this file?`, decimalChoices(example));
}
