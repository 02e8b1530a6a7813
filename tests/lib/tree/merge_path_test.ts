// Merged decision paths: the conditions on one attribute along a path say
// what they mean together, and the merged bounds are exactly the
// intersection of the split conditions (a point meets the raw path iff it
// meets the merged form), on hand-built trees, grown trees and the model of
// the invented demo company.
import assert from "node:assert/strict";
import fc from "fast-check";
import {
  binFeatures,
  explainPath,
  type Feature,
  type FlatTree,
  goesLeft,
  growTree,
  meetsCondition,
  mergePath,
  readTableFileForModel,
  rowProfile,
} from "../../../mod.ts";
import { DEMO_PATH, demoModel } from "../model/_demo_model.ts";
import { levels, numeric, regression } from "./_small.ts";

// A tree from a list of nodes: [feature, threshold or level set sent left, left, right,
// missing left], a leaf as null; values are the node numbers, rows 100 - node.
type HandNode = [number, number | number[], number, number, boolean] | null;

function handTree(nodes: HandNode[], features: Pick<Feature, "kind" | "levels">[]): FlatTree {
  const n = nodes.length;
  const words = features.map((f) =>
    f.kind === "categorical" ? Math.ceil((f.levels?.length ?? 0) / 32) || 1 : 0
  );
  const masks: number[] = [];
  const tree: FlatTree = {
    task: "regression",
    width: 1,
    nodeCount: n,
    feature: new Int32Array(n).fill(-1),
    threshold: new Float64Array(n).fill(NaN),
    maskOffset: new Int32Array(n).fill(-1),
    masks: new Uint32Array(0),
    maskWords: Int32Array.from(words),
    left: new Int32Array(n).fill(-1),
    right: new Int32Array(n).fill(-1),
    missingLeft: new Uint8Array(n),
    value: Float64Array.from({ length: n }, (_, i) => i),
    rows: Int32Array.from({ length: n }, (_, i) => 100 - i),
    weight: new Float64Array(n).fill(1),
    impurity: new Float64Array(n),
  };
  nodes.forEach((node, i) => {
    if (node === null) return;
    const [f, split, l, r, missingLeft] = node;
    tree.feature[i] = f;
    tree.left[i] = l;
    tree.right[i] = r;
    tree.missingLeft[i] = missingLeft ? 1 : 0;
    if (typeof split === "number") {
      tree.threshold[i] = split;
      return;
    }
    // Left set, then every other level to the right.
    tree.maskOffset[i] = masks.length;
    const count = features[f].levels?.length ?? 0;
    const left = new Array(words[f]).fill(0);
    const right = new Array(words[f]).fill(0);
    for (let c = 0; c < count; c++) {
      if (split.includes(c)) left[c >>> 5] |= 1 << (c & 31);
      else right[c >>> 5] |= 1 << (c & 31);
    }
    masks.push(...left, ...right);
  });
  tree.masks = Uint32Array.from(masks.map((m) => m >>> 0));
  return tree;
}

const LEVEL: Feature = {
  name: "level",
  kind: "ordinal",
  levels: ["G1", "G2", "G3", "G4", "G5"],
  values: new Float64Array(0),
};
const YEARS: Feature = { name: "years", kind: "numeric", values: new Float64Array(0) };
const FAMILY: Feature = {
  name: "family",
  kind: "categorical",
  levels: ["Lab", "Sales", "Support", "Field"],
  values: new Float64Array(0),
};
const FEATURES = [LEVEL, YEARS, FAMILY];

// level <= G2 (0), level >= G2 (1), years > 3.5 (3), family in {Lab, Sales} (5),
// years <= 8 (7), family not Sales (9): the leaf 11.
const HAND = handTree([
  [0, 1.5, 1, 2, false], // 0: level <= G2
  [0, 0.5, 2, 3, false], // 1: level <= G1 | >= G2
  null,
  [1, 3.5, 4, 5, true], // 3: years <= 3.5 | > 3.5 (missing left)
  null,
  [2, [0, 1], 7, 6, false], // 5: family in {Lab, Sales}
  null,
  [1, 8, 9, 8, false], // 7: years <= 8
  null,
  [2, [1], 10, 11, true], // 9: family Sales | not
  null,
  null,
], FEATURES);

Deno.test("a hand-built path's conditions merge into what they mean, in the order of their last step", () => {
  // A G2 with 5 years in Lab: six split steps on three attributes.
  const raw = explainPath(HAND, FEATURES, [1, 5, 0]);
  assert.deepEqual(raw.map((s) => s.condition), [
    "level <= G2",
    "level >= G2",
    "years > 3.5",
    "family in {Lab, Sales}",
    "years <= 8",
    "family in {Lab, Support, Field}",
  ]);
  const merged = mergePath(HAND, FEATURES, [1, 5, 0]);
  assert.deepEqual(
    merged.map((c) => [c.condition, c.steps, c.node, c.rows, c.value]),
    [
      ["level G2", [1, 2], 3, 97, 3],
      ["years 3.5 to 8", [3, 5], 9, 91, 9],
      ["family Lab", [4, 6], 11, 89, 11],
    ],
  );
  assert.deepEqual([merged[1].above, merged[1].atMost, merged[1].levels], [3.5, 8, null]);
  assert.deepEqual(merged[0].levels, ["G2"]);
  assert.deepEqual(merged[2].levels, ["Lab"]);
  // Missing years went left at step 3 (years <= 3.5), so no missing value follows this path.
  assert.equal(merged[1].missing, false);
});

Deno.test("one-sided bounds, runs of levels and sets say so in words", () => {
  const tree = handTree([
    [0, 2.5, 1, 2, false], // level <= G3
    [1, 3.5, 3, 4, false], // years
    null,
    null,
    [2, [0, 1, 2], 5, 6, false], // family not Field
    null,
    null,
  ], FEATURES);
  assert.deepEqual(mergePath(tree, FEATURES, [1, 9, 1]).map((c) => c.condition), [
    "level G3 or below",
    "years above 3.5",
    "family other than Field",
  ]);
  const low = handTree([[1, 3.5, 1, 2, false], [0, 1.5, 3, 4, false], null, null, null], FEATURES);
  assert.deepEqual(mergePath(low, FEATURES, [3, 2, 0]).map((c) => c.condition), [
    "years up to 3.5",
    "level G3 or above",
  ]);
  // A missing value is said as missing.
  const missing = mergePath(HAND, FEATURES, [1, NaN, 0]);
  assert.equal(missing[1].condition, "years missing");
  assert.equal(missing[1].missing, true);
});

// A point meets the raw path when every split step sends it the way the
// profile went; it meets the merged form when it meets every condition.
function meetsRaw(tree: FlatTree, profile: ArrayLike<number>, point: ArrayLike<number>): boolean {
  let node = 0;
  while (tree.left[node] !== -1) {
    const f = tree.feature[node];
    const side = goesLeft(tree, node, profile[f]);
    if (goesLeft(tree, node, point[f]) !== side) return false;
    node = side ? tree.left[node] : tree.right[node];
  }
  return true;
}

function meetsMerged(
  tree: FlatTree,
  features: readonly Pick<Feature, "name" | "kind" | "levels">[],
  profile: ArrayLike<number>,
  point: ArrayLike<number>,
): boolean {
  return mergePath(tree, features, profile).every((c) => {
    const f = features.findIndex((x) => x.name === c.feature);
    return meetsCondition(c, point[f], features[f].levels ?? []);
  });
}

// Values that sit on, just beside and between the tree's thresholds, missing, and level codes.
function valueArbitrary(tree: FlatTree, f: number, feature: Pick<Feature, "kind" | "levels">) {
  if (feature.kind === "categorical" || feature.kind === "ordinal") {
    return fc.oneof(
      fc.constant(NaN),
      fc.integer({ min: 0, max: (feature.levels?.length ?? 1) - 1 }),
    );
  }
  const cuts: number[] = [];
  for (let n = 0; n < tree.nodeCount; n++) {
    if (tree.feature[n] === f && Number.isFinite(tree.threshold[n])) cuts.push(tree.threshold[n]);
  }
  const near = cuts.flatMap((t) => [t, t - 1e-9, t + 1e-9, t - 1, t + 1]);
  return fc.oneof(
    fc.constant(NaN),
    fc.double({ min: -100, max: 100, noNaN: true }),
    ...(near.length > 0 ? [fc.constantFrom(...near)] : []),
  );
}

function checkProperty(
  tree: FlatTree,
  features: readonly Pick<Feature, "name" | "kind" | "levels">[],
  runs: number,
): void {
  const point = fc.tuple(...features.map((f, i) => valueArbitrary(tree, i, f)));
  fc.assert(
    fc.property(point, point, (profile, other) => {
      // The profile meets its own path; the other point meets it iff it meets the merged form.
      assert.ok(meetsMerged(tree, features, profile, profile));
      assert.equal(meetsMerged(tree, features, profile, other), meetsRaw(tree, profile, other));
    }),
    { numRuns: runs, seed: 14 },
  );
}

Deno.test("property: a point meets a hand-built tree's raw path iff it meets the merged form", () => {
  checkProperty(HAND, FEATURES, 2000);
});

Deno.test("property: the same on trees grown on random tables with repeated splits on one attribute", () => {
  fc.assert(
    fc.property(
      fc.array(
        fc.tuple(
          fc.oneof(fc.constant(NaN), fc.integer({ min: 0, max: 40 })),
          fc.oneof(fc.constant(NaN), fc.integer({ min: 0, max: 5 })),
          fc.oneof(fc.constant(NaN), fc.integer({ min: 0, max: 4 })),
          fc.integer({ min: 0, max: 1000 }),
        ),
        { minLength: 20, maxLength: 80 },
      ),
      (rows) => {
        const dataset = regression(
          [
            numeric("years", rows.map((r) => r[0])),
            levels("level", rows.map((r) => r[1]), 6, "ordinal"),
            levels("family", rows.map((r) => r[2]), 5),
          ],
          rows.map((r) => r[3]),
        );
        const tree = growTree({ dataset, bins: binFeatures(dataset) }, { minLeaf: 1 });
        checkProperty(tree, dataset.features, 50);
      },
    ),
    { numRuns: 60, seed: 7 },
  );
});

Deno.test("the demo company's reference tree: merged paths keep the property and never repeat an attribute", async () => {
  const { model } = await demoModel();
  const tree = model.reference.tree;
  checkProperty(tree, model.features, 1000);
  // Every person of the demo table: one condition per attribute, and the
  // raw steps all covered once.
  const rows = await readTableFileForModel(model, DEMO_PATH);
  let repeated = 0;
  for (let r = 0; r < 200; r++) {
    const profile = rowProfile(rows, r);
    const raw = explainPath(tree, model.features, profile);
    const merged = mergePath(tree, model.features, profile);
    const names = merged.map((c) => c.feature);
    assert.equal(new Set(names).size, names.length);
    assert.deepEqual(
      merged.flatMap((c) => c.steps).sort((a, b) => a - b),
      raw.map((_, i) => i + 1),
    );
    assert.equal(merged.at(-1)?.node, raw.at(-1)?.node);
    if (merged.length < raw.length) repeated++;
  }
  // The demo tree splits on one attribute more than once on some paths (level, years).
  assert.ok(repeated > 0, "no path of the demo tree repeats an attribute");
});
