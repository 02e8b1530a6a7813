// The shipped defaults are the ones the committed measurements chose
// (written by bench/prune_mode_experiment.ts and bench/how_sure_experiment.ts).
import assert from "node:assert/strict";
import { DEFAULT_HOW_SURE, DEFAULT_PRUNING } from "../../../mod.ts";

Deno.test("the default pruning is the mode with the lowest held-out RMSE", async () => {
  const results = JSON.parse(
    await Deno.readTextFile(new URL("../../results/prune_modes_cps1988.json", import.meta.url)),
  );
  const best = results.results.reduce((
    a: { heldOutRmse: number },
    b: { heldOutRmse: number },
  ) => (b.heldOutRmse < a.heldOutRmse ? b : a));
  assert.equal(best.mode, results.chosen);
  const shipped = DEFAULT_PRUNING.mode === "alpha"
    ? `alpha-${DEFAULT_PRUNING.alphaRule === "min" ? "min" : "one-se"}`
    : DEFAULT_PRUNING.mode;
  assert.equal(shipped, results.chosen);
  // Pruning pays: every pruned mode beats unpruned bagging on held-out rows.
  const none = results.results.find((r: { mode: string }) => r.mode === "none");
  for (const r of results.results) {
    if (r.mode !== "none") assert.ok(r.heldOutRmse < none.heldOutRmse, r.mode);
  }
});

Deno.test("the default 'how sure' interval and jackknife cut-off are the ones the simulation chose", async () => {
  const doc = JSON.parse(
    await Deno.readTextFile(new URL("../../results/how_sure_sim.json", import.meta.url)),
  );
  type Row = { trees: number; ratio: number; percentileCover: number; clamped: number };
  const results: Row[] = doc.results;
  // Recomputed from the figures, not read from the file's own verdict.
  const atDefault = results.filter((r) => r.trees === 200);
  assert.ok(atDefault.length >= 6);
  assert.ok(atDefault.every((r) => r.percentileCover >= 0.87));
  assert.equal(DEFAULT_HOW_SURE.interval, "percentile");
  const ratios = [...new Set(results.map((r) => r.ratio))].filter((r) =>
    results.some((x) => x.ratio === r && x.trees !== 200)
  ).sort((a, b) => a - b);
  const stable = ratios.find((ratio) =>
    results.filter((r) => r.ratio >= ratio && ratios.includes(r.ratio)).every((r) =>
      r.clamped <= 0.01
    )
  );
  assert.equal(DEFAULT_HOW_SURE.jackknifeFromTreesPerRow, stable);
  assert.deepEqual(doc.chosen, {
    interval: DEFAULT_HOW_SURE.interval,
    jackknifeFromTreesPerRow: DEFAULT_HOW_SURE.jackknifeFromTreesPerRow,
  });
});
