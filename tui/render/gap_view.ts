/**
 * The gap check as text for the terminal and as a Markdown report: a plain
 * sentence, a table per category, the unexplained gaps on one axis, pay
 * quartiles, the comparisons, proxies, notes, sources and cautions.
 *
 * A suppressed category appears only by name with "too few to report".
 *
 * @module
 */

import { gapPartsMarkdown, renderGapParts } from "./gap_parts_view.ts";
import wrapAnsi from "wrap-ansi";
import {
  GAP_CAUTIONS,
  GAP_SOURCES,
  type GapFigure,
  type GapReport,
  type PayQuartile,
} from "../../mod.ts";
import { formatNumber, formatPay, formatPercent, type NumberStyle } from "./numbers.ts";
import type { Style } from "./style.ts";
import { fitTable, leftOutNote } from "./fit_table.ts";
import { linearVersionSentence } from "./aliased_terms.ts";
import { forMarkdown } from "./safe_text.ts";
import { gapNoteText } from "./report_notes.ts";

/** How a gap report is drawn. */
export interface GapView {
  /** Styling. */
  style: Style;
  /** Columns available. */
  width: number;
  /** Number formatting. */
  numbers: NumberStyle;
  /**
   * For the guided flow: the sentence, the table, the chart, proxies and
   * notes; no quartiles, comparisons, model figures or sources.
   */
  brief?: boolean;
}

const TOO_FEW = "too few to report";

/** "12.1%", or "n/a" for a missing figure. */
function pct(value: number | null, numbers: NumberStyle, signed = false): string {
  if (value === null) return "n/a";
  // No "-0.0%": what rounds to zero is zero.
  return formatPercent(Math.abs(value) < 0.0005 ? 0 : value, signed, numbers);
}

/** The flags of a figure as short words. */
function flagWords(f: GapFigure): string {
  // "small": significant after Holm's adjustment but below the materiality,
  // so that an interval clear of 0 never stands unflagged without a reason.
  const small = !f.unexplainedFlag && f.pAdjusted !== null && f.pAdjusted <= 0.05;
  return [f.rawFlag ? "raw" : "", f.unexplainedFlag ? "unexpl." : "", small ? "small" : ""]
    .filter(Boolean).join(" ");
}

// "0.9% to 2.0%" on one side of zero; "-2.0% to +2.4%" across it, where the sign matters.
function intervalWords(low: number, high: number, numbers: NumberStyle): string {
  const words = (x: number) => `${pct(Math.abs(x), numbers)} ${x >= 0 ? "below" : "above"}`;
  if (low >= 0) return `${pct(low, numbers)} to ${words(high)}`;
  if (high <= 0) return `${pct(-high, numbers)} to ${words(low)}`;
  return `${words(low)} to ${words(high)}`;
}

/**
 * One plain sentence on the overall figures.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { gapSentence } from "./gap_view.ts";
 * const sentence = gapSentence("Man", {
 *   group: "Woman", rows: 10, referenceRows: 10, rawMean: 0.12, rawMedian: 0.1,
 *   variableMean: null, variableMedian: null, adjusted: 0.013, low: 0.002, high: 0.024,
 *   familyLow: 0.002, familyHigh: 0.024, family: 1, coefficient: -0.013, se: 0.0056, p: 0.02, pAdjusted: 0.02, residualDifference: 0.01,
 *   rawFlag: true, unexplainedFlag: false,
 * }, {});
 * assert(sentence.startsWith("Woman: mean pay 12.0% below Man's"));
 * ```
 */
export function gapSentence(reference: string, f: GapFigure, numbers: NumberStyle): string {
  const side = (x: number) => (x >= 0 ? "below" : "above");
  let text = `${f.group}: mean pay ${pct(Math.abs(f.rawMean), numbers)} ${side(f.rawMean)} ` +
    `${reference}'s`;
  if (f.adjusted !== null) {
    text += `; with the factors below held equal, ` +
      `${pct(Math.abs(f.adjusted), numbers)} ${side(f.adjusted)} (95% interval: ` +
      intervalWords(f.low!, f.high!, numbers) + ")";
  }
  return text + ".";
}

/**
 * Unexplained gaps with their intervals on one common axis, zero marked.
 * Positive values (the group paid less than the reference) lie right of it.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { gapAxis } from "./gap_view.ts";
 * const lines = gapAxis([{ label: "A", value: 0.05, low: 0.02, high: 0.08 }], 21, false);
 * assert(lines[1].includes("[") && lines[1].includes("o"));
 * ```
 */
export function gapAxis(
  rows: readonly { label: string; value: number | null; low: number | null; high: number | null }[],
  axisWidth: number,
  ascii: boolean,
): string[] {
  const known = rows.filter((r) => r.value !== null);
  const low = Math.min(0, ...known.map((r) => r.low!));
  const high = Math.max(0, ...known.map((r) => r.high!));
  const span = high - low || 0.01;
  const at = (x: number) => Math.round(((x - low) / span) * (axisWidth - 1));
  const zero = at(0);
  const labelWidth = Math.max(...rows.map((r) => r.label.length));
  const axisChar = ascii ? ":" : "┆";
  const scale = new Array(axisWidth).fill(" ");
  const put = (text: string, where: number) => {
    const start = Math.max(
      0,
      Math.min(axisWidth - text.length, where - Math.floor(text.length / 2)),
    );
    for (let i = 0; i < text.length; i++) scale[start + i] = text[i];
  };
  put(formatPercent(low, true), 0 + Math.floor(formatPercent(low, true).length / 2));
  put("0", zero);
  put(formatPercent(high, true), axisWidth - 1);
  const lines = [`${"".padEnd(labelWidth)}  ${scale.join("").replace(/\s+$/, "")}`];
  for (const r of rows) {
    const cells = new Array(axisWidth).fill(" ");
    cells[zero] = axisChar;
    if (r.value !== null) {
      const a = at(r.low!);
      const b = at(r.high!);
      for (let i = a; i <= b; i++) cells[i] = "-";
      cells[a] = "[";
      cells[b] = "]";
      cells[at(r.value)] = "o";
    }
    lines.push(`${r.label.padEnd(labelWidth)}  ${cells.join("").replace(/\s+$/, "")}`);
  }
  return lines;
}

/** The rows of the main table: overall first, then each category. */
function tableRows(report: GapReport, numbers: NumberStyle): string[][] {
  // With one group compared, the title names it and the column is left out.
  const many = report.groups.length > 1;
  const people = many ? "people/ref" : `${report.groups[0]}/${report.reference}`;
  const head = ["", ...(many ? ["group"] : []), people, "raw mean", "median"];
  head.push("unexplained", "flags");
  const rows: string[][] = [head];
  // Per category the family-wise interval, the one that matches the Holm
  // flags; overall (one test) the 95% interval.
  const interval = (f: GapFigure) => {
    const bare = (x: number | null) => pct(x, numbers).replace("%", "");
    return `${pct(f.adjusted, numbers)} (${bare(f.familyLow)}..${bare(f.familyHigh)})`;
  };
  const figureRow = (label: string, f: GapFigure) => [
    label,
    ...(many ? [f.group] : []),
    `${formatNumber(f.rows, numbers, 0)}/${formatNumber(f.referenceRows, numbers, 0)}`,
    pct(f.rawMean, numbers),
    pct(f.rawMedian, numbers),
    f.adjusted === null ? "n/a" : interval(f),
    flagWords(f),
  ];
  const tooFew = (label: string) => [label, TOO_FEW, ...new Array(head.length - 2).fill("")];
  if (report.overall.suppressed) rows.push(tooFew("Overall"));
  else report.overall.gaps.forEach((f, i) => rows.push(figureRow(i === 0 ? "Overall" : "", f)));
  for (const c of report.categories) {
    if (c.suppressed) rows.push(tooFew(c.name));
    else c.gaps.forEach((f, i) => rows.push(figureRow(i === 0 ? c.name : "", f)));
  }
  return rows;
}

/**
 * The gap report as terminal lines (without the cautions, which the
 * command adds).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, gapCheck, loadTable } from "../../mod.ts";
 * import { gapSentence, renderGap } from "./gap_view.ts";
 * import { makeStyle } from "./style.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 200, seed: 3 }), { currency: "EUR" });
 * const report = await gapCheck(table, {
 *   target: "base_pay_eur", group: "gender", compare: ["Woman"], trees: 10, workers: 1,
 * });
 * const numbers = { currency: "EUR" };
 * const lines = renderGap(report, { style: makeStyle(false), width: 1000, numbers });
 * assert.equal(lines[0], "Pay gap by gender: Woman against Man");
 * assert(!report.overall.suppressed);
 * assert(lines.includes(gapSentence("Man", report.overall.gaps[0], numbers)));
 * ```
 */
export function renderGap(report: GapReport, view: GapView): string[] {
  const { style, width, numbers } = view;
  const brief = view.brief ?? false;
  const wrap = (text: string) => wrapAnsi(text, width).split("\n");
  const lines: string[] = [];
  lines.push(
    ...wrap(style.bold(
      `Pay gap by ${report.group}: ${report.groups.join(", ")} against ${report.reference}`,
    )),
    ...wrap(style.dim(
      `Reference group: ${report.reference} (${report.referenceReason}). ${report.target}, ` +
        `${formatNumber(report.rows, numbers, 0)} people` +
        (report.within.length ? `, categories by ${report.within.join(" x ")}` : "") +
        (report.missingGroup ? `; ${report.missingGroup} without a ${report.group} left out` : "") +
        ". Gaps are shares of the reference group's pay: 5.0% = paid 5% less.",
    )),
    "",
  );
  if (!report.overall.suppressed) {
    for (const f of report.overall.gaps) {
      lines.push(...wrap(gapSentence(report.reference, f, numbers)));
    }
    lines.push("");
  }
  const many = report.groups.length > 1;
  const tablePart = (): string[] => {
    const lines: string[] = [];
    const [head, ...body] = tableRows(report, numbers);
    const median = head.indexOf("median");
    const people = many ? 2 : 1;
    // Too wide for the screen: the median gaps go first, then the head
    // counts (both stay in --json and --report); then a list, one block per
    // row, each named by its category.
    let category = "";
    const table = fitTable({
      width,
      head,
      rows: body,
      aligns: head.map((_, j) => (j === 0 || j === head.length - 1 ? "left" : "right")),
      drop: [median, people],
      borders: "none",
      gap: width < 90 ? 1 : 2,
      spanning: TOO_FEW,
      styleHead: style.bold,
      ascii: style.ascii,
      listTitles: body.map((r) => (category = r[0] === "" ? category : r[0])),
    });
    const said = leftOutNote(
      table.dropped.map((d) => (d === "median" ? "median gaps" : "people counts")),
      "--json and --report have",
    );
    if (said !== null) lines.push(...wrap(style.dim(said)));
    lines.push(...table.lines);
    const anyShown = !report.overall.suppressed || report.categories.some((c) => !c.suppressed);
    if (anyShown) {
      lines.push(
        ...wrap(style.dim(
          brief
            ? `Unexplained: the gap left with the other factors held equal, and its 95% ` +
              `interval (per category: family-wise, Bonferroni across the categories). Flags: raw = a raw mean gap of ${
                pct(report.threshold, numbers)
              } or more either ` +
              `way (a joint pay assessment under Directive (EU) 2023/970, Art. 10, unless ` +
              `justified); unexpl. = significant after Holm's adjustment and at least ` +
              `${pct(report.materiality, numbers)}; small = significant but below it.`
            : `Unexplained: the gap left with the other factors held equal, and its 95% ` +
              `interval; per category the interval is family-wise (Bonferroni: each at ` +
              `1 - 5% / the number of figures), the level of the flags, so one clear of 0 ` +
              `always comes with a significant test (Holm may also flag one that touches 0). ` +
              `Flags: raw = a raw mean gap of ${
                pct(report.threshold, numbers)
              } or more either way (Directive ` +
              `(EU) 2023/970, Art. 10: a joint pay assessment unless objective, gender-neutral criteria ` +
              `justify it, which only the employer can judge); unexpl. = the adjusted gap differs ` +
              `from 0 at the 5% level after Holm's adjustment across categories and is at least ` +
              `${pct(report.materiality, numbers)}; small = it differs from 0 but is below that.`,
        )),
      );
    }
    lines.push("");
    return lines;
  };
  const axisPart = (): string[] => {
    const lines: string[] = [];
    const axisRows: {
      label: string;
      value: number | null;
      low: number | null;
      high: number | null;
    }[] = [];
    const add = (label: string, f: GapFigure) =>
      axisRows.push({ label, value: f.adjusted, low: f.familyLow, high: f.familyHigh });
    if (!report.overall.suppressed) {
      for (const f of report.overall.gaps) add(many ? `Overall ${f.group}` : "Overall", f);
    }
    for (const c of report.categories) {
      if (c.suppressed) axisRows.push({ label: c.name, value: null, low: null, high: null });
      else for (const f of c.gaps) add(many ? `${c.name} ${f.group}` : c.name, f);
    }
    if (axisRows.some((r) => r.value !== null)) {
      const labelWidth = Math.max(...axisRows.map((r) => r.label.length));
      lines.push(
        ...wrap(style.bold("Unexplained gap, 95% interval, one axis (right of 0: paid less)")),
        ...gapAxis(axisRows, Math.max(20, Math.min(50, width - labelWidth - 4)), style.ascii),
        "",
      );
    }
    return lines;
  };
  // In the flow, the table (with its flags) comes last, nearest the next question.
  if (brief) lines.push(...axisPart(), ...tablePart());
  else lines.push(...tablePart(), ...axisPart());

  if (!brief) {
    if (!report.overall.suppressed) {
      const f = report.overall.gaps;
      for (const g of f) {
        const linear = report.linear?.find((l) => l.group === g.group);
        lines.push(
          ...wrap(
            `${
              many ? `${g.group}, beside` : "Beside"
            } the adjusted gap: the simple difference of ` +
              `out-of-bag pay residuals ${
                pct(g.residualDifference, numbers)
              } (it tends to understate ` +
              `the gap when a group is concentrated in some levels or families)` +
              (linear
                ? `; the linear version (log pay on the factors plus a group indicator) ` +
                  `${pct(linear.gap, numbers)} (b = ${
                    formatNumber(linear.coefficient, numbers, 4)
                  }, ` +
                  `SE ${formatNumber(linear.se, numbers, 4)}).`
                : "."),
          ),
        );
      }
      const aliased = linearVersionSentence(report.linearAliased, report.group);
      if (aliased !== null) lines.push(...wrap(style.dim(aliased)));
      lines.push("");
    }
    lines.push(...renderGapParts(report, view));

    if (report.quartiles) {
      const groups = [report.reference, ...report.groups];
      lines.push(
        ...wrap(
          style.bold("Pay quartiles (four equal groups of people by pay): share of each group"),
        ),
      );
      lines.push(
        ...fitTable({
          width,
          head: ["", ...groups, "pay"],
          rows: report.quartiles.map((q) => [
            ["Q1 lowest", "Q2", "Q3", "Q4 highest"][q.quartile - 1],
            ...groups.map((g) => pct(q.shares[g] ?? 0, numbers)),
            quartileBounds(q, numbers),
          ]),
          borders: "none",
        }).lines,
        ...wrap(style.dim(quartileNote(report.privacyMin))),
        "",
      );
    }

    if (report.variable !== null) {
      lines.push(style.bold(`Variable pay (${report.variable}): raw gaps`));
      const rows: string[][] = [];
      const push = (label: string, f: GapFigure) =>
        rows.push([label, f.group, pct(f.variableMean, numbers), pct(f.variableMedian, numbers)]);
      if (!report.overall.suppressed) report.overall.gaps.forEach((f) => push("Overall", f));
      for (const c of report.categories) {
        if (c.suppressed) rows.push([c.name, TOO_FEW, "", ""]);
        else c.gaps.forEach((f) => push(c.name, f));
      }
      const head = ["", "group", "mean", "median"];
      lines.push(
        ...fitTable({ width, head, rows, borders: "none", spanning: TOO_FEW }).lines,
        "",
      );
    }
  }

  lines.push(
    ...wrap(
      report.proxies.length === 0
        ? `No factor alone predicts ${report.group} with balanced accuracy of ` +
          `${formatNumber(report.proxyThreshold, numbers, 2)} or more.`
        : style.warn(
          `Possible proxies of ${report.group} (one factor alone predicts it; balanced ` +
            `accuracy, 0.5 = none for two groups): ` +
            report.proxies.map((p) =>
              `${p.feature} ${formatNumber(p.balancedAccuracy, numbers, 2)}`
            )
              .join(", ") +
            `. The adjustment counts them as legitimate; if they carry ${report.group}, ` +
            `the adjusted gap understates it.`,
        ),
    ),
    ...(brief ? [] : wrap(style.dim(
      `Adjusted for: ${report.features.join(", ")}. Out-of-bag R^2 of log pay ` +
        `${formatNumber(report.models.payR2Log, numbers, 3)}; the factors predict ` +
        `${report.group} with balanced accuracy ${
          formatNumber(report.models.groupBalancedAccuracy, numbers, 2)
        } (${report.models.trees} trees each).`,
    ))),
    ...(brief ? [] : [""]),
  );
  for (const note of report.notes) {
    // Brief: only what changes how to read the figures shown.
    if (brief && note.kind === "residualDifference") continue;
    lines.push(...wrap(style.dim(gapNoteText(note))));
  }
  if (!brief) lines.push(...wrap(style.dim("Sources: " + GAP_SOURCES.join(" "))));
  return lines;
}

/**
 * A quartile's pay bounds in words: open below for the first, open above
 * for the fourth (no one's own pay is shown).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { quartileBounds } from "./gap_view.ts";
 * const q = { quartile: 1, rows: 5, low: null, high: 41250, shares: {} };
 * assert.equal(quartileBounds(q, {}), "under 41,250");
 * assert.equal(quartileBounds({ ...q, quartile: 4, low: 72300, high: null }, {}), "72,300 and above");
 * assert.equal(quartileBounds({ ...q, quartile: 2, low: 41250, high: 52000 }, {}), "41,250 to 52,000");
 * const hourly = { ...q, quartile: 2, low: 1, high: 5.25 };
 * assert.equal(quartileBounds(hourly, { currency: "USD" }), "$1.00 to $5.25");
 * ```
 */
export function quartileBounds(q: PayQuartile, numbers: NumberStyle): string {
  // As pay is shown everywhere: its currency, and cents below 100 (hourly
  // rates of $1.00 to $5.25 are not "1 to 5").
  const pay = (x: number) => formatPay(x, numbers);
  if (q.low === null) return q.high === null ? "" : `under ${pay(q.high)}`;
  if (q.high === null) return `${pay(q.low)} and above`;
  return `${pay(q.low)} to ${pay(q.high)}`;
}

function quartileNote(privacyMin: number): string {
  return `Each cut between two quartiles is the mean pay of the ${privacyMin} people nearest it; ` +
    `the lowest and highest pay are not shown, as they are one person's.`;
}

/**
 * The gap report as a Markdown document, cautions and provenance included.
 * Every text of the report (group, category and factor names, notes, the
 * file name) is written through {@linkcode markdownText}: shown as typed,
 * never as HTML, a link or a table cell break.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, GAP_CAUTIONS, gapCheck, loadTable } from "../../mod.ts";
 * import { gapMarkdown } from "./gap_view.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 200, seed: 3 }), { currency: "EUR" });
 * const report = await gapCheck(table, {
 *   target: "base_pay_eur", group: "gender", compare: ["Woman"], trees: 10, workers: 1,
 * });
 * const md = gapMarkdown(report, { currency: "EUR" }, "2026-12-02T10:00:00Z").split("\n");
 * assert.equal(md[0], "# Pay gap by gender");
 * assert(md.includes(`> ${GAP_CAUTIONS}`));
 * assert(!report.overall.suppressed);
 * const { rows, referenceRows } = report.overall.gaps[0];
 * assert(md.includes("| category | Woman/Man | raw mean | median | unexplained | flags |"));
 * assert(md.some((l) => l.startsWith(`| Overall | ${rows}/${referenceRows} |`)));
 * ```
 */
export function gapMarkdown(data: GapReport, numbers: NumberStyle, created: string): string {
  const report = forMarkdown(data);
  const md: string[] = [];
  const table = (rows: string[][]) => [
    `| ${rows[0].join(" | ")} |`,
    `|${rows[0].map((_, j) => (j === 0 ? " --- " : " ---: ")).join("|")}|`,
    ...rows.slice(1).map((r) => `| ${r.join(" | ")} |`),
  ];
  md.push(
    `# Pay gap by ${report.group}`,
    "",
    `${report.groups.join(", ")} against ${report.reference} (the reference: ` +
      `${report.referenceReason}). ${report.target}, ${
        formatNumber(report.rows, numbers, 0)
      } people` +
      (report.within.length ? `, categories by ${report.within.join(" x ")}` : "") +
      ". Gaps are shares of the reference group's pay: 5.0% means paid 5% less.",
    "",
    `> ${GAP_CAUTIONS}`,
    "",
  );
  if (!report.overall.suppressed) {
    for (const f of report.overall.gaps) md.push(`- ${gapSentence(report.reference, f, numbers)}`);
    md.push("");
  }
  md.push(
    "## Gaps",
    "",
    ...table(tableRows(report, numbers).map((r, i) => i === 0 ? ["category", ...r.slice(1)] : r)),
    "",
  );
  md.push(
    `Flags: **raw** = a raw mean gap of ${pct(report.threshold, numbers)} or more (Art. 10: a ` +
      `joint pay assessment unless objective, gender-neutral criteria justify it); ` +
      `**unexplained** = the adjusted gap differs from 0 at the 5% level after Holm's ` +
      `adjustment and is at least ${pct(report.materiality, numbers)}.`,
    "",
  );
  if (!report.overall.suppressed) {
    md.push("## The adjusted gap beside two simpler estimates", "");
    const rows = [["group", "adjusted (partialling out)", "residual difference", "linear (OLS)"]];
    for (const f of report.overall.gaps) {
      const lin = report.linear?.find((l) => l.group === f.group);
      rows.push([
        f.group,
        `${pct(f.adjusted, numbers)} (b = ${formatNumber(f.coefficient ?? NaN, numbers, 4)}, SE ${
          formatNumber(f.se ?? NaN, numbers, 4)
        })`,
        pct(f.residualDifference, numbers),
        lin
          ? `${pct(lin.gap, numbers)} (b = ${formatNumber(lin.coefficient, numbers, 4)}, SE ${
            formatNumber(lin.se, numbers, 4)
          })`
          : "n/a",
      ]);
    }
    md.push(...table(rows), "");
    md.push(
      "The residual difference tends to understate the gap when a group is concentrated in some " +
        "levels or families.",
      "",
    );
    const aliased = linearVersionSentence(report.linearAliased, report.group);
    if (aliased !== null) md.push(aliased, "");
  }
  md.push(...gapPartsMarkdown(report, numbers));
  if (report.quartiles) {
    const groups = [report.reference, ...report.groups];
    md.push("## Pay quartiles", "");
    md.push(
      ...table([
        ["quartile", ...groups, "pay"],
        ...report.quartiles.map((q) => [
          String(q.quartile),
          ...groups.map((g) => pct(q.shares[g] ?? 0, numbers)),
          quartileBounds(q, numbers),
        ]),
      ]),
      "",
      quartileNote(report.privacyMin),
      "",
    );
  }
  md.push("## Proxies and the models", "");
  md.push(
    report.proxies.length === 0
      ? `No factor alone predicts ${report.group} with balanced accuracy of ${report.proxyThreshold} or more.`
      : `Possible proxies of ${report.group}: ` +
        report.proxies.map((p) =>
          `${p.feature} (balanced accuracy ${p.balancedAccuracy.toFixed(2)})`
        )
          .join(", ") +
        ".",
    "",
    `Adjusted for: ${report.features.join(", ")}. Out-of-bag R² of log pay ` +
      `${report.models.payR2Log.toFixed(3)}; balanced accuracy of the group model ` +
      `${report.models.groupBalancedAccuracy.toFixed(2)}.`,
    "",
  );
  if (report.notes.length) {
    md.push(
      "## Notes",
      "",
      ...report.notes.map((n) => `- ${gapNoteText(n)}`),
      "",
    );
  }
  md.push("## Sources", "", ...GAP_SOURCES.map((s) => `- ${s}`), "");
  const p = report.provenance;
  md.push(
    `---`,
    `paygrove ${p.paygrove}; ${p.table.file} (sha256 ${p.table.sha256}); seed ${p.seed}; ` +
      `written ${created}.`,
    "",
  );
  return md.join("\n");
}
