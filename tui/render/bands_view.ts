/**
 * The band table (lib/bands/band_table.ts) in words: a table of the cells
 * within the width, the bands as floating bars on one axis with the current
 * pay's quartiles under them, the measures along the ladder, and the
 * cautions a published range needs; the same as Markdown and as CSV rows.
 *
 * @module
 */

import wrapAnsi from "wrap-ansi";
import type { BandCell, BandPosition, BandTable, PostingRange } from "../../mod.ts";
import { bandChart } from "./charts.ts";
import { fitTable } from "./fit_table.ts";
import { formatNumber, formatPay, formatPercent, type NumberStyle } from "./numbers.ts";
import { csvCell } from "./safe_text.ts";
import type { Style } from "./style.ts";

/** How to draw the band table. */
export interface BandsView {
  style: Style;
  width: number;
  money: NumberStyle;
  /** Draw the bands as floating bars. @default {true} */
  chart?: boolean;
  /**
   * The guided flow's short form, to stay in view above its menu: the
   * cautions in one sentence, no cost line, no role line.
   * @default {false}
   */
  brief?: boolean;
}

/**
 * The cautions in one sentence, for the guided flow's screens.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { BANDS_CAUTIONS_SHORT } from "./bands_view.ts";
 * assert.match(BANDS_CAUTIONS_SHORT, /gap check first/);
 * ```
 */
export const BANDS_CAUTIONS_SHORT = "A proposal to review, learned from current pay: run the gap " +
  "check first; a posted range must be what the employer in good faith expects to pay, and " +
  "local law decides what a posting must say.";

type Shown = Extract<BandCell, { suppressed: false }>;

/** What a cell too small to show says in place of its figures. */
const TOO_FEW = "too few to report";

/**
 * One cell's row of the table, in the columns of the text and the reports:
 * cell, people, current p25, median, p75, band min, mid, max, spread,
 * below, above; a hidden cell says "too few to report" and nothing else.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { bandCellTexts } from "./bands_view.ts";
 * assert.deepEqual(bandCellTexts({ key: ["G1", "Sales"], suppressed: true }, {}).slice(0, 3), [
 *   "G1 / Sales", "too few to report", "",
 * ]);
 * ```
 */
export function bandCellTexts(c: BandCell, money: NumberStyle): string[] {
  if (c.suppressed) return [c.key.join(" / "), TOO_FEW, "", "", "", "", "", "", "", "", ""];
  const pay = (v: number) => formatPay(v, money);
  return [
    c.key.join(" / "),
    formatNumber(c.people, money, 0),
    pay(c.currentPay.p25),
    pay(c.currentPay.median),
    pay(c.currentPay.p75),
    pay(c.band.min),
    pay(c.band.mid),
    pay(c.band.max),
    formatPercent(c.spread, false, money),
    formatNumber(c.outside.below, money, 0),
    formatNumber(c.outside.above, money, 0),
  ];
}

/**
 * The cautions every band output carries.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { BANDS_CAUTIONS } from "./bands_view.ts";
 * assert.match(BANDS_CAUTIONS, /paygrove gap/);
 * assert.match(BANDS_CAUTIONS, /good faith/);
 * ```
 */
export const BANDS_CAUTIONS = "These bands are a proposal to review, learned from current pay: " +
  "they carry any unjustified gap in it, so run the gap check first (paygrove gap). A range " +
  "published in a job posting must be the range the employer in good faith expects to pay, and " +
  "local law decides what a posting must say (Directive (EU) 2023/970, Art. 5, as each member " +
  "state transposes it; US state posting laws). This is not legal advice.";

/**
 * How the bands were built, in one sentence without its full stop.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { bandMethodWords } from "./bands_view.ts";
 * const table = { method: { kind: "spread" as const, spread: 0.4 } };
 * assert.match(bandMethodWords(table as never, {}), /^Each band a 40(\.0)?% spread/);
 * ```
 */
export function bandMethodWords(table: BandTable, money: NumberStyle): string {
  return table.method.kind === "coverage"
    ? `Each band built to hold ${
      formatPercent(table.method.coverage, false, money)
    } of its cell's people (the pay the model implies for them)`
    : `Each band a ${
      formatPercent(table.method.spread, false, money)
    } spread (max / min - 1) around the model's midpoint`;
}

/**
 * The terminal's lines for a band table.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { bandTable, demoCompanyCsv, fitModel, loadTable, openModel, readForModel } from "../../mod.ts";
 * import { renderBands } from "./bands_view.ts";
 * import { makeStyle } from "./style.ts";
 * const csv = demoCompanyCsv({ rows: 600, seed: 4 });
 * const model = await fitModel(loadTable(csv, { target: "base_pay_eur" }), {
 *   target: "base_pay_eur", trees: 10, folds: 3, workers: 1,
 * });
 * const table = bandTable(openModel(model), readForModel(model, csv, "demo.csv"), { by: ["level"] });
 * const lines = renderBands(table, { style: makeStyle(false), width: 80, money: { currency: "EUR" } });
 * assert.match(lines[0], /^Pay bands by level/);
 * assert(lines.every((l) => l.length <= 80));
 * assert(lines.some((l) => l.startsWith("G1 ")));
 * ```
 */
export function renderBands(table: BandTable, view: BandsView): string[] {
  const { style, width, money } = view;
  const wrap = (text: string) => wrapAnsi(text, width).split("\n");
  const pay = (v: number) => formatPay(v, money);
  const lines: string[] = [
    ...wrap(style.bold(`Pay bands by ${table.by.join(" x ")}`)),
    ...wrap(style.dim(
      `${bandMethodWords(table, money)}.` + (view.brief === true ? "" : ` Current pay: each ` +
        `quartile the mean of the ${table.privacyMin} people nearest it; cells of fewer than ` +
        `${table.privacyMin} people show nothing.`),
    )),
    "",
  ];
  const head = [
    "cell",
    "people",
    "p25",
    "median",
    "p75",
    "min",
    "mid",
    "max",
    "spread",
    "below",
    "above",
  ];
  const rows = table.cells.map((c) => bandCellTexts(c, money));
  const fitted = fitTable({
    width,
    head,
    rows,
    // Narrow: the current quartiles go first, then who is above, below, the spread.
    drop: [2, 4, 10, 9, 8],
    borders: "none",
    gap: width < 90 ? 1 : 2,
    spanning: TOO_FEW,
    styleHead: style.bold,
    ascii: style.ascii,
  });
  if (fitted.dropped.length > 0) {
    lines.push(
      ...wrap(style.dim(
        `Left out at this width: ${fitted.dropped.join(", ")}` +
          (view.brief === true ? "." : " (--json has them)."),
      )),
    );
  }
  lines.push(...fitted.lines, "");
  const leftOut = leftOutWords(table);
  if (leftOut.length > 0) lines.push(...leftOut.flatMap((text) => wrap(style.warn(text))), "");

  const shown = table.cells.filter((c): c is Shown => !c.suppressed);
  if (shown.length > 0 && view.chart !== false) {
    const labelWidth = Math.max(...shown.map((c) => c.key.join(" / ").length));
    lines.push(
      ...wrap(style.bold("The bands on one axis: [min | mid max], current pay (p25 o median p75)")),
      ...bandChart(
        shown.map((c) => ({
          label: c.key.join(" / "),
          min: c.band.min,
          mid: c.band.mid,
          max: c.band.max,
          inner: { low: c.currentPay.p25, middle: c.currentPay.median, high: c.currentPay.p75 },
        })),
        Math.max(20, Math.min(60, width - labelWidth - 3)),
      ),
      "",
    );
  }
  for (const ladder of table.ladders) {
    if (ladder.levels.length < 2) continue;
    const steps = ladder.levels.slice(1).map((level, k) =>
      `${ladder.levels[k]} to ${level} ${formatPercent(ladder.progression[k], true, money)} ` +
      `(overlap ${formatPercent(ladder.overlap[k], false, money)})`
    );
    lines.push(
      ...wrap(
        `Midpoint progression${ladder.key.length ? ` (${ladder.key.join(" / ")})` : ""}: ` +
          steps.join("; ") + ".",
      ),
    );
  }
  if (table.smoothed) {
    lines.push(...wrap(style.warn(
      `Some midpoints did not rise with ${table.by[0]}: they were smoothed (isotonic, weighted ` +
        `by people, on log pay) and the band moved with them; --json has each raw midpoint.`,
    )));
  }
  const withCost = shown.filter((c) => c.outside.costToMinimum !== null);
  if (withCost.length > 0 && view.brief !== true) {
    lines.push(...wrap(
      "Cost of bringing people below the minimum up to it: " +
        withCost.map((c) => `${c.key.join(" / ")} ${pay(c.outside.costToMinimum!)}`).join(", ") +
        ` (withheld where fewer than ${table.privacyMin} are below).`,
    ));
  }
  lines.push(
    ...(view.brief === true ? [] : [""]),
    ...wrap(style.dim(view.brief === true ? BANDS_CAUTIONS_SHORT : BANDS_CAUTIONS)),
  );
  return lines;
}

/**
 * The band table as Markdown (for `--report`).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { bandsMarkdown } from "./bands_view.ts";
 * const table = {
 *   by: ["level"], method: { kind: "coverage" as const, coverage: 0.8 }, privacyMin: 5,
 *   newHire: false, smoothed: false, withoutPay: 0, ladders: [], notScored: { rows: 0, first: null },
 *   cells: [{ key: ["G1"], suppressed: true as const }],
 * };
 * const md = bandsMarkdown(table, {}, "2026-12-03T10:00:00Z");
 * assert(md.includes("| G1 | too few to report |"));
 * ```
 */
export function bandsMarkdown(table: BandTable, money: NumberStyle, created: string): string {
  const md = [
    `# Pay bands by ${table.by.join(" x ")}`,
    "",
    `Written ${created}. ${bandMethodWords(table, money)}.`,
    "",
    `> ${BANDS_CAUTIONS}`,
    "",
    "| cell | people | current p25 | median | p75 | min | mid | max | spread | below | above |",
    "| --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: |",
  ];
  for (const c of table.cells) md.push(`| ${bandCellTexts(c, money).join(" | ")} |`);
  md.push("");
  const left = leftOutWords(table);
  if (left.length > 0) md.push(...left, "");
  return md.join("\n");
}

/**
 * The band table as CSV, one row per cell, every cell formula-safe.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { bandsCsv } from "./bands_view.ts";
 * const csv = bandsCsv({
 *   by: ["level"], method: { kind: "spread" as const, spread: 0.4 }, privacyMin: 5,
 *   newHire: false, smoothed: false, withoutPay: 0, ladders: [], notScored: { rows: 0, first: null },
 *   cells: [{ key: ["=G1"], suppressed: true as const }],
 * });
 * assert.equal(csv.split("\n")[1], `"'=G1",true,,,,,,,,,,,,,`); // quoted, apostrophed
 * ```
 */
export function bandsCsv(table: BandTable): string {
  const head = [
    ...table.by,
    "suppressed",
    "people",
    "current_p25",
    "current_median",
    "current_p75",
    "typical_estimate",
    "band_min",
    "band_mid",
    "band_max",
    "raw_mid",
    "spread",
    "below_min",
    "above_max",
    "cost_to_min",
  ];
  const lines = [head.map(csvCell).join(",")];
  const cents = (v: number) => v.toFixed(2);
  for (const c of table.cells) {
    const cells = c.suppressed
      ? [...c.key, "true", ...Array(head.length - table.by.length - 1).fill("")]
      : [
        ...c.key,
        "false",
        String(c.people),
        cents(c.currentPay.p25),
        cents(c.currentPay.median),
        cents(c.currentPay.p75),
        cents(c.typicalEstimate),
        cents(c.band.min),
        cents(c.band.mid),
        cents(c.band.max),
        cents(c.rawMid),
        c.spread.toFixed(6),
        String(c.outside.below),
        String(c.outside.above),
        c.outside.costToMinimum === null ? "" : cents(c.outside.costToMinimum),
      ];
    lines.push(cells.map(csvCell).join(","));
  }
  return lines.join("\n") + "\n";
}

/**
 * The terminal's lines for the range to post for one role.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { renderPosting } from "./bands_view.ts";
 * import { makeStyle } from "./style.ts";
 * const lines = renderPosting({
 *   profile: { level: "G3", job_family: "Sales", years_at_company: 0 },
 *   newHire: ["years_at_company"], estimate: 56000, low: 49000, high: 64000, coverage: 0.8,
 *   criteria: ["level", "job_family", "years_at_company"],
 *   comparable: { named: ["level", "job_family"], people: 60, inside: 0.78 },
 * }, { style: makeStyle(false), width: 80, money: { currency: "EUR" } });
 * assert.equal(lines[0], "Range to post: €49,000 to €64,000");
 * assert(lines.some((l) => l.includes("78.0%") && l.includes("60")));
 * ```
 */
export function renderPosting(posting: PostingRange, view: BandsView): string[] {
  const { style, width, money } = view;
  const wrap = (text: string) => wrapAnsi(text, width).split("\n");
  const pay = (v: number) => formatPay(v, money);
  const role = Object.entries(posting.profile)
    .map(([name, value]) => `${name} ${value ?? "missing"}`).join(", ");
  const lines = [
    style.bold(`Range to post: ${pay(posting.low)} to ${pay(posting.high)}`),
    ...wrap(
      `Centred on the estimate ${pay(posting.estimate)}; built to hold ${
        formatPercent(posting.coverage, false, money)
      } of the pay of people like this role.`,
    ),
    ...(view.brief === true ? [] : wrap(style.dim(
      `The role as a new hire: ${role}` +
        (posting.newHire.length > 0
          ? ` (${posting.newHire.join(", ")} at its entry value, the lowest in the model's table).`
          : "."),
    ))),
  ];
  const c = posting.comparable;
  if (c === null) {
    lines.push(...wrap(style.dim(
      "How many current people it rests on, and what share of them it holds, needs --table: " +
        "the model file holds no one's pay.",
    )));
  } else if (c.people === null) {
    lines.push(...wrap(
      `Fewer current people than the privacy minimum share ${c.named.join(" and ")} with this ` +
        "role: no figure of them is shown.",
    ));
  } else {
    lines.push(...wrap(
      `${formatNumber(c.people, money, 0)} current people share ${c.named.join(" and ")} with ` +
        `this role; ${formatPercent(c.inside!, false, money)} of them are paid within the range.`,
    ));
  }
  lines.push(
    ...wrap(
      view.brief === true
        ? `It rests on the model's ${posting.criteria.length} attributes, none protected.`
        : `Objective criteria it rests on: ${
          posting.criteria.join(", ")
        } (no protected attribute).`,
    ),
    ...(view.brief === true ? [] : [""]),
    ...wrap(style.dim(view.brief === true ? BANDS_CAUTIONS_SHORT : BANDS_CAUTIONS)),
  );
  return lines;
}

/**
 * The analyst's per-person file as CSV: each person's cell, pay, band,
 * compa-ratio, range position and place (one person's pay in several
 * forms: for the analyst alone, written readable by its owner only). Every
 * cell formula-safe; people of a hidden cell have no band.
 *
 * @param idColumn The identifier column's name; without one, each row is
 * named by its line in the file (`line`, the header being line 1).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { bandPositionsCsv } from "./bands_view.ts";
 * const band = { min: 40000, mid: 50000, max: 60000 };
 * const csv = bandPositionsCsv(["level"], [
 *   { row: 0, id: "E1", key: ["G2"], pay: 45000, band, compaRatio: 0.9, rangePosition: 0.25, place: "inside" },
 *   { row: 1, id: "+E2", key: ["G9"], pay: 70000, band: null, compaRatio: null, rangePosition: null, place: null },
 * ], "employee_id");
 * const lines = csv.trim().split("\n");
 * assert.equal(lines[0], "employee_id,level,pay,band_min,band_mid,band_max,compa_ratio,range_position,place");
 * assert.equal(lines[1], "E1,G2,45000.00,40000.00,50000.00,60000.00,0.900000,0.250000,inside");
 * assert.equal(lines[2], `"'+E2",G9,70000.00,,,,,,`);
 * assert.equal(bandPositionsCsv(["level"], [], undefined).split(",")[0], "line");
 * ```
 */
export function bandPositionsCsv(
  by: readonly string[],
  people: readonly BandPosition[],
  idColumn: string | undefined,
): string {
  const head = [
    idColumn ?? "line",
    ...by,
    "pay",
    "band_min",
    "band_mid",
    "band_max",
    "compa_ratio",
    "range_position",
    "place",
  ];
  const lines = [head.map(csvCell).join(",")];
  const cents = (v: number) => v.toFixed(2);
  for (const p of people) {
    const b = p.band;
    lines.push(
      [
        idColumn === undefined ? String(p.row + 2) : p.id,
        ...p.key,
        cents(p.pay),
        b === null ? "" : cents(b.min),
        b === null ? "" : cents(b.mid),
        b === null ? "" : cents(b.max),
        p.compaRatio === null ? "" : p.compaRatio.toFixed(6),
        p.rangePosition === null ? "" : p.rangePosition.toFixed(6),
        p.place ?? "",
      ].map(csvCell).join(","),
    );
  }
  return lines.join("\n") + "\n";
}

/**
 * The rows of the table a band table leaves out, in words: those without
 * pay and those the model cannot score (a level it never saw).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { leftOutWords } from "./bands_view.ts";
 * const words = leftOutWords({
 *   withoutPay: 2,
 *   notScored: { rows: 3, first: { line: 31, reasons: ['level "G9" the model never saw'] } },
 * });
 * assert.equal(words.length, 2);
 * assert.match(words[1], /3 rows left out: the model cannot score them \(first, line 31: level "G9"/);
 * assert.deepEqual(leftOutWords({ withoutPay: 0, notScored: { rows: 0, first: null } }), []);
 * ```
 */
export function leftOutWords(table: Pick<BandTable, "withoutPay" | "notScored">): string[] {
  const out: string[] = [];
  const rows = (n: number) => `${formatNumber(n, {}, 0)} ${n === 1 ? "row" : "rows"}`;
  if (table.withoutPay > 0) {
    out.push(`${rows(table.withoutPay)} without pay (or a --by value) left out.`);
  }
  const { rows: count, first } = table.notScored;
  if (count > 0 && first !== null) {
    out.push(
      `${rows(count)} left out: the model cannot score ${count === 1 ? "it" : "them"} ` +
        `(${count === 1 ? "" : "first, "}line ${first.line}: ` +
        `${first.reasons.join("; ")}). The bands rest on the other rows.`,
    );
  }
  return out;
}
