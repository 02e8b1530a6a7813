/**
 * A fitted model as an HTML report: what it learned from, how accurate it
 * is beside a constant and a straight line on the same folds, which
 * attributes matter (importance bars), and any possible proxies of a
 * protected attribute; each chart with a table of the same figures.
 *
 * @module
 */

import type { Accuracy, Model } from "../../../mod.ts";
import {
  formatLeaves,
  formatNumber,
  formatPay,
  formatPercent,
  type NumberStyle,
} from "../numbers.ts";
import { barsChart } from "./charts.ts";
import { figureTable, type HtmlCell, type HtmlSection, paragraph } from "./page.ts";

/**
 * The sections of a fit's report.
 *
 * @param notes What the run said about the data (warnings in words).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../../mod.ts";
 * import { fitSections } from "./fit_html.ts";
 * const model = await fitModel(loadTable(demoCompanyCsv({ rows: 300, seed: 1 })), {
 *   target: "base_pay_eur", trees: 10, folds: 3, workers: 1,
 * });
 * const sections = fitSections(model, [], {});
 * assert.deepEqual(sections.map((s) => s.title), ["The model", "How accurate it is", "What matters"]);
 * assert(sections[1].body.includes(`data-value="${model.quality.ensemble!.money!.rmse}"`));
 * ```
 */
export function fitSections(model: Model, notes: string[], money: NumberStyle): HtmlSection[] {
  const pay = (v: number) => formatPay(v, money);
  // Four decimals; a figure that rounds to nothing reads 0, not -0.
  const small = (v: number) => (Math.abs(v) < 5e-5 ? "0" : formatNumber(v, money, 4));
  const regression = model.target.kind === "regression";
  const sections: HtmlSection[] = [];
  sections.push({
    title: "The model",
    body: [
      paragraph(
        `Estimates ${model.target.name} (${
          regression ? `fitted on the ${model.target.scale} scale` : "a class"
        }) from ${model.features.length} attributes: ` +
          model.features.map((f) => f.name).join(", ") + `. Learned from ` +
          `${formatNumber(model.rows.used, money, 0)} rows` +
          (model.rows.dropped > 0
            ? ` (${formatNumber(model.rows.dropped, money, 0)} left out without a value)`
            : "") +
          ".",
      ),
      ...(model.dropped.length === 0 ? [] : [paragraph(
        "Left out of the estimates: " +
          model.dropped.map((d) => `${d.name} (${d.reason})`).join(", ") + ".",
      )]),
      ...notes.map((n) => paragraph(n, "warning")),
      paragraph(
        `One reference tree (${
          formatLeaves(model.reference.leaves)
        }, chosen by ${model.settings.folds}-fold ` +
          `cross-validation of cost-complexity pruning) explains estimates` +
          (model.ensemble === null
            ? "."
            : `; ${model.ensemble.trees.length} bagged trees give them.`),
      ),
    ].join("\n"),
  });

  const q = model.quality;
  const models: [string, Accuracy | null][] = [
    ["the same figure for everyone", q.constant],
    ["a straight line", q.linear],
    ["the reference tree", q.reference],
    ["the ensemble", q.ensemble],
  ];
  const shown = models.filter((m): m is [string, Accuracy] => m[1] !== null);
  if (regression) {
    const rows: HtmlCell[][] = shown.map(([name, a]) => [
      { text: name },
      { text: a.measuredBy },
      { text: pay(a.money!.rmse), value: a.money!.rmse },
      { text: pay(a.money!.mae), value: a.money!.mae },
      { text: formatNumber(a.money!.r2, money, 3), value: a.money!.r2 },
    ]);
    sections.push({
      title: "How accurate it is",
      body: [
        barsChart({
          items: shown.map(([name, a]) => ({ label: name, value: a.money!.rmse })),
          axis: "typical error (RMSE)",
          format: pay,
          caption: "The typical error of each way of estimating, on rows it did not learn from " +
            "(cross-validation folds; out-of-bag rows for the ensemble): shorter is better. " +
            "The table below has the same figures.",
        }).html,
        figureTable(
          "Accuracy on rows each did not learn from",
          ["estimated by", "measured by", "RMSE", "mean absolute error", "R²"],
          rows,
        ),
      ].join("\n"),
    });
  } else {
    sections.push({
      title: "How accurate it is",
      body: figureTable(
        "Share classified correctly on rows each did not learn from",
        ["estimated by", "measured by", "accuracy"],
        shown.map(([name, a]) => [
          { text: name },
          { text: a.measuredBy },
          { text: formatPercent(a.accuracy!, false, money), value: a.accuracy! },
        ]),
      ),
    });
  }

  const importance = [...model.importance].sort((a, b) =>
    (Number.isNaN(b.permutation) ? b.impurity : b.permutation) -
    (Number.isNaN(a.permutation) ? a.impurity : a.permutation)
  );
  const byPermutation = importance.every((i) => !Number.isNaN(i.permutation));
  sections.push({
    title: "What matters",
    body: [
      barsChart({
        items: importance.map((i) => ({
          label: i.feature,
          value: byPermutation ? i.permutation : i.impurity,
        })),
        axis: byPermutation ? "error added when shuffled" : "share of the splits' gain",
        format: (v) => formatNumber(v, money, 3),
        caption: byPermutation
          ? "How much the ensemble's error on out-of-bag rows grows when an attribute's values " +
            "are shuffled (permutation importance): the longer the bar, the more the estimates " +
            "rest on it. The table below has the same figures."
          : "Each attribute's share of the reference tree's gain. The table below has the same " +
            "figures.",
      }).html,
      figureTable(
        "Importance of each attribute",
        ["attribute", "permutation", "its sd", "share of the gain"],
        importance.map((i) => [
          { text: i.feature },
          Number.isNaN(i.permutation)
            ? { text: "" }
            : { text: small(i.permutation), value: i.permutation },
          Number.isNaN(i.permutationSd)
            ? { text: "" }
            : { text: small(i.permutationSd), value: i.permutationSd },
          { text: formatPercent(i.impurity, false, money), value: i.impurity },
        ]),
      ),
    ].join("\n"),
  });
  if ((model.proxies ?? []).length > 0) {
    sections.push({
      title: "Possible proxies of a protected attribute",
      body: [
        paragraph(
          "These attributes on their own predict a protected attribute: the model leaves the " +
            "protected attribute out, but can still pay by it through them. Check them before " +
            "relying on the estimates.",
          "warning",
        ),
        figureTable(
          "Balanced accuracy of each attribute alone (0.5 is chance for two groups)",
          ["attribute", "predicts", "balanced accuracy"],
          model.proxies!.map((p) => [
            { text: p.feature },
            { text: p.attribute },
            { text: formatNumber(p.balancedAccuracy, money, 3), value: p.balancedAccuracy },
          ]),
        ),
      ].join("\n"),
    });
  }
  return sections;
}
