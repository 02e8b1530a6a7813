/**
 * Each attribute's contribution to one regression tree's prediction for a
 * profile: exact Shapley values (Shapley 1953) of the set function v(S),
 * "the tree's expected prediction when only the attributes in S are known",
 * where an unknown attribute at a split sends the profile down both sides in
 * proportion to the training rows each side holds (the node's cover). This
 * is the set function of the path-dependent tree algorithm of Lundberg,
 * Erion, Chen et al. (2020, "From local explanations to global
 * understanding with explainable AI for trees", *Nature Machine
 * Intelligence* 2), and the values are the same; they are worked out here
 * leaf by leaf rather than along a walk with path weights.
 *
 * v(S) is a sum over leaves of the leaf's value times, for each attribute
 * its path tests, s_j (1 when the profile meets every test of j on the path,
 * else 0) if j is in S, else z_j (the product of the cover shares of those
 * tests). Each leaf's term is a game of its k attributes alone, so with H
 * the attributes the profile meets (h of them), C the others, P the
 * product of z over C, e_r the elementary symmetric polynomials of z over
 * H and w(m) = m! (k - m - 1)! / k!:
 *
 * - every j in C gets -value * P * sum_m w(m) e_{h-m}(H);
 * - each j in H gets value * (1 - z_j) * P * sum_m w(m) e_{h-1-m}(H \ j).
 *
 * So a tree costs O(nodes + leaves x (depth + k^2)) per profile, where
 * the walk with path weights costs O(leaves x depth^2); on the demo model
 * that took the 200 trees from 2.9-3.7 to 2.4-2.8 ms per profile, in-process side by side,
 * and the leaves are the simpler code to check.
 *
 * The contributions add up to the prediction minus v(nothing known)
 * ({@linkcode coverMean}): for a tree whose covers count every training row,
 * the mean of its predictions over the training table.
 *
 * Written here rather than taken from a library: no package on the npm
 * registry computes it over our flat trees (with categorical level masks
 * and missing values); it is checked against enumerating every subset of
 * attributes (tests/lib/tree/contributions_test.ts).
 *
 * @module
 */

import type { FlatTree } from "./flat_tree.ts";
import { goesLeft } from "./flat_tree.ts";

/**
 * A tree's expected prediction when no attribute is known: the leaves'
 * values weighted by the product of cover shares along their paths (the
 * cover-weighted mean of the leaves when covers add up).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, growTree } from "../../mod.ts";
 * import { coverMean } from "./contributions.ts";
 * const dataset = {
 *   rows: 4,
 *   features: [{ name: "x", kind: "numeric" as const, values: Float64Array.of(1, 2, 3, 4) }],
 *   target: { kind: "regression" as const, name: "pay", values: Float64Array.of(10, 10, 10, 30) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
 * assert.equal(coverMean(tree), 15);
 * ```
 */
export function coverMean(tree: FlatTree): number {
  // From the last node back: children come after their parent, so each
  // node's children are done before it (no recursion, whatever the depth).
  const below = new Float64Array(tree.nodeCount);
  for (let node = tree.nodeCount - 1; node >= 0; node--) {
    const left = tree.left[node];
    if (left === -1) {
      below[node] = tree.value[node * tree.width];
      continue;
    }
    const right = tree.right[node];
    const cover = tree.rows[node];
    below[node] = (tree.rows[left] / cover) * below[left] +
      (tree.rows[right] / cover) * below[right];
  }
  return below[0];
}

/** A tree's leaves as the parts need them, worked out once per tree. */
interface LeafPaths {
  /** Each leaf's value. */
  value: Float64Array;
  /** Leaf l's tests are at [testStart[l], testStart[l + 1]) of the next three. */
  testStart: Int32Array;
  /** The node of each test. */
  testNode: Int32Array;
  /** 1 when the path goes left at it. */
  testLeft: Uint8Array;
  /** Which of the leaf's attributes the test is on (0-based within the leaf). */
  testEntry: Int32Array;
  /** Leaf l's attributes are at [entryStart[l], entryStart[l + 1]) of the next two. */
  entryStart: Int32Array;
  /** The attribute. */
  entryFeature: Int32Array;
  /** The product of the cover shares of the path's tests on it. */
  entryZero: Float64Array;
  /** The most attributes on one leaf's path. */
  widest: number;
}

const leafPaths = new WeakMap<FlatTree, LeafPaths>();

/**
 * The most tests a tree's leaf paths may hold in all for its parts to be
 * worked out (a tree of 100,000 leaves at depth 50 holds 5,000,000).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { MAX_PATH_TESTS } from "./contributions.ts";
 * assert(MAX_PATH_TESTS >= 100_000 * 50);
 * ```
 */
export const MAX_PATH_TESTS = 20_000_000;

/**
 * Works out a tree's leaf paths ahead of the first profile (they are kept
 * with the tree); throws a RangeError for a tree whose paths hold more than
 * {@linkcode MAX_PATH_TESTS} tests.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { prepareTree } from "./contributions.ts";
 * // A chain: each split's right child splits again, 30,000 deep.
 * const n = 60_001;
 * const left = Int32Array.from({ length: n }, (_, i) => (i % 2 === 0 && i + 2 < n ? i + 1 : -1));
 * const right = Int32Array.from({ length: n }, (_, i) => (i % 2 === 0 && i + 2 < n ? i + 2 : -1));
 * const chain = {
 *   task: "regression" as const, width: 1, nodeCount: n, feature: Int32Array.from(left, (l) => (l < 0 ? -1 : 0)),
 *   threshold: new Float64Array(n), maskOffset: new Int32Array(n).fill(-1), masks: new Uint32Array(0),
 *   maskWords: Int32Array.of(0), left, right, missingLeft: new Uint8Array(n), value: new Float64Array(n),
 *   rows: new Int32Array(n).fill(1), weight: new Float64Array(n).fill(1), impurity: new Float64Array(n),
 * };
 * assert.throws(() => prepareTree(chain), /beyond 20000000/);
 * ```
 */
export function prepareTree(tree: FlatTree): void {
  pathsOf(tree);
}

// Every leaf's path from the root, with each attribute's tests gathered.
function pathsOf(tree: FlatTree): LeafPaths {
  const known = leafPaths.get(tree);
  if (known !== undefined) return known;
  // The paths' total length bounds the work and memory: a tree as deep as a
  // chain of its nodes (none a fit makes, one a crafted file might hold) is
  // refused rather than walked in time quadratic in its size.
  const depth = new Int32Array(tree.nodeCount);
  let total = 0;
  for (let node = 0; node < tree.nodeCount; node++) {
    const left = tree.left[node];
    if (left === -1) {
      total += depth[node];
      continue;
    }
    depth[left] = depth[node] + 1;
    depth[tree.right[node]] = depth[node] + 1;
  }
  if (total > MAX_PATH_TESTS) {
    throw new RangeError(`the tree's paths hold ${total} tests, beyond ${MAX_PATH_TESTS}`);
  }
  const value: number[] = [];
  const testStart = [0];
  const testNode: number[] = [];
  const testLeft: number[] = [];
  const testEntry: number[] = [];
  const entryStart = [0];
  const entryFeature: number[] = [];
  const entryZero: number[] = [];
  let widest = 0;
  // The path to the node being visited: its nodes and directions.
  // Depth first, left before right, with a stack of its own (a tree as
  // deep as a chain of its nodes must not overflow the call stack); the
  // path to a node is its ancestors and the direction taken at each.
  const pathNodes: number[] = [];
  const pathLeft: number[] = [];
  const stack = [{ node: 0, depth: 0, parent: -1, left: 0 }];
  while (stack.length > 0) {
    const { node, depth, parent, left: wentLeft } = stack.pop()!;
    pathNodes.length = depth;
    pathLeft.length = depth;
    if (depth > 0) {
      pathNodes[depth - 1] = parent;
      pathLeft[depth - 1] = wentLeft;
    }
    const left = tree.left[node];
    if (left !== -1) {
      stack.push({ node: tree.right[node], depth: depth + 1, parent: node, left: 0 });
      stack.push({ node: left, depth: depth + 1, parent: node, left: 1 });
      continue;
    }
    value.push(tree.value[node * tree.width]);
    const features: number[] = [];
    const zero: number[] = [];
    for (let i = 0; i < pathNodes.length; i++) {
      const at = pathNodes[i];
      const f = tree.feature[at];
      let entry = features.indexOf(f);
      if (entry < 0) {
        entry = features.length;
        features.push(f);
        zero.push(1);
      }
      const child = pathLeft[i] === 1 ? tree.left[at] : tree.right[at];
      zero[entry] *= tree.rows[child] / tree.rows[at];
      testNode.push(at);
      testLeft.push(pathLeft[i]);
      testEntry.push(entry);
    }
    testStart.push(testNode.length);
    entryFeature.push(...features);
    entryZero.push(...zero);
    entryStart.push(entryFeature.length);
    widest = Math.max(widest, features.length);
  }
  const paths: LeafPaths = {
    value: Float64Array.from(value),
    testStart: Int32Array.from(testStart),
    testNode: Int32Array.from(testNode),
    testLeft: Uint8Array.from(testLeft),
    testEntry: Int32Array.from(testEntry),
    entryStart: Int32Array.from(entryStart),
    entryFeature: Int32Array.from(entryFeature),
    entryZero: Float64Array.from(entryZero),
    widest,
  };
  leafPaths.set(tree, paths);
  return paths;
}

/**
 * Reusable work space for {@linkcode addContributions}: the direction a
 * profile takes at each node, a leaf's attributes met or not, the
 * polynomials' coefficients, and the Shapley weights w(m) for up to
 * `attributes` attributes on a path.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { ContributionSpace } from "./contributions.ts";
 * const space = new ContributionSpace(3);
 * // w(m) = m! (k - m - 1)! / k!: for k = 3, 1/3, 1/6, 1/3.
 * assert.deepEqual([0, 1, 2].map((m) => space.shapleyWeight(3, m) * 6), [2, 1, 2]);
 * space.fit(5, 40);
 * assert.equal(space.shapleyWeight(5, 0), 1 / 5);
 * ```
 */
export class ContributionSpace {
  goes: Uint8Array = new Uint8Array(0);
  met: Uint8Array = new Uint8Array(0);
  coefficients: Float64Array = new Float64Array(0);
  without: Float64Array = new Float64Array(0);
  metZero: Float64Array = new Float64Array(0);
  /** w(m) for k attributes at k * (attributes + 1) + m. */
  weights: Float64Array = new Float64Array(0);
  attributes = -1;

  constructor(attributes = 16, nodes = 256) {
    this.fit(attributes, nodes);
  }

  /** Grows the space for paths of `attributes` attributes and trees of `nodes` nodes. */
  fit(attributes: number, nodes: number): void {
    if (this.goes.length < nodes) this.goes = new Uint8Array(nodes);
    if (attributes <= this.attributes) return;
    const k = attributes;
    this.attributes = k;
    this.met = new Uint8Array(k);
    this.metZero = new Float64Array(k);
    this.coefficients = new Float64Array(k + 1);
    this.without = new Float64Array(k + 1);
    this.weights = new Float64Array((k + 1) * (k + 1));
    for (let n = 1; n <= k; n++) {
      // w(0) = 1 / n; w(m + 1) = w(m) (m + 1) / (n - m - 1).
      let w = 1 / n;
      for (let m = 0; m < n; m++) {
        this.weights[n * (k + 1) + m] = w;
        w = (w * (m + 1)) / (n - m - 1);
      }
    }
  }

  /** w(m) for `k` attributes. */
  shapleyWeight(k: number, m: number): number {
    return this.weights[k * (this.attributes + 1) + m];
  }
}

/**
 * Adds `scale` times each attribute's contribution to a regression tree's
 * prediction for `profile` into `out` (one entry per feature).
 *
 * @param profile One value per feature (NaN: missing), as `applyValues` takes it.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { applyValues, binFeatures, growTree } from "../../mod.ts";
 * import { addContributions, ContributionSpace, coverMean } from "./contributions.ts";
 * // Pay 10 + 20 when x > 2, + 5 when z is 1: two attributes, four cells.
 * const x = Float64Array.of(1, 1, 3, 3, 1, 1, 3, 3);
 * const z = Float64Array.of(0, 1, 0, 1, 0, 1, 0, 1);
 * const dataset = {
 *   rows: 8,
 *   features: [
 *     { name: "x", kind: "numeric" as const, values: x },
 *     { name: "z", kind: "numeric" as const, values: z },
 *   ],
 *   target: { kind: "regression" as const, name: "pay", values: x.map((v, i) => 10 + (v > 2 ? 20 : 0) + 5 * z[i]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
 * const out = new Float64Array(2);
 * addContributions(tree, Float64Array.of(3, 1), out, 1, new ContributionSpace());
 * // Additive pay: each attribute's part is its effect minus its average effect.
 * assert.deepEqual([...out], [10, 2.5]);
 * assert.equal(coverMean(tree) + out[0] + out[1], tree.value[applyValues(tree, Float64Array.of(3, 1))]);
 * ```
 */
export function addContributions(
  tree: FlatTree,
  profile: ArrayLike<number>,
  out: Float64Array,
  scale: number,
  space: ContributionSpace,
): void {
  if (tree.task !== "regression") throw new RangeError("contributions need a regression tree");
  const paths = pathsOf(tree);
  space.fit(paths.widest, tree.nodeCount);
  const goes = space.goes;
  // The direction the profile takes at every split: 1 left, 0 right.
  for (let node = 0; node < tree.nodeCount; node++) {
    if (tree.left[node] !== -1) {
      goes[node] = goesLeft(tree, node, profile[tree.feature[node]]) ? 1 : 0;
    }
  }
  addLeaves(paths, space, out, scale);
}

// Each leaf's term of v(S), split among its attributes (see the module
// note). One loop over the leaves with every array in a local: through a
// function per leaf, reading the arrays from their record at every test
// took a third of the time.
function addLeaves(
  paths: LeafPaths,
  space: ContributionSpace,
  out: Float64Array,
  scale: number,
): void {
  const { goes, met, metZero, coefficients: e, without, weights } = space;
  const { value, testStart, testNode, testLeft, testEntry, entryStart, entryFeature, entryZero } =
    paths;
  const stride = space.attributes + 1;
  const leaves = value.length;
  for (let l = 0; l < leaves; l++) {
    const first = entryStart[l];
    const k = entryStart[l + 1] - first;
    if (k === 0) continue; // a tree of one leaf: no attribute has a part
    for (let j = 0; j < k; j++) met[j] = 1;
    const lastTest = testStart[l + 1];
    for (let t = testStart[l]; t < lastTest; t++) {
      if (goes[testNode[t]] !== testLeft[t]) met[testEntry[t]] = 0;
    }
    // The product of z over the attributes not met, and the polynomials of
    // those met: e[r] is e_r after each attribute is taken in.
    let product = 1;
    let h = 0;
    e[0] = 1;
    for (let j = 0; j < k; j++) {
      const z = entryZero[first + j];
      if (met[j] === 0) {
        product *= z;
        continue;
      }
      metZero[h] = z;
      h++;
      e[h] = 0;
      for (let r = h; r >= 1; r--) e[r] += z * e[r - 1];
    }
    const row = k * stride;
    const leafValue = value[l] * scale;
    if (h < k) {
      let sum = 0;
      for (let m = 0; m <= h; m++) sum += weights[row + m] * e[h - m];
      const part = -leafValue * product * sum;
      for (let j = 0; j < k; j++) {
        if (met[j] === 0) out[entryFeature[first + j]] += part;
      }
    }
    // Each attribute met: e of the others, by dividing its factor (t + z) out.
    let i = 0;
    for (let j = 0; j < k; j++) {
      if (met[j] === 0) continue;
      const z = metZero[i++];
      without[0] = 1;
      for (let r = 1; r < h; r++) without[r] = e[r] - z * without[r - 1];
      let sum = 0;
      for (let m = 0; m < h; m++) sum += weights[row + m] * without[h - 1 - m];
      out[entryFeature[first + j]] += leafValue * (1 - z) * product * sum;
    }
  }
}
