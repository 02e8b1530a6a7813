// The shipped defaults are the ones the committed measurements chose
// (written by bench/prune_mode_experiment.ts).
import assert from "node:assert/strict";
import { DEFAULT_PRUNING } from "../../../mod.ts";

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
