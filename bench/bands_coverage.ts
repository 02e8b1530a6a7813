// Held-out coverage of the pay bands (issue 18): a seeded split stratified
// by cell (70% of each cell's people to fit the default model, 30% held
// out), then the band table of the held-out people, and the share of them
// inside their cell's band: at --coverage 0.8 (the default way) and with a
// fixed 40% spread, overall and per cell. Tables: the invented demo company
// at 20,000 rows (--by level) and CPS1988 (--by region). Writes
// bench/results/bands_coverage.md.
// Run: deno run -A bench/bands_coverage.ts
import {
  bandTable,
  demoCompanyCsv,
  fitModel,
  loadTable,
  makeRng,
  openModel,
  readForModel,
  shuffle,
} from "../mod.ts";

interface Case {
  name: string;
  csv: string;
  target: string;
  by: string;
}

const cases: Case[] = [
  {
    name: "demo company, 20,000 rows",
    csv: demoCompanyCsv({ rows: 20000, seed: 11 }),
    target: "base_pay_eur",
    by: "level",
  },
  {
    name: "CPS1988 (28,155 rows)",
    csv: await Deno.readTextFile(new URL("../fixtures/cps1988.csv", import.meta.url)),
    target: "wage",
    by: "region",
  },
];

// The 70/30 split, stratified by the cell column's text, seeded.
function split(csv: string, by: string): { fit: string; held: string } {
  const lines = csv.trim().split("\n");
  const header = lines[0];
  const at = header.split(",").indexOf(by);
  const cells = new Map<string, string[]>();
  for (const line of lines.slice(1)) {
    const key = line.split(",")[at];
    cells.set(key, [...(cells.get(key) ?? []), line]);
  }
  const rng = makeRng(20261203);
  const fit = [header];
  const held = [header];
  for (const key of [...cells.keys()].sort()) {
    const members = shuffle([...cells.get(key)!], rng);
    const cut = Math.round(0.7 * members.length);
    fit.push(...members.slice(0, cut));
    held.push(...members.slice(cut));
  }
  return { fit: fit.join("\n") + "\n", held: held.join("\n") + "\n" };
}

const out = [
  "# Held-out coverage of the pay bands",
  "",
  `Written by \`deno run -A bench/bands_coverage.ts\` on ${
    new Date().toISOString().slice(0, 10)
  }: ` +
  "70% of each cell's people (seeded) fit the default model, the other 30% are banded and " +
  "counted inside or outside their cell's band.",
  "",
];
for (const c of cases) {
  const { fit, held } = split(c.csv, c.by);
  const model = await fitModel(loadTable(fit, { target: c.target }), { target: c.target });
  const rows = readForModel(model, held, "held.csv");
  const feature = model.features.findIndex((f) => f.name === c.by);
  out.push(
    `## ${c.name}, --by ${c.by}`,
    "",
    "| way | overall | per cell (held-out people: share inside) |",
    "| --- | ---: | --- |",
  );
  for (
    const [way, options] of [["--coverage 0.8", { coverage: 0.8 }], ["--spread 40%", {
      spread: 0.4,
    }]] as const
  ) {
    const table = bandTable(openModel(model), rows, { by: [c.by], ...options });
    let inside = 0;
    let total = 0;
    const per: string[] = [];
    for (const cell of table.cells) {
      if (cell.suppressed) continue;
      let n = 0;
      let ins = 0;
      for (let r = 0; r < rows.rows; r++) {
        if (model.features[feature].levels![rows.features[feature][r]] !== cell.key[0]) continue;
        n++;
        const pay = rows.target![r];
        if (pay >= cell.band.min && pay <= cell.band.max) ins++;
      }
      inside += ins;
      total += n;
      per.push(`${cell.key[0]} ${n}: ${(100 * ins / n).toFixed(1)}%`);
    }
    out.push(`| ${way} | ${(100 * inside / total).toFixed(1)}% | ${per.join("; ")} |`);
    console.log(c.name, way, (inside / total).toFixed(3), per.join("; "));
  }
  out.push("");
}
await Deno.writeTextFile(new URL("./results/bands_coverage.md", import.meta.url), out.join("\n"));
