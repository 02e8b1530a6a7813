/**
 * The decision path of one profile through a tree, in words.
 *
 * @module
 */

import type { Feature } from "../dataset/types.ts";
import { type FlatTree, goesLeft, predictedClass, splitLevels } from "./flat_tree.ts";

/** One step of a decision path. */
export interface PathStep {
  /** The feature tested at this node. */
  feature: string;
  /** The condition the profile met, e.g. `years <= 8.5`, `family in {Sales, Support}`. */
  condition: string;
  /** Node reached after the step. */
  node: number;
  /** Distinct training rows in the node reached. */
  rows: number;
  /** Mean of the node reached (regression) or its most frequent class's share. */
  value: number;
  /** Most frequent class of the node reached (classification only). */
  className?: string;
}

/**
 * Walks a profile (one value per feature, `NaN` for missing, level codes for
 * ordinal and categorical features) from the root to its leaf.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, explainPath, growTree } from "../../mod.ts";
 * const dataset = {
 *   rows: 6,
 *   features: [{ name: "years", kind: "numeric" as const, values: new Float64Array([1, 2, 3, 8, 9, 10]) }],
 *   target: { kind: "regression" as const, name: "pay", values: new Float64Array([50, 52, 54, 80, 82, 84]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 3 });
 * const steps = explainPath(tree, dataset.features, [9]);
 * assert(steps[0].condition === "years > 5.5" && steps[0].value === 82);
 * ```
 */
export function explainPath(
  tree: FlatTree,
  features: readonly Pick<Feature, "name" | "kind" | "levels">[],
  profile: ArrayLike<number>,
  classes?: readonly string[],
): PathStep[] {
  const steps: PathStep[] = [];
  let node = 0;
  while (tree.left[node] !== -1) {
    const f = tree.feature[node];
    const feature = features[f];
    const x = profile[f];
    const left = goesLeft(tree, node, x);
    const next = left ? tree.left[node] : tree.right[node];
    const step: PathStep = {
      feature: feature.name,
      condition: describeCondition(tree, node, feature, x, left),
      node: next,
      rows: tree.rows[next],
      value: tree.value[next * tree.width],
    };
    if (tree.task === "classification") {
      const best = predictedClass(tree, next);
      step.value = tree.value[next * tree.width + best];
      step.className = classes?.[best] ?? String(best);
    }
    steps.push(step);
    node = next;
  }
  return steps;
}

/**
 * The condition of a split in words, for the side taken.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, describeCondition, growTree } from "../../mod.ts";
 * const dataset = {
 *   rows: 6,
 *   features: [{ name: "years", kind: "numeric" as const, values: new Float64Array([1, 2, 3, 8, 9, 10]) }],
 *   target: { kind: "regression" as const, name: "pay", values: new Float64Array([50, 52, 54, 80, 82, 84]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 3 });
 * assert(describeCondition(tree, 0, dataset.features[0], 2, true) === "years <= 5.5");
 * ```
 */
export function describeCondition(
  tree: FlatTree,
  node: number,
  feature: Pick<Feature, "name" | "kind" | "levels">,
  x: number,
  left: boolean,
): string {
  const side = left ? "left" : "right";
  if (Number.isNaN(x)) return `${feature.name} is missing -> ${side}`;
  if (feature.kind === "categorical") {
    const levels = feature.levels ?? [];
    const inSet = splitLevels(tree, node, left, levels.length).map((code) => levels[code]);
    const level = levels[x] ?? String(x);
    if (!inSet.includes(level)) return `${feature.name} = ${level} (not seen here) -> ${side}`;
    return `${feature.name} in {${inSet.join(", ")}}`;
  }
  const t = tree.threshold[node];
  // A split on whether the value is known: every known value goes left.
  if (t === Infinity) return `${feature.name} is known`;
  if (feature.kind === "ordinal") {
    const levels = feature.levels ?? [];
    const lastLeft = Math.floor(t);
    return left
      ? `${feature.name} <= ${levels[lastLeft] ?? lastLeft}`
      : `${feature.name} >= ${levels[lastLeft + 1] ?? lastLeft + 1}`;
  }
  return `${feature.name} ${left ? "<=" : ">"} ${formatThreshold(t)}`;
}

/**
 * A split's threshold as a condition says it: at least 6 significant
 * digits, and every digit before the point and two after it (at 6 alone a
 * split at 1234567.5 read "x > 1234570", false for someone at 1234569 who
 * went right); no last-bit noise of a midpoint (0.30000000000000004).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { formatThreshold } from "./explain.ts";
 * assert.equal(formatThreshold(1234567.5), "1234567.5");
 * assert.equal(formatThreshold(0.1 + 0.2), "0.3");
 * assert.equal(formatThreshold(1 / 3), "0.333333");
 * assert.equal(formatThreshold(52345.675), "52345.68");
 * ```
 */
export function formatThreshold(t: number): string {
  const whole = Math.abs(t) >= 1 ? Math.floor(Math.log10(Math.abs(t))) + 1 : 0;
  return String(Number(t.toPrecision(Math.min(17, Math.max(6, whole + 2)))));
}
