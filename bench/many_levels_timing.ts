// Whole commands on tables with one text column of many levels, as a user
// runs them: `fit` (defaults: 200 trees, 10 folds) on three tables whose
// `team` column has about 2,000, 8,600 and 43,000 levels, and `review` on one
// whose `team` has 1,000 levels (used as a feature). Prints the seconds, the
// peak resident memory (GNU time) and the exit status of each run.
// Usage: deno run -A bench/many_levels_timing.ts [ROOT]   (ROOT: a paygrove
// checkout to time, default this one; results in bench/results/many_levels.txt)
const root = Deno.args[0] ?? new URL("..", import.meta.url).pathname;
const dir = await Deno.makeTempDir({ prefix: "paygrove-levels-bench-" });

// mulberry32: a small seeded generator, so the tables are the same every run.
function generator(seed: number): () => number {
  let s = seed;
  return () => {
    s = (s + 0x6d2b79f5) | 0;
    let t = Math.imul(s ^ (s >>> 15), 1 | s);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

async function table(rows: number, levels: number): Promise<string> {
  const rnd = generator(12345);
  const lines = ["id,level,years,team,pay"];
  for (let i = 0; i < rows; i++) {
    const level = 1 + Math.floor(rnd() * 7);
    const years = Math.round(rnd() * 300) / 10;
    const team = Math.floor(rnd() * levels);
    const pay = Math.round(
      30000 + level * 12000 + years * 800 + rnd() * 8000 + (team % 7) * 1000,
    );
    lines.push(`E${i},G${level},${years},T${team},${pay}`);
  }
  const path = `${dir}/teams_${rows}_${levels}.csv`;
  await Deno.writeTextFile(path, lines.join("\n") + "\n");
  return path;
}

async function timed(label: string, args: string[]): Promise<void> {
  const out = await new Deno.Command("/usr/bin/time", {
    // At most 300 s a run (GNU timeout; status 124 when it is reached).
    args: [
      "-f",
      "%e %M",
      "timeout",
      "300",
      Deno.execPath(),
      "run",
      "--no-prompt",
      "-A",
      "tui/main.ts",
      ...args,
    ],
    cwd: root,
    stdout: "null",
    stderr: "piped",
    env: { NO_COLOR: "1" },
  }).output();
  const lines = new TextDecoder().decode(out.stderr).trim().split("\n");
  const [seconds, kib] = lines.at(-1)!.split(" ").map(Number);
  console.log(
    `${label.padEnd(44)} ${seconds.toFixed(1).padStart(6)} s  peak ${
      Math.round(kib / 1024).toString().padStart(5)
    } MiB  status ${out.code}`,
  );
}

for (const [rows, levels] of [[10000, 2000], [20000, 10000], [100000, 50000]]) {
  const path = await table(rows, levels);
  await timed(`fit ${rows} rows, team drawn from ${levels} names`, [
    "fit",
    path,
    "--target",
    "pay",
    "--out",
    `${dir}/m.json`,
    "--force",
  ]);
}
const thousand = await table(20000, 1000);
await timed("review 20000 rows, team of 1000 levels", ["review", thousand, "--target", "pay"]);
await Deno.remove(dir, { recursive: true });
