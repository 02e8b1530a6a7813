/**
 * A fitted model as text: the summary `fit` prints and the model card
 * `inspect` prints (with the reference tree as an indented outline).
 *
 * @module
 */

import {
  compareWithLine,
  formatThreshold,
  importanceGrowth,
  type LineComparison,
  type MeasureComparison,
  treeOutline,
  typicalErrorShare,
} from "../../mod.ts";
import Table from "cli-table3";
import wrapAnsi from "wrap-ansi";
import type { Accuracy, Model } from "../../mod.ts";
import { barChart } from "./charts.ts";
import {
  describeUnit,
  formatLeaves,
  formatNumber,
  formatPay,
  formatPercent,
  type NumberStyle,
} from "./numbers.ts";
import type { Style } from "./style.ts";
import { fitTable, leftOutNote } from "./fit_table.ts";
import { tableChars } from "./glyphs.ts";
import { straightLineSentence } from "./aliased_terms.ts";

/** What the views need besides the model. */
export interface ModelViewOptions {
  /** Styling. */
  style: Style;
  /** Terminal width. */
  width: number;
  /** Locale (and a currency overriding the model's). */
  numbers: NumberStyle;
}

/**
 * The currency the model's money is shown in (the one given, else the
 * model's), with the locale and glyphs given.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { moneyStyle } from "./model_view.ts";
 * const model = { target: { money: { currency: "EUR" } } } as unknown as import("../../mod.ts").Model;
 * assert.deepEqual(moneyStyle(model, { locale: "de-DE", ascii: true }), { locale: "de-DE", currency: "EUR", ascii: true });
 * assert.equal(moneyStyle(model, { currency: "USD" }).currency, "USD");
 * ```
 */
export function moneyStyle(model: Model, numbers: NumberStyle): NumberStyle {
  return {
    locale: numbers.locale,
    currency: numbers.currency ?? model.target.money?.currency,
    ...(numbers.ascii ? { ascii: true } : {}),
  };
}

/**
 * The target's unit and scale in words.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { describeTarget } from "./model_view.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }), { currency: "EUR" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * const ratio = model.target.center!.meanOverEstimate.toFixed(3);
 * assert.equal(
 *   describeTarget(model, {}),
 *   "base_pay_eur (EUR), fitted on the log scale: estimates are the median pay of people like " +
 *     `the profile (mean pay is ${ratio} x the estimate)`,
 * );
 * ```
 */
export function describeTarget(model: Model, numbers: NumberStyle): string {
  if (model.target.kind === "classification") {
    return `${model.target.name} (a class: ${model.target.classes!.join(", ")})`;
  }
  const unit = describeUnit(model.target.money ?? {}, numbers.currency);
  const center = model.target.center;
  const scale = model.target.scale === "raw"
    ? "fitted on the raw scale: estimates are mean pay"
    : center === undefined
    ? "fitted on the log scale: estimates are geometric mean pay"
    : "fitted on the log scale: estimates are the median pay of people like the profile " +
      `(mean pay is ${center.meanOverEstimate.toFixed(3)} x the estimate)`;
  return `${model.target.name} (${unit}), ${scale}`;
}

/**
 * The summary after fitting: rows, features, accuracy side by side,
 * importance as bars, and what the figures mean.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { renderModelSummary } from "./model_view.ts";
 * import { makeStyle } from "./style.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }), { currency: "EUR" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * const lines = renderModelSummary(model, { style: makeStyle(false), width: 200, numbers: {} });
 * assert(lines.includes("Rows: 120 used, 0 left out (missing target)"));
 * assert(lines.includes("Left out: employee_id (identifier), gender (protected attribute)"));
 * assert(lines.some((l) => l.startsWith(`Reference tree: ${model.reference.leaves} leaves`)));
 * ```
 */
export function renderModelSummary(model: Model, options: ModelViewOptions): string[] {
  const { style } = options;
  const wrap = (text: string) => wrapAnsi(text, options.width).split("\n");
  const lines: string[] = [];
  const short = inShort(model, options.numbers);
  if (short !== null) lines.push(...wrap(`${style.bold("In short:")} ${short}`));
  lines.push(...wrap(`${style.bold("Target:")} ${describeTarget(model, options.numbers)}`));
  const where = Object.entries(model.settings.where);
  lines.push(
    ...wrap(
      `${style.bold("Rows:")} ${formatNumber(model.rows.used, options.numbers)} used, ` +
        `${formatNumber(model.rows.dropped, options.numbers)} left out (missing target` +
        `${where.length > 0 ? " or not matching --where" : ""})`,
    ),
  );
  lines.push(
    ...wrap(
      `${style.bold("Features")} (${model.features.length}): ${
        model.features.map((f) => f.name).join(", ")
      }`,
    ),
  );
  if (model.dropped.length > 0) {
    lines.push(
      ...wrap(
        `${style.bold("Left out:")} ${
          model.dropped.map((d) => `${d.name} (${d.reason})`).join(", ")
        }`,
      ),
    );
  }
  lines.push("", ...renderAccuracy(model, options));
  lines.push("", ...renderImportance(model, options));
  const proxies = proxyLine(model);
  if (proxies !== null) lines.push("", ...wrap(style.warn(proxies)));
  lines.push("", ...wrap(style.dim(pruningLine(model))));
  return lines;
}

/**
 * The summary in one sentence for people who do not read RMSE: how far off
 * one person's estimate typically is, and what matters most.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { formatPay } from "./numbers.ts";
 * import { inShort } from "./model_view.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }), { currency: "EUR" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * const rmse = formatPay(model.quality.ensemble!.money!.rmse, { currency: "EUR" });
 * const sentence = inShort(model, {})!;
 * assert(sentence.startsWith(`for one person, the estimate is typically off by ${rmse}`));
 * ```
 */
export function inShort(model: Model, numbers: NumberStyle): string | null {
  const best = model.quality.ensemble ?? model.quality.reference;
  const top = [...model.importance].sort((a, b) =>
    (Number.isNaN(b.permutation) ? b.impurity : b.permutation) -
    (Number.isNaN(a.permutation) ? a.impurity : a.permutation)
  )[0]?.feature;
  if (model.target.kind === "classification") {
    return best.accuracy === undefined
      ? null
      : `the model names the right ${model.target.name} for ${formatPercent(best.accuracy)} of ` +
        `people it did not learn from; ${top} matters most.`;
  }
  if (best.money === undefined) return null;
  const money = moneyStyle(model, numbers);
  // On logs, exp(RMSE) - 1 is the typical error as a share of pay.
  const errorShare = typicalErrorShare(best);
  const share = errorShare !== null ? ` (about ${formatPercent(errorShare)})` : "";
  return `for one person, the estimate is typically off by ${formatPay(best.money.rmse, money)}` +
    `${share}, judged on people it did not learn from; ${top} matters most.`;
}

function pruningLine(model: Model): string {
  const ref = model.reference;
  const rule = model.settings.rule === "one-se" ? "1-SE rule" : "minimum CV error";
  const full = ref.pruningPath[0]?.leaves ?? ref.leaves;
  const ensemble = model.ensemble === null
    ? "No ensemble (--trees 0): estimates carry no intervals."
    : model.settings.prune === "none"
    ? `The ensemble's ${model.ensemble.trees.length} trees are not pruned (--prune none).`
    : `The ensemble's ${model.ensemble.trees.length} trees are pruned at the minimum-CV alpha ` +
      `(${model.ensemble.alpha.toPrecision(3)}).`;
  const increasing = model.settings.increasing;
  const constrained = increasing.length === 0
    ? ""
    : ` Every tree is grown so that the estimate never falls as ${
      increasing.join(" or ")
    } rises, the rest held (--increasing).`;
  return `Reference tree: ${formatLeaves(ref.leaves)}, depth ${ref.depth}, pruned from ${
    formatLeaves(full)
  } ` +
    `at alpha ${
      ref.alpha.toPrecision(3)
    } (${model.settings.folds}-fold cross-validation, ${rule}). ` +
    ensemble + constrained;
}

/**
 * The accuracy table with one line on what it means.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { formatPay } from "./numbers.ts";
 * import { renderAccuracy } from "./model_view.ts";
 * import { makeStyle } from "./style.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }), { currency: "EUR" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * const lines = renderAccuracy(model, { style: makeStyle(false, true), width: 100, numbers: {} });
 * const row = lines.find((l) => l.includes("ensemble, 3 trees"))!;
 * assert(row.includes(formatPay(model.quality.ensemble!.money!.rmse, { currency: "EUR" })));
 * assert(row.includes("out-of-bag"));
 * ```
 */
export function renderAccuracy(model: Model, options: ModelViewOptions): string[] {
  const { style } = options;
  const q = model.quality;
  const rows: [string, Accuracy | null][] = [
    ["constant", q.constant],
    ["straight line", q.linear],
    [`tree, ${formatLeaves(model.reference.leaves)}`, q.reference],
    [model.ensemble ? `ensemble, ${model.ensemble.trees.length} trees` : "ensemble", q.ensemble],
  ];
  const by = (a: Accuracy) =>
    a.measuredBy === "cross-validation"
      ? `${model.settings.folds}-fold CV`
      : a.measuredBy === "out-of-bag"
      ? "out-of-bag"
      : "in-sample";
  const money = moneyStyle(model, options.numbers);
  if (model.target.kind === "classification") {
    const table = new Table({
      head: ["model", "accuracy", "measured by"].map(style.bold),
      colAligns: ["left", "right", "left"],
      style: { head: [], border: [], compact: true },
      ...(tableChars(style.ascii) ? { chars: tableChars(style.ascii) } : {}),
    });
    for (const [name, a] of rows) {
      if (a === null) continue;
      table.push([name, formatPercent(a.accuracy ?? NaN), by(a)]);
    }
    const lines = [
      style.bold("Accuracy (share classified correctly)"),
      ...table.toString().split("\n"),
    ];
    const classes = q.ensemble?.classes;
    if (classes) {
      // Out-of-bag confusion matrix: rows are the actual class, columns the predicted one.
      const names = model.target.classes!;
      const matrix = new Table({
        head: ["actual", ...names, "recall"].map(style.bold),
        colAligns: ["left", ...names.map(() => "right" as const), "right"],
        style: { head: [], border: [], compact: true },
        ...(tableChars(style.ascii) ? { chars: tableChars(style.ascii) } : {}),
      });
      names.forEach((name, a) => {
        matrix.push([
          name,
          ...classes.confusion[a].map((n) => formatNumber(n, options.numbers)),
          // A class with no row (or never predicted) has no recall (precision).
          Number.isNaN(classes.recall[a]) ? "-" : formatPercent(classes.recall[a]),
        ]);
      });
      matrix.push([
        "precision",
        ...classes.precision.map((p) => (Number.isNaN(p) ? "-" : formatPercent(p))),
        "",
      ]);
      lines.push(
        "",
        style.bold("Out-of-bag confusion matrix (rows: actual class; columns: predicted)"),
        ...matrix.toString().split("\n"),
      );
    }
    return lines;
  }
  const log = model.target.scale === "log";
  const head = [
    "model",
    "RMSE",
    "MAE",
    style.ascii ? "R^2" : "R²",
    ...(log ? ["log RMSE", "log MAE"] : []),
    "measured by",
  ];
  const body: string[][] = [];
  for (const [name, a] of rows) {
    if (a === null || a.money === undefined) continue;
    body.push([
      name,
      formatPay(a.money.rmse, money),
      formatPay(a.money.mae, money),
      formatNumber(a.money.r2, options.numbers, 3),
      ...(log
        ? [
          formatNumber(a.log?.rmse ?? NaN, options.numbers, 4),
          formatNumber(a.log?.mae ?? NaN, options.numbers, 4),
        ]
        : []),
      by(a),
    ]);
  }
  // Narrow terminals: "measured by" goes first (a line under the table says it), then MAE.
  const fitted = fitTable({
    width: options.width,
    head,
    rows: body,
    aligns: [
      "left",
      "right",
      "right",
      "right",
      ...(log ? ["right" as const, "right" as const] : []),
      "left",
    ],
    // "measured by", then log MAE, then MAE.
    drop: [head.length - 1, ...(log ? [head.length - 2] : []), 2],
    styleHead: style.bold,
    ascii: style.ascii,
  });
  const lines = [
    ...wrapAnsi(
      style.bold(
        `Accuracy (RMSE, MAE and ${style.ascii ? "R^2" : "R²"} on pay itself, in ${
          money.currency ?? "the target's units"
        }${log ? "; log RMSE and log MAE on log pay, the scale the trees are fitted on" : ""})`,
      ),
      options.width,
    ).split("\n"),
    ...fitted.lines,
  ];
  if (fitted.dropped.includes("measured by")) {
    const measured = body.map((r) => `${r[0]}: ${r[r.length - 1]}`).join("; ");
    lines.push(...wrapAnsi(style.dim(`Measured by ${measured}.`), options.width).split("\n"));
  }
  const said = leftOutNote(fitted.dropped.filter((d) => d !== "measured by"));
  if (said !== null) lines.push(...wrapAnsi(style.dim(said), options.width).split("\n"));
  const comparison = compareWithLine(q.ensemble, q.reference, q.linear);
  if (comparison !== null) {
    lines.push(
      ...wrapAnsi(
        style.dim(
          `RMSE: the typical size of an error (MAE: the average size). ` +
            lineVerdict(comparison, money.currency ?? "the target's units"),
        ),
        options.width,
      ).split("\n"),
    );
  }
  const aliased = straightLineSentence(q.linear?.aliased ?? [], model.settings.folds);
  if (aliased !== null) lines.push(...wrapAnsi(style.dim(aliased), options.width).split("\n"));
  return lines;
}

// Words for each measure of the comparison with the straight line.
const MEASURE_WORDS: Record<MeasureComparison["measure"], string> = {
  rmse: "RMSE",
  mae: "MAE",
  "log-rmse": "log RMSE",
  "log-mae": "log MAE",
};

/**
 * The sentence under the accuracy table: a verdict only where the measures
 * agree, and never a recommendation of the trees where the line is as good.
 */
function lineVerdict(c: LineComparison, currency: string): string {
  const who = c.who === "ensemble" ? "The ensemble" : "The reference tree";
  const list = (better: "model" | "line") =>
    c.measures.filter((m) => m.better === better).map((m) => MEASURE_WORDS[m.measure]).join(", ");
  const rmse = c.measures[0];
  switch (c.verdict) {
    case "model":
      return `${who} errs less than the straight line on ${list("model")} (RMSE ` +
        `${formatPercent(rmse.gain)} lower, in ${currency}): the data has steps or ` +
        `interactions a line misses.`;
    case "line":
      return `The straight line errs less than ${who.toLowerCase()} on ${list("line")} and no ` +
        `more on the rest: pay here follows a straight line as well as the trees can say.`;
    case "mixed":
      return `The figures disagree: ${who.toLowerCase()} errs less on ${list("model")}, the ` +
        `straight line on ${list("line")}; neither is clearly better on this table.`;
    case "tie":
      return `${who} and the straight line err about equally (within 1% on every measure): ` +
        `pay here is close to a straight line.`;
  }
}

/**
 * Importance as horizontal bars.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { renderImportance } from "./model_view.ts";
 * import { makeStyle } from "./style.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }), { currency: "EUR" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * const lines = renderImportance(model, { style: makeStyle(false), width: 120, numbers: {} });
 * assert.match(lines[0], /^Importance: how much the typical error \(RMSE of log pay\) grows/);
 * // One bar per attribute, the largest growth first.
 * assert.equal(lines.length, 1 + model.features.length);
 * assert(lines[1].startsWith("level "));
 * ```
 */
export function renderImportance(model: Model, options: ModelViewOptions): string[] {
  const { style } = options;
  const permutation = model.importance.some((i) => !Number.isNaN(i.permutation));
  // Permutation importance read as "how much larger the typical error gets
  // when the attribute is scrambled" (importanceGrowth, on the fitting scale).
  const growthText = (
    g: number,
  ) => (g < 0.001 ? "+0%" : `+${formatPercent(g).replace(".0%", "%")}`);
  const items = importanceGrowth(model)
    .map((i) => {
      const g = i.growth;
      return {
        label: i.feature,
        value: permutation ? g : i.impurity,
        text: permutation ? growthText(g) : formatPercent(i.impurity),
      };
    })
    .sort((a, b) => b.value - a.value);
  const title = permutation
    ? `Importance: how much the typical error (RMSE${
      model.target.scale === "log" ? " of log pay" : ""
    }) grows when an attribute is scrambled`
    : "Importance: share of the trees' impurity decrease (favours many-valued attributes)";
  return [
    ...wrapAnsi(style.bold(title), options.width).split("\n"),
    ...barChart(items, Math.max(10, Math.min(40, options.width - 40))),
  ];
}

/**
 * The reference tree as an indented outline: each node's condition, rows
 * and typical pay (hidden below the privacy minimum).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { renderTreeOutline } from "./model_view.ts";
 * import { makeStyle } from "./style.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }), { currency: "EUR" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * const lines = renderTreeOutline(model, { style: makeStyle(false), width: 80, numbers: {} });
 * assert.equal(lines.length, model.reference.tree.nodeCount);
 * assert.match(lines[0], /^all: €[\d,]+ \(120 people\)$/);
 * assert(lines.filter((l) => l.includes(" -> ")).length === model.reference.leaves);
 * ```
 */
export function renderTreeOutline(model: Model, options: ModelViewOptions): string[] {
  const tree = model.reference.tree;
  const nodes = treeOutline(model);
  const money = moneyStyle(model, options.numbers);
  const lines: string[] = [];
  const privacy = model.settings.privacyMin;
  const valueText = (node: number) => {
    const n = nodes[node];
    if (n.value === null) return `fewer than ${privacy} people`;
    if (n.predicted) return `${n.predicted.class} ${formatPercent(n.predicted.share)}`;
    return formatPay(n.value, money);
  };
  const conditionText = (node: number, left: boolean) => {
    const split = nodes[node].split!;
    const f = model.features[tree.feature[node]];
    if (split.left !== undefined) {
      return `${f.name} in {${(left ? split.left : split.right!).join(", ")}}`;
    }
    const t = split.threshold!;
    if (t === Infinity) return left ? `${f.name} is known` : `${f.name} is missing`;
    if (f.kind === "ordinal") {
      const last = Math.floor(t);
      return left ? `${f.name} <= ${f.levels![last]}` : `${f.name} >= ${f.levels![last + 1]}`;
    }
    return `${f.name} ${left ? "<=" : ">"} ${formatThreshold(t)}`;
  };
  // Depth first, left before right, with an explicit stack: a tree of any
  // depth is drawn without recursion. Indentation stops growing at
  // OUTLINE_INDENT levels; deeper lines say their depth instead.
  const stack: [number, number, string][] = [[0, 0, "all"]];
  while (stack.length > 0) {
    const [node, depth, label] = stack.pop()!;
    const indent = "  ".repeat(Math.min(depth, OUTLINE_INDENT));
    const deep = depth > OUTLINE_INDENT ? `(depth ${depth}) ` : "";
    const leaf = tree.left[node] === -1;
    // Long lines wrap at word boundaries, continued under their own indent.
    const line = `${deep}${label}${leaf ? " -> " : ": "}${valueText(node)} ` +
      options.style.dim(`(${formatNumber(tree.rows[node], options.numbers)} people)`);
    wrapAnsi(line, Math.max(20, options.width - indent.length - 2)).split("\n").forEach((part, i) =>
      lines.push(`${indent}${i === 0 ? "" : "  "}${part}`)
    );
    if (leaf) continue;
    stack.push([tree.right[node], depth + 1, conditionText(node, false)]);
    stack.push([tree.left[node], depth + 1, conditionText(node, true)]);
  }
  return lines;
}

/**
 * Levels of the outline that are indented; deeper ones carry "(depth N)".
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { OUTLINE_INDENT, renderTreeOutline } from "./model_view.ts";
 * import { makeStyle } from "./style.ts";
 * // A hand-made chain 18 splits deep on "years" (years <= d + 0.5 goes left, to a leaf).
 * const splits = 18;
 * const n = 2 * splits + 1;
 * const tree = {
 *   width: 1, nodeCount: n, feature: new Int32Array(n).fill(-1),
 *   threshold: new Float64Array(n).fill(NaN), left: new Int32Array(n).fill(-1),
 *   right: new Int32Array(n).fill(-1), value: new Float64Array(n).fill(10.819778284410283), // log 50,000
 *   rows: new Int32Array(n).fill(10),
 * };
 * for (let d = 0; d < splits; d++) {
 *   tree.feature[2 * d] = 0;
 *   tree.threshold[2 * d] = d + 0.5;
 *   [tree.left[2 * d], tree.right[2 * d]] = [2 * d + 1, 2 * d + 2];
 * }
 * const model = {
 *   reference: { tree }, features: [{ name: "years", kind: "numeric" }],
 *   settings: { privacyMin: 5 }, target: { kind: "regression", scale: "log" },
 * } as unknown as import("../../mod.ts").Model;
 * const lines = renderTreeOutline(model, { style: makeStyle(false), width: 80, numbers: {} });
 * const indent = " ".repeat(2 * OUTLINE_INDENT);
 * assert(lines.includes(`${indent}years > 15.5: 50,000 (10 people)`)); // depth 16
 * assert(lines.includes(`${indent}(depth 17) years <= 16.5 -> 50,000 (10 people)`));
 * ```
 */
export const OUTLINE_INDENT = 16;

/**
 * The possible proxies of protected attributes in one sentence, or null
 * when there are none.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { proxyLine } from "./model_view.ts";
 * const line = proxyLine({ proxies: [{ feature: "site", attribute: "gender", balancedAccuracy: 0.71 }] });
 * assert(line!.startsWith("Possible proxy: site predicts gender (balanced accuracy 0.71)"));
 * assert(proxyLine({ proxies: [] }) === null);
 * ```
 */
export function proxyLine(model: Pick<Model, "proxies">): string | null {
  const proxies = model.proxies ?? [];
  if (proxies.length === 0) return null;
  return `Possible prox${proxies.length > 1 ? "ies" : "y"}: ` +
    proxies.map((p) =>
      `${p.feature} predicts ${p.attribute} (balanced accuracy ${p.balancedAccuracy.toFixed(2)})`
    ).join("; ") +
    `. The model leaves ${[...new Set(proxies.map((p) => p.attribute))].join(" and ")} out, ` +
    "but can still pay by it through such an attribute; check the gap (paygrove gap) before use.";
}
