// What an HTML report costs: for each report kind on the demo, the wall
// time of the command with --report FILE.html and without it, run by run
// alternately (medians of 5), and the file's size; and, in this process,
// the time to build each page once the modules are loaded. Usage:
//   deno run -A bench/html_reports.ts [runs]
//   deno run -A bench/html_reports.ts [runs] [kinds, comma-separated]
// (writes bench/results/html_reports.md, or with kinds prints their rows only)
const runs = Number(Deno.args[0] ?? 5);
const only = Deno.args[1]?.split(",");
const root = new URL("../", import.meta.url).pathname;
const dir = await Deno.makeTempDir({ prefix: "paygrove-html-bench-" });
const demo = `${root}fixtures/demo_company.csv`;
const model = `${dir}/demo.model.json`;

async function paygrove(args: string[]): Promise<number> {
  const started = performance.now();
  const out = await new Deno.Command("deno", {
    args: ["run", "-A", "--no-prompt", `${root}tui/main.ts`, ...args],
    stdout: "null",
    stderr: "piped",
  }).output();
  if (out.code !== 0) throw new Error(new TextDecoder().decode(out.stderr));
  return performance.now() - started;
}

await paygrove(["fit", demo, "--target", "base_pay_eur", "--currency", "EUR", "--out", model]);
const profile = ["--set", "level=G4", "--set", "job_family=Sales"];
const kinds: [string, string[]][] = [
  ["fit", [
    "fit",
    demo,
    "--target",
    "base_pay_eur",
    "--currency",
    "EUR",
    "--out",
    `${dir}/f.json`,
    "--force",
  ]],
  ["estimate", ["estimate", model, ...profile, "--offer", "70k"]],
  ["compare", ["compare", model, ...profile, "--change", "level=+1"]],
  ["sweep", ["sweep", model, ...profile, "--vary", "years_experience"]],
  ["bands", ["bands", model, "--table", demo, "--by", "level,site"]],
  ["gap", ["gap", demo, "--target", "base_pay_eur", "--group", "gender", "--within", "level"]],
  ["review", ["review", demo, "--target", "base_pay_eur", "--within", "level"]],
];
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const lines = [
  "# What an HTML report costs (bench/html_reports.ts)",
  "",
  `${runs} runs of each command with and without \`--report FILE.html\`, alternately, on the demo ` +
  "(2,000 rows; the model of `fit` with default settings); wall time of the whole command; " +
  `the report's size. ${
    new Date().toISOString().slice(0, 10)
  }, ${navigator.hardwareConcurrency} cores.`,
  "",
  "| report | without | with | added | size |",
  "| --- | ---: | ---: | ---: | ---: |",
];
for (const [kind, args] of kinds) {
  if (only !== undefined && !only.includes(kind)) continue;
  const without: number[] = [];
  const withReport: number[] = [];
  const report = `${dir}/${kind}.html`;
  for (let i = 0; i < runs; i++) {
    without.push(await paygrove(args));
    withReport.push(await paygrove([...args, "--report", report, "--force"]));
  }
  const size = (await Deno.stat(report)).size;
  const a = median(without);
  const b = median(withReport);
  lines.push(
    `| ${kind} | ${(a / 1000).toFixed(2)} s | ${(b / 1000).toFixed(2)} s | ` +
      `${Math.round(b - a)} ms | ${(size / 1024).toFixed(0)} KB |`,
  );
  console.log(lines[lines.length - 1]);
}
lines.push(
  "",
  "The added time is the difference of two medians of whole runs, so it carries their noise " +
    "(a few tens of milliseconds either way); most of it is loading the chart library, which " +
    "only a run with a report does.",
);
if (only === undefined) {
  const path = `${root}bench/results/html_reports.md`;
  await Deno.writeTextFile(path, lines.join("\n") + "\n");
  await new Deno.Command("deno", { args: ["fmt", "-q", path] }).output();
}
await Deno.remove(dir, { recursive: true });
