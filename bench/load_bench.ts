// Loading a generated table of 1,000,000 rows x 10 features (6 numeric, 4
// categorical with 3-20 levels, seeded; bench/generated_table.ts) through
// the streaming reader, in 64 KiB chunks as a file arrives (deno task
// bench). Target: under 10 s and under 1 GB peak resident memory; the peak
// and the comparison with scikit-learn's side come from
// bench/scale_vs_sklearn.py (bench/results/scale.txt).
import { loadTableChunks } from "../mod.ts";
import { generatedTableCsv } from "./generated_table.ts";

const bytes = new TextEncoder().encode(generatedTableCsv(1_000_000, 1));
const CHUNK = 65536;

async function* chunks(): AsyncGenerator<Uint8Array> {
  for (let i = 0; i < bytes.length; i += CHUNK) yield bytes.subarray(i, i + CHUNK);
}

Deno.bench("load 1,000,000 rows x 11 columns (58 MB of CSV)", { n: 3, warmup: 0 }, async () => {
  const table = await loadTableChunks(chunks(), { target: "pay", file: "generated.csv" });
  if (table.rows !== 1_000_000) throw new Error(`loaded ${table.rows} rows`);
});
