// The default fit's fingerprint on the demo table and CPS1988: every
// ensemble tree's prediction on every training row (hashed), the
// out-of-bag accuracy, the permutation importance and the reference tree's
// cross-validated path. A change that makes the learner faster must leave
// the trees and the out-of-bag figures exactly as they were; the
// cross-validated errors may move in their last bits when sums are
// reordered (compared within 1e-9 relative, tests/fingerprint/). After
// writing the fixture, run `deno fmt tests/fingerprint/`.
import {
  bootstrapCounts,
  featureImportance,
  fitModel,
  loadTableFile,
  payRows,
  predictRows,
  resamplesOf,
} from "../../mod.ts";

/** The tables and targets fingerprinted (as `paygrove fit FILE --target T`). */
export const FINGERPRINTED = [
  { name: "demo", file: "fixtures/demo_company.csv", target: "base_pay_eur" },
  { name: "cps1988", file: "fixtures/cps1988.csv", target: "wage" },
] as const;

/** What is compared. */
export interface Fingerprint {
  trees: number;
  /** SHA-256 of every tree's predictions on every row (Float64, tree by tree). */
  predictions: string;
  /** SHA-256 of every row's out-of-bag mean (NaN where every tree drew it). */
  outOfBag: string;
  /** Permutation importance per feature (fitting scale), and its SD, unrounded. */
  permutation: number[];
  permutationSd: number[];
  /** The reference tree's path: alpha, leaves, risk, CV error and its SE. */
  path: { alpha: number; leaves: number; risk: number; cvError: number; cvSe: number }[];
}

/** The fingerprint of the default fit of one table, as `paygrove fit` makes it. */
export async function fingerprint(
  file: string,
  target: string,
  root: string,
): Promise<Fingerprint> {
  const table = await loadTableFile(`${root}${file}`, { target });
  const model = await fitModel(table, { target, workers: 2, now: () => "fixed" });
  const { dataset } = payRows(table, { target });
  const trees = model.ensemble!.trees;
  const all = new Float64Array(trees.length * dataset.rows);
  trees.forEach((tree, b) => {
    all.set(predictRows(tree, dataset.features, dataset.rows), b * dataset.rows);
  });
  const resamples = resamplesOf(model)!;
  const oobSum = new Float64Array(dataset.rows);
  const oobCount = new Float64Array(dataset.rows);
  trees.forEach((_, b) => {
    const counts = bootstrapCounts(dataset.rows, resamples, b);
    for (let r = 0; r < dataset.rows; r++) {
      if (counts[r] > 0) continue;
      oobSum[r] += all[b * dataset.rows + r];
      oobCount[r]++;
    }
  });
  const oobMean = oobSum.map((s, r) => s / oobCount[r]);
  const importance = featureImportance(
    {
      trees,
      resamples,
      alphas: new Float64Array(trees.length),
      width: 1,
      oob: oobMean,
      oobTrees: new Int32Array(0),
    },
    dataset,
    { repeats: 3, seed: 1 },
  );
  return {
    trees: trees.length,
    predictions: await sha256(all),
    outOfBag: await sha256(oobMean),
    permutation: importance.map((i) => i.permutation),
    permutationSd: importance.map((i) => i.permutationSd),
    path: model.reference.pruningPath,
  };
}

async function sha256(values: Float64Array): Promise<string> {
  const digest = await crypto.subtle.digest("SHA-256", values.buffer as ArrayBuffer);
  return Array.from(new Uint8Array(digest), (x) => x.toString(16).padStart(2, "0")).join("");
}

if (import.meta.main) {
  const root = new URL("../../", import.meta.url).pathname;
  const out: Record<string, Fingerprint> = {};
  for (const { name, file, target } of FINGERPRINTED) {
    out[name] = await fingerprint(file, target, root);
  }
  const path = `${root}tests/fingerprint/fingerprint.json`;
  await Deno.writeTextFile(path, JSON.stringify(out, null, 1) + "\n");
  console.log(`wrote ${path}`);
}
