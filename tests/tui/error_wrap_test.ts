// An error read at a narrow terminal is wrapped at spaces to its width; the
// same error sent to a pipe or a file stays one line per item for scripts.
// Invented table: the pay of two rows is 0 and -500.
import assert from "node:assert/strict";
import { run } from "../../tui/main.ts";
import { recordingTerminal } from "../../tui/terminal.ts";

const dir = await Deno.makeTempDir({ prefix: "paygrove-error-wrap-" });
const table = `${dir}/pay.csv`;
const lines = ["grade,years,pay"];
for (let i = 0; i < 60; i++) {
  const pay = i === 3 ? "0" : i === 7 ? "-500" : String(40000 + 1000 * (i % 5) + 37 * i);
  lines.push(`G${1 + (i % 5)},${i % 20},${pay}`);
}
await Deno.writeTextFile(table, lines.join("\n") + "\n");

async function errorText(args: string[], atTerminal: boolean, width = 60) {
  const terminal = { ...recordingTerminal(width), errIsTerminal: atTerminal };
  const status = await run(args, terminal);
  return { status, text: terminal.stderr.join("") };
}

for (
  const [what, args, status] of [
    ["a data error", ["fit", table, "--target", "pay", "--out", `${dir}/m.model`], 1],
    ["a usage error", ["fit", table, "--target", "salary", "--out", `${dir}/m.model`], 2],
  ] as const
) {
  Deno.test(`${what} is wrapped to a 60-column terminal and one line for a pipe`, async () => {
    const narrow = await errorText([...args], true);
    const piped = await errorText([...args], false);
    assert.equal(narrow.status, status);
    assert.equal(piped.status, status);
    const narrowLines = narrow.text.trimEnd().split("\n");
    assert(narrowLines.length > 1, narrow.text);
    for (const line of narrowLines) assert(line.length <= 60, `${line.length}: ${line}`);
    // The same words, only the breaks differ.
    assert.equal(narrow.text.replace(/\s+/g, " "), piped.text.replace(/\s+/g, " "));
    assert(piped.text.trimEnd().split("\n")[0].length > 60, piped.text);
  });
}
