// deno task bench: the tree learner on CPS1988 (28,155 rows; log wage on
// education, experience, ethnicity, smsa, region, parttime as in the
// scikit-learn fixtures). Compare with bench/sklearn_tree_bench.py, run on
// the same machine; results are committed under bench/results/.
import {
  binFeatures,
  canonicalRowOrder,
  crossValidateTree,
  growTree,
  pruningPath,
} from "../mod.ts";
import { readReference, referenceDataset } from "../tests/lib/tree/_reference.ts";

const file = await readReference("cps1988");
const dataset = referenceDataset(file);
const bins = binFeatures(dataset);
const order = canonicalRowOrder(dataset);
const tree = growTree({ dataset, bins, order }, { minLeaf: 5 });

Deno.bench("bin features (once per table)", () => {
  binFeatures(dataset);
});
Deno.bench("canonical row order (once per table)", () => {
  canonicalRowOrder(dataset);
});
Deno.bench("grow one tree, min leaf 5", { baseline: true }, () => {
  growTree({ dataset, bins, order }, { minLeaf: 5 });
});
Deno.bench("grow one tree, min leaf 1", () => {
  growTree({ dataset, bins, order }, { minLeaf: 1, minSplit: 2 });
});
Deno.bench("pruning path of the min-leaf-5 tree", () => {
  pruningPath(tree);
});
Deno.bench("10-fold cross-validated reference tree", { n: 3, warmup: 1 }, () => {
  crossValidateTree(dataset, { folds: 10, seed: 1 }, bins);
});
