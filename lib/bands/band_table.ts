/**
 * The band table of a pay structure: per cell (each combination of the
 * `by` attributes that occurs among the table's people), its people, their
 * current pay at inner quartiles, the model's estimate for the cell's
 * typical profile, and a proposed band (minimum, midpoint, maximum), with
 * the structure's measures along the ladder and who sits outside each band.
 *
 * The band, two ways:
 * - coverage (the default): the central interval of the pay the model
 *   implies for the cell's people (lib/bands/cell_band.ts), built to hold
 *   that share of them; the midpoint is that pay's middle (its median);
 * - spread: a fixed max / min - 1 around the same midpoint, the
 *   midpoint halfway between the ends (min = 2 mid / (2 + spread)).
 *
 * Midpoints rise with an ordinal first `by` attribute: where they do not,
 * within each combination of the other `by` attributes, the log midpoints
 * are smoothed by weighted isotonic regression (people as weights), the
 * band moved with its midpoint, and the raw midpoint kept beside it.
 *
 * Privacy: a cell of fewer than the privacy minimum of people shows no
 * figure, nor its count, and enough other cells are hidden with it that
 * the hidden ones hold at least the minimum together (lib/gap/suppress.ts);
 * current-pay quartiles are each the mean pay of the privacy minimum of
 * people nearest the quartile (no one's own pay); the cost of bringing
 * people up to the minimum is withheld when fewer than the minimum are
 * below it (it would be their shortfall).
 *
 * @module
 */

import { OptionError } from "../errors.ts";
import { mean, treeEstimates } from "../ensemble/intervals.ts";
import { toMoney } from "../ensemble/pay_scale.ts";
import { suppressSmallGroups } from "../gap/suppress.ts";
import { checkedPrivacyMin } from "../model/pay_pipeline.ts";
import { describeProfile, findFeature } from "../model/profile.ts";
import { typicalValue } from "../model/fit_model.ts";
import type { ModelRows } from "../model/model_table.ts";
import { type ModelSession, shiftedMoney } from "../model/model_session.ts";
import {
  type Band,
  bandOverlap,
  midpointProgression,
  type OutsideBand,
  outsideBand,
  rangeSpread,
} from "./band_measures.ts";
import { mixtureBand, mixtureQuantile } from "./cell_band.ts";
import { increasingFit } from "./isotonic.ts";
import { isTenureName } from "./posting_range.ts";

/** Options of {@linkcode bandTable}. */
export interface BandTableOptions {
  /** The attributes whose combinations are the cells; the first is the ladder. */
  by: string[];
  /** Share of a cell's people the band is built to hold. @default {0.8} */
  coverage?: number;
  /** A fixed range spread (max / min - 1) instead of a coverage. */
  spread?: number;
  /** Fewest people a cell needs to show figures. @default {5} */
  privacyMin?: number;
  /**
   * The typical profile as a new hire: attributes that measure time with
   * the employer (`isTenureName`) at their lowest value in the model's table.
   * @default {false}
   */
  newHire?: boolean;
}

/** One cell of the band table. */
export type BandCell =
  | { key: string[]; suppressed: true }
  | {
    key: string[];
    suppressed: false;
    /** The cell's people with pay in the table. */
    people: number;
    /** Current pay at the quartiles, each the mean pay of the privacy minimum of people nearest it. */
    currentPay: { p25: number; median: number; p75: number };
    /** The model's estimate for the cell's typical profile (money). */
    typicalEstimate: number;
    /** The cell's typical profile: the `by` values, then each other attribute's median or most common level. */
    typicalProfile: Record<string, string | number | null>;
    /** The proposed band (money). */
    band: Band;
    /** Its range spread, max / min - 1. */
    spread: number;
    /** The midpoint before smoothing along the ladder. */
    rawMid: number;
    /** Who sits outside the band; the cost is null when fewer than the privacy minimum are below. */
    outside: Omit<OutsideBand, "costToMinimum"> & { costToMinimum: number | null };
  };

/** The whole band table. */
export interface BandTable {
  /** The `by` attributes. */
  by: string[];
  /** How the bands were built. */
  method: { kind: "coverage"; coverage: number } | { kind: "spread"; spread: number };
  /** The privacy minimum. */
  privacyMin: number;
  /** Cells in ladder order within each combination of the other `by` attributes. */
  cells: BandCell[];
  /** Whether each cell's typical profile is a new hire's. */
  newHire: boolean;
  /** Whether any midpoint was moved to make midpoints rise with the ladder. */
  smoothed: boolean;
  /**
   * Per run of shown cells along the ladder (one per combination of the
   * other `by` attributes): midpoint progression and overlap with the next.
   */
  ladders: { key: string[]; levels: string[]; progression: number[]; overlap: number[] }[];
  /** Rows of the table without pay, left out. */
  withoutPay: number;
  /**
   * Rows left out because the model cannot score them (a level it never
   * saw), and the first of them; none when every row could be read.
   */
  notScored: { rows: number; first: { line: number; reasons: string[] } | null };
}

/**
 * Builds the band table from a model and a table of current people (read
 * for the model, with pay).
 *
 * @throws {OptionError} for a `by` attribute the model lacks, a table
 *   without pay, or a model without an ensemble.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable, openModel, readForModel } from "../../mod.ts";
 * import { bandTable } from "./band_table.ts";
 * const csv = demoCompanyCsv({ rows: 600, seed: 4 });
 * const model = await fitModel(loadTable(csv, { target: "base_pay_eur" }), {
 *   target: "base_pay_eur", trees: 20, folds: 3, workers: 1,
 * });
 * const table = bandTable(openModel(model), readForModel(model, csv, "demo.csv"), { by: ["level"] });
 * const shown = table.cells.filter((c) => !c.suppressed);
 * assert(shown.length >= 5);
 * for (const c of shown) {
 *   if (c.suppressed) continue;
 *   assert(c.band.min < c.band.mid && c.band.mid < c.band.max);
 * }
 * // Midpoints rise along the ladder.
 * const mids = shown.map((c) => (c.suppressed ? 0 : c.band.mid));
 * assert(mids.every((m, i) => i === 0 || m >= mids[i - 1]));
 * ```
 */
export function bandTable(
  session: ModelSession,
  rows: ModelRows,
  options: BandTableOptions,
): BandTable {
  const { model, reader } = session;
  if (reader === null) {
    throw new OptionError(
      "bands need a model with an ensemble of pay; this one has its reference tree only",
    );
  }
  if (rows.target === null) {
    throw new OptionError(
      `bands need current pay: the table has no "${model.target.name}" column`,
    );
  }
  if (options.by.length === 0) throw new OptionError("{by}: name at least one attribute");
  const privacyMin = checkedPrivacyMin(options.privacyMin);
  const coverage = options.coverage ?? 0.8;
  if (!(coverage >= 0.5 && coverage < 1)) {
    throw new OptionError(`{coverage} must be from 0.5 to 0.99, got ${coverage}`);
  }
  if (options.spread !== undefined && !(options.spread > 0 && options.spread <= 3)) {
    throw new OptionError(`{spread} must be above 0 and at most 3 (300%), got ${options.spread}`);
  }
  const byIndex = options.by.map((name) => findFeature(model, name, "by"));
  const byFeatures = byIndex.map((j) => model.features[j]);
  for (const f of byFeatures) {
    if (f.kind === "numeric") {
      throw new OptionError(
        `{by}: "${f.name}" is numeric; cells need levels (a level, a family, a site)`,
      );
    }
  }
  const pay = rows.target;
  const scale = model.target.scale;

  // Cells: each combination that occurs among people with pay, ladder last
  // in the sort so a ladder's levels sit together.
  const cellOf = new Map<string, number[]>();
  let withoutPay = 0;
  const refused = new Set((rows.refused ?? []).map((x) => x.row));
  for (let r = 0; r < rows.rows; r++) {
    if (refused.has(r)) continue;
    if (!(pay[r] > 0) || byIndex.some((j) => Number.isNaN(rows.features[j][r]))) {
      withoutPay++;
      continue;
    }
    const codes = byIndex.map((j) => rows.features[j][r]);
    const key = [...codes.slice(1), codes[0]].join(",");
    const members = cellOf.get(key);
    if (members === undefined) cellOf.set(key, [r]);
    else members.push(r);
  }
  const keys = [...cellOf.keys()].sort((a, b) => {
    const x = a.split(",").map(Number);
    const y = b.split(",").map(Number);
    for (let i = 0; i < x.length; i++) if (x[i] !== y[i]) return x[i] - y[i];
    return 0;
  });
  const members = keys.map((k) => cellOf.get(k)!);
  const codesOf = keys.map((k) => {
    const c = k.split(",").map(Number);
    return [c[c.length - 1], ...c.slice(0, -1)];
  });
  const names = codesOf.map((codes) => codes.map((code, i) => byFeatures[i].levels![code]));
  const suppression = suppressSmallGroups(members.map((m) => [m.length]), privacyMin);

  // Each person's range centre (the trees' mean, unshifted, as readProfile centres a range).
  const profile = new Float64Array(model.features.length);
  const centreOf = (r: number) => {
    for (let j = 0; j < profile.length; j++) profile[j] = rows.features[j][r];
    return mean(treeEstimates(reader.ensemble, profile));
  };

  const built = members.map((rowsOfCell, c) => {
    if (suppression.hidden[c]) return null;
    const centres = rowsOfCell.map(centreOf);
    const mid = mixtureQuantile(centres, reader.groups, 0.5, coverage);
    const ends = options.spread === undefined
      ? mixtureBand(centres, reader.groups, coverage)
      : null;
    const typical = typicalOf(session, rows, rowsOfCell, options.newHire ?? false);
    return { centres, mid, ends, typical };
  });

  // Midpoints along the ladder, within each combination of the other attributes.
  const logMid = built.map((
    b,
  ) => (b === null ? NaN : scale === "log" ? b.mid : Math.log(toMoney(b.mid, scale))));
  const smoothedMid = Float64Array.from(logMid);
  const ladderKeys = new Map<string, number[]>();
  codesOf.forEach((codes, c) => {
    if (built[c] === null) return;
    const rest = codes.slice(1).join(",");
    const list = ladderKeys.get(rest);
    if (list === undefined) ladderKeys.set(rest, [c]);
    else list.push(c);
  });
  let smoothed = false;
  if (byFeatures[0].kind === "ordinal") {
    for (const cells of ladderKeys.values()) {
      const fit = increasingFit(cells.map((c) => logMid[c]), cells.map((c) => members[c].length));
      cells.forEach((c, i) => {
        if (fit[i] !== logMid[c]) smoothed = true;
        smoothedMid[c] = fit[i];
      });
    }
  }

  const cells: BandCell[] = members.map((rowsOfCell, c) => {
    const b = built[c];
    if (b === null) return { key: names[c], suppressed: true as const };
    const shift = smoothedMid[c] - logMid[c];
    const inMoney = (v: number) => toMoney(v, scale);
    const rawMid = inMoney(b.mid);
    const mid = rawMid * Math.exp(shift);
    let band: Band;
    if (b.ends !== null) {
      band = {
        min: inMoney(b.ends.low) * Math.exp(shift),
        mid,
        max: inMoney(b.ends.high) * Math.exp(shift),
      };
    } else {
      const min = (2 * mid) / (2 + options.spread!);
      band = { min, mid, max: min * (1 + options.spread!) };
    }
    const pays = Float64Array.from(rowsOfCell, (r) => pay[r]).sort();
    const outside = outsideBand(pays, band);
    return {
      key: names[c],
      suppressed: false as const,
      people: rowsOfCell.length,
      currentPay: {
        p25: nearestMean(pays, 0.25, privacyMin),
        median: nearestMean(pays, 0.5, privacyMin),
        p75: nearestMean(pays, 0.75, privacyMin),
      },
      typicalEstimate: b.typical.estimate,
      typicalProfile: b.typical.profile,
      band,
      spread: rangeSpread(band),
      rawMid,
      outside: {
        below: outside.below,
        above: outside.above,
        costToMinimum: outside.below >= privacyMin ? outside.costToMinimum : null,
      },
    };
  });

  const ladders = [...ladderKeys.values()].map((list) => {
    const bands = list.map((c) => (cells[c] as Extract<BandCell, { suppressed: false }>).band);
    return {
      key: names[list[0]].slice(1),
      levels: list.map((c) => names[c][0]),
      progression: midpointProgression(bands),
      overlap: bandOverlap(bands),
    };
  });

  return {
    by: byFeatures.map((f) => f.name),
    method: options.spread === undefined
      ? { kind: "coverage", coverage }
      : { kind: "spread", spread: options.spread },
    privacyMin,
    newHire: options.newHire ?? false,
    cells,
    smoothed,
    ladders,
    withoutPay,
    notScored: {
      rows: refused.size,
      first: rows.refused?.[0] === undefined
        ? null
        : { line: rows.refused[0].line, reasons: rows.refused[0].reasons },
    },
  };
}

// The mean of the `k` sorted values nearest the quantile `p` (type 7
// position), so that no figure is one person's value.
function nearestMean(sorted: Float64Array, p: number, k: number): number {
  const n = sorted.length;
  const take = Math.min(k, n);
  const centre = p * (n - 1);
  let from = Math.round(centre - (take - 1) / 2);
  from = Math.max(0, Math.min(n - take, from));
  let sum = 0;
  for (let i = from; i < from + take; i++) sum += sorted[i];
  return sum / take;
}

// The cell's typical profile: each attribute's typical value among its
// people (the median number or most common level, as a model's own typical
// profile), the `by` values thereby the cell's own; and the model's estimate
// for it (money, as `estimate` gives it).
function typicalOf(
  session: ModelSession,
  rows: ModelRows,
  rowsOfCell: number[],
  newHire: boolean,
): { estimate: number; profile: Record<string, string | number | null> } {
  const { model, reader } = session;
  const profile = Float64Array.from(model.features, (feature, j) => {
    if (
      newHire && feature.kind === "numeric" && feature.range !== undefined &&
      isTenureName(feature.name)
    ) return feature.range.min;
    return typicalValue(Float64Array.from(rowsOfCell, (r) => rows.features[j][r]), feature.kind);
  });
  return {
    estimate: shiftedMoney(model, mean(treeEstimates(reader!.ensemble, profile))),
    profile: describeProfile(model, profile),
  };
}
