/**
 * The proxy check (proxies.ts) on a fitting pool's workers, sent aside
 * between two runs: each worker gets a share of every question's features.
 * A whole fit sends it when the cross-validation's trees are back, and the
 * workers then check proxies while this thread scores the last of those
 * trees and starts the ensemble, time in which they would otherwise wait.
 * The figures are proxyFigureSets' own: a feature's votes do not depend on
 * which other features are checked with it (each tree's resample is drawn
 * from the seed and the attribute alone).
 *
 * @module
 */

import type { FittingPool } from "./_worker_pool.ts";
import type { ProxyFigure, ProxyOptions, ProxyQuestion } from "./proxies.ts";

/**
 * Starts the proxy check of `questions` on the pool's workers, features
 * dealt to the workers in turn, and returns the figures as
 * `proxyFigureSets(questions, options)` does: per question, every feature,
 * highest balanced accuracy first (ties in feature order).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { FittingPool } from "./_worker_pool.ts";
 * import { proxyFigureSets } from "./proxies.ts";
 * import { proxyFigureSetsAside } from "./proxies_parallel.ts";
 * // A site that tells the groups apart, a level that does not.
 * const rows = 120;
 * const attribute = Int32Array.from({ length: rows }, (_, r) => r % 2);
 * const features = [
 *   { name: "site", kind: "categorical" as const, levels: ["A", "B"],
 *     values: Float64Array.from(attribute, (g, r) => (r % 10 === 0 ? 1 - g : g)) },
 *   { name: "level", kind: "numeric" as const, values: Float64Array.from({ length: rows }, (_, r) => r % 3) },
 * ];
 * const questions = [{ features, attribute, groups: ["x", "y"], attributeName: "group" }];
 * const pool = new FittingPool(2);
 * try {
 *   const aside = await proxyFigureSetsAside(pool, questions, { trees: 10, seed: 3 });
 *   assert.deepEqual(aside, proxyFigureSets(questions, { trees: 10, seed: 3 }));
 *   assert.equal(aside[0][0].feature, "site");
 * } finally {
 *   pool.close();
 * }
 * ```
 */
export async function proxyFigureSetsAside(
  pool: FittingPool,
  questions: readonly ProxyQuestion[],
  options: ProxyOptions = {},
): Promise<ProxyFigure[][]> {
  // Worker p checks features p, p + size, ... of every question (a worker
  // with none of them gets nothing).
  const parts = Array.from({ length: pool.size }, (_, worker) => ({
    worker,
    asked: questions.flatMap((q, index) => {
      const features = q.features.filter((_, f) => f % pool.size === worker);
      return features.length === 0 ? [] : [{ index, question: { ...q, features } }];
    }),
  })).filter((part) => part.asked.length > 0);
  const replies = await Promise.all(
    parts.map(({ worker, asked }) =>
      pool.aside(worker, { kind: "proxies", questions: asked.map((a) => a.question), options })
    ),
  );
  const byName = questions.map(() => new Map<string, ProxyFigure>());
  replies.forEach((reply, k) => {
    if (reply.kind !== "proxies") throw new Error(`a proxy check answered "${reply.kind}"`);
    reply.figures.forEach((figures, j) => {
      for (const figure of figures) byName[parts[k].asked[j].index].set(figure.feature, figure);
    });
  });
  // proxyFigureSets' order: features in order, then a stable sort.
  return questions.map((q, i) =>
    q.features.map((feature) => byName[i].get(feature.name)!)
      .sort((a, b) => b.balancedAccuracy - a.balancedAccuracy)
  );
}
