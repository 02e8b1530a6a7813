/**
 * Runs the real `paygrove` command as a subprocess, with exactly the Deno
 * permissions of the `paygrove` task in deno.json.
 *
 * @module
 */

const root = new URL("../../", import.meta.url).pathname;
const config = JSON.parse(await Deno.readTextFile(`${root}deno.json`));

// A task is `NAME=value ... deno run ...`: the settings, then the command.
function taskWords(task: string): { settings: string[]; command: string[] } {
  const words = (config.tasks[task] as string).split(/\s+/);
  const first = words.findIndex((w) => !/^[A-Z_]+=/.test(w));
  if (words[first] !== "deno") throw new Error(`task ${task} does not run deno`);
  return { settings: words.slice(0, first), command: words.slice(first + 1) };
}

/** The `deno run ...` arguments of a task, after the word `deno`. */
export function taskArgs(task: string): string[] {
  return taskWords(task).command;
}

/** The environment settings a task puts before `deno` (`DENO_NO_UPDATE_CHECK=1`). */
export function taskEnv(task: string): Record<string, string> {
  return Object.fromEntries(taskWords(task).settings.map((w) => w.split("=", 2)));
}

/** What a run of the CLI printed and returned. */
export interface CliResult {
  code: number;
  stdout: string;
  stderr: string;
}

/**
 * Runs `paygrove ARGS` from the project root. With `killAfterSeconds`, a
 * run still going then is killed (its status is then not 0, 1 or 2): for
 * inputs built to make a slow path take hours, not for timing.
 */
export async function paygrove(
  args: string[],
  env: Record<string, string> = {},
  killAfterSeconds?: number,
): Promise<CliResult> {
  const output = await new Deno.Command(Deno.execPath(), {
    args: [...taskArgs("paygrove"), ...args],
    cwd: root,
    signal: killAfterSeconds === undefined
      ? undefined
      : AbortSignal.timeout(killAfterSeconds * 1000),
    env: { ...taskEnv("paygrove"), NO_COLOR: "", ...env },
    stdin: "null",
    stdout: "piped",
    stderr: "piped",
  }).output();
  const decode = (b: Uint8Array) => new TextDecoder().decode(b);
  return { code: output.code, stdout: decode(output.stdout), stderr: decode(output.stderr) };
}

/** The project root, with a trailing slash. */
export const ROOT = root;

/**
 * Fits the demo company's model (EUR, 30 trees, 3 folds: quick, and the
 * same model each time) to `out`, with any further `fit` options; throws
 * what fit said if it fails.
 */
export async function fitDemoModel(out: string, ...more: string[]): Promise<void> {
  const run = await paygrove([
    "fit",
    `${root}fixtures/demo_company.csv`,
    "--target",
    "base_pay_eur",
    "--currency",
    "EUR",
    "--trees",
    "30",
    "--folds",
    "3",
    "--out",
    out,
    ...more,
  ]);
  if (run.code !== 0) throw new Error(run.stderr);
}

/** Whether util-linux's `script` is here to give a command a pseudo-terminal. */
export const HAS_SCRIPT = await new Deno.Command("script", {
  args: ["--version"],
  stdout: "null",
  stderr: "null",
}).output().then((o) => o.success, () => false);

/**
 * Runs `paygrove ARGS` on a pseudo-terminal (through `script`), as a person
 * at a terminal would, and returns the exit status and the screen text.
 */
export async function paygroveOnTerminal(
  args: string[],
  options: { noColor?: boolean } = {},
): Promise<{ code: number; screen: string }> {
  const command = ["deno", ...taskArgs("paygrove"), ...args].map((w) => `'${w}'`).join(" ");
  const output = await new Deno.Command("script", {
    args: [
      "-qec",
      options.noColor ? `NO_COLOR=1 ${command}` : `env -u NO_COLOR ${command}`,
      "/dev/null",
    ],
    cwd: root,
    env: {
      PATH: `${Deno.execPath().replace(/\/[^/]+$/, "")}:${Deno.env.get("PATH")}`,
      TERM: "xterm-256color",
      ...taskEnv("paygrove"),
    },
    stdout: "piped",
    stderr: "piped",
  }).output();
  return { code: output.code, screen: new TextDecoder().decode(output.stdout) };
}
