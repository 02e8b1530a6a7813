/**
 * Cost-complexity (weakest-link) pruning (Breiman et al. 1984, ch. 3 and
 * 10), as a pass over a fitted tree that never touches the grower.
 *
 * The risk of a node is R(t) = p(t) * impurity(t), p(t) its share of the
 * root's weight; the risk of a tree is the sum over its leaves. This is the
 * normalisation of scikit-learn's `cost_complexity_pruning_path`, and the
 * loop below follows the same order (one node per step, the lowest node id
 * among equal alphas), so the two paths agree number for number.
 *
 * @module
 */

import { copyNodes, type FlatTree } from "./flat_tree.ts";

/**
 * Alphas closer than this, relative to the larger alpha, plus this much of
 * the root's risk, count as one alpha. The path is computed from floating-point sums, so the
 * alpha at which a node is collapsed is known only to rounding; a subtree
 * requested at a path alpha must include that step whichever way the last
 * bits fall, and alphas of splits that reduce the risk by nothing but
 * rounding count as zero.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { SAME_ALPHA, sameAlpha } from "./prune.ts";
 * // Relative to the larger alpha...
 * assert.equal(sameAlpha(1, 1 + SAME_ALPHA / 2, 0), true);
 * assert.equal(sameAlpha(1, 1 + 2 * SAME_ALPHA, 0), false);
 * // ...plus that share of the root's risk: near zero, rounding counts as zero.
 * assert.equal(sameAlpha(0, SAME_ALPHA / 2, 1), true);
 * assert.equal(sameAlpha(0, 2 * SAME_ALPHA, 1), false);
 * ```
 */
export const SAME_ALPHA = 1e-12;

/**
 * Whether two alphas of a tree whose root has risk `rootRisk` count as one.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { sameAlpha } from "./prune.ts";
 * assert(sameAlpha(0, 1e-18, 0.5) && !sameAlpha(0.01, 0.0101, 0.5));
 * ```
 */
export function sameAlpha(a: number, b: number, rootRisk: number, tolerance = SAME_ALPHA): boolean {
  return Math.abs(a - b) <= tolerance * Math.max(Math.abs(a), Math.abs(b)) + SAME_ALPHA * rootRisk;
}

/**
 * How far above a requested alpha a link's alpha may lie and still be
 * collapsed. Risks near the root are differences of large sums, so two
 * correct implementations agree on alphas to about 1e-11 (relative) on a
 * table of 28,000 rows; a subtree requested at an alpha read from another
 * implementation's path must not depend on those last digits.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { collapsedWithin, PRUNE_TOLERANCE } from "./prune.ts";
 * // A link whose alpha lies above the one asked for by less than PRUNE_TOLERANCE
 * // (relative) is still collapsed: another implementation's last digits do not matter.
 * assert.equal(collapsedWithin(0.5 * (1 + PRUNE_TOLERANCE / 2), 0.5, 0), true);
 * assert.equal(collapsedWithin(0.5 * (1 + 2 * PRUNE_TOLERANCE), 0.5, 0), false);
 * ```
 */
export const PRUNE_TOLERANCE = 1e-9;

/**
 * Whether a path step whose alpha is `step` is collapsed in the subtree for
 * `limit`: at or below it, or above it by no more than
 * {@linkcode PRUNE_TOLERANCE}. The one rule behind {@linkcode pruneTree},
 * {@linkcode stepAt} and cross-validation.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { collapsedWithin } from "./prune.ts";
 * assert.equal(collapsedWithin(1, 2, 10), true); // below the limit
 * assert.equal(collapsedWithin(2, 1, 10), false); // above it by 1
 * // Above by 1e-12 of 1, within PRUNE_TOLERANCE (1e-9 relative): still collapsed.
 * assert.equal(collapsedWithin(1 + 1e-12, 1, 0), true);
 * assert.equal(collapsedWithin(1.001, 1, 0), false);
 * ```
 */
export function collapsedWithin(step: number, limit: number, rootRisk: number): boolean {
  return step <= limit || sameAlpha(step, limit, rootRisk, PRUNE_TOLERANCE);
}

/**
 * The steps of a path at which its distinct alphas end: of a run of equal
 * alphas (see {@linkcode sameAlpha}) the last step, whose subtree has
 * collapsed every link of the run.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { distinctSteps } from "./prune.ts";
 * const path = {
 *   alphas: new Float64Array([0, 2, 2, 5]),
 *   risks: new Float64Array([0, 1, 2, 9]),
 *   leaves: new Int32Array([4, 3, 2, 1]),
 *   nodes: new Int32Array([-1, 3, 4, 0]),
 * };
 * assert.deepEqual(distinctSteps(path), [0, 2, 3]);
 * ```
 */
export function distinctSteps(path: PruningPath): number[] {
  const rootRisk = path.risks[path.risks.length - 1];
  const steps: number[] = [];
  for (let s = 0; s < path.alphas.length; s++) {
    const next = path.alphas[s + 1];
    if (next !== undefined && sameAlpha(next, path.alphas[s], rootRisk)) continue;
    steps.push(s);
  }
  return steps;
}

/**
 * How many steps of a path the subtree for `alpha` takes: up to the first
 * step whose alpha is not {@linkcode collapsedWithin} it. With
 * {@linkcode subtreeAfter} this gives the same tree as
 * {@linkcode pruneTree}(tree, alpha) from a path computed once.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { stepAt } from "./prune.ts";
 * const path = {
 *   alphas: new Float64Array([0, 2, 2, 5]),
 *   risks: new Float64Array([0, 1, 2, 9]),
 *   leaves: new Int32Array([4, 3, 2, 1]),
 *   nodes: new Int32Array([-1, 3, 4, 0]),
 * };
 * // Below 2 nothing is collapsed; at 2 both steps of alpha 2; at 5 the root.
 * assert.deepEqual([0, 1.9, 2, 4.9, 5, 100].map((a) => stepAt(path, a)), [0, 0, 2, 2, 3, 3]);
 * ```
 */
export function stepAt(path: PruningPath, alpha: number): number {
  const rootRisk = path.risks[path.risks.length - 1];
  let s = 0;
  while (s + 1 < path.alphas.length && collapsedWithin(path.alphas[s + 1], alpha, rootRisk)) s++;
  return s;
}

/** The weakest-link sequence of a tree. */
export interface PruningPath {
  /** Effective alpha of each step; entry 0 is 0 (the full tree). */
  alphas: Float64Array;
  /** Risk of the subtree after each step; entry 0 is the full tree's. */
  risks: Float64Array;
  /** Leaves of the subtree after each step. */
  leaves: Int32Array;
  /** Node collapsed at each step; entry 0 is -1. */
  nodes: Int32Array;
}

/**
 * The full weakest-link pruning path, down to the root alone.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, growTree, pruningPath } from "../../mod.ts";
 * const dataset = {
 *   rows: 6,
 *   features: [{ name: "years", kind: "numeric" as const, values: new Float64Array([1, 2, 3, 8, 9, 10]) }],
 *   target: { kind: "regression" as const, name: "pay", values: new Float64Array([50, 52, 54, 80, 82, 84]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
 * const path = pruningPath(tree);
 * assert(path.alphas[0] === 0 && path.leaves[path.leaves.length - 1] === 1);
 * // The last step removes the split between the two pay groups: its alpha
 * // is the fall in risk, 225 (variance 227.67 at the root, 2.67 within groups).
 * assert(Math.abs(path.alphas[path.alphas.length - 1] - 225) < 1e-9);
 * ```
 */
export function pruningPath(tree: FlatTree): PruningPath {
  return weakestLinks(tree, Infinity);
}

/**
 * The subtree for complexity `alpha`: weakest links are collapsed in path
 * order until one's effective alpha exceeds `alpha` by more than
 * {@linkcode PRUNE_TOLERANCE} (relative), as scikit-learn's `ccp_alpha` does
 * up to that tolerance; at alpha 0 the tree is kept whole. Returns a new,
 * compact tree; `tree` is not changed.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, growTree, leafCount, pruneTree } from "../../mod.ts";
 * const dataset = {
 *   rows: 6,
 *   features: [{ name: "years", kind: "numeric" as const, values: new Float64Array([1, 2, 3, 8, 9, 10]) }],
 *   target: { kind: "regression" as const, name: "pay", values: new Float64Array([50, 52, 54, 80, 82, 84]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
 * assert(leafCount(tree) === 6 && leafCount(pruneTree(tree, 10)) === 2);
 * ```
 */
export function pruneTree(tree: FlatTree, alpha: number): FlatTree {
  if (!(alpha >= 0)) throw new RangeError(`alpha must be >= 0, got ${alpha}`);
  // At alpha 0 the tree is kept whole, as scikit-learn's ccp_alpha=0 does.
  if (alpha === 0) return collapse(tree, []);
  const path = weakestLinks(tree, alpha);
  return collapse(tree, path.nodes);
}

/**
 * The subtree after the first `steps` steps of a path (step 0: the full
 * tree). Faster than {@linkcode pruneTree} when many subtrees of one path
 * are needed.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, growTree, leafCount, pruningPath, subtreeAfter } from "../../mod.ts";
 * const dataset = {
 *   rows: 4,
 *   features: [{ name: "x", kind: "numeric" as const, values: new Float64Array([1, 2, 3, 4]) }],
 *   target: { kind: "regression" as const, name: "pay", values: new Float64Array([1, 2, 9, 10]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
 * const path = pruningPath(tree);
 * assert(leafCount(subtreeAfter(tree, path, path.nodes.length - 2)) === 2);
 * ```
 */
export function subtreeAfter(tree: FlatTree, path: PruningPath, steps: number): FlatTree {
  if (steps < 0 || steps >= path.nodes.length) {
    throw new RangeError(`steps must lie in [0, ${path.nodes.length}), got ${steps}`);
  }
  return collapse(tree, path.nodes.subarray(0, steps + 1));
}

function weakestLinks(tree: FlatTree, limit: number): PruningPath {
  const n = tree.nodeCount;
  const parent = new Int32Array(n).fill(-1);
  for (let i = 0; i < n; i++) {
    if (tree.left[i] !== -1) {
      parent[tree.left[i]] = i;
      parent[tree.right[i]] = i;
    }
  }
  const total = tree.weight[0];
  const rNode = new Float64Array(n);
  for (let i = 0; i < n; i++) rNode[i] = (tree.weight[i] * tree.impurity[i]) / total;
  const rBranch = new Float64Array(n);
  const leaves = new Int32Array(n);
  // Children have larger ids, so a backward pass sees them first.
  for (let i = n - 1; i >= 0; i--) {
    if (tree.left[i] === -1) {
      rBranch[i] = rNode[i];
      leaves[i] = 1;
    } else {
      rBranch[i] = rBranch[tree.left[i]] + rBranch[tree.right[i]];
      leaves[i] = leaves[tree.left[i]] + leaves[tree.right[i]];
    }
  }
  // Internal nodes still in the subtree.
  const candidate = new Uint8Array(n);
  for (let i = 0; i < n; i++) candidate[i] = tree.left[i] === -1 ? 0 : 1;

  const alphas = [0];
  const risks = [rBranch[0]];
  const leafCounts = [leaves[0]];
  const nodes = [-1];
  // Candidates in a heap keyed by (alpha, node id): the lowest id wins among
  // equal alphas, as in a scan in id order. A node has one entry, whose
  // alpha moves when a collapse below it changes the node's risk and
  // leaves; a node collapsed with an ancestor is passed over when it comes
  // up (its entry can no longer change: only ancestors of a collapse do).
  const heap = new AlphaHeap(n);
  const alphaOf = (i: number) => (rNode[i] - rBranch[i]) / (leaves[i] - 1);
  for (let i = 0; i < n; i++) if (candidate[i]) heap.set(i, alphaOf(i));
  const stack: number[] = [];
  while (candidate[0] === 1) {
    let weakest = -1;
    let effective = Infinity;
    while (heap.size > 0) {
      const i = heap.pop();
      if (candidate[i] === 1) {
        weakest = i;
        effective = heap.topAlpha;
        break;
      }
    }
    if (weakest < 0) break;
    if (!collapsedWithin(effective, limit, rNode[0])) break;
    // Collapse the weakest link: its descendants leave the subtree.
    stack.push(weakest);
    while (stack.length > 0) {
      const i = stack.pop()!;
      candidate[i] = 0;
      if (tree.left[i] !== -1) stack.push(tree.left[i], tree.right[i]);
    }
    const prunedLeaves = leaves[weakest] - 1;
    const rise = rNode[weakest] - rBranch[weakest];
    leaves[weakest] = 1;
    rBranch[weakest] = rNode[weakest];
    for (let a = parent[weakest]; a !== -1; a = parent[a]) {
      leaves[a] -= prunedLeaves;
      rBranch[a] += rise;
      heap.set(a, alphaOf(a));
    }
    alphas.push(effective);
    risks.push(rBranch[0]);
    leafCounts.push(leaves[0]);
    nodes.push(weakest);
  }
  return {
    alphas: Float64Array.from(alphas),
    risks: Float64Array.from(risks),
    leaves: Int32Array.from(leafCounts),
    nodes: Int32Array.from(nodes),
  };
}

// A binary min-heap of nodes ordered by (alpha, node), with each node's
// place in it, so a node's alpha changes in place. An earlier heap took a
// new entry for every change and passed over the stale ones: on a bagged
// tree it held ten times as many entries as nodes, and its pops were 4% of
// a whole fit's profile.
class AlphaHeap {
  // The heap: node ids; the key of node i is alpha[i], then i.
  private readonly heap: Int32Array;
  private readonly place: Int32Array;
  private readonly alpha: Float64Array;
  size = 0;
  /** The alpha of the node `pop` took out last. */
  topAlpha = 0;

  constructor(nodes: number) {
    this.heap = new Int32Array(nodes);
    this.place = new Int32Array(nodes).fill(-1);
    this.alpha = new Float64Array(nodes);
  }

  /** Puts node `i` in the heap at `alpha`, or moves it there. */
  set(i: number, alpha: number): void {
    const at = this.place[i];
    this.alpha[i] = alpha;
    if (at < 0) {
      this.place[i] = this.size;
      this.heap[this.size] = i;
      this.up(this.size++);
    } else {
      this.up(at);
      this.down(this.place[i]);
    }
  }

  /** Takes out the node of the smallest key (its alpha in topAlpha). */
  pop(): number {
    const { heap, place } = this;
    const top = heap[0];
    this.topAlpha = this.alpha[top];
    place[top] = -1;
    const last = heap[--this.size];
    if (this.size > 0) {
      heap[0] = last;
      place[last] = 0;
      this.down(0);
    }
    return top;
  }

  // Whether node a's key is below node b's.
  private before(a: number, b: number): boolean {
    const { alpha } = this;
    return alpha[a] < alpha[b] || (alpha[a] === alpha[b] && a < b);
  }

  // The entry at `at` rises past larger parents.
  private up(at: number): void {
    const { heap, place } = this;
    const i = heap[at];
    while (at > 0) {
      const parent = (at - 1) >> 1;
      const p = heap[parent];
      if (!this.before(i, p)) break;
      heap[at] = p;
      place[p] = at;
      at = parent;
    }
    heap[at] = i;
    place[i] = at;
  }

  // The entry at `at` sinks past smaller children.
  private down(at: number): void {
    const { heap, place } = this;
    const size = this.size;
    const i = heap[at];
    for (;;) {
      const l = 2 * at + 1;
      if (l >= size) break;
      const r = l + 1;
      const m = r < size && this.before(heap[r], heap[l]) ? r : l;
      const c = heap[m];
      if (!this.before(c, i)) break;
      heap[at] = c;
      place[c] = at;
      at = m;
    }
    heap[at] = i;
    place[i] = at;
  }
}

// A compact copy of the tree with the given nodes made leaves (entries of -1 ignored).
function collapse(tree: FlatTree, collapsed: ArrayLike<number>): FlatTree {
  const n = tree.nodeCount;
  const isCollapsed = new Uint8Array(n);
  for (let i = 0; i < collapsed.length; i++) if (collapsed[i] >= 0) isCollapsed[collapsed[i]] = 1;
  // Keep nodes reachable without passing below a collapsed node, in id order.
  const keep = new Uint8Array(n);
  keep[0] = 1;
  for (let i = 0; i < n; i++) {
    if (!keep[i] || isCollapsed[i] || tree.left[i] === -1) continue;
    keep[tree.left[i]] = 1;
    keep[tree.right[i]] = 1;
  }
  const newId = new Int32Array(n).fill(-1);
  const kept: number[] = [];
  for (let i = 0; i < n; i++) {
    if (keep[i]) {
      newId[i] = kept.length;
      kept.push(i);
    }
  }
  return copyNodes(tree, kept, (j) => {
    const i = kept[j];
    return isCollapsed[i] === 1 || tree.left[i] === -1
      ? null
      : [newId[tree.left[i]], newId[tree.right[i]]];
  });
}

/**
 * The tree with each of `nodes` made a leaf (its fitted value kept, the
 * subtree below removed), renumbered in id order.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { binFeatures, collapseNodes, growTree } from "../../mod.ts";
 * const dataset = {
 *   rows: 6,
 *   features: [{ name: "x", kind: "numeric" as const, values: new Float64Array([1, 2, 3, 8, 9, 10]) }],
 *   target: { kind: "regression" as const, name: "y", values: new Float64Array([1, 1, 1, 5, 5, 5]) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 3 });
 * const stump = collapseNodes(tree, [0]);
 * assert.equal(stump.nodeCount, 1);
 * assert.equal(stump.value[0], 3);
 * ```
 */
export function collapseNodes(tree: FlatTree, nodes: ArrayLike<number>): FlatTree {
  return collapse(tree, nodes);
}

/**
 * Where each node of a tree lies in a subtree of it (the tree with some
 * nodes made leaves, as {@linkcode pruneTree}, {@linkcode subtreeAfter} and
 * {@linkcode collapseNodes} give): its own node when kept, else the leaf
 * that took the place of its collapsed ancestor. A row's leaf in the tree
 * then gives its leaf in the subtree without a walk.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { applyRow, binFeatures, collapseNodes, growTree, subtreeNodeOf } from "../../mod.ts";
 * const dataset = {
 *   rows: 6,
 *   features: [{ name: "x", kind: "numeric" as const, values: Float64Array.of(1, 2, 3, 8, 9, 10) }],
 *   target: { kind: "regression" as const, name: "y", values: Float64Array.of(1, 2, 3, 7, 8, 9) },
 * };
 * const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
 * const subtree = collapseNodes(tree, [tree.left[0]]);
 * const nodeOf = subtreeNodeOf(tree, subtree);
 * for (let r = 0; r < 6; r++) {
 *   assert.equal(nodeOf[applyRow(tree, dataset.features, r)], applyRow(subtree, dataset.features, r));
 * }
 * assert.equal(nodeOf[0], 0);
 * ```
 */
export function subtreeNodeOf(tree: FlatTree, subtree: FlatTree): Int32Array {
  const n = tree.nodeCount;
  const nodeOf = new Int32Array(n);
  // Children have larger ids than their parent in both trees. Where the
  // subtree has a leaf, so does everything below the node in the tree.
  for (let i = 0; i < n; i++) {
    if (tree.left[i] === -1) continue;
    const at = nodeOf[i];
    const split = subtree.left[at] !== -1;
    nodeOf[tree.left[i]] = split ? subtree.left[at] : at;
    nodeOf[tree.right[i]] = split ? subtree.right[at] : at;
  }
  return nodeOf;
}
