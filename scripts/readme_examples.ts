// Recaptures the command examples in README.md from real runs: every code
// block whose lines start with "$ deno task paygrove" or "$ paygrove" is run
// in-process (the same `run` the CLI calls), in order, in a scratch folder
// that holds the candidates table the README shows (the README's own fit
// example writes the model the later examples read), and the block's output
// is replaced by what the run printed. The
// width is the block's own: 80 columns where its old output fits 80, else
// 100. A block whose old output ended in "..." keeps as many lines before it;
// one that left out the closing cautions and provenance leaves them out.
// Screens of the guided flow and of explore are captured in tmux by hand and left alone.
//
// Run: deno run -A scripts/readme_examples.ts [--check]
// With --check it only reports the blocks whose output would change.
import { run } from "../tui/main.ts";
import { recordingTerminal } from "../tui/terminal.ts";

const root = new URL("../", import.meta.url).pathname;
const readmePath = `${root}README.md`;
const check = Deno.args.includes("--check");

const work = await Deno.makeTempDir({ prefix: "paygrove-readme-" });
await Deno.symlink(`${root}fixtures`, `${work}/fixtures`);
const readme = await Deno.readTextFile(readmePath);

// The candidates table is the one the README shows after `$ cat`.
const candidates = /\$ cat candidates\.csv\n([\s\S]*?)\n\$ /.exec(readme);
if (candidates) await Deno.writeTextFile(`${work}/candidates.csv`, candidates[1] + "\n");

function argsOf(command: string): string[] {
  const words: string[] = [];
  const pattern = /"([^"]*)"|'([^']*)'|(\S+)/g;
  for (const m of command.matchAll(pattern)) words.push(m[1] ?? m[2] ?? m[3]);
  const start = words[0] === "deno" ? 3 : 1; // "deno task paygrove" or "paygrove"
  return words.slice(start);
}

// The exit status of the last command run (for a `$ echo $?` line).
let lastStatus = 0;

async function capture(args: string[], width: number): Promise<string[]> {
  const terminal = recordingTerminal(width);
  const cwd = Deno.cwd();
  Deno.chdir(work);
  try {
    const status = await run(args, terminal);
    lastStatus = status;
    // 3 is batch's documented "some rows refused".
    if (status !== 0 && status !== 3) {
      throw new Error(
        `paygrove ${args.join(" ")} ended with ${status}: ${terminal.stderr.join("")}`,
      );
    }
  } finally {
    Deno.chdir(cwd);
  }
  // A command whose answer goes to a file shows what it said on stderr.
  const stdout = terminal.stdout.join("");
  const shown = stdout !== "" ? stdout : terminal.stderr.join("");
  return shown.replace(/\n$/, "").split("\n");
}

// `$ echo $?` and `$ cat FILE` after a command: the status and the file it wrote.
async function shellLine(command: string): Promise<string[] | null> {
  if (command === "echo $?") return [String(lastStatus)];
  const cat = /^cat (\S+)$/.exec(command);
  if (cat) {
    try {
      return (await Deno.readTextFile(`${work}/${cat[1]}`)).replace(/\n$/, "").split("\n");
    } catch {
      return null; // a file the README made by hand (candidates.csv is kept as it is)
    }
  }
  return null;
}

const lines = readme.split("\n");
const out: string[] = [];
let changed = 0;
for (let i = 0; i < lines.length; i++) {
  const line = lines[i];
  // The explore screen needs a terminal: captured in tmux by hand, as the flow's are.
  if (/^\$ (deno task )?paygrove explore /.test(line)) {
    out.push(line);
    continue;
  }
  if (!/^\$ (deno task )?paygrove /.test(line)) {
    out.push(line);
    const shell = /^\$ (.*)$/.exec(line);
    const fresh = shell && !shell[1].startsWith("cat candidates")
      ? await shellLine(shell[1])
      : null;
    if (fresh !== null) {
      const old: string[] = [];
      while (i + 1 < lines.length && lines[i + 1] !== "```" && !lines[i + 1].startsWith("$ ")) {
        old.push(lines[++i]);
      }
      if (fresh.join("\n") !== old.join("\n")) {
        changed++;
        console.log(`${check ? "would change" : "recaptured"}: ${line.slice(2, 72)}`);
      }
      out.push(...fresh);
    }
    continue;
  }
  // The command, with its continuation lines.
  let command = line.slice(2);
  out.push(line);
  while (command.endsWith("\\")) {
    i++;
    out.push(lines[i]);
    command = command.slice(0, -1) + " " + lines[i].trim();
  }
  // The old output: up to the block's end or the next command.
  const old: string[] = [];
  while (i + 1 < lines.length && lines[i + 1] !== "```" && !lines[i + 1].startsWith("$ ")) {
    old.push(lines[++i]);
  }
  const truncated = old.length > 0 && old[old.length - 1] === "...";
  const kept = truncated ? old.length - 1 : Infinity;
  const width = old.every((l) => l.length <= 80) ? 80 : 100;
  let fresh = await capture(argsOf(command), width);
  // A block that showed the output without its closing cautions and
  // provenance (trimmed to keep the README short) stays trimmed.
  const cautions = fresh.findIndex((l) => l.startsWith("These figures describe"));
  if (cautions >= 0 && !old.some((l) => l.startsWith("These figures describe"))) {
    fresh = fresh.slice(0, cautions);
    while (fresh.length > 0 && fresh[fresh.length - 1] === "") fresh.pop();
  }
  if (fresh.length > kept) fresh = [...fresh.slice(0, kept), "..."];
  if (fresh.join("\n") !== old.join("\n")) {
    changed++;
    console.log(`${check ? "would change" : "recaptured"}: ${command.slice(0, 70)}`);
  }
  out.push(...fresh);
}
if (!check) await Deno.writeTextFile(readmePath, out.join("\n"));
console.log(`${changed} example(s) ${check ? "out of date" : "recaptured"}`);
await Deno.remove(work, { recursive: true });
