import { fitModel, loadTableFile } from "../mod.ts";
const table = await loadTableFile("fixtures/cps1988.csv", { target: "wage" });
let t = performance.now();
const model = await fitModel(table, {
  target: "wage",
  onProgress: (s, d, n) => {
    if (d === n || d === 0) {
      console.log(s, d, n, ((performance.now() - t) / 1000).toFixed(2));
      t = performance.now();
    }
  },
});
console.log(JSON.stringify(model.quality.constant));
