/**
 * A decision path with the conditions on one attribute merged into what they
 * mean together: `level <= G4` then `level >= G2` is `level G2 to G4`.
 *
 * @module
 */

import type { Feature } from "../dataset/types.ts";
import { formatThreshold } from "./explain.ts";
import { type FlatTree, goesLeft, predictedClass } from "./flat_tree.ts";

/** The conditions of a decision path on one attribute, merged. */
export interface PathCondition {
  /** The attribute. */
  feature: string;
  /** How the attribute splits: bounds for numeric, a run of levels for ordinal, a set for categorical. */
  kind: "numeric" | "ordinal" | "categorical";
  /** The merged condition in words, e.g. `level G2 to G4`, `years above 3.5`. */
  condition: string;
  /** Numeric: the value is above this bound (exclusive); null when unbounded below. */
  above: number | null;
  /** Numeric: the value is at most this bound (inclusive); null when unbounded above. */
  atMost: number | null;
  /**
   * Ordinal: the levels the value may take, lowest first (a run of the ladder);
   * categorical: the levels left, in code order; numeric: null.
   */
  levels: string[] | null;
  /** Whether a missing value follows these steps too. */
  missing: boolean;
  /** Whether any known value follows these steps (not when a split sent every known value the other way). */
  known: boolean;
  /** Whether the profile's value is missing (the condition then says so). */
  profileMissing: boolean;
  /** The steps of the per-split path this condition covers (1-based, ascending). */
  steps: number[];
  /** Node reached after the last covered step. */
  node: number;
  /** Distinct training rows in that node. */
  rows: number;
  /** Mean of that node (regression) or its most frequent class's share. */
  value: number;
  /** Most frequent class of that node (classification only). */
  className?: string;
}

interface Region {
  feature: number;
  missing: boolean;
  above: number;
  atMost: number;
  codes: Uint8Array | null;
  steps: number[];
  node: number;
}

/**
 * Walks a profile from the root to its leaf and merges the conditions met on
 * each attribute: numeric bounds intersect (`above` exclusive, `atMost`
 * inclusive), ordinal levels narrow to a run, categorical sets to the levels
 * routed the same way at every step. Conditions come in the order of their
 * last step, so rows shrink down the list and the last one ends in the leaf.
 *
 * @example Two conditions on one attribute become one
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, growTree, mergePath } from "../../mod.ts";
 * const years = new Float64Array([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12]);
 * const dataset = {
 *   rows: 12,
 *   features: [{ name: "years", kind: "numeric" as const, values: years }],
 *   target: { kind: "regression" as const, name: "pay", values: years.map((y) => (y > 4 && y <= 8 ? 90 : 10 * y)) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 2 });
 * const [merged] = mergePath(tree, dataset.features, [6]);
 * assert.equal(merged.condition, "years 4.5 to 8.5");
 * assert.deepEqual([merged.above, merged.atMost], [4.5, 8.5]);
 * assert.ok(merged.steps.length >= 2 && merged.value === 90);
 * ```
 */
export function mergePath(
  tree: FlatTree,
  features: readonly Pick<Feature, "name" | "kind" | "levels">[],
  profile: ArrayLike<number>,
  classes?: readonly string[],
): PathCondition[] {
  const regions = new Map<number, Region>();
  let node = 0;
  let step = 0;
  while (tree.left[node] !== -1) {
    step++;
    const f = tree.feature[node];
    const left = goesLeft(tree, node, profile[f]);
    let region = regions.get(f);
    if (region === undefined) {
      const n = features[f].kind === "categorical" ? features[f].levels?.length ?? 0 : 0;
      region = {
        feature: f,
        missing: true,
        above: -Infinity,
        atMost: Infinity,
        codes: features[f].kind === "categorical" ? new Uint8Array(n).fill(1) : null,
        steps: [],
        node: 0,
      };
      regions.set(f, region);
    }
    narrow(tree, node, left, region);
    const next = left ? tree.left[node] : tree.right[node];
    region.steps.push(step);
    region.node = next;
    node = next;
  }
  return [...regions.values()]
    .sort((a, b) => a.steps[a.steps.length - 1] - b.steps[b.steps.length - 1])
    .map((r) => condition(tree, features[r.feature], r, profile[r.feature], classes));
}

// Narrows a region by the side taken at a node.
function narrow(tree: FlatTree, node: number, left: boolean, region: Region): void {
  if ((tree.missingLeft[node] === 1) !== left) region.missing = false;
  if (region.codes !== null) {
    for (let c = 0; c < region.codes.length; c++) {
      if (goesLeft(tree, node, c) !== left) region.codes[c] = 0;
    }
    return;
  }
  const t = tree.threshold[node];
  if (left) region.atMost = Math.min(region.atMost, t);
  else region.above = Math.max(region.above, t);
}

function condition(
  tree: FlatTree,
  feature: Pick<Feature, "name" | "kind" | "levels">,
  r: Region,
  x: number,
  classes?: readonly string[],
): PathCondition {
  const kind = feature.kind as PathCondition["kind"];
  const levelNames = feature.levels ?? [];
  let levels: string[] | null = null;
  let words: string;
  if (kind === "categorical") {
    const codes = r.codes ?? new Uint8Array(0);
    levels = levelNames.filter((_, c) => codes[c] === 1);
    const left = levelNames.filter((_, c) => codes[c] === 0);
    words = levels.length === 0
      ? "none of its levels"
      : levels.length === 1
      ? levels[0]
      : left.length > 0 && left.length <= 3 && left.length < levels.length
      ? `other than ${orList(left)}`
      : orList(levels);
  } else if (kind === "ordinal") {
    // Codes are whole numbers: above t means from floor(t) + 1, at most t up to floor(t).
    const last = levelNames.length - 1;
    const from = r.above === -Infinity ? 0 : Math.floor(r.above) + 1;
    const to = r.atMost === Infinity ? last : Math.min(last, Math.floor(r.atMost));
    levels = levelNames.slice(from, to + 1);
    const name = (c: number) => levelNames[c] ?? String(c);
    words = from > to
      ? "none of its levels"
      : from === to
      ? name(from)
      : from === 0 && to === last
      ? "known"
      : from === 0
      ? `${name(to)} or below`
      : to === last
      ? `${name(from)} or above`
      : `${name(from)} to ${name(to)}`;
  } else {
    const lo = r.above === -Infinity ? null : formatThreshold(r.above);
    const hi = r.atMost === Infinity ? null : formatThreshold(r.atMost);
    words = lo !== null && hi !== null
      ? `${lo} to ${hi}`
      : lo !== null
      ? `above ${lo}`
      : hi !== null
      ? `up to ${hi}`
      : "known";
  }
  const profileMissing = Number.isNaN(x);
  const known = kind === "numeric" ? r.above < r.atMost : (levels ?? []).length > 0;
  const out: PathCondition = {
    feature: feature.name,
    kind,
    condition: `${feature.name} ${profileMissing ? "missing" : words}`,
    above: kind === "numeric" && known && r.above !== -Infinity ? r.above : null,
    atMost: kind === "numeric" && known && r.atMost !== Infinity ? r.atMost : null,
    levels,
    missing: r.missing,
    known,
    profileMissing,
    steps: r.steps,
    node: r.node,
    rows: tree.rows[r.node],
    value: tree.value[r.node * tree.width],
  };
  if (tree.task === "classification") {
    const best = predictedClass(tree, r.node);
    out.value = tree.value[r.node * tree.width + best];
    out.className = classes?.[best] ?? String(best);
  }
  return out;
}

function orList(items: readonly string[]): string {
  return items.length <= 1
    ? items.join("")
    : `${items.slice(0, -1).join(", ")} or ${items[items.length - 1]}`;
}

/**
 * Whether a value of one attribute meets a merged condition: the test a
 * profile passes at every step the condition covers.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { meetsCondition } from "../../mod.ts";
 * const years = { kind: "numeric" as const, above: 3.5, atMost: 8, levels: null, missing: false, known: true };
 * assert.ok(meetsCondition(years, 8, ["x"]) && !meetsCondition(years, 3.5, []));
 * const level = { kind: "ordinal" as const, above: null, atMost: null, levels: ["G2", "G3"], missing: false, known: true };
 * assert.ok(meetsCondition(level, 2, ["G1", "G2", "G3"]) && !meetsCondition(level, 0, ["G1", "G2", "G3"]));
 * ```
 */
export function meetsCondition(
  c: Pick<PathCondition, "kind" | "above" | "atMost" | "levels" | "missing" | "known">,
  x: number,
  levelNames: readonly string[],
): boolean {
  if (Number.isNaN(x)) return c.missing;
  if (!c.known) return false;
  if (c.kind === "numeric") {
    return (c.above === null || x > c.above) && (c.atMost === null || x <= c.atMost);
  }
  return (c.levels ?? []).includes(levelNames[x]);
}
