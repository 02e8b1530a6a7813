// Decides, by measurement on held-out rows, whether the estimate is
// constrained by default to never fall along the table's ordinal ladder
// (fit's --increasing). On the invented demo table (log base pay, the ladder
// `level`) and on CPS1988 (log weekly wage, `education` in years: not
// `experience`, whose effect on pay rises and then falls), 20% of rows are
// held out (seeded, as bench/prune_mode_experiment.ts), and on the other
// 80% the default recipe (reference tree's 10-fold CV, 200 trees pruned at
// its minimum-CV alpha) is fitted with and without the constraint, over
// three split seeds. Reported: held-out RMSE of the ensemble and of the
// reference tree, and how many held-out people's estimate falls somewhere
// when the constrained attribute is raised step by step (the others kept).
// Writes tests/results/increasing_demo.json or increasing_cps1988.json.
// Run: deno run --allow-read --allow-write=tests/results bench/increasing_experiment.ts demo|cps1988
import { applyValues, type Dataset, fitDefaultEnsemble, treeEstimates } from "../mod.ts";
import { cps1988LogWage, heldOutSplit } from "../tests/lib/_cps1988.ts";
import { demoLogPay } from "../tests/lib/_demo.ts";

const root = new URL("../", import.meta.url).pathname;
const table = Deno.args[0] ?? "demo";
if (table !== "cps1988" && table !== "demo") throw new Error("cps1988 or demo");
const data = table === "cps1988" ? await cps1988LogWage() : await demoLogPay();
const name = table === "cps1988" ? "education" : "level";
const f = data.features.findIndex((feature) => feature.name === name);
if (f < 0) throw new Error(`no ${name}`);
// The values the attribute is raised through: its distinct known values.
const steps = [...new Set(data.features[f].values.filter((v) => !Number.isNaN(v)))].sort((a, b) =>
  a - b
);

function heldOutFigures(
  fitted: Awaited<ReturnType<typeof fitDefaultEnsemble>>,
  test: Dataset,
) {
  let sse = 0;
  let treeSse = 0;
  let falls = 0;
  for (let r = 0; r < test.rows; r++) {
    const profile = test.features.map((feature) => feature.values[r]);
    const mean = (p: number[]) => {
      const estimates = treeEstimates(fitted.ensemble!, p);
      return estimates.reduce((a, b) => a + b, 0) / estimates.length;
    };
    sse += (test.target.values[r] - mean(profile)) ** 2;
    const tree = fitted.reference!.tree;
    treeSse += (test.target.values[r] - tree.value[applyValues(tree, profile)]) ** 2;
    let last = -Infinity;
    let fell = false;
    for (const v of steps) {
      const raised = [...profile];
      raised[f] = v;
      const estimate = mean(raised);
      if (estimate < last - 1e-12) fell = true;
      last = estimate;
    }
    if (fell) falls++;
  }
  return {
    heldOutRmse: Math.sqrt(sse / test.rows),
    referenceTreeRmse: Math.sqrt(treeSse / test.rows),
    peopleWhoseEstimateFalls: falls,
    heldOut: test.rows,
  };
}

const runs: (ReturnType<typeof heldOutFigures> & {
  splitSeed: number;
  constrained: boolean;
  seconds: number;
})[] = [];
for (const seed of [20261202, 20261203, 20261204]) {
  const { train, test } = heldOutSplit(data, seed);
  for (const constrained of [false, true]) {
    const started = performance.now();
    const fitted = await fitDefaultEnsemble(train, {
      trees: 200,
      seed: 7,
      workers: 2,
      grow: { minLeaf: 5, increasing: constrained ? [f] : [] },
    });
    const run = {
      splitSeed: seed,
      constrained,
      ...heldOutFigures(fitted, test),
      seconds: (performance.now() - started) / 1000,
    };
    runs.push(run);
    console.log(run);
  }
}
const mean = (constrained: boolean, key: "heldOutRmse" | "referenceTreeRmse") => {
  const mine = runs.filter((r) => r.constrained === constrained);
  return mine.reduce((a, r) => a + r[key], 0) / mine.length;
};
const doc = {
  data: table === "cps1988"
    ? "CPS1988 (AER), log weekly wage; 80% train / 20% held out, split seeds 20261202-4"
    : "invented demo table (fixtures/demo_company.csv), log base pay; 80% / 20%, split seeds 20261202-4",
  attribute: name,
  trees: 200,
  runs,
  meanHeldOutRmse: {
    unconstrained: mean(false, "heldOutRmse"),
    constrained: mean(true, "heldOutRmse"),
  },
  meanReferenceTreeRmse: {
    unconstrained: mean(false, "referenceTreeRmse"),
    constrained: mean(true, "referenceTreeRmse"),
  },
  rule:
    "constrain by default when the mean held-out RMSE of the ensemble is no worse than 1% above " +
    "the unconstrained one's",
};
await Deno.writeTextFile(
  `${root}tests/results/increasing_${table}.json`,
  JSON.stringify(doc, null, 2) + "\n",
);
console.log(doc.meanHeldOutRmse, doc.meanReferenceTreeRmse);
