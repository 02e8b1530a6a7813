// paygrove's side of bench/speed_goals.py's tree row: one fully grown tree
// (minimum leaf 1) on CPS1988 or the generated table, warm: the median of 5
// fits after 10 unmeasured ones. (After 2, as this script first did, a
// CPS1988 tree took 17-60 ms from run to run: the runtime was still
// compiling the builder's loops. It settles by the eighth fit.) Prints one
// JSON line.
// Usage: deno run --allow-read bench/one_tree_timing.ts cps1988|generated [ROWS]
import { binFeatures, canonicalRowOrder, growTree } from "../mod.ts";
import { benchmarkDataset } from "./forest_timing.ts";

const [name = "cps1988", rowsArg = "100000"] = Deno.args;
const dataset = await benchmarkDataset(name as "cps1988" | "generated", Number(rowsArg));
const bins = binFeatures(dataset);
const order = canonicalRowOrder(dataset);
const grow = () => growTree({ dataset, bins, order }, { minLeaf: 1, minSplit: 2 });
for (let i = 0; i < 10; i++) grow();
const times: number[] = [];
let leaves = 0;
for (let i = 0; i < 5; i++) {
  const start = performance.now();
  const tree = grow();
  times.push(performance.now() - start);
  leaves = tree.nodeCount;
}
times.sort((a, b) => a - b);
console.log(
  JSON.stringify({
    program: "paygrove",
    table: name,
    rows: dataset.rows,
    ms: times[2],
    nodes: leaves,
  }),
);
