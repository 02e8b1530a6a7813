/**
 * The pay-gap check behind `paygrove gap`: raw mean and median gaps and pay
 * quartiles (Directive (EU) 2023/970, Article 3(1)(c), (e), (f)), the
 * adjusted gap by partialling out with bagged trees (see partial_out.ts),
 * the simple difference of out-of-bag pay residuals and the linear version
 * beside it, flags, possible proxies, and small-group suppression, overall
 * and per category of workers the user defines.
 *
 * Everything is plain data, ready for text, Markdown or JSON.
 *
 * @module
 */

import type { Dataset } from "../dataset/types.ts";
import { OptionError } from "../errors.ts";
import { fitDefaultEnsemble } from "../ensemble/fit_default.ts";
import type { Ensemble } from "../ensemble/fit_ensemble.ts";
import { checkedPrivacyMin, payRows } from "../model/pay_pipeline.ts";
import { designOf, type DesignTerm } from "../linear/design.ts";
import { fitLeastSquares } from "../linear/least_squares.ts";
import { filterRows, subsetRows } from "../table/filter_rows.ts";
import { columnNamed } from "../table/column_named.ts";
import { nameWords } from "../table/protected_names.ts";
import { isPayName } from "../table/money.ts";
import type { LevelColumn, NumericColumn, Table } from "../table/types.ts";
import {
  categoriesOf,
  oobRSquared,
  type TableProvenance,
  tableProvenance,
  withinColumns,
} from "./categories.ts";
import { gapFromCoefficient, holmAdjust, residualRegression, twoSidedP } from "./partial_out.ts";
import {
  oobBalancedAccuracy,
  PROXY_THRESHOLD,
  type ProxyFigure,
  proxyFigures,
} from "../ensemble/proxies.ts";
import { type PayQuartile, payQuartiles, rawGaps } from "./raw_gaps.ts";
import { type Suppression, suppressSmallGroups } from "./suppress.ts";
import { decomposeGap, type GapDecompositionReport } from "./decompose_gap.ts";

/** Options of {@linkcode gapCheck}. */
export interface GapOptions {
  /** The pay column. */
  target: string;
  /** The column of groups compared (e.g. gender). */
  group: string;
  /** The reference group (default: men for a sex or gender column, else the largest group). */
  reference?: string;
  /** The groups compared with the reference (default: all); people of other groups are left out. */
  compare?: string[];
  /** Columns whose combinations are the categories of workers (e.g. job family, level). */
  within?: string[];
  /** The legitimate factors (default: every usable column but protected ones). */
  features?: string[];
  /** Columns to leave out of the factors. */
  drop?: string[];
  /** Keep only rows matching these. */
  where?: Record<string, string[]>;
  /** A column of variable pay, gapped beside base pay. */
  variable?: string;
  /** Raw mean gap from which a category is flagged. @default {0.05} */
  threshold?: number;
  /** Smallest adjusted gap that is flagged when it is significant. @default {0.02} */
  materiality?: number;
  /** Fewest people of any group for a category to be shown. @default {5} */
  privacyMin?: number;
  /** Balanced accuracy from which a feature is named a possible proxy. @default {0.65} */
  proxyThreshold?: number;
  /** Trees in each of the two ensembles. @default {200} */
  trees?: number;
  /** Fewest people in a leaf. @default {5} */
  minLeaf?: number;
  /** Seed. @default {1} */
  seed?: number;
  /** Workers. */
  workers?: number;
  /**
   * Split each group's raw gap by factor (lib/gap/decompose_gap.ts: two
   * more ensembles and the contributions).
   * @default {true}
   */
  decompose?: boolean;
  /** Progress of the stages. */
  onProgress?: (
    stage: "pay model" | "group model" | "proxies" | "pooled model" | "group chances",
    done: number,
    total: number,
  ) => void;
}

/** One group against the reference group, in one category or overall. */
export interface GapFigure {
  /** The group. */
  group: string;
  /** People in the group. */
  rows: number;
  /** People in the reference group. */
  referenceRows: number;
  /** Raw mean gap: (reference mean - group mean) / reference mean; 0.05 = the group earns 5% less. */
  rawMean: number;
  /** Raw median gap, the same with medians. */
  rawMedian: number;
  /** Raw mean gap of variable pay (with `variable`), else null. */
  variableMean: number | null;
  /** Raw median gap of variable pay (with `variable`), else null. */
  variableMedian: number | null;
  /** Adjusted (unexplained) gap 1 - exp(b); null where it cannot be estimated. */
  adjusted: number | null;
  /** Low end of its confidence interval. */
  low: number | null;
  /** High end of its confidence interval. */
  high: number | null;
  /**
   * The interval at the family-wise level of the Holm flags: per category,
   * Bonferroni over the m figures shown (each at 1 - 0.05 / m), so that an
   * interval excluding 0 always comes with a significant Holm test (Holm
   * rejects whatever Bonferroni does; it may also flag a figure whose
   * family-wise interval touches 0). Overall: the 95% interval (one test).
   */
  familyLow: number | null;
  /** High end of the family-wise interval. */
  familyHigh: number | null;
  /** The figures in the family (1 overall; the figures shown per category). */
  family: number;
  /** b in log points. */
  coefficient: number | null;
  /** Robust standard error of b. */
  se: number | null;
  /** Two-sided p-value of b = 0. */
  p: number | null;
  /** Holm-adjusted p-value across the categories shown (overall: unadjusted). */
  pAdjusted: number | null;
  /** 1 - exp(difference of the groups' mean out-of-bag log-pay residuals). */
  residualDifference: number | null;
  /** The raw mean gap is at least the threshold in size. */
  rawFlag: boolean;
  /** The adjusted gap differs from 0 at the 5% level (Holm) and is at least the materiality. */
  unexplainedFlag: boolean;
}

/** A category of workers: its figures, or only its name when too few to report. */
export type GapCategory =
  | { name: string; suppressed: true }
  | { name: string; suppressed: false; rows: number; gaps: GapFigure[] };

/** One group's coefficient from a regression over everyone. */
export interface GapRegression {
  /** The group. */
  group: string;
  /** b in log points. */
  coefficient: number;
  /** Its standard error. */
  se: number;
  /** 100 (1 - exp(b)): the gap in percent. */
  percent: number;
  /** The gap 1 - exp(b) as a fraction. */
  gap: number;
  /** Low end of its confidence interval (fraction). */
  low: number;
  /** High end (fraction). */
  high: number;
  /** Two-sided p-value of b = 0. */
  p: number;
}

/** Everything `paygrove gap` reports. */
export interface GapReport {
  /** The pay column. */
  target: string;
  /** The pay column's currency (ISO 4217 code), where the table or the options state it. */
  currency: string | null;
  /** The group column. */
  group: string;
  /** The reference group. */
  reference: string;
  /** Why that reference group. */
  referenceReason: string;
  /** Groups compared with the reference. */
  groups: string[];
  /** Columns defining the categories. */
  within: string[];
  /** The variable-pay column, when asked. */
  variable: string | null;
  /** The raw-gap threshold. */
  threshold: number;
  /** The materiality of the adjusted gap. */
  materiality: number;
  /** The privacy minimum. */
  privacyMin: number;
  /** Confidence level of the intervals. */
  confidence: number;
  /** People analysed (pay and group known). */
  rows: number;
  /** Rows left out because the group is missing. */
  missingGroup: number;
  /**
   * People of groups not compared: those left out by the groups named, and
   * groups with fewer than the privacy minimum of people (`tooFew`, named
   * but never counted). `people` is null when fewer than the privacy
   * minimum are left out this way (the number would be a small group's
   * size); then no count in the report, nor the table's row count in its
   * provenance, tells it.
   */
  leftOut: { people: number | null; tooFew: string[] };
  /** Overall figures, or withheld. */
  overall: { suppressed: false; rows: number; gaps: GapFigure[] } | { suppressed: true };
  /**
   * Pay quartiles (null when the overall figures are withheld, or when a
   * quartile would hold fewer than the privacy minimum of people).
   */
  quartiles: PayQuartile[] | null;
  /** The partialling-out regression over everyone, first compared group (null when withheld). */
  regression: GapRegression | null;
  /** The same for every compared group. */
  regressions: GapRegression[];
  /** Log pay on the factors plus group indicators (ordinary least squares, HC1 errors). */
  linear: GapRegression[] | null;
  /**
   * Terms the linear version left out as combinations of other columns
   * (a group left out has no linear figure).
   */
  linearAliased: DesignTerm[];
  /** Per category. */
  categories: GapCategory[];
  /** The legitimate factors the adjustment used. */
  features: string[];
  /** Features that on their own predict the group with balanced accuracy at or above the threshold. */
  proxies: ProxyFigure[];
  /** The proxy threshold used. */
  proxyThreshold: number;
  /** How well the two ensembles did out of bag. */
  models: { trees: number; payR2Log: number; groupBalancedAccuracy: number };
  /**
   * Each compared group's raw gap in mean log pay split into the part each
   * factor explains, the part none explains and the rest, overall only
   * (null when the overall figures are withheld, or when not asked).
   */
  decomposition: GapDecompositionReport | null;
  /** What is withheld and how far to trust the adjusted gap, as data (the terminal words them). */
  notes: GapNote[];
  /** Where the figures came from. */
  provenance: TableProvenance;
}

/**
 * Below this out-of-bag R-squared of log pay, the adjusted gap is flagged as fragile.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "../../mod.ts";
 * import { gapCheck, WEAK_MODEL_R2 } from "./gap_check.ts";
 * // Pay that no factor explains (level has no bearing on it).
 * const rows = Array.from({ length: 120 }, (_, i) =>
 *   `${i % 2 ? "Woman" : "Man"},G${1 + (i % 3)},${40000 + ((i * 7919) % 10007)}`);
 * const table = loadTable(`gender,level,pay\n${rows.join("\n")}\n`);
 * const report = await gapCheck(table, { target: "pay", group: "gender", trees: 10, workers: 1 });
 * const note = report.notes.find((n) => n.kind === "fragileAdjustment");
 * assert(note?.kind === "fragileAdjustment" && note.r2 !== null && note.r2 < WEAK_MODEL_R2);
 * assert.equal(note.r2, report.models.payR2Log);
 * ```
 */
export const WEAK_MODEL_R2 = 0.5;
/**
 * Below this many people, the adjusted gap is flagged as fragile.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, loadTable } from "../../mod.ts";
 * import { FEW_PEOPLE, gapCheck } from "./gap_check.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 80, seed: 3 }));
 * const report = await gapCheck(table, {
 *   target: "base_pay_eur", group: "gender", trees: 10, workers: 1,
 * });
 * const note = report.notes.find((n) => n.kind === "fragileAdjustment");
 * assert(note?.kind === "fragileAdjustment" && note.people !== null);
 * assert(note.people < FEW_PEOPLE && note.people === report.rows);
 * ```
 */
export const FEW_PEOPLE = 100;

/**
 * The sources cited under every gap report.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { GAP_SOURCES } from "./gap_check.ts";
 * // Each figure's source is named: the Directive's articles, or authors with year and journal.
 * assert.match(GAP_SOURCES[0], /Directive \(EU\) 2023\/970, Article 3\(1\)/);
 * for (const source of GAP_SOURCES.slice(1)) {
 *   assert.match(source, /[A-Z][a-z]+.* \((19|20)\d\d\), /);
 * }
 * ```
 */
export const GAP_SOURCES = [
  "Raw mean and median gaps and pay quartiles: Directive (EU) 2023/970, Article 3(1)(c), (e) and (f); " +
  "the 5% threshold: Article 10(1).",
  "Adjusted gap by partialling out: Robinson (1988), Econometrica 56(4); Chernozhukov et al. " +
  "(2018), The Econometrics Journal 21(1). Robust standard errors: White (1980), Econometrica 48(4).",
  "Multiple categories: Holm (1979), Scandinavian Journal of Statistics 6(2).",
  "Bagged trees: Breiman (1996), Machine Learning 24(2).",
  "The raw gap split by factor: Oaxaca (1973), International Economic Review 14(3); Blinder " +
  "(1973), Journal of Human Resources 8(4); pooled with a group indicator: Neumark (1988), " +
  "Journal of Human Resources 23(3), Fortin (2008), Journal of Human Resources 43(4), Jann " +
  "(2008), The Stata Journal 8(4); each factor's part: Lundberg et al. (2020), Nature Machine " +
  "Intelligence 2; the unexplained part's correction: Robins, Rotnitzky and Zhao (1994), " +
  "Journal of the American Statistical Association 89(427).",
];

/**
 * The cautions every gap and review output carries.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { GAP_CAUTIONS } from "./gap_check.ts";
 * // Both ways: an unexplained gap proves nothing, nor does an explained one.
 * assert.match(GAP_CAUTIONS, /not proof of discrimination.*not proof of its absence/);
 * assert.match(GAP_CAUTIONS, /not legal advice/);
 * ```
 */
export const GAP_CAUTIONS = "These figures describe the table as it is. A gap the model does not " +
  "explain is not proof of discrimination, and an explained gap is not proof of its absence: " +
  "the factors themselves (level, performance rating) can carry bias. Rules differ by country " +
  "and change. This is not legal advice; consult counsel or a qualified pay-equity practitioner " +
  "before acting.";

/**
 * Runs the gap check on a loaded table.
 *
 * @throws {OptionError} for options that do not fit the table.
 * @throws {DataError} for pay at or below zero (logs are taken).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, gapCheck, loadTable } from "../../mod.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 400, seed: 3 }), { target: "base_pay_eur" });
 * const report = await gapCheck(table, {
 *   target: "base_pay_eur", group: "gender", trees: 20, workers: 1,
 * });
 * assert(report.reference === "Man" && report.features.every((f) => f !== "gender"));
 * ```
 */
export async function gapCheck(table: Table, options: GapOptions): Promise<GapReport> {
  const settings = gapSettings(options);
  // 1. Who is compared: people with pay and a group, groups large enough.
  const who = comparedPeople(table, options, settings.privacyMin);
  // 2. Residuals: pay and group membership each less what the factors predict.
  const fit = await outOfBagResiduals(who, options, settings);
  // 3. Figures: overall and per category, small categories suppressed, Holm across categories.
  const shown = shownFigures(who, fit, settings);
  const linearFit = shown.overallHidden
    ? null
    : linearGaps(fit.payDataset, fit.logPay, options.group, fit.groupCode, who.groups, CONFIDENCE);
  const linear = linearFit?.gaps ?? null;
  options.onProgress?.("proxies", 0, fit.payDataset.features.length);
  const proxies = proxyFigures(
    fit.payDataset.features,
    fit.groupCode,
    who.allGroups,
    options.group,
    { seed: settings.seed, minLeaf: settings.minLeaf },
  ).filter((p) => p.balancedAccuracy >= settings.proxyThreshold);
  options.onProgress?.("proxies", fit.payDataset.features.length, fit.payDataset.features.length);
  const payR2Log = oobRSquared(fit.logPay, fit.payModel.oob);
  // 4. The raw gap split by factor, over everyone only: every group shown
  // overall has at least the privacy minimum of people.
  const decomposition = shown.overallHidden || options.decompose === false
    ? null
    : await decomposeGap({
      dataset: fit.payDataset,
      group: options.group,
      groups: who.allGroups,
      groupCode: fit.groupCode,
      trees: settings.trees,
      minLeaf: settings.minLeaf,
      seed: settings.seed,
      workers: options.workers,
      confidence: CONFIDENCE,
      onProgress: options.onProgress,
    });
  // 5. Notes: what is withheld, and how far to trust the adjusted gap.
  const notes = gapNotes(who, shown, settings, payR2Log, linear, fit.payDataset.rows);
  const { seed } = settings;
  return {
    target: options.target,
    currency: who.pay.money?.currency ?? null,
    group: options.group,
    reference: who.reference,
    referenceReason: who.referenceReason,
    groups: who.groups,
    within: settings.within,
    variable: options.variable ?? null,
    threshold: settings.threshold,
    materiality: settings.materiality,
    privacyMin: settings.privacyMin,
    confidence: CONFIDENCE,
    rows: fit.payDataset.rows,
    missingGroup: who.missingGroup,
    leftOut: {
      people: who.leftOutCounted ? who.otherGroupsLeftOut : null,
      tooFew: who.tooFew,
    },
    overall: shown.overallHidden
      ? { suppressed: true }
      : { suppressed: false, rows: fit.payDataset.rows, gaps: shown.overallGaps },
    quartiles: shown.overallHidden
      ? null
      : payQuartiles(who.payOf, who.groupName, settings.privacyMin),
    regression: shown.regressions[0] ?? null,
    regressions: shown.regressions,
    linear,
    linearAliased: linearFit?.aliased ?? [],
    categories: shown.categories,
    features: fit.payDataset.features.map((f) => f.name),
    proxies,
    proxyThreshold: settings.proxyThreshold,
    models: {
      trees: settings.trees,
      payR2Log,
      groupBalancedAccuracy: oobBalancedAccuracy(fit.groupModel, fit.groupCode),
    },
    decomposition,
    notes,
    provenance: who.leftOutCounted
      ? tableProvenance(table, seed)
      : withoutRowCount(tableProvenance(table, seed)),
  };
}

/** Confidence level of every gap interval. */
const CONFIDENCE = 0.95;

/** The gap check's settings, checked, with their defaults. */
interface GapSettings {
  threshold: number;
  materiality: number;
  privacyMin: number;
  proxyThreshold: number;
  trees: number;
  seed: number;
  minLeaf: number;
  within: string[];
}

function gapSettings(options: GapOptions): GapSettings {
  const threshold = options.threshold ?? 0.05;
  const materiality = options.materiality ?? 0.02;
  const privacyMin = checkedPrivacyMin(options.privacyMin);
  if (!(threshold >= 0 && threshold < 1)) {
    throw new OptionError(`{threshold} must be between 0 and 1 (0.05 = 5%), got ${threshold}`);
  }
  if (!(materiality >= 0 && materiality < 1)) {
    throw new OptionError(`{materiality} must be between 0 and 1 (0.02 = 2%), got ${materiality}`);
  }
  return {
    threshold,
    materiality,
    privacyMin,
    proxyThreshold: options.proxyThreshold ?? PROXY_THRESHOLD,
    trees: options.trees ?? 200,
    seed: options.seed ?? 1,
    minLeaf: Math.max(options.minLeaf ?? 5, 1),
    within: options.within ?? [],
  };
}

/** Stage 1's result: who is compared with whom. */
interface ComparedPeople {
  /** The pay column of the table after `where`. */
  pay: NumericColumn;
  /** The people compared, as a table. */
  rowsTable: Table;
  /** Their rows in the table after `where`. */
  keep: number[];
  /** The columns the categories come from. */
  withinCols: ReturnType<typeof withinColumns>;
  /** The variable-pay column, when asked. */
  variable: NumericColumn | undefined;
  reference: string;
  referenceReason: string;
  /** Groups with fewer than the privacy minimum: never compared. */
  tooFew: string[];
  /** People of groups not compared (not named, or too few). */
  otherGroupsLeftOut: number;
  /** Whether that number may be shown (none, or at least the privacy minimum). */
  leftOutCounted: boolean;
  /** Rows without a group. */
  missingGroup: number;
  /** Each compared person's pay and group name. */
  payOf: Float64Array;
  groupName: string[];
  /** People per group. */
  counts: Map<string, number>;
  /** Groups compared with the reference, and all of them (the reference first). */
  groups: string[];
  allGroups: string[];
}

function comparedPeople(table: Table, options: GapOptions, privacyMin: number): ComparedPeople {
  const filtered = filterRows(table, options.where ?? {});
  const column = (name: string, option: string) => columnNamed(filtered, name, option);
  const pay = column(options.target, "target");
  if (pay.type !== "numeric") {
    throw new OptionError(`{target}: "${options.target}" is not numeric; a gap needs pay`);
  }
  const groupColumn = column(options.group, "group");
  if (groupColumn.type !== "categorical" && groupColumn.type !== "ordinal") {
    throw new OptionError(
      `{group}: "${options.group}" is ${groupColumn.type}; it needs a few named groups ` +
        `(declare it with {type} ${options.group}=categorical if it holds codes)`,
    );
  }
  const withinCols = withinColumns(filtered, options.within ?? [], [options.group, options.target]);
  const variable = options.variable === undefined
    ? undefined
    : column(options.variable, "variable");
  if (variable !== undefined && variable.type !== "numeric") {
    throw new OptionError(`{variable}: "${options.variable}" is not numeric`);
  }

  // People with pay and a group.
  let keep: number[] = [];
  let missingGroup = 0;
  const allCounts = new Map<string, number>();
  for (let r = 0; r < filtered.rows; r++) {
    if (Number.isNaN(pay.values[r])) continue;
    if (groupColumn.codes[r] < 0) missingGroup++;
    else {
      keep.push(r);
      const g = groupColumn.levels[groupColumn.codes[r]];
      allCounts.set(g, (allCounts.get(g) ?? 0) + 1);
    }
  }
  if (allCounts.size < 2) {
    throw new OptionError(`{group}: "${options.group}" has only one group among people with pay`);
  }
  const { reference, reason: referenceReason } = chooseReference(
    options.group,
    allCounts,
    options.reference,
  );
  if (allCounts.get(reference)! < privacyMin) {
    throw new OptionError(
      `{reference}: ${reference} has fewer than ${privacyMin} people with pay; no gap against ` +
        `it can be shown`,
    );
  }
  // A group of fewer than the privacy minimum is never compared: its
  // figures, its quartile shares and its size would be a few people's.
  const tooFew = [...allCounts.keys()].filter((g) => allCounts.get(g)! < privacyMin).sort();
  let otherGroupsLeftOut = 0;
  if (options.compare !== undefined) {
    const known = [...allCounts.keys()].sort();
    const wanted = new Set(
      options.compare.map((name) => groupNamed(known, name, options.group, "groups")),
    );
    wanted.delete(reference);
    if (wanted.size === 0) {
      throw new OptionError(`{groups}: name at least one group besides the reference ${reference}`);
    }
    const before = keep.length;
    keep = keep.filter((r) => {
      const g = groupColumn.levels[groupColumn.codes[r]];
      return g === reference || wanted.has(g);
    });
    otherGroupsLeftOut = before - keep.length;
  }
  if (tooFew.length > 0) {
    const before = keep.length;
    keep = keep.filter((r) => !tooFew.includes(groupColumn.levels[groupColumn.codes[r]]));
    otherGroupsLeftOut += before - keep.length;
    if ([...new Set(keep.map((r) => groupColumn.codes[r]))].length < 2) {
      throw new OptionError(
        `{group}: every group besides ${reference} has fewer than ${privacyMin} people ` +
          `(${tooFew.join(", ")}); no gap can be shown without telling their pay`,
      );
    }
  }
  const rowsTable = subsetRows(filtered, keep, "people with pay and a group");
  const payOf = (rowsTable.columns.find((c) => c.name === options.target) as NumericColumn).values;
  const groupOf = rowsTable.columns.find((c) => c.name === options.group) as LevelColumn;
  const groupName = Array.from(groupOf.codes, (c) => groupOf.levels[c]);
  const counts = new Map<string, number>();
  for (const g of groupName) counts.set(g, (counts.get(g) ?? 0) + 1);
  const groups = [...counts.keys()].filter((g) => g !== reference).sort();
  return {
    pay,
    rowsTable,
    keep,
    withinCols,
    variable: variable === undefined
      ? undefined
      : rowsTable.columns.find((c) => c.name === variable.name) as NumericColumn,
    reference,
    referenceReason,
    tooFew,
    otherGroupsLeftOut,
    leftOutCounted: otherGroupsLeftOut === 0 || otherGroupsLeftOut >= privacyMin,
    missingGroup,
    payOf,
    groupName,
    counts,
    groups,
    allGroups: [reference, ...groups],
  };
}

/** Stage 2's result: the two ensembles and their out-of-bag residuals. */
interface Residuals {
  /** The legitimate factors and log pay. */
  payDataset: Dataset;
  logPay: Float64Array;
  /** Each person's group as its index in `allGroups`. */
  groupCode: Int32Array;
  payModel: Ensemble;
  groupModel: Ensemble;
  /** Log pay less its out-of-bag estimate. */
  payResidual: Float64Array;
  /** Per compared group: membership (0/1) less its out-of-bag share. */
  groupResidual: Float64Array[];
  /** Rows with an out-of-bag estimate in both models (rows every tree drew are left out). */
  usable: boolean[];
}

async function outOfBagResiduals(
  who: ComparedPeople,
  options: GapOptions,
  settings: GapSettings,
): Promise<Residuals> {
  // The legitimate factors: never the group, the variable pay or the target.
  const drop = [...(options.drop ?? []), options.group];
  if (options.variable !== undefined) drop.push(options.variable);
  if (options.features?.includes(options.group)) {
    throw new OptionError(
      `{features}: "${options.group}" is the group compared; it cannot adjust itself`,
    );
  }
  const { encoded, dataset: payDataset } = payRows(who.rowsTable, {
    target: options.target,
    features: options.features,
    drop: options.features ? undefined : [...new Set(drop)].filter((d) => d !== options.target),
    scale: "log",
  });
  if (encoded.features.length === 0) {
    throw new OptionError(
      "no legitimate factors are left to adjust for; name them with {features}",
    );
  }
  const logPay = payDataset.target.values as Float64Array;
  const n = payDataset.rows;
  const { trees, seed, minLeaf } = settings;
  // Both ensembles unpruned: the adjustment wants each tree's low bias, and
  // their out-of-bag averages do the smoothing.
  const unpruned = {
    trees,
    seed,
    prune: "none" as const,
    grow: { minLeaf },
    workers: options.workers,
  };

  options.onProgress?.("pay model", 0, trees);
  const payModel = (await fitDefaultEnsemble(payDataset, {
    ...unpruned,
    onProgress: (done, total) => options.onProgress?.("pay model", done, total),
  })).ensemble!;
  const groupCode = Int32Array.from(who.groupName, (g) => who.allGroups.indexOf(g));
  const groupDataset: Dataset = {
    rows: n,
    features: payDataset.features,
    target: {
      kind: "classification",
      name: options.group,
      classes: who.allGroups,
      values: groupCode,
    },
  };
  options.onProgress?.("group model", 0, trees);
  const groupModel = (await fitDefaultEnsemble(groupDataset, {
    ...unpruned,
    onProgress: (done, total) => options.onProgress?.("group model", done, total),
  })).ensemble!;

  const payResidual = new Float64Array(n);
  const groupResidual = who.groups.map(() => new Float64Array(n));
  const usable: boolean[] = [];
  const width = who.allGroups.length;
  for (let r = 0; r < n; r++) {
    const ok = payModel.oobTrees[r] > 0 && groupModel.oobTrees[r] > 0;
    usable.push(ok);
    payResidual[r] = logPay[r] - payModel.oob[r];
    who.groups.forEach((_, j) => {
      groupResidual[j][r] = (groupCode[r] === j + 1 ? 1 : 0) - groupModel.oob[r * width + j + 1];
    });
  }
  return {
    payDataset,
    logPay,
    groupCode,
    payModel,
    groupModel,
    payResidual,
    groupResidual,
    usable,
  };
}

/** Stage 3's result: the figures shown, and what is withheld. */
interface ShownFigures {
  overallHidden: boolean;
  overallGaps: GapFigure[];
  categories: GapCategory[];
  regressions: GapRegression[];
  categoryNames: string[];
  /** People of each group (allGroups order) per category. */
  countsPer: number[][];
  suppression: Suppression;
}

function shownFigures(who: ComparedPeople, fit: Residuals, settings: GapSettings): ShownFigures {
  const { groups, allGroups, groupName, reference, payOf } = who;
  const { privacyMin, threshold, materiality } = settings;
  const n = fit.payDataset.rows;
  // Categories: each combination of the within columns' levels that occurs.
  const { names: categoryNames, members: categoryRows } = categoriesOf(who.withinCols, who.keep);
  const allRows = Array.from({ length: n }, (_, r) => r);
  const variableOf = who.variable?.values;

  const figures = (rows: number[]): GapFigure[] => {
    const raw = rawGaps(
      rows.map((r) => payOf[r]),
      rows.map((r) => groupName[r]),
      reference,
    );
    const variableRaw = variableOf === undefined
      ? []
      : variableGaps(rows, variableOf, groupName, reference, privacyMin);
    const fitted = residualRegression(
      fit.payResidual,
      fit.groupResidual,
      rows.filter((r) => fit.usable[r]),
    );
    return groups.map((g, j) => {
      const rawOne = raw.find((x) => x.group === g)!;
      const referenceRows = rows.filter((r) => groupName[r] === reference).length;
      const coefficient = fitted?.[j];
      const interval = coefficient
        ? gapFromCoefficient(coefficient.coefficient, coefficient.se, CONFIDENCE)
        : null;
      const v = variableRaw.find((x) => x.group === g);
      return {
        group: g,
        rows: rawOne.rows,
        referenceRows,
        rawMean: rawOne.meanGap,
        rawMedian: rawOne.medianGap,
        variableMean: v?.meanGap ?? null,
        variableMedian: v?.medianGap ?? null,
        adjusted: interval?.gap ?? null,
        low: interval?.low ?? null,
        high: interval?.high ?? null,
        familyLow: interval?.low ?? null,
        familyHigh: interval?.high ?? null,
        family: 1,
        coefficient: coefficient?.coefficient ?? null,
        se: coefficient?.se ?? null,
        p: coefficient?.p ?? null,
        pAdjusted: coefficient?.p ?? null,
        residualDifference: residualDifference(
          rows,
          fit.usable,
          fit.payResidual,
          groupName,
          g,
          reference,
        ),
        rawFlag: Math.abs(rawOne.meanGap) >= threshold,
        unexplainedFlag: false,
      };
    });
  };
  const flag = (f: GapFigure) => {
    f.unexplainedFlag = f.pAdjusted !== null && f.adjusted !== null && f.pAdjusted <= 0.05 &&
      Math.abs(f.adjusted) >= materiality;
  };

  // Privacy: counts of each group per category, then suppression.
  const countsPer = categoryRows.map((rows) =>
    allGroups.map((g) => rows.filter((r) => groupName[r] === g).length)
  );
  const suppression = who.withinCols.length > 0
    ? suppressSmallGroups(countsPer, privacyMin)
    : suppressSmallGroups([allGroups.map((g) => who.counts.get(g)!)], privacyMin);

  const overallHidden = suppression.overallHidden;
  const overallGaps = overallHidden ? [] : figures(allRows);
  overallGaps.forEach(flag);
  const categories: GapCategory[] = categoryNames.map((name, c) =>
    suppression.hidden[c] ? { name, suppressed: true as const } : {
      name,
      suppressed: false as const,
      rows: categoryRows[c].length,
      gaps: figures(categoryRows[c]),
    }
  );
  // Holm across every figure shown per category; intervals at the family-wise level.
  const shown = categories.flatMap((c) => (c.suppressed ? [] : c.gaps.filter((g) => g.p !== null)));
  const adjusted = holmAdjust(shown.map((g) => g.p!));
  shown.forEach((g, i) => {
    g.pAdjusted = adjusted[i];
    const family = gapFromCoefficient(g.coefficient!, g.se!, 1 - (1 - CONFIDENCE) / shown.length);
    g.familyLow = family.low;
    g.familyHigh = family.high;
    g.family = shown.length;
  });
  for (const c of categories) if (!c.suppressed) c.gaps.forEach(flag);

  const regressions: GapRegression[] = overallHidden
    ? []
    : overallGaps.flatMap((f) =>
      f.coefficient === null ? [] : [{
        group: f.group,
        coefficient: f.coefficient,
        se: f.se!,
        percent: 100 * f.adjusted!,
        gap: f.adjusted!,
        low: f.low!,
        high: f.high!,
        p: f.p!,
      }]
    );
  return {
    overallHidden,
    overallGaps,
    categories,
    regressions,
    categoryNames,
    countsPer,
    suppression,
  };
}

/**
 * What the gap report says besides its figures, as data; the terminal
 * words each kind.
 */
export type GapNote =
  /** The adjusted gap is fragile: few people, or factors that explain little. */
  | {
    kind: "fragileAdjustment";
    /** People analysed, when fewer than {@linkcode FEW_PEOPLE} (else null). */
    people: number | null;
    /** Out-of-bag R² of log pay, when below {@linkcode WEAK_MODEL_R2} (else null). */
    r2: number | null;
    /** The linear version's first figure, to compare with. */
    linear: { group: string; gap: number } | null;
  }
  /** Groups of fewer than the privacy minimum, never compared. */
  | { kind: "groupsTooFew"; groups: string[]; privacyMin: number }
  /** People of other groups left out of the comparison. */
  | { kind: "otherGroupsLeftOut"; people: number; compared: string[] }
  /** Categories where a group is too small; the other groups it could be left out for. */
  | {
    kind: "categoriesTooFew";
    group: string;
    categories: string[];
    privacyMin: number;
    /** The groups to compare instead so those categories show (null: none would help). */
    compareInstead: string[] | null;
  }
  /** Categories withheld so that the hidden ones cannot be worked out. */
  | { kind: "complementaryWithheld"; categories: string[] }
  /** The overall figures are withheld. */
  | { kind: "overallWithheld"; privacyMin: number }
  /** The variable-pay column does not look like pay. */
  | { kind: "variableNotPay"; column: string }
  /** The variable-pay column is not a factor. */
  | { kind: "variableNotFactor"; column: string }
  /** How the residual difference reads (always said). */
  | { kind: "residualDifference" };

function gapNotes(
  who: ComparedPeople,
  shown: ShownFigures,
  settings: GapSettings,
  payR2Log: number,
  linear: GapRegression[] | null,
  n: number,
): GapNote[] {
  const { privacyMin } = settings;
  const notes: GapNote[] = [];
  if (payR2Log < WEAK_MODEL_R2 || n < FEW_PEOPLE) {
    notes.push({
      kind: "fragileAdjustment",
      people: n < FEW_PEOPLE ? n : null,
      r2: payR2Log < WEAK_MODEL_R2 ? payR2Log : null,
      linear: linear?.[0] ? { group: linear[0].group, gap: linear[0].gap } : null,
    });
  }
  if (who.tooFew.length > 0) {
    notes.push({ kind: "groupsTooFew", groups: who.tooFew, privacyMin });
  }
  if (who.otherGroupsLeftOut > 0 && who.leftOutCounted) {
    notes.push({
      kind: "otherGroupsLeftOut",
      people: who.otherGroupsLeftOut,
      compared: who.allGroups,
    });
  }
  const hiddenCount = shown.suppression.hidden.filter(Boolean).length;
  if (hiddenCount > 0 && who.withinCols.length > 0) {
    notes.push(
      ...suppressionNotes(
        shown.categoryNames,
        shown.countsPer,
        who.allGroups,
        shown.suppression,
        privacyMin,
      ),
    );
  }
  if (shown.overallHidden) notes.push({ kind: "overallWithheld", privacyMin });
  const variable = who.variable;
  if (variable !== undefined && !variable.money && !isPayName(variable.name)) {
    notes.push({ kind: "variableNotPay", column: variable.name });
  } else if (variable !== undefined) {
    notes.push({ kind: "variableNotFactor", column: variable.name });
  }
  notes.push({ kind: "residualDifference" });
  return notes;
}

// The table's row count, less everyone analysed and counted, would be the
// number left out uncounted.
function withoutRowCount(p: TableProvenance): TableProvenance {
  const { rows: _, ...table } = p.table;
  return { ...p, table };
}

/**
 * The reference group: the one named, else men for a column named sex or
 * gender (the Directive's gender pay gap takes male workers as the
 * reference), else the largest group (ties: the first by name).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { chooseReference } from "./gap_check.ts";
 * const counts = new Map([["Woman", 60], ["Man", 40]]);
 * assert(chooseReference("gender", counts).reference === "Man");
 * assert(chooseReference("site", new Map([["A", 5], ["B", 9]])).reference === "B");
 * ```
 */
export function chooseReference(
  column: string,
  counts: ReadonlyMap<string, number>,
  named?: string,
): { reference: string; reason: string } {
  const groups = [...counts.keys()].sort();
  if (named !== undefined) {
    return {
      reference: groupNamed(groups, named, column, "reference"),
      reason: "named by the user",
    };
  }
  const words = nameWords(column);
  if (words.includes("sex") || words.includes("gender")) {
    const men = groups.find((g) => /^(m|male|males|man|men)$/i.test(g.trim()));
    if (men !== undefined) {
      return { reference: men, reason: "men, as the Directive measures the gender pay gap" };
    }
  }
  let best = groups[0];
  for (const g of groups) if (counts.get(g)! > counts.get(best)!) best = g;
  return { reference: best, reason: "the largest group" };
}

// Which categories are hidden and why: each small group named with the
// categories where it is small, and how to see the others.
function suppressionNotes(
  names: string[],
  counts: number[][],
  groups: string[],
  suppression: Suppression,
  minimum: number,
): GapNote[] {
  const notes: GapNote[] = [];
  const smallIn = new Map<string, string[]>();
  names.forEach((name, c) => {
    if (!suppression.primary[c]) return;
    groups.forEach((g, j) => {
      if (counts[c][j] < minimum) smallIn.set(g, [...(smallIn.get(g) ?? []), name]);
    });
  });
  for (const [g, where] of smallIn) {
    const others = groups.slice(1).filter((x) => x !== g && !smallIn.has(x));
    notes.push({
      kind: "categoriesTooFew",
      group: g,
      categories: where,
      privacyMin: minimum,
      compareInstead: g !== groups[0] && others.length > 0 ? others : null,
    });
  }
  const complementary = names.filter((_, c) => suppression.hidden[c] && !suppression.primary[c]);
  if (complementary.length > 0) {
    notes.push({ kind: "complementaryWithheld", categories: complementary });
  }
  return notes;
}

// The group called `name` (case ignored, as people type it).
function groupNamed(groups: readonly string[], name: string, column: string, option: string) {
  const found = groups.find((g) => g.toLowerCase() === name.toLowerCase());
  if (found === undefined) {
    throw new OptionError(
      `{${option}}: "${name}" is not a group of "${column}"; the groups are: ${groups.join(", ")}`,
    );
  }
  return found;
}

function residualDifference(
  rows: number[],
  usable: boolean[],
  residual: Float64Array,
  groupName: string[],
  group: string,
  reference: string,
): number | null {
  let sg = 0, ng = 0, sr = 0, nr = 0;
  for (const r of rows) {
    if (!usable[r]) continue;
    if (groupName[r] === group) {
      sg += residual[r];
      ng++;
    } else if (groupName[r] === reference) {
      sr += residual[r];
      nr++;
    }
  }
  if (ng === 0 || nr === 0) return null;
  return 1 - Math.exp(sg / ng - sr / nr);
}

function variableGaps(
  rows: number[],
  values: Float64Array,
  groupName: string[],
  reference: string,
  privacyMin: number,
) {
  const known = rows.filter((r) => !Number.isNaN(values[r]));
  const per = new Map<string, number>();
  for (const r of known) per.set(groupName[r], (per.get(groupName[r]) ?? 0) + 1);
  // Variable pay known for too few of a group: no figure for it.
  if ((per.get(reference) ?? 0) < privacyMin) return [];
  const sumRef = known.reduce((s, r) => s + (groupName[r] === reference ? values[r] : 0), 0);
  if (sumRef === 0) return [];
  return rawGaps(known.map((r) => values[r]), known.map((r) => groupName[r]), reference)
    .filter((g) => g.rows >= privacyMin);
}

function linearGaps(
  dataset: Dataset,
  logPay: Float64Array,
  group: string,
  groupCode: Int32Array,
  groups: string[],
  confidence: number,
): { gaps: GapRegression[]; aliased: DesignTerm[] } {
  const design = designOf(dataset);
  groups.forEach((g, j) => {
    design.names.push(`group=${g}`);
    design.columns.push(Float64Array.from(groupCode, (c) => (c === j + 1 ? 1 : 0)));
    design.terms.push({ feature: group, kind: "level", level: g });
  });
  const fit = fitLeastSquares(design, logPay);
  const aliased = fit.aliased.map((j) => design.terms[j - 1]);
  const gaps = groups.flatMap((g) => {
    const at = fit.names.indexOf(`group=${g}`);
    const b = fit.coefficients[at];
    // A group indicator that follows from the factors has no linear figure.
    if (Number.isNaN(b)) return [];
    // HC1, as the adjusted gap's residual regression: one kind of error
    // for both figures a reader sets side by side.
    const se = fit.robustStandardErrors[at];
    const interval = gapFromCoefficient(b, se, confidence);
    return {
      group: g,
      coefficient: b,
      se,
      percent: 100 * interval.gap,
      gap: interval.gap,
      low: interval.low,
      high: interval.high,
      // Normal approximation, as for the adjusted gap.
      p: twoSidedP(b, se),
    };
  });
  return { gaps, aliased };
}
