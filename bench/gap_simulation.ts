// The gap check's simulation (issue 7): 20 seeded invented tables of six
// job families of 300 people, group Q concentrated in the lower levels, a
// planted unexplained gap of 6% in one family (tests/lib/gap/_gap_sim.ts).
// Counts how often the planted family is flagged, how often the others are,
// how often the interval covers 6%, and the bias of the adjusted gap and of
// the simple residual difference. Writes tests/results/gap_sim.json, which
// tests/lib/gap/gap_check_test.ts recomputes and compares.
// Run: deno run --allow-read --allow-write=tests/results bench/gap_simulation.ts
import { runGapSimulation } from "../tests/lib/gap/_gap_sim.ts";

const started = performance.now();
const summary = await runGapSimulation(20);
await Deno.writeTextFile("tests/results/gap_sim.json", JSON.stringify(summary, null, 2) + "\n");
const { perRun: _, ...figures } = summary;
console.log(JSON.stringify(figures, null, 2));
console.log(`${((performance.now() - started) / 1000).toFixed(1)} s`);
