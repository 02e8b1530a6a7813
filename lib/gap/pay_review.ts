/**
 * The per-employee pay review behind `paygrove review`: for each person,
 * what the current pay structure pays people like them (the out-of-bag
 * estimate, from trees that never saw the person, so someone paid
 * differently is not hidden by their own pay), the range comparable people
 * earn, where their pay sits in it, and whether it is under or over; then,
 * per category of workers, how many are under range and what bringing
 * them up to the low end of their range would cost.
 *
 * The range is the default range of paygrove's estimates: the estimate
 * plus quantiles of out-of-bag log-pay residuals of people with similar
 * estimates (see grouped_range.ts).
 *
 * @module
 */

import { DataError, OptionError } from "../errors.ts";
import { fitDefaultEnsemble } from "../ensemble/fit_default.ts";
import { groupedRange } from "../ensemble/grouped_range.ts";
import { checkedPrivacyMin, outOfBagFigures, payRows } from "../model/pay_pipeline.ts";
import { checkCoverage } from "../model/model_session.ts";
import type { MoneyUnit, Table } from "../table/types.ts";
import {
  categoriesOf,
  oobRSquared,
  type TableProvenance,
  tableProvenance,
  withinColumns,
} from "./categories.ts";
import { suppressSmallGroups } from "./suppress.ts";
import { FEW_PEOPLE, WEAK_MODEL_R2 } from "./gap_check.ts";

/**
 * Relative tolerance of the comparison of pay with its range's ends.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "../../mod.ts";
 * import { payReview, RANGE_TOLERANCE } from "./pay_review.ts";
 * // A pay scale paid exactly: each level's range is one value, up to exp(log(pay)) rounding.
 * const scale = [40000, 50000, 60000];
 * const rows = Array.from({ length: 150 }, (_, i) => `G${1 + (i % 3)},${scale[i % 3]}`);
 * const review = await payReview(loadTable(`level,pay\n${rows.join("\n")}\n`), {
 *   target: "pay", trees: 10, workers: 1,
 * });
 * const placed = review.people.filter((p) => p.status !== null);
 * assert(placed.length > 0 && placed.every((p) => p.status === "within"));
 * assert(placed.every((p) => Math.abs(p.pay - p.low!) <= RANGE_TOLERANCE * p.high!));
 * ```
 */
export const RANGE_TOLERANCE = 1e-9;

/** Options of {@linkcode payReview}. */
export interface ReviewOptions {
  /** The pay column. */
  target: string;
  /** The factors (default: every usable column but protected ones). */
  features?: string[];
  /** Columns to leave out of the factors. */
  drop?: string[];
  /** Keep only rows matching these. */
  where?: Record<string, string[]>;
  /** Columns whose combinations are the categories summarised. */
  within?: string[];
  /** Share of comparable people's pay the range covers. @default {0.9} */
  coverage?: number;
  /** Fewest people in a category for its summary to be shown. @default {5} */
  privacyMin?: number;
  /** Trees. @default {200} */
  trees?: number;
  /** Fewest people in a leaf. @default {5} */
  minLeaf?: number;
  /** Seed. @default {1} */
  seed?: number;
  /** Workers. */
  workers?: number;
  /** Progress of the trees. */
  onProgress?: (done: number, total: number) => void;
}

/** Where one person's pay sits. */
export type ReviewStatus = "under" | "within" | "over";

/** One person of the table. */
export interface ReviewPerson {
  /** Identifier (or "line N" when the table has no identifier column). */
  id: string;
  /** Source line of the row. */
  line: number;
  /** Their pay. */
  pay: number;
  /** Out-of-bag estimate (typical pay of people like them); null when every tree drew them. */
  estimate: number | null;
  /** Low end of the range comparable people earn. */
  low: number | null;
  /** High end. */
  high: number | null;
  /**
   * (pay - low) / (high - low): 0 at the low end, 1 at the high end; null
   * without an estimate, or when the range has no width.
   */
  position: number | null;
  /** Under, within or over the range. */
  status: ReviewStatus | null;
  /** low - pay for people under range, else 0: the cost of bringing them to the low end. */
  shortfall: number;
}

/** One category's summary, or only its name when too few to report. */
export type ReviewCategory =
  | { name: string; suppressed: true }
  | { name: string; suppressed: false; people: number; under: number; over: number; cost: number };

/** What the review says besides its figures, as data; the terminal words each kind. */
export type ReviewNote =
  /** Categories too small to report, and those withheld so they cannot be worked out. */
  | { kind: "categoriesTooFew"; categories: string[]; privacyMin: number; alsoWithheld: string[] }
  /**
   * The ranges rest on little: fewer than {@linkcode FEW_PEOPLE} people
   * (`people`, else null), or an out-of-bag R² of log pay below
   * {@linkcode WEAK_MODEL_R2} (`r2` is always given).
   */
  | { kind: "fragileRanges"; people: number | null; r2: number };

/** Everything `paygrove review` reports. */
export interface PayReview {
  /** The pay column. */
  target: string;
  /** The range's coverage. */
  coverage: number;
  /** The pay column's currency and period, when known. */
  money: MoneyUnit | null;
  /** The factors used. */
  features: string[];
  /** The identifier column, when the table has one. */
  idColumn: string | null;
  /** Every person, in table order. */
  people: ReviewPerson[];
  /** Totals over everyone (withheld when suppression demands it). */
  overall:
    | { suppressed: false; people: number; under: number; over: number; cost: number }
    | { suppressed: true };
  /** The columns defining categories. */
  within: string[];
  /** Per category. */
  categories: ReviewCategory[];
  /** The privacy minimum. */
  privacyMin: number;
  /** Out-of-bag R^2 of log pay. */
  oobR2Log: number;
  /** What is withheld and how far to trust the ranges, as data (the terminal words them). */
  notes: ReviewNote[];
  /** Where the figures came from. */
  provenance: TableProvenance;
}

/**
 * Reviews every person's pay against the range of comparable people.
 *
 * @throws {OptionError} for options that do not fit the table.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, loadTable, payReview } from "../../mod.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 300, seed: 2 }), { target: "base_pay_eur" });
 * const review = await payReview(table, { target: "base_pay_eur", trees: 20, workers: 1 });
 * const under = review.people.filter((p) => p.status === "under");
 * assert(!review.overall.suppressed);
 * assert(Math.abs(review.overall.cost - under.reduce((s, p) => s + p.shortfall, 0)) < 1e-6);
 * ```
 */
export async function payReview(table: Table, options: ReviewOptions): Promise<PayReview> {
  const coverage = options.coverage ?? 0.9;
  const privacyMin = checkedPrivacyMin(options.privacyMin);
  const seed = options.seed ?? 1;
  const trees = options.trees ?? 200;
  // The same bounds as every answer's ranges (the terminal's --coverage).
  checkCoverage(coverage);
  // A column's type is the same before and after rows are kept.
  const payColumn = table.columns.find((c) => c.name === options.target);
  if (payColumn !== undefined && payColumn.type !== "numeric") {
    throw new OptionError(`{target}: "${options.target}" is not numeric; a review needs pay`);
  }
  const within = options.within ?? [];
  const { table: filtered, encoded, dataset, rowIndex } = payRows(table, {
    target: options.target,
    features: options.features,
    drop: options.drop,
    where: options.where,
    scale: "log",
  });
  const withinCols = withinColumns(filtered, within, [options.target]);
  if (encoded.features.length === 0) {
    throw new OptionError("no factors are left to compare people on; name them with {features}");
  }
  // Comparable people are those sharing a leaf: with fewer than two leaves'
  // worth of rows no tree can split, and every estimate would be the mean.
  const minLeaf = Math.max(options.minLeaf ?? 5, 1);
  if (encoded.rows < 2 * minLeaf) {
    throw new DataError(
      `only ${encoded.rows} ${encoded.rows === 1 ? "person has" : "people have"} pay; a review ` +
        `needs at least ${2 * minLeaf} (two groups of the fewest people in a leaf, ${minLeaf})`,
    );
  }
  const logPay = dataset.target.values as Float64Array;
  const { ensemble } = await fitDefaultEnsemble(dataset, {
    trees,
    seed,
    foldSeed: seed,
    workers: options.workers,
    grow: { minLeaf },
    onProgress: options.onProgress,
  });
  const oob = ensemble!.oob;
  // Each person's estimate is the median pay of people like them, as
  // \`estimate\` gives it; their range comes from the unshifted estimates.
  const { residuals: groups, center: { shift } } = outOfBagFigures(oob, logPay, privacyMin);
  const idColumn = filtered.columns.find((c) => c.type === "identifier");
  const people: ReviewPerson[] = Array.from(rowIndex, (tableRow, r) => {
    const pay = encoded.target.values[r];
    const id = idColumn?.type === "identifier" && idColumn.values[tableRow] !== ""
      ? idColumn.values[tableRow]
      : `line ${filtered.lines[tableRow]}`;
    if (Number.isNaN(oob[r])) {
      return {
        id,
        line: filtered.lines[tableRow],
        pay,
        estimate: null,
        low: null,
        high: null,
        position: null,
        status: null,
        shortfall: 0,
      };
    }
    const range = groupedRange(oob[r], groups, coverage);
    const low = Math.exp(range.low);
    const high = Math.exp(range.high);
    // exp(log(pay)) differs from pay in its last bits, so the range's ends
    // are compared with a relative tolerance: on a pay scale paid exactly
    // (everyone at a level earns the same) the range is one value, and the
    // people paid it are within it, not a rounding error under or over.
    const tolerance = RANGE_TOLERANCE * high;
    const status: ReviewStatus = pay < low - tolerance
      ? "under"
      : pay > high + tolerance
      ? "over"
      : "within";
    return {
      id,
      line: filtered.lines[tableRow],
      pay,
      estimate: Math.exp(oob[r] + shift),
      low,
      high,
      // A range of no width has no positions in it.
      position: high - low > tolerance ? (pay - low) / (high - low) : null,
      status,
      shortfall: status === "under" ? low - pay : 0,
    };
  });

  const summary = (members: number[]) => ({
    people: members.length,
    under: members.filter((i) => people[i].status === "under").length,
    over: members.filter((i) => people[i].status === "over").length,
    cost: members.reduce((s, i) => s + people[i].shortfall, 0),
  });
  const { names, members } = categoriesOf(withinCols, rowIndex);
  const suppression = suppressSmallGroups(
    withinCols.length > 0 ? members.map((m) => [m.length]) : [[people.length]],
    privacyMin,
  );
  const categories: ReviewCategory[] = names.map((name, c) =>
    suppression.hidden[c]
      ? { name, suppressed: true as const }
      : { name, suppressed: false as const, ...summary(members[c]) }
  );
  const oobR2Log = oobRSquared(logPay, oob);
  const notes: ReviewNote[] = [];
  const primary = names.filter((_, c) => suppression.primary[c]);
  const complementary = names.filter((_, c) => suppression.hidden[c] && !suppression.primary[c]);
  if (primary.length > 0) {
    notes.push({
      kind: "categoriesTooFew",
      categories: primary,
      privacyMin,
      alsoWithheld: complementary,
    });
  }
  if (oobR2Log < WEAK_MODEL_R2 || dataset.rows < FEW_PEOPLE) {
    notes.push({
      kind: "fragileRanges",
      people: dataset.rows < FEW_PEOPLE ? dataset.rows : null,
      r2: oobR2Log,
    });
  }
  return {
    target: options.target,
    coverage,
    money: payColumn?.type === "numeric" ? payColumn.money ?? null : null,
    features: dataset.features.map((f) => f.name),
    idColumn: idColumn?.name ?? null,
    people,
    overall: suppression.overallHidden
      ? { suppressed: true }
      : { suppressed: false, ...summary(people.map((_, i) => i)) },
    within,
    categories,
    privacyMin,
    oobR2Log,
    notes,
    provenance: tableProvenance(table, seed),
  };
}
