/**
 * Loading the scikit-learn reference fixtures (fixtures/reference/, written
 * by tests/reference/sklearn_trees.py with scikit-learn 1.2.1) as datasets.
 *
 * @module
 */

import type { Dataset } from "../../../mod.ts";

/** One fitted setting of a reference file. */
export interface ReferenceCase {
  name: string;
  min_samples_leaf: number;
  min_samples_split: number;
  max_depth: number | null;
  sample_weight: number[] | null;
  n_leaves: number;
  pure_splits: number;
  path_seed_difference: number;
  depth: number;
  predict: number[] | number[][];
  unstable_rows: number[];
  seed_spread: { n_leaves: [number, number]; depth: [number, number]; path_len: [number, number] };
  path: { ccp_alphas: number[]; impurities: number[] };
  pruned_leaves: number[];
  pruned_index?: number[];
}

/** A reference file. */
export interface ReferenceFile {
  source: string;
  sklearn_version: string;
  dataset: string;
  task: "regression" | "classification";
  features: string[];
  X: number[][];
  y: number[];
  cases: ReferenceCase[];
}

/** Reads `fixtures/reference/trees_NAME.json`. */
export async function readReference(name: string): Promise<ReferenceFile> {
  const url = new URL(`../../../fixtures/reference/trees_${name}.json`, import.meta.url);
  return JSON.parse(await Deno.readTextFile(url));
}

/** The reference data as a dataset of numeric features (the float32-rounded values). */
export function referenceDataset(file: ReferenceFile): Dataset {
  const features = file.X.map((column, j) => ({
    name: file.features[j],
    kind: "numeric" as const,
    values: Float64Array.from(column),
  }));
  const target = file.task === "regression"
    ? { kind: "regression" as const, name: "y", values: Float64Array.from(file.y) }
    : {
      kind: "classification" as const,
      name: "y",
      classes: [...new Set(file.y)].sort().map(String),
      values: Int32Array.from(file.y),
    };
  return { rows: file.y.length, features, target };
}
