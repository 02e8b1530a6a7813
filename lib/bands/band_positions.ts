/**
 * Each person's place in their cell's band: compa-ratio (pay / midpoint)
 * and range position ((pay - min) / (max - min)). These are one person's
 * pay in another form, so they belong in the analyst's own per-person file
 * only, never in a table that is shared (lib/bands/band_table.ts shows only
 * counts and figures of at least the privacy minimum of people).
 *
 * @module
 */

import type { ModelRows } from "../model/model_table.ts";
import type { Model } from "../model/types.ts";
import { findFeature } from "../model/profile.ts";
import { type Band, compaRatio, rangePosition } from "./band_measures.ts";
import type { BandCell, BandTable } from "./band_table.ts";

/** One person's place in their cell's band. */
export interface BandPosition {
  /** The row in the table (0-based). */
  row: number;
  /** The row's identifier ("" without an identifier column). */
  id: string;
  /** The person's cell: their values of the band table's `by` attributes. */
  key: string[];
  /** Current pay (money). */
  pay: number;
  /** The cell's band; null when the cell shows no figures (fewer than the privacy minimum). */
  band: Band | null;
  /** pay / midpoint; null without a band. */
  compaRatio: number | null;
  /** (pay - min) / (max - min): 0 at the minimum, 1 at the maximum; null without a band. */
  rangePosition: number | null;
  /** Below the minimum, inside the band, above the maximum; null without a band. */
  place: "below" | "inside" | "above" | null;
}

/**
 * Every person with pay in the table, in table order, placed in the band of
 * their cell of `table` (built by `bandTable` from the same rows); rows the
 * model cannot score (`rows.refused`) are left out, as the table leaves them.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable, openModel, readForModel } from "../../mod.ts";
 * import { bandTable } from "./band_table.ts";
 * import { bandPositions } from "./band_positions.ts";
 * const csv = demoCompanyCsv({ rows: 400, seed: 4 });
 * const model = await fitModel(loadTable(csv, { target: "base_pay_eur" }), {
 *   target: "base_pay_eur", trees: 10, folds: 3, workers: 1,
 * });
 * const rows = readForModel(model, csv, "demo.csv");
 * const table = bandTable(openModel(model), rows, { by: ["level"] });
 * const people = bandPositions(model, rows, table);
 * assert.equal(people.length, 400);
 * const p = people.find((x) => x.band !== null)!;
 * assert.equal(p.compaRatio, p.pay / p.band!.mid);
 * ```
 */
export function bandPositions(model: Model, rows: ModelRows, table: BandTable): BandPosition[] {
  const byIndex = table.by.map((name) => findFeature(model, name, "by"));
  const cellOf = new Map<string, BandCell>();
  for (const cell of table.cells) cellOf.set(JSON.stringify(cell.key), cell);
  const pay = rows.target;
  if (pay === null) return [];
  const out: BandPosition[] = [];
  const refused = new Set((rows.refused ?? []).map((x) => x.row));
  for (let r = 0; r < rows.rows; r++) {
    if (!(pay[r] > 0) || refused.has(r)) continue;
    const codes = byIndex.map((j) => rows.features[j][r]);
    if (codes.some(Number.isNaN)) continue;
    const key = codes.map((code, i) => model.features[byIndex[i]].levels![code]);
    const cell = cellOf.get(JSON.stringify(key));
    const band = cell === undefined || cell.suppressed ? null : cell.band;
    out.push({
      row: r,
      id: rows.ids[r] ?? "",
      key,
      pay: pay[r],
      band,
      compaRatio: band === null ? null : compaRatio(pay[r], band),
      rangePosition: band === null ? null : rangePosition(pay[r], band),
      place: band === null
        ? null
        : pay[r] < band.min
        ? "below"
        : pay[r] > band.max
        ? "above"
        : "inside",
    });
  }
  return out;
}
