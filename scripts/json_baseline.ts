// The JSON of every command on the demo table and on CPS1988 (AER's open
// survey table, fixtures/cps1988.csv), kept as a baseline for changes that
// must not change any figure (a redesign, a speed-up).
//
//   deno run -A scripts/json_baseline.ts --write   capture into tests/baseline/ (gzip)
//   deno run -A scripts/json_baseline.ts           capture again and compare
//
// Every run is in-process (the same `run` the CLI calls), in a scratch folder
// so that paths are relative and the same on every machine. The comparison
// masks what changes on every run (`seconds`, timestamps, the model file's
// SHA-256 and checksum), allows note codes that are new (an object's field
// `code`/`kind` in a list of notes present now and absent before), and asks
// every other value to be equal: strings exactly, numbers to a relative
// 1e-9 (another processor of the same kind may round a last digit
// differently; a changed figure differs far more). It ends with status 1 and
// the paths of the values that differ when any do.
import { run } from "../tui/main.ts";
import { recordingTerminal } from "../tui/terminal.ts";

const root = new URL("../", import.meta.url).pathname;
const baselineDir = `${root}tests/baseline`;
const write = Deno.args.includes("--write");
const only = Deno.args.find((a) => !a.startsWith("--"));

/** One command whose JSON is kept: its name (the file) and its arguments. */
interface Case {
  name: string;
  args: string[];
}

const DEMO = "fixtures/demo_company.csv";
const CPS = "fixtures/cps1988.csv";

const CASES: Case[] = [
  { name: "demo-schema", args: ["schema", DEMO, "--json"] },
  {
    name: "demo-fit",
    args: ["fit", DEMO, "--target", "base_pay_eur", "--out", "demo.model", "--json"],
  },
  {
    name: "demo-fit-class",
    args: [
      "fit",
      DEMO,
      "--target",
      "job_family",
      "--trees",
      "50",
      "--out",
      "class.model",
      "--json",
    ],
  },
  {
    name: "demo-fit-unpruned",
    args: [
      "fit",
      DEMO,
      "--target",
      "base_pay_eur",
      "--prune",
      "none",
      "--trees",
      "40",
      "--out",
      "unpruned.model",
      "--json",
    ],
  },
  {
    name: "demo-fit-tree-only",
    args: [
      "fit",
      DEMO,
      "--target",
      "base_pay_eur",
      "--trees",
      "0",
      "--out",
      "tree.model",
      "--json",
    ],
  },
  {
    name: "demo-estimate-unpruned",
    args: ["estimate", "unpruned.model", "--set", "level=G5", "--json"],
  },
  {
    name: "demo-estimate-tree-only",
    args: ["estimate", "tree.model", "--set", "level=G5", "--json"],
  },
  { name: "demo-estimate", args: ["estimate", "demo.model", "--json"] },
  {
    name: "demo-estimate-offer",
    args: [
      "estimate",
      "demo.model",
      "--set",
      "job_family=Engineering",
      "--set",
      "level=G3",
      "--set",
      "years_experience=8",
      "--offer",
      "61k",
      "--json",
    ],
  },
  { name: "demo-estimate-class", args: ["estimate", "class.model", "--set", "level=G5", "--json"] },
  { name: "demo-compare", args: ["compare", "demo.model", "--change", "level=+1", "--json"] },
  {
    name: "demo-sweep-years",
    args: ["sweep", "demo.model", "--vary", "years_experience", "--json"],
  },
  {
    name: "demo-sweep-level",
    args: ["sweep", "demo.model", "--vary", "level", "--table", DEMO, "--average", "--json"],
  },
  { name: "demo-batch", args: ["batch", "demo.model", DEMO, "--json"] },
  { name: "demo-inspect", args: ["inspect", "demo.model", "--json"] },
  { name: "demo-inspect-class", args: ["inspect", "class.model", "--json"] },
  {
    name: "demo-gap",
    args: [
      "gap",
      DEMO,
      "--target",
      "base_pay_eur",
      "--group",
      "gender",
      "--within",
      "job_family",
      "--json",
    ],
  },
  { name: "demo-review", args: ["review", DEMO, "--target", "base_pay_eur", "--json"] },
  { name: "cps-schema", args: ["schema", CPS, "--json"] },
  { name: "cps-fit", args: ["fit", CPS, "--target", "wage", "--out", "cps.model", "--json"] },
  { name: "cps-estimate", args: ["estimate", "cps.model", "--set", "education=16", "--json"] },
  { name: "cps-compare", args: ["compare", "cps.model", "--change", "education=16", "--json"] },
  { name: "cps-sweep", args: ["sweep", "cps.model", "--vary", "experience", "--json"] },
  { name: "cps-inspect", args: ["inspect", "cps.model", "--json"] },
  {
    name: "cps-gap",
    args: ["gap", CPS, "--target", "wage", "--group", "ethnicity", "--within", "region", "--json"],
  },
  { name: "cps-review", args: ["review", CPS, "--target", "wage", "--json"] },
];

async function capture(work: string, args: string[]): Promise<unknown> {
  const terminal = recordingTerminal(100);
  const cwd = Deno.cwd();
  Deno.chdir(work);
  try {
    const status = await run(args, terminal);
    if (status !== 0) {
      throw new Error(
        `paygrove ${args.join(" ")} ended with ${status}: ${terminal.stderr.join("")}`,
      );
    }
  } finally {
    Deno.chdir(cwd);
  }
  return JSON.parse(terminal.stdout.join(""));
}

/** Fields that change on every run, by name. */
const MASKED = new Set([
  "seconds",
  "created",
  "createdAt",
  "timestamp",
  "sha256",
  "checksum",
  "modelSha256",
  "bytes", // the model file's size: its timestamp's digits vary
]);

/** Fields that carry notes as data beside their words: new ones are allowed. */
const NOTE_CODES = new Set(["code", "kind", "noteCodes", "warningCodes", "reasonCodes"]);

/** The paths where `now` differs from `before`, masked fields and new note codes aside. */
export function differences(
  before: unknown,
  now: unknown,
  path = "$",
  out: string[] = [],
): string[] {
  if (out.length >= 50) return out;
  if (typeof before === "number" && typeof now === "number") {
    const scale = Math.max(Math.abs(before), Math.abs(now));
    if (!(before === now || Math.abs(before - now) <= 1e-9 * scale)) {
      out.push(`${path}: ${before} -> ${now}`);
    }
    return out;
  }
  if (Array.isArray(before) && Array.isArray(now)) {
    // A list of notes may gain entries with codes that are new.
    const kept = now.filter((item, i) => i < before.length || !isNote(item));
    if (kept.length !== before.length) {
      out.push(`${path}: ${before.length} items -> ${now.length}`);
      return out;
    }
    for (let i = 0; i < before.length; i++) differences(before[i], now[i], `${path}[${i}]`, out);
    return out;
  }
  if (isObject(before) && isObject(now)) {
    for (const key of Object.keys(before)) {
      if (MASKED.has(key)) continue;
      if (!(key in now)) out.push(`${path}.${key}: gone`);
      else differences(before[key], now[key], `${path}.${key}`, out);
    }
    for (const key of Object.keys(now)) {
      // A new field is allowed when it is a note's code (typed notes added).
      if (!(key in before) && !MASKED.has(key) && !NOTE_CODES.has(key)) {
        out.push(`${path}.${key}: new`);
      }
    }
    return out;
  }
  if (before !== now) out.push(`${path}: ${JSON.stringify(before)} -> ${JSON.stringify(now)}`);
  return out;
}

/** Gzip-compressed text (the review of 28,155 people is 6.7 MB as text, ~10% of it compressed). */
async function gzip(text: string): Promise<Uint8Array> {
  const stream = new Blob([text]).stream().pipeThrough(new CompressionStream("gzip"));
  return new Uint8Array(await new Response(stream).arrayBuffer());
}

async function gunzip(bytes: Uint8Array<ArrayBuffer>): Promise<string> {
  const stream = new Blob([bytes]).stream().pipeThrough(new DecompressionStream("gzip"));
  return await new Response(stream).text();
}

function isObject(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}

function isNote(value: unknown): boolean {
  return isObject(value) && ("code" in value || "kind" in value);
}

if (import.meta.main) {
  const work = await Deno.makeTempDir({ prefix: "paygrove-baseline-" });
  await Deno.symlink(`${root}fixtures`, `${work}/fixtures`);
  await Deno.mkdir(baselineDir, { recursive: true });
  let failed = 0;
  for (const c of CASES) {
    if (only && !c.name.startsWith(only)) continue;
    const started = performance.now();
    const json = await capture(work, c.args);
    const seconds = ((performance.now() - started) / 1000).toFixed(1);
    const file = `${baselineDir}/${c.name}.json.gz`;
    if (write) {
      await Deno.writeFile(file, await gzip(JSON.stringify(json, null, 1) + "\n"));
      console.log(`wrote ${c.name} (${seconds} s)`);
      continue;
    }
    const before = JSON.parse(await gunzip(await Deno.readFile(file)));
    const found = differences(before, json);
    if (found.length === 0) console.log(`same   ${c.name} (${seconds} s)`);
    else {
      failed++;
      console.log(`DIFFER ${c.name}:\n  ${found.join("\n  ")}`);
    }
  }
  await Deno.remove(work, { recursive: true });
  if (failed > 0) {
    console.log(`${failed} command(s) differ from the baseline`);
    Deno.exit(1);
  }
}
