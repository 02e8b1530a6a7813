/**
 * A model written out by hand (invented figures), small enough that every
 * answer read from it can be worked out on paper: a reference tree on level
 * and site, three ensemble trees (two on years, one on level), residuals
 * kept as a five-point grid, twenty training rows with their identifiers.
 *
 * @module
 */

import { resampleStates, VERSION } from "../../../mod.ts";
import type { FeatureSchema, FlatTree, Model } from "../../../mod.ts";
import { rowKey } from "../../../lib/model/fit_model.ts";
import { handTree } from "../tree/_hand_tree.ts";

/** Levels of `level`, lowest first. */
export const LEVELS = ["G1", "G2", "G3"];
/** Levels of `site`. */
export const SITES = ["North", "South"];

/** The features: level (ordinal), years (numeric), site (categorical). */
export const FEATURES: FeatureSchema[] = [
  { name: "level", kind: "ordinal", levels: LEVELS, typical: 1, missing: 0, protected: false },
  {
    name: "years",
    kind: "numeric",
    typical: 8,
    range: { min: 0, max: 20, p01: 1, p99: 19 },
    missing: 0,
    protected: false,
  },
  { name: "site", kind: "categorical", levels: SITES, typical: 0, missing: 0, protected: false },
];

const KINDS = FEATURES.map((f) => ({ kind: f.kind, levels: f.levels }));

/**
 * The reference tree: level <= G1 (node 1: 4 people at 40,000) | else site
 * North (node 3: 10 people at 50,000) | South (node 4: 6 people at 60,000).
 */
export const REFERENCE: FlatTree = handTree(
  [
    { feature: 0, split: 0.5, left: 1, right: 2 },
    null,
    { feature: 2, split: { left: [0], right: [1] }, left: 3, right: 4 },
    null,
    null,
  ],
  KINDS,
  [50000, 40000, 54000, 50000, 60000].map(Math.log),
  [20, 4, 16, 10, 6],
);

/** Ensemble tree b: years <= 10 gives LOW[b], else HIGH[b] (trees 0 and 1). */
export const LOW = [45000, 50000];
/** See {@linkcode LOW}. */
export const HIGH = [60000, 66000];
/** Tree 2: level G1 gives 40,000, any other 58,000. */
export const BY_LEVEL = [40000, 58000];

function split(feature: number, threshold: number, left: number, right: number): FlatTree {
  return handTree(
    [{ feature, split: threshold, left: 1, right: 2 }, null, null],
    KINDS,
    [(left + right) / 2, left, right].map(Math.log),
    [20, 10, 10],
  );
}

/** The trees' log estimates for a profile, worked out from the splits. */
export function treeLogs(level: number, years: number): number[] {
  return [
    Math.log(years <= 10 ? LOW[0] : HIGH[0]),
    Math.log(years <= 10 ? LOW[1] : HIGH[1]),
    Math.log(level <= 0.5 ? BY_LEVEL[0] : BY_LEVEL[1]),
  ];
}

/** The shift to the median. */
export const SHIFT = 0.01;
/** The kept residual grid (one group). */
export const RESIDUALS = [-0.2, -0.1, 0, 0.1, 0.2];

/** The twenty training rows: identifier, level code, years, site code. */
export const TRAINING: [string, number, number, number][] = Array.from({ length: 20 }, (_, i) => [
  `e${String(i + 1).padStart(2, "0")}`,
  i < 4 ? 0 : i < 12 ? 1 : 2,
  (i * 7) % 20,
  i % 3 === 0 ? 1 : 0,
]);

/** The training rows as the CSV they were read from (pay in whole euros). */
export function trainingCsv(): string {
  return "employee_id,level,years,site,pay_eur\n" +
    TRAINING.map(([id, l, y, s], i) => `${id},${LEVELS[l]},${y},${SITES[s]},${40000 + 1000 * i}`)
      .join("\n") +
    "\n";
}

/** The hand model (regression on logs, an ensemble of three trees, the analyst's part). */
export function handModel(): Model {
  const trees = [
    split(1, 10, LOW[0], HIGH[0]),
    split(1, 10, LOW[1], HIGH[1]),
    split(0, 0.5, BY_LEVEL[0], BY_LEVEL[1]),
  ];
  const fig = (rmse: number, mae: number, r2: number) => ({ rmse, mae, r2 });
  return {
    provenance: {
      paygrove: VERSION,
      format: 2,
      created: "2026-01-01T00:00:00.000Z",
      table: { file: "hand.csv", sha256: "0".repeat(64), rows: 20 },
      seed: 1,
    },
    target: {
      name: "pay_eur",
      kind: "regression",
      money: { currency: "EUR", period: "year" },
      scale: "log",
      center: { shift: SHIFT, duan: 1.02, meanOverEstimate: 1.01, rows: 20 },
    },
    features: structuredClone(FEATURES),
    dropped: [
      { name: "employee_id", reason: "identifier" },
      { name: "gender", reason: "protected attribute" },
    ],
    read: {
      decimal: ".",
      encoding: "utf-8",
      types: {
        employee_id: "identifier",
        level: "ordinal",
        years: "numeric",
        site: "categorical",
        pay_eur: "numeric",
      },
      orders: { level: [...LEVELS] },
      identifier: "employee_id",
    },
    settings: {
      trees: 3,
      minLeaf: 3,
      folds: 5,
      rule: "one-se",
      prune: "alpha-min",
      seed: 1,
      privacyMin: 5,
      where: {},
      allowProtected: false,
      increasing: [],
    },
    rows: { used: 20, dropped: 0 },
    reference: { tree: REFERENCE, alpha: 0.001, leaves: 3, depth: 2, pruningPath: [] },
    ensemble: { trees, alpha: 0.001 },
    residuals: { edges: Float64Array.of(Infinity), residuals: [Float64Array.from(RESIDUALS)] },
    quality: {
      constantInSample: {
        measuredBy: "in-sample",
        money: fig(9000, 7000, 0),
        log: fig(0.2, 0.15, 0),
      },
      constant: {
        measuredBy: "cross-validation",
        money: fig(9100, 7100, -0.01),
        log: fig(0.2, 0.15, 0),
      },
      linear: {
        measuredBy: "cross-validation",
        money: fig(5200, 4100, 0.7),
        log: fig(0.11, 0.09, 0.7),
      },
      reference: {
        measuredBy: "cross-validation",
        money: fig(5500, 4300, 0.65),
        log: fig(0.12, 0.09, 0.65),
      },
      ensemble: { measuredBy: "out-of-bag", money: fig(5000, 4000, 0.8), log: fig(0.1, 0.08, 0.8) },
    },
    importance: [
      { feature: "level", permutation: 0.03, permutationSd: 0.001, impurity: 0.6 },
      { feature: "years", permutation: -0.001, permutationSd: 0.001, impurity: 0.3 },
      { feature: "site", permutation: NaN, permutationSd: NaN, impurity: 0.1 },
    ],
    support: {
      peers: {
        features: ["level", "site"],
        counts: {
          "G1\u0000North": 2,
          "G1\u0000South": 2,
          "G2\u0000North": 6,
          "G2\u0000South": 2,
          "G3\u0000North": 6,
          "G3\u0000South": 2,
        },
      },
      levelRanges: [{
        feature: "level",
        level: "G2",
        ranges: [{ feature: "years", p01: 3, p99: 12 }],
      }],
    },
    analyst: {
      resamples: resampleStates(1, TRAINING.map((_, i) => i), 3),
      rowKeys: TRAINING.map(([id, l, y, s]) => rowKey(id, [l, y, s])).join(""),
    },
    seconds: 0,
  };
}

/** The hand model without an ensemble (the reference tree alone). */
export function treeOnlyModel(): Model {
  return { ...handModel(), ensemble: null, residuals: null, analyst: null };
}

/**
 * A class model by hand: the reference tree and two trees on years
 * (years <= 10: junior 0.75 | 0.5; else 0.25 | 0.125), classes junior, senior.
 */
export function classModel(): Model {
  const model = handModel();
  const classTree = (junior: number, senior: number) =>
    handTree(
      [{ feature: 1, split: 10, left: 1, right: 2 }, null, null],
      KINDS,
      [0.5, 0.5, junior, 1 - junior, senior, 1 - senior],
      [20, 10, 10],
      "classification",
    );
  return {
    ...model,
    target: { name: "grade", kind: "classification", classes: ["junior", "senior"], scale: "raw" },
    reference: { ...model.reference, tree: classTree(0.75, 0.25) },
    ensemble: { trees: [classTree(0.75, 0.25), classTree(0.5, 0.125)], alpha: 0 },
    residuals: null,
  };
}
