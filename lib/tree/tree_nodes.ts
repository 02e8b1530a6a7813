/**
 * A tree's nodes as a builder adds them, and the flat tree they make: the
 * one record of node figures and splits that both builders fill
 * (lib/tree/grow_tree.ts over rows, lib/tree/grow_one_feature.ts over one
 * feature's bins), so that their trees are laid out alike.
 *
 * @module
 */

import type { Feature } from "../dataset/types.ts";
import type { FlatTree } from "./flat_tree.ts";
import type { SplitChoice } from "./splitter.ts";

/**
 * A node waiting on a builder's stack: its entries `[start, end)` of the
 * builder's list (rows, or a feature's bins) and where it hangs.
 *
 * @example
 * ```ts
 * import type { PendingNode } from "./tree_nodes.ts";
 * const root: PendingNode = { start: 0, end: 10, depth: 0, parent: -1, side: "root" };
 * if (root.side !== "root" || root.parent !== -1) throw new Error("the root hangs nowhere");
 * ```
 */
export interface PendingNode {
  start: number;
  end: number;
  depth: number;
  /** The parent's id (-1: the root). */
  parent: number;
  /** Which child of the parent it is. */
  side: "left" | "right" | "root";
}

/**
 * Words of a categorical feature's level mask (0 for other features).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { maskWordsOf } from "./tree_nodes.ts";
 * const words = maskWordsOf([
 *   { name: "years", kind: "numeric", values: new Float64Array() },
 *   { name: "site", kind: "categorical", levels: Array.from({ length: 33 }, (_, i) => `s${i}`), values: new Float64Array() },
 * ]);
 * assert.deepEqual([...words], [0, 2]);
 * ```
 */
export function maskWordsOf(features: readonly Feature[]): Int32Array {
  return Int32Array.from(
    features,
    (f) => (f.kind === "categorical" ? Math.ceil(f.levels!.length / 32) : 0),
  );
}

/**
 * The nodes of one tree being grown, in the order they are added.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { TreeNodes } from "./tree_nodes.ts";
 * const nodes = new TreeNodes("regression", 1, Int32Array.of(0));
 * const root = nodes.add([50], 4, 4, 1);
 * const left = nodes.add([49], 2, 2, 0);
 * const right = nodes.add([51], 2, 2, 0);
 * nodes.split(root, { feature: 0, threshold: 2.5, leftBins: [], rightBins: [] }, true);
 * nodes.attach(root, "left", left);
 * nodes.attach(root, "right", right);
 * const tree = nodes.finish();
 * assert.equal(tree.nodeCount, 3);
 * assert.deepEqual([...tree.left], [1, -1, -1]);
 * assert.equal(tree.threshold[0], 2.5);
 * ```
 */
export class TreeNodes {
  private readonly task: FlatTree["task"];
  private readonly width: number;
  private readonly maskWords: Int32Array;
  private readonly feature: number[] = [];
  private readonly threshold: number[] = [];
  private readonly maskOffset: number[] = [];
  private readonly masks: number[] = [];
  private readonly left: number[] = [];
  private readonly right: number[] = [];
  private readonly missingLeft: number[] = [];
  private readonly value: number[] = [];
  private readonly rows: number[] = [];
  private readonly weight: number[] = [];
  private readonly impurity: number[] = [];

  /**
   * @param width Values per node: 1 (regression) or the number of classes.
   * @param maskWords Per feature, the words of its level masks (see maskWordsOf).
   */
  constructor(task: FlatTree["task"], width: number, maskWords: Int32Array) {
    this.task = task;
    this.width = width;
    this.maskWords = maskWords;
  }

  /** Adds a node, a leaf until split, with its `width` values; returns its id. */
  add(values: ArrayLike<number>, rows: number, weight: number, impurity: number): number {
    const id = this.feature.length;
    for (let c = 0; c < this.width; c++) this.value.push(values[c]);
    this.feature.push(-1);
    this.threshold.push(NaN);
    this.maskOffset.push(-1);
    this.left.push(-1);
    this.right.push(-1);
    this.missingLeft.push(0);
    this.rows.push(rows);
    this.weight.push(weight);
    this.impurity.push(impurity);
    return id;
  }

  /** A node's weight. */
  weightOf(id: number): number {
    return this.weight[id];
  }

  /** A node's impurity. */
  impurityOf(id: number): number {
    return this.impurity[id];
  }

  /** Hangs node `child` under `parent` on one side. */
  attach(parent: number, side: "left" | "right", child: number): void {
    if (side === "left") this.left[parent] = child;
    else this.right[parent] = child;
  }

  /** Makes node `id` a split: a threshold, or two level masks for a categorical feature. */
  split(
    id: number,
    best: Pick<SplitChoice, "feature" | "threshold" | "leftBins" | "rightBins">,
    missingLeft: boolean,
  ): void {
    this.feature[id] = best.feature;
    this.missingLeft[id] = missingLeft ? 1 : 0;
    const words = this.maskWords[best.feature];
    if (words > 0) {
      // Two bit sets: the levels sent left, then those sent right. A level in
      // neither was absent from the node and follows the missing direction.
      this.maskOffset[id] = this.masks.length;
      const mask = new Array<number>(2 * words).fill(0);
      for (const bin of best.leftBins) mask[bin >>> 5] |= 1 << (bin & 31);
      for (const bin of best.rightBins) mask[words + (bin >>> 5)] |= 1 << (bin & 31);
      for (const word of mask) this.masks.push(word >>> 0);
    } else {
      this.threshold[id] = best.threshold;
    }
  }

  /** The flat tree. */
  finish(): FlatTree {
    return {
      task: this.task,
      width: this.width,
      nodeCount: this.feature.length,
      feature: new Int32Array(this.feature),
      threshold: new Float64Array(this.threshold),
      maskOffset: new Int32Array(this.maskOffset),
      masks: new Uint32Array(this.masks),
      maskWords: this.maskWords,
      left: new Int32Array(this.left),
      right: new Int32Array(this.right),
      missingLeft: new Uint8Array(this.missingLeft),
      value: new Float64Array(this.value),
      rows: new Int32Array(this.rows),
      weight: new Float64Array(this.weight),
      impurity: new Float64Array(this.impurity),
    };
  }
}
