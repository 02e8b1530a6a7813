// When do two fitting workers pay for themselves? The whole default fit
// (bench/fit_phases.ts, a fresh process per run) on one thread and on two
// workers, on the demo table and on the first 5,000, 10,000 and 20,000 rows
// of CPS1988 and the whole of it; medians of 3, the two settings
// alternating. Writes bench/results/workers_by_rows.md and .json; the default of
// lib/ensemble/defaults.ts (WORKERS_FROM_ROW_TREES) names that file, and
// tests/lib/ensemble/defaults_test.ts holds the two together.
//   deno run -A bench/workers_by_rows.ts
const root = new URL("../", import.meta.url).pathname;
const tables: [string, string, string, number][] = [
  ["demo (2,000 rows)", `${root}fixtures/demo_company.csv`, "base_pay_eur", 2000],
];
const cps = Deno.readTextFileSync(`${root}fixtures/cps1988.csv`).trimEnd().split("\n");
for (const rows of [5000, 10000, 20000]) {
  const path = await Deno.makeTempFile({ suffix: ".csv" });
  Deno.writeTextFileSync(path, cps.slice(0, rows + 1).join("\n") + "\n");
  tables.push([`CPS1988, first ${rows.toLocaleString("en")} rows`, path, "wage", rows]);
}
tables.push([
  `CPS1988 (${(cps.length - 1).toLocaleString("en")} rows)`,
  `${root}fixtures/cps1988.csv`,
  "wage",
  cps.length - 1,
]);

async function fitSeconds(path: string, target: string, workers: number): Promise<number> {
  const out = await new Deno.Command("deno", {
    args: ["run", "-A", `${root}bench/fit_phases.ts`, path, target],
    env: { WORKERS: String(workers) },
    stdout: "piped",
  }).output();
  return JSON.parse(new TextDecoder().decode(out.stdout)).seconds.total;
}
const median = (xs: number[]) => xs.sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const lines = [
  "# One thread or two workers for the whole default fit (bench/workers_by_rows.ts)",
  "",
  `${navigator.hardwareConcurrency} cores; seconds of fitModel after loading (200 trees), medians of 3, fresh process each.`,
  "",
  "| table | one thread | two workers | two / one |",
  "| --- | --- | --- | --- |",
];
const results: { table: string; rows: number; oneThread: number; twoWorkers: number }[] = [];
for (const [name, path, target, rows] of tables) {
  const one: number[] = [];
  const two: number[] = [];
  for (let k = 0; k < 3; k++) {
    one.push(await fitSeconds(path, target, 1));
    two.push(await fitSeconds(path, target, 2));
  }
  const [a, b] = [median(one), median(two)];
  results.push({ table: name, rows, oneThread: a, twoWorkers: b });
  lines.push(`| ${name} | ${a.toFixed(2)} | ${b.toFixed(2)} | ${(b / a).toFixed(2)} |`);
  console.log(lines.at(-1));
}
Deno.writeTextFileSync(`${root}bench/results/workers_by_rows.md`, lines.join("\n") + "\n");
Deno.writeTextFileSync(
  `${root}bench/results/workers_by_rows.json`,
  JSON.stringify(
    { command: "deno run -A bench/workers_by_rows.ts", trees: 200, results },
    null,
    2,
  ) + "\n",
);
