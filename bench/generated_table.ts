/**
 * A seeded, generated table for benchmarks: 6 numeric and 4 categorical
 * features (3, 5, 10 and 20 levels) and a pay-like target, with no missing
 * cells (so scikit-learn 1.2 takes it as it is). Invented; it stands for no
 * one. Run as a script it prints the CSV:
 * `deno run bench/generated_table.ts ROWS [SEED] > table.csv`.
 *
 * @module
 */

import { makeRng, randomInt } from "../lib/random.ts";

/** The levels of the four categorical columns. */
export const CATEGORY_SIZES = [3, 5, 10, 20] as const;

/** The table as CSV text with a header row; the target column is `pay`. */
export function generatedTableCsv(rows: number, seed = 1): string {
  const rng = makeRng(seed);
  const uniform = () => (randomInt(rng, 0, 2 ** 30 - 1) + 0.5) / 2 ** 30;
  const normal = () => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform());
  // Each category's pay effect, drawn once.
  const effects = CATEGORY_SIZES.map((size) => Array.from({ length: size }, () => 6000 * normal()));
  const header = ["x1", "x2", "x3", "x4", "x5", "x6", "c1", "c2", "c3", "c4", "pay"];
  const lines = [header.join(",")];
  for (let r = 0; r < rows; r++) {
    const x1 = 40 * uniform();
    const x2 = normal();
    const x3 = -Math.log(uniform()) * 3;
    const x4 = randomInt(rng, 0, 10);
    const x5 = uniform();
    const x6 = normal();
    const codes = CATEGORY_SIZES.map((size) => randomInt(rng, 0, size - 1));
    let pay = 52000 + 1500 * Math.min(x1, 25) + 4000 * x2 + 3000 * Math.sqrt(x3) + 800 * x4 +
      (x6 > 0.5 ? 5000 : 0) + 7000 * normal();
    for (let c = 0; c < codes.length; c++) pay += effects[c][codes[c]];
    lines.push(
      [
        x1.toFixed(2),
        x2.toFixed(3),
        x3.toFixed(3),
        x4,
        x5.toFixed(3),
        x6.toFixed(3),
        ...codes.map((code) => `k${String(code).padStart(2, "0")}`),
        pay.toFixed(2),
      ].join(","),
    );
  }
  return lines.join("\n") + "\n";
}

if (import.meta.main) {
  const rows = Number(Deno.args[0] ?? 100000);
  const seed = Number(Deno.args[1] ?? 1);
  await Deno.stdout.write(new TextEncoder().encode(generatedTableCsv(rows, seed)));
}
