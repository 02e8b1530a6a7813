// Model file size and load time (deno task bench): the default 200-tree
// model of CPS1988 (log weekly wage) and the same with unpruned trees
// (--prune none). Targets: under 300 ms to load and under 20 MB.
import { fitModel, loadTableFile, modelFromText, modelToText } from "../mod.ts";

const table = await loadTableFile(new URL("../fixtures/cps1988.csv", import.meta.url).pathname, {
  target: "wage",
  currency: "USD",
  periods: { wage: "week" },
});
const texts: Record<string, string> = {};
for (const prune of ["alpha-min", "none"] as const) {
  const model = await fitModel(table, { target: "wage", prune, workers: 2 });
  texts[prune] = modelToText(model);
  console.log(
    `CPS1988, 200 trees, ${prune === "none" ? "unpruned" : "pruned at the minimum-CV alpha"}: ` +
      `${(new TextEncoder().encode(texts[prune]).length / 1e6).toFixed(1)} MB, fitted in ` +
      `${model.seconds.toFixed(1)} s`,
  );
}

Deno.bench("load and check the default CPS1988 model (200 pruned trees)", () => {
  modelFromText(texts["alpha-min"], "cps.json");
});
Deno.bench("load and check the unpruned CPS1988 model (200 trees)", { n: 5, warmup: 1 }, () => {
  modelFromText(texts["none"], "cps-unpruned.json");
});
