/**
 * A worker that grows the trees it is asked for. It receives the shared
 * data once, then tree indices; it answers each with the fitted tree, whose
 * arrays are transferred, not copied. Several ensembles' data may be held
 * at once, each under its own key (0 unless given), and a tree asked for
 * by its ensemble's key. A pool that keeps the worker for several runs
 * starts each with a reset. It also works out contributions: given a set
 * of trees once, then blocks of profiles (lib/ensemble/contributions_parallel.ts);
 * and, sent aside between runs, a part of the proxy check (proxies_parallel.ts).
 *
 * @module
 */

import { datasetOf, type SharedData } from "./_shared_data.ts";
import { type EnsembleOptions, fitOneTree } from "./fit_ensemble.ts";
import type { FlatTree } from "../tree/flat_tree.ts";
import { type GrowOptions, growTree } from "../tree/grow_tree.ts";
import { ContributionReader } from "./contributions.ts";
import {
  type ProxyFigure,
  proxyFigureSets,
  type ProxyOptions,
  type ProxyQuestion,
} from "./proxies.ts";

/** Messages to the worker. */
export type ToWorker =
  | { kind: "data"; data: SharedData; options: EnsembleOptions; states: Int32Array; key?: number }
  | { kind: "tree"; index: number; key?: number }
  // Cross-validation: each row's fold, then the trees by number (-1: the
  // tree of every row; k: fold k's rows left out).
  | { kind: "folds"; fold: Int32Array; grow?: GrowOptions }
  | { kind: "foldTree"; index: number }
  // Contributions: the trees once, then blocks of profiles (row-major, one
  // value per feature), each row over every tree or the trees listed.
  | { kind: "partsTrees"; trees: FlatTree[]; features: number }
  | { kind: "parts"; index: number; profiles: Float64Array; only: (Int32Array | null)[] }
  // The proxy check of some features, with its own data (a task aside).
  | { kind: "proxies"; questions: ProxyQuestion[]; options: ProxyOptions }
  // A new run: the data and folds of earlier runs are forgotten.
  | { kind: "reset" }
  | { kind: "stop" };

/** Messages from the worker. */
export type FromWorker =
  | {
    kind: "tree";
    index: number;
    key?: number;
    tree: FlatTree;
    alpha: number;
    oob: Float64Array;
    importance?: Float64Array;
    shared?: FlatTree;
  }
  | { kind: "foldTree"; index: number; tree: FlatTree }
  // Per profile of the block: base, prediction, then one part per feature.
  | { kind: "parts"; index: number; figures: Float64Array }
  | { kind: "proxies"; figures: ProxyFigure[][] }
  | { kind: "error"; message: string };

// deno-lint-ignore no-explicit-any
const scope = self as any;
// Each ensemble's data, options and resampling states, by key.
const sets = new Map<
  number,
  { data: SharedData; options: EnsembleOptions; states: Int32Array }
>();
let folds: { fold: Int32Array; grow?: GrowOptions } | undefined;
let partsReader: ContributionReader | undefined;

// A tree's arrays, to transfer rather than copy.
function buffersOf(tree: FlatTree): ArrayBufferLike[] {
  return [
    tree.feature,
    tree.threshold,
    tree.maskOffset,
    tree.left,
    tree.right,
    tree.missingLeft,
    tree.value,
    tree.rows,
    tree.weight,
    tree.impurity,
  ].map((a) => a.buffer);
}

scope.onmessage = (event: MessageEvent<ToWorker>) => {
  const message = event.data;
  try {
    if (message.kind === "data") {
      const { data, options, states } = message;
      sets.set(message.key ?? 0, { data, options, states });
      return;
    }
    if (message.kind === "reset") {
      sets.clear();
      folds = undefined;
      partsReader = undefined;
      return;
    }
    if (message.kind === "partsTrees") {
      partsReader = new ContributionReader(message.trees, message.features);
      return;
    }
    if (message.kind === "parts") {
      if (partsReader === undefined) throw new Error("profiles sent before the trees");
      const width = partsReader.features;
      const count = message.only.length;
      const figures = new Float64Array(count * (width + 2));
      for (let i = 0; i < count; i++) {
        const profile = message.profiles.subarray(i * width, (i + 1) * width);
        const { base, prediction, parts } = partsReader.profile(
          profile,
          message.only[i] ?? undefined,
        );
        figures[i * (width + 2)] = base;
        figures[i * (width + 2) + 1] = prediction;
        figures.set(parts, i * (width + 2) + 2);
      }
      const reply: FromWorker = { kind: "parts", index: message.index, figures };
      scope.postMessage(reply, [figures.buffer]);
      return;
    }
    if (message.kind === "proxies") {
      const reply: FromWorker = {
        kind: "proxies",
        figures: proxyFigureSets(message.questions, message.options),
      };
      scope.postMessage(reply);
      return;
    }
    if (message.kind === "stop") {
      scope.close();
      return;
    }
    if (message.kind === "folds") {
      folds = { fold: message.fold, grow: message.grow };
      return;
    }
    const key = message.kind === "tree" ? message.key ?? 0 : 0;
    const set = sets.get(key);
    if (set === undefined) throw new Error("tree requested before data");
    const { data, options, states } = set;
    const dataset = datasetOf(data);
    if (message.kind === "foldTree") {
      if (folds === undefined) throw new Error("fold tree requested before the folds");
      const k = message.index;
      const weights = k < 0 ? undefined : Float64Array.from(folds.fold, (f) => (f === k ? 0 : 1));
      const tree = growTree(
        { dataset, bins: data.bins, weights, order: data.order },
        folds.grow,
      );
      const reply: FromWorker = { kind: "foldTree", index: k, tree };
      scope.postMessage(reply, buffersOf(tree));
      return;
    }
    const { tree, alpha, oob, importance, shared } = fitOneTree(
      dataset,
      data.bins,
      data.order,
      states,
      message.index,
      options,
    );
    const reply: FromWorker = { kind: "tree", index: message.index, tree, alpha, oob };
    if (message.key !== undefined) reply.key = message.key;
    if (importance !== undefined) reply.importance = importance;
    if (shared !== undefined) reply.shared = shared;
    // A shared copy may keep some of the tree's arrays: each buffer once.
    const buffers = new Set([
      ...buffersOf(tree),
      oob.buffer,
      ...(importance === undefined ? [] : [importance.buffer]),
      ...(shared === undefined ? [] : buffersOf(shared)),
    ]);
    scope.postMessage(reply, [...buffers]);
  } catch (error) {
    const reply: FromWorker = { kind: "error", message: (error as Error).stack ?? String(error) };
    scope.postMessage(reply);
  }
};
