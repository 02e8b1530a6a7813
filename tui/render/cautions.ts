/**
 * The cautions every pay answer carries, and the provenance line.
 *
 * @module
 */

import wrapAnsi from "wrap-ansi";
import { GAP_CAUTIONS, type Provenance, type TableProvenance } from "../../mod.ts";
import { forTerminal, jsonText } from "./safe_text.ts";
import type { Style } from "./style.ts";

/** The usual cautions, wrapped to the width. */
export function cautionLines(style: Style, width: number): string[] {
  const text = "These figures describe what your current pay structure does, not what anyone " +
    "should be paid. Protected attributes are kept out of estimates unless you allowed them. " +
    "Defer to local law, counsel and licensed practice before acting on any figure.";
  return wrapAnsi(style.dim(text), width).split("\n");
}

/**
 * One line naming where a result came from.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { provenanceLine } from "./cautions.ts";
 * const line = provenanceLine({
 *   paygrove: "0.1.0", format: 1, created: "2026-12-02T10:00:00Z",
 *   table: { file: "pay.csv", sha256: "ab".repeat(32), rows: 10 }, seed: 1,
 * });
 * assert(line === "paygrove 0.1.0, model format 1, fitted 2026-12-02T10:00:00Z on pay.csv (sha256 abababababab...), seed 1");
 * ```
 */
export function provenanceLine(p: Provenance): string {
  return `paygrove ${p.paygrove}, model format ${p.format}, fitted ${p.created} on ` +
    `${p.table.file} (sha256 ${p.table.sha256.slice(0, 12)}...), seed ${p.seed}`;
}

/**
 * An answer's screen as printed by the model commands: its lines, then the
 * cautions and the provenance line, wrapped to the terminal.
 */
export function withCautions(
  lines: string[],
  provenance: Provenance,
  style: Style,
  width: number,
): string {
  return [
    ...lines,
    "",
    ...cautionLines(style, width),
    ...wrapAnsi(style.dim(provenanceLine(provenance)), width).split("\n"),
  ].join("\n");
}

/**
 * How the model commands print an answer: one JSON document with `--json`,
 * else the rendered lines with the cautions and the provenance.
 *
 * @param json The `--json` document (written with {@linkcode jsonText}).
 * @param render The text lines, drawn only when text is asked for, from
 * documents passed through {@linkcode forTerminal}.
 */
export function printAnswer(
  terminal: { out(text: string): void; style: Style; width: number },
  asJson: boolean,
  provenance: Provenance,
  json: unknown,
  render: () => string[],
): void {
  if (asJson) {
    terminal.out(jsonText(json));
    return;
  }
  terminal.out(withCautions(render(), forTerminal(provenance), terminal.style, terminal.width));
}

/**
 * One line naming the table a gap or review answer was computed from.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { tableProvenanceLine } from "./cautions.ts";
 * const line = tableProvenanceLine({
 *   paygrove: "0.1.0", table: { file: "pay.csv", sha256: "ab".repeat(32), rows: 10 }, seed: 1,
 * });
 * assert(line === "paygrove 0.1.0; pay.csv (sha256 abababababab...); seed 1");
 * ```
 */
export function tableProvenanceLine(p: TableProvenance): string {
  return `paygrove ${p.paygrove}; ${p.table.file} (sha256 ${p.table.sha256.slice(0, 12)}...); ` +
    `seed ${p.seed}`;
}

/**
 * How `gap` and `review` print: one JSON document with the pay-gap
 * cautions in it, or the rendered lines, the cautions, the provenance line
 * and any lines `after` (e.g. where a report went).
 */
export function printTableAnswer(
  terminal: { out(text: string): void; style: Style; width: number },
  asJson: boolean,
  doc: { provenance: TableProvenance },
  render: () => string[],
  after: string[] = [],
): void {
  if (asJson) {
    terminal.out(jsonText({ ...doc, cautions: GAP_CAUTIONS }));
    return;
  }
  const { style, width } = terminal;
  terminal.out(
    [
      ...render(),
      ...wrapAnsi(style.dim(GAP_CAUTIONS), width).split("\n"),
      ...wrapAnsi(style.dim(tableProvenanceLine(forTerminal(doc.provenance))), width).split("\n"),
      ...after,
    ].join("\n"),
  );
}

// Kept here too for the modules that import it from here.
export { jsonNumbers } from "./safe_text.ts";

/** The caution printed whenever protected attributes are allowed. */
export const PROTECTED_CAUTION = "Caution: --allow-protected lets sex, race, age and other " +
  "protected attributes shape pay estimates. Setting pay on them risks unlawful discrimination; " +
  "use such a model only to study gaps, with counsel.";
