/**
 * Classification and regression trees: growing, cost-complexity pruning,
 * cross-validated size selection, prediction and explanation.
 *
 * @module
 */

export { binFeatures, FEATURE_TOLERANCE, type FeatureBins } from "./bins.ts";
export {
  applyRow,
  applyRows,
  applyValues,
  copyNodes,
  type FlatTree,
  goesLeft,
  leafCount,
  pathOfRow,
  predictedClass,
  predictRows,
  splitLevels,
  treeDepth,
} from "./flat_tree.ts";
export {
  canonicalRowOrder,
  type GrowInput,
  type GrownLeaves,
  type GrowOptions,
  growTree,
  growTreeLeaves,
} from "./grow_tree.ts";
export {
  collapsedWithin,
  collapseNodes,
  distinctSteps,
  PRUNE_TOLERANCE,
  pruneTree,
  type PruningPath,
  pruningPath,
  SAME_ALPHA,
  sameAlpha,
  stepAt,
  subtreeAfter,
  subtreeNodeOf,
} from "./prune.ts";
export {
  type AlphaCandidate,
  assignFolds,
  type CrossValidatedTree,
  crossValidateGrown,
  type CrossValidateOptions,
  crossValidateTree,
  scoreSubtrees,
} from "./cross_validate.ts";
export {
  type ClassificationMetrics,
  classificationMetrics,
  constantBaseline,
  type RegressionMetrics,
  regressionMetrics,
} from "./metrics.ts";
export { describeCondition, explainPath, formatThreshold, type PathStep } from "./explain.ts";
export { meetsCondition, mergePath, type PathCondition } from "./merge_path.ts";
export { shareableTree, shareTree, shareTreeAt } from "./share_tree.ts";
export { diverseLeaves, diverseLeavesAt, SAME_PAY_SHARE } from "./diverse_leaves.ts";
