// The gap decomposition's check (issue 17): 20 seeded invented tables of
// 2,000 people whose log pay is linear in level, years and site, with a
// planted effect of 0.06 for group Q, who sit in the lower levels
// (tests/lib/gap/_linear_gap.ts). Per table: the trees' explained parts
// beside pooled least squares (coefficient x difference of the groups'
// means), the unexplained part and whether its 95% interval covers 0.06.
// Run with the group-chance leaf size the decomposition uses (written to
// tests/results/gap_decomposition.json, which tests/lib/gap/decompose_gap_test.ts
// recomputes) and, with --leaves, with others beside it for
// bench/results/gap_decomposition.md.
// Run: deno run --allow-read --allow-write=tests/results,bench/results bench/gap_decomposition.ts [--leaves]
import { linearGapRun, PLANTED_EFFECT, summarise } from "../tests/lib/gap/_linear_gap.ts";
import { PROPENSITY_MIN_LEAF } from "../lib/gap/decompose_gap.ts";

const leaves = Deno.args.includes("--leaves")
  ? [5, PROPENSITY_MIN_LEAF, 60]
  : [PROPENSITY_MIN_LEAF];
const lines = [
  "# Gap decomposition on 20 planted tables",
  "",
  "Written by `deno run -A bench/gap_decomposition.ts --leaves` on " +
  new Date().toISOString().slice(0, 10) + ". Each table: 2,000 invented people, log pay linear " +
  `in level, years and site, group Q ${PLANTED_EFFECT} lower and concentrated in the lower levels ` +
  "(tests/lib/gap/_linear_gap.ts). 200 trees, leaves of 5 in the pay model.",
  "",
  "| leaves of the group-chance model | mean unexplained | its spread (sd) | intervals covering 0.06 | mean before correction | largest gap to least squares, any attribute | seconds |",
  "|---|---|---|---|---|---|---|",
];
for (const leaf of leaves) {
  const started = performance.now();
  const runs = [];
  for (let seed = 1; seed <= 20; seed++) runs.push(await linearGapRun(seed, 200, leaf));
  const summary = summarise(runs);
  const seconds = (performance.now() - started) / 1000;
  lines.push(
    `| ${leaf} | ${summary.meanUnexplained.toFixed(4)} | ${summary.sdUnexplained.toFixed(4)} | ` +
      `${summary.covered} of 20 | ${summary.meanPlugIn.toFixed(4)} | ${
        summary.largestLinearGap.toFixed(4)
      } | ${seconds.toFixed(0)} |`,
  );
  console.log(lines.at(-1));
  if (leaf === PROPENSITY_MIN_LEAF) {
    await Deno.writeTextFile(
      "tests/results/gap_decomposition.json",
      JSON.stringify({ ...summary, runs }, null, 2) + "\n",
    );
  }
}
if (leaves.length > 1) {
  await Deno.writeTextFile("bench/results/gap_decomposition.md", lines.join("\n") + "\n");
}
