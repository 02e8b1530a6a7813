/**
 * Runs the real `paygrove` command as a subprocess, with exactly the Deno
 * permissions of the `paygrove` task in deno.json.
 *
 * @module
 */

const root = new URL("../../", import.meta.url).pathname;
const config = JSON.parse(await Deno.readTextFile(`${root}deno.json`));

/** The `deno run ...` arguments of a task, after the word `deno`. */
export function taskArgs(task: string): string[] {
  const words = (config.tasks[task] as string).split(/\s+/);
  if (words[0] !== "deno") throw new Error(`task ${task} does not start with deno`);
  return words.slice(1);
}

/** What a run of the CLI printed and returned. */
export interface CliResult {
  code: number;
  stdout: string;
  stderr: string;
}

/** Runs `paygrove ARGS` from the project root. */
export async function paygrove(
  args: string[],
  env: Record<string, string> = {},
): Promise<CliResult> {
  const output = await new Deno.Command(Deno.execPath(), {
    args: [...taskArgs("paygrove"), ...args],
    cwd: root,
    env: { NO_COLOR: "", ...env },
    stdin: "null",
    stdout: "piped",
    stderr: "piped",
  }).output();
  const decode = (b: Uint8Array) => new TextDecoder().decode(b);
  return { code: output.code, stdout: decode(output.stdout), stderr: decode(output.stderr) };
}

/** The project root, with a trailing slash. */
export const ROOT = root;

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
    },
    stdout: "piped",
    stderr: "piped",
  }).output();
  return { code: output.code, screen: new TextDecoder().decode(output.stdout) };
}
