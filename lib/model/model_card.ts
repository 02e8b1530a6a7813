/**
 * The figures a model's card shows that are not stored as such: the
 * reference tree as a flat outline with values in money (hidden below the
 * privacy minimum), permutation importance as the growth of the typical
 * error, and the typical error as a share of pay. The terminal words them;
 * it computes none of them.
 *
 * @module
 */

import { toMoney } from "../ensemble/pay_scale.ts";
import { predictedClass, splitLevels } from "../tree/flat_tree.ts";
import type { Accuracy, Model } from "./types.ts";

/** One node of the reference tree's outline. */
export interface OutlineNode {
  /** The parent's id (null for the root). */
  parent: number | null;
  /** Depth (the root is 0). */
  depth: number;
  /** Training rows reaching the node. */
  rows: number;
  /**
   * The node's value: pay in money for a pay model, the first class's share
   * for a class model; null below the privacy minimum.
   */
  value: number | null;
  /** A class model's most likely class and its share (null below the privacy minimum). */
  predicted?: { class: string; share: number } | null;
  /** A split's attribute and where it splits (a threshold, or the levels each side takes). */
  split?: { feature: string; threshold?: number; left?: string[]; right?: string[] };
  /** A split's children's ids, left then right. */
  children?: [number, number];
}

/**
 * The reference tree as a flat list in id order (children after their
 * parent): no recursion however deep, and a shape JSON tools can take.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { treeOutline } from "./model_card.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 300, seed: 4 }), { target: "base_pay_eur" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 10, folds: 5, workers: 1 });
 * const nodes = treeOutline(model);
 * assert.equal(nodes.length, model.reference.tree.nodeCount);
 * assert.equal(nodes[0].rows, model.rows.used); // the root holds everyone
 * // A pay model's values are money: exp of the stored log value.
 * assert(Math.abs(nodes[0].value! - Math.exp(model.reference.tree.value[0])) < 1e-9);
 * ```
 */
export function treeOutline(model: Model): OutlineNode[] {
  const tree = model.reference.tree;
  const privacy = model.settings.privacyMin;
  const regression = model.target.kind === "regression";
  const nodes: OutlineNode[] = [];
  // Children come after their parent (checked when the file is read), so one
  // pass in id order meets every parent first.
  const parent = new Int32Array(tree.nodeCount).fill(-1);
  const depth = new Int32Array(tree.nodeCount);
  for (let node = 0; node < tree.nodeCount; node++) {
    const hidden = tree.rows[node] < privacy;
    const raw = tree.value[node * tree.width];
    const out: OutlineNode = {
      parent: parent[node] < 0 ? null : parent[node],
      depth: depth[node],
      rows: tree.rows[node],
      value: hidden ? null : regression ? toMoney(raw, model.target.scale) : raw,
    };
    if (!regression) {
      const best = predictedClass(tree, node);
      out.predicted = hidden
        ? null
        : { class: model.target.classes![best], share: tree.value[node * tree.width + best] };
    }
    nodes.push(out);
    const [l, r] = [tree.left[node], tree.right[node]];
    if (l === -1) continue;
    parent[l] = parent[r] = node;
    depth[l] = depth[r] = depth[node] + 1;
    const f = model.features[tree.feature[node]];
    if (f.kind === "categorical") {
      const names = (left: boolean) =>
        splitLevels(tree, node, left, f.levels!.length).map((code) => f.levels![code]);
      out.split = { feature: f.name, left: names(true), right: names(false) };
    } else {
      out.split = { feature: f.name, threshold: tree.threshold[node] };
    }
    out.children = [l, r];
  }
  return nodes;
}

/** An attribute's importance as the card shows it. */
export interface ImportanceGrowth {
  /** The attribute. */
  feature: string;
  /**
   * How much larger the typical error (RMSE on the fitting scale) gets when
   * the attribute is scrambled: sqrt(1 + rise / out-of-bag MSE) - 1; NaN
   * where permutation importance was not measured.
   */
  growth: number;
  /** Share of the trees' impurity decrease. */
  impurity: number;
}

/**
 * Each attribute's permutation importance read as the growth of the
 * typical error, in the model's order.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { importanceGrowth } from "./model_card.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 300, seed: 4 }), { target: "base_pay_eur" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 10, folds: 5, workers: 1 });
 * const growth = importanceGrowth(model);
 * const rmse = model.quality.ensemble!.log!.rmse;
 * const first = model.importance[0];
 * assert(Math.abs(growth[0].growth - (Math.sqrt(1 + Math.max(0, first.permutation) / rmse ** 2) - 1)) < 1e-12);
 * ```
 */
export function importanceGrowth(model: Model): ImportanceGrowth[] {
  const oob = model.quality.ensemble;
  const rmse = model.target.scale === "log" ? oob?.log?.rmse : oob?.money?.rmse;
  const mse = rmse !== undefined ? rmse * rmse : NaN;
  return model.importance.map((i) => ({
    feature: i.feature,
    growth: Number.isNaN(i.permutation) ? NaN : Math.sqrt(1 + Math.max(0, i.permutation) / mse) - 1,
    impurity: i.impurity,
  }));
}

/**
 * The typical error as a share of pay, exp(log RMSE) - 1, for a model
 * fitted on logs; null otherwise.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { typicalErrorShare } from "./model_card.ts";
 * const accuracy = {
 *   measuredBy: "out-of-bag" as const, money: { rmse: 5000, mae: 4000, r2: 0.8 }, log: { rmse: 0.1, mae: 0.08, r2: 0.8 } };
 * assert(Math.abs(typicalErrorShare(accuracy)! - 0.10517091807564771) < 1e-15);
 * assert.equal(typicalErrorShare({ ...accuracy, log: undefined }), null);
 * ```
 */
export function typicalErrorShare(accuracy: Accuracy): number | null {
  return accuracy.log ? Math.expm1(accuracy.log.rmse) : null;
}
