// The explore screen's time from a key to a finished redraw, and the bytes
// each redraw writes, over 1,000 random keys (choose up or down, move left
// or right, a big move, undo, back to the start), on the demo model (200
// trees) and on a 500-tree CPS1988 model. The screen runs on in-memory
// streams; the time is from writing the key to the end of the redraw it
// caused (the key read, the what-if from the start, the frame, the
// changed lines written). Usage:
//   deno run -A bench/explore_latency.ts   (writes bench/results/explore_latency.md)
import { PassThrough } from "node:stream";
import { fitModel, loadTableFile, type Model, openModel, typicalProfile } from "../mod.ts";
import { exploreSession } from "../tui/explore/explore_loop.ts";
import { makeStyle } from "../tui/render/style.ts";
import { makeRng, randomBelow } from "../lib/random.ts";

const root = new URL("../", import.meta.url).pathname;
const KEYS = ["\x1b[A", "\x1b[B", "\x1b[C", "\x1b[D", "\x1b[1;2C", "\x1b[1;2D", "u", "r"];

async function measure(model: Model, moves: number): Promise<{ ms: number[]; bytes: number[] }> {
  const input = new PassThrough();
  const output = new PassThrough();
  let written = 0;
  output.on("data", (chunk) => (written += chunk.length));
  const done = exploreSession(
    { input, output, width: 80, height: 24, style: makeStyle(false), money: {}, ascii: true },
    openModel(model),
    typicalProfile(model),
  );
  const turn = () => new Promise((resolve) => setTimeout(resolve, 0));
  await turn();
  const rng = makeRng(7);
  const ms: number[] = [];
  const bytes: number[] = [];
  for (let i = 0; i < moves; i++) {
    const key = KEYS[randomBelow(rng, KEYS.length)];
    const before = written;
    const t = performance.now();
    input.write(key);
    await turn();
    ms.push(performance.now() - t);
    bytes.push(written - before);
  }
  input.write("q");
  await done;
  return { ms, bytes };
}

const quantile = (xs: number[], p: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor(p * s.length))];
};
const lines = [
  "# The explore screen's redraw time (bench/explore_latency.ts)",
  "",
  `1,000 random keys per model, 80 x 24, in memory; ${new Date().toISOString().slice(0, 10)}, ` +
  `${navigator.hardwareConcurrency} cores. The goal: under 16 ms at the 99th percentile (one frame).`,
  "",
  "| model | trees | median | 99th percentile | max | bytes per redraw (median, max) |",
  "| --- | ---: | ---: | ---: | ---: | ---: |",
];
const cases: [string, string, string, number][] = [
  ["demo", "fixtures/demo_company.csv", "base_pay_eur", 200],
  ["CPS1988", "fixtures/cps1988.csv", "wage", 500],
];
for (const [name, file, target, trees] of cases) {
  const table = await loadTableFile(`${root}${file}`, { target });
  const model = await fitModel(table, { target, trees, workers: 2 });
  await measure(model, 50); // warm
  const { ms, bytes } = await measure(model, 1000);
  const drawn = bytes.filter((b) => b > 0);
  lines.push(
    `| ${name} | ${trees} | ${quantile(ms, 0.5).toFixed(2)} ms | ${
      quantile(ms, 0.99).toFixed(2)
    } ms | ` +
      `${Math.max(...ms).toFixed(2)} ms | ${quantile(drawn, 0.5)}, ${Math.max(...drawn)} |`,
  );
  console.log(lines[lines.length - 1]);
}
const path = `${root}bench/results/explore_latency.md`;
await Deno.writeTextFile(path, lines.join("\n") + "\n");
await new Deno.Command("deno", { args: ["fmt", "-q", path] }).output();
