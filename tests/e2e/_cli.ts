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
    stdout: "piped",
    stderr: "piped",
  }).output();
  const decode = (b: Uint8Array) => new TextDecoder().decode(b);
  return { code: output.code, stdout: decode(output.stdout), stderr: decode(output.stderr) };
}

/** The project root, with a trailing slash. */
export const ROOT = root;
