// The permissions the program runs with, read from what Deno grants rather
// than from the words of the task: whatever the task says (flags or a
// permission set in deno.json), the program gets read, write and the
// terminal's environment names, and nothing else; the network is denied.
import assert from "node:assert/strict";
import { ROOT, taskArgs, taskEnv } from "./_cli.ts";

// The variables the prompt library and colour detection read (README, Permissions).
const ENV_NAMES = [
  "NO_COLOR",
  "FORCE_COLOR",
  "CLICOLOR_FORCE",
  "TERM",
  "TERM_PROGRAM",
  "CI",
  "WT_SESSION",
  "TERMINAL_EMULATOR",
  "TERMINUS_SUBLIME",
  "ConEmuTask",
  "CLI_WIDTH",
  "INQUIRER_KEYBINDINGS",
  "NODE_DISABLE_COLORS",
  "TMUX",
  "TF_BUILD",
  "TEAMCITY_VERSION",
  "COLORTERM",
  "APPVEYOR",
  "BUILDKITE",
  "CIRCLECI",
  "DRONE",
  "GITEA_ACTIONS",
  "GITHUB_ACTIONS",
  "GITLAB_CI",
  "TRAVIS",
  "CI_NAME",
];

// The flags of README's `deno install` line, which spells them out.
async function installFlags(): Promise<string[]> {
  const readme = await Deno.readTextFile(`${ROOT}README.md`);
  const line = readme.match(
    /deno install -g -n paygrove --config deno\.json ([^]*?) tui\/main\.ts/,
  );
  assert.ok(line, "README has the deno install line");
  return line[1].replace(/\\\n/g, " ").split(/\s+/).filter((w) => w !== "");
}

const RUNS: [string, () => Promise<string[]>, Record<string, string>][] = [
  ["the start task", () => Promise.resolve(taskArgs("start")), taskEnv("start")],
  ["the paygrove task", () => Promise.resolve(taskArgs("paygrove")), taskEnv("paygrove")],
  ["README's deno install line", async () => ["run", ...(await installFlags()), "tui/main.ts"], {}],
];

for (const [what, words, env] of RUNS) {
  Deno.test(`${what} grants read, write and the terminal's names, and denies the network`, async () => {
    const args = (await words()).map((
      a,
    ) => (a === "tui/main.ts" ? "tests/e2e/_permission_probe.ts" : a));
    assert.ok(args.includes("tests/e2e/_permission_probe.ts"));
    const output = await new Deno.Command(Deno.execPath(), {
      args: [...args, ENV_NAMES.join(",")],
      cwd: ROOT,
      env,
      stdout: "piped",
      stderr: "piped",
    }).output();
    const text = new TextDecoder().decode(output.stdout);
    const expected = [
      "read: granted",
      "write: granted",
      "net: denied",
      // Under --no-prompt a permission not granted is refused, never asked for.
      "env: prompt",
      "run: prompt",
      "sys: prompt",
      "ffi: prompt",
      "import: prompt",
      ...ENV_NAMES.map((v) => `env ${v}: granted`),
      "env HOME: prompt",
      "env PATH: prompt",
    ];
    assert.deepEqual(text.trim().split("\n"), expected, new TextDecoder().decode(output.stderr));
    // --no-prompt: a refused permission is an error, not a question.
    assert.ok(args.includes("--no-prompt"), args.join(" "));
  });
}

Deno.test("deno task start and paygrove print one short line before the program's own words", async () => {
  for (const task of ["start", "paygrove"]) {
    const output = await new Deno.Command(Deno.execPath(), {
      args: ["task", task, "--version"],
      cwd: ROOT,
      env: { NO_COLOR: "1" },
      stdout: "piped",
      stderr: "piped",
    }).output();
    assert.equal(output.code, 0);
    const stderr = new TextDecoder().decode(output.stderr);
    // Deno's echo of the task, then nothing else of Deno's (no warnings).
    const lines = stderr.split("\n").filter((l) => l !== "");
    assert.equal(lines.length, 1, stderr);
    assert.match(lines[0], new RegExp(`^Task ${task} DENO_NO_UPDATE_CHECK=1 deno run `));
    // The task's own words fit one line of an 80-column terminal.
    const echo = lines[0].replace(/ '--version'$/, "");
    assert.ok(echo.length <= 80, `${echo.length} characters: ${echo}`);
    assert.match(new TextDecoder().decode(output.stdout), /^\d+\.\d+\.\d+/);
  }
});
