// The shipped defaults are the ones the committed measurements chose
// (written by bench/prune_mode_experiment.ts and bench/how_sure_experiment.ts).
import assert from "node:assert/strict";
import { DEFAULT_HOW_SURE, DEFAULT_INCREASING, DEFAULT_PRUNING } from "../../../mod.ts";
import { WORKERS_FROM_ROW_TREES } from "../../../lib/ensemble/defaults.ts";

Deno.test("the default pruning has the lowest held-out RMSE over CPS1988 and the demo table", async () => {
  const read = async (name: string) =>
    JSON.parse(
      await Deno.readTextFile(new URL(`../../results/prune_modes_${name}.json`, import.meta.url)),
    ) as { results: { mode: string; heldOutRmse: number }[] };
  const tables = [await read("cps1988"), await read("demo")];
  // Each mode's held-out RMSE relative to the best mode on the same table,
  // averaged over the tables (so neither table's scale dominates).
  const modes = tables[0].results.map((r) => r.mode);
  const excess = (mode: string) =>
    tables.reduce((sum, t) => {
      const best = Math.min(...t.results.map((r) => r.heldOutRmse));
      return sum + t.results.find((r) => r.mode === mode)!.heldOutRmse / best - 1;
    }, 0) / tables.length;
  const chosen = modes.reduce((a, b) => (excess(b) < excess(a) ? b : a));
  const shipped = DEFAULT_PRUNING.mode === "alpha"
    ? `alpha-${DEFAULT_PRUNING.alphaRule === "min" ? "min" : "one-se"}`
    : DEFAULT_PRUNING.mode;
  assert.equal(shipped, chosen);
  // On CPS1988 pruning pays: every pruned mode beats unpruned bagging.
  const cps = tables[0].results;
  const none = cps.find((r) => r.mode === "none")!;
  for (const r of cps) {
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

Deno.test("the ladder is constrained by default only where the measurements allow it", async () => {
  const read = async (name: string) =>
    JSON.parse(
      await Deno.readTextFile(new URL(`../../results/increasing_${name}.json`, import.meta.url)),
    ) as {
      runs: { constrained: boolean; heldOutRmse: number; peopleWhoseEstimateFalls: number }[];
    };
  // The cost of the constraint, recomputed from the runs: mean held-out RMSE
  // constrained over unconstrained, minus 1.
  const cost = (doc: Awaited<ReturnType<typeof read>>) => {
    const mean = (c: boolean) => {
      const runs = doc.runs.filter((r) => r.constrained === c);
      return runs.reduce((a, r) => a + r.heldOutRmse, 0) / runs.length;
    };
    return mean(true) / mean(false) - 1;
  };
  const tables = [await read("demo"), await read("cps1988")];
  const allowed = tables.every((t) => cost(t) <= DEFAULT_INCREASING.maxCost);
  assert.equal(DEFAULT_INCREASING.ladder, allowed);
  // The constraint does what it claims on held-out people: no estimate falls.
  for (const t of tables) {
    for (const r of t.runs) if (r.constrained) assert.equal(r.peopleWhoseEstimateFalls, 0);
  }
});

Deno.test("WORKERS_FROM_ROW_TREES: workers from where two were no slower than one thread (bench/results/workers_by_rows.json)", async () => {
  const doc = JSON.parse(
    await Deno.readTextFile(
      new URL("../../../bench/results/workers_by_rows.json", import.meta.url),
    ),
  ) as { trees: number; results: { rows: number; oneThread: number; twoWorkers: number }[] };
  assert.equal(doc.trees, 200);
  for (const r of doc.results) {
    const ratio = r.twoWorkers / r.oneThread;
    if (r.rows * doc.trees >= WORKERS_FROM_ROW_TREES) {
      // Workers by default: at most level with one thread (timing noise 5%).
      assert(ratio <= 1.05, `${r.rows} rows: two workers ${ratio.toFixed(2)} x one thread`);
    } else {
      assert(
        ratio > 1,
        `${r.rows} rows: one thread by default, but workers took ${ratio.toFixed(2)} x`,
      );
    }
  }
  // Both sides of the line are measured.
  assert(doc.results.some((r) => r.rows * doc.trees < WORKERS_FROM_ROW_TREES));
  assert(doc.results.some((r) => r.rows * doc.trees >= WORKERS_FROM_ROW_TREES));
});
