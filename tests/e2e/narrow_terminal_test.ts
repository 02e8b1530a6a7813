// One command end to end on a pseudo-terminal 60 columns wide (util-linux
// `script`, `stty cols 60`): no line of what it prints is longer than 60
// columns, and the figures of its tables appear whole.
import assert from "node:assert/strict";
import { HAS_SCRIPT, ROOT, taskArgs, taskEnv } from "./_cli.ts";

// deno-lint-ignore no-control-regex
const ANSI = /\x1b\[[0-9;?]*[A-Za-z]/g;

async function onNarrowTerminal(args: string[], columns: number): Promise<string[]> {
  const command = ["deno", ...taskArgs("paygrove"), ...args].map((w) => `'${w}'`).join(" ");
  const output = await new Deno.Command("script", {
    args: ["-qec", `stty cols ${columns} rows 200; NO_COLOR=1 ${command}`, "/dev/null"],
    cwd: ROOT,
    env: {
      PATH: `${Deno.execPath().replace(/\/[^/]+$/, "")}:${Deno.env.get("PATH")}`,
      TERM: "xterm-256color",
      ...taskEnv("paygrove"),
    },
    stdout: "piped",
    stderr: "piped",
  }).output();
  assert.equal(output.code, 0, new TextDecoder().decode(output.stderr));
  return new TextDecoder().decode(output.stdout).replace(ANSI, "").split(/\r?\n/);
}

Deno.test({
  name: "schema on a 60-column terminal: no line wider, every column named whole",
  ignore: !HAS_SCRIPT && Deno.env.get("CI") !== "true",
  fn: async () => {
    const lines = await onNarrowTerminal(["schema", "fixtures/demo_company.csv"], 60);
    const long = lines.filter((l) => l.length > 60);
    assert.deepEqual(long, [], long.join("\n"));
    for (const name of ["employee_id", "years_experience", "performance_rating", "base_pay_eur"]) {
      assert.ok(lines.some((l) => l.includes(name)), name);
    }
    // The pay range appears whole on one line.
    assert.ok(lines.some((l) => /\d[\d,.]*\s*(to|-)\s*\d/.test(l)), lines.join("\n"));
  },
});
