import assert from "node:assert/strict";
import { run } from "../../tui/main.ts";
import { recordingTerminal } from "../../tui/terminal.ts";
import { VERSION } from "../../mod.ts";

const fixture = new URL("../../fixtures/cps1985.csv", import.meta.url).pathname;

Deno.test("schema output fits the terminal width, wrapping and clipping level lists", async () => {
  const dir = await Deno.makeTempDir({ prefix: "paygrove-tui-" });
  try {
    // 40 invented site names: too many levels for three lines of 23 characters.
    const sites = Array.from({ length: 40 }, (_, i) => `site${String(i).padStart(2, "0")}`);
    const file = `${dir}/wide.csv`;
    // Each site twice, so that the column is categorical rather than an identifier.
    const body = [...sites, ...sites].map((s, i) => `${s},${1000 + i}`).join("\n");
    await Deno.writeTextFile(file, `site,pay\n${body}\n`);
    for (const path of [fixture, file]) {
      const terminal = recordingTerminal(72);
      assert.equal(await run(["schema", path], terminal), 0, terminal.stderr.join(""));
      // Table, notes, warnings and caution all wrap to the width.
      for (const line of terminal.stdout.join("").split("\n")) {
        assert.ok(line.length <= 72, `${line.length}: ${line}`);
      }
    }
    const terminal = recordingTerminal(72);
    await run(["schema", file], terminal);
    const out = terminal.stdout.join("");
    assert.match(out, /40 levels: site00,/);
    assert.match(out, /\.\.\./);
    assert.doesNotMatch(out, /site39/);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test("schema shows money in the chosen currency and locale", async () => {
  const terminal = recordingTerminal(120);
  const code = await run(
    ["schema", fixture, "--period", "wage=hour", "--currency", "EUR", "--locale", "de-DE"],
    terminal,
  );
  assert.equal(code, 0, terminal.stderr.join(""));
  const wage = terminal.stdout.join("").split("\n").find((l) => l.startsWith("│ wage"));
  assert.match(wage ?? "", /1,00\u00a0€ to 44,50\u00a0€ \(EUR an hour\)/);
});

Deno.test("hourly pay is annualised from the command line", async () => {
  const terminal = recordingTerminal(120);
  const code = await run(
    ["schema", fixture, "--json", "--period", "wage=hour", "--hours-per-year", "2080"],
    terminal,
  );
  assert.equal(code, 0, terminal.stderr.join(""));
  const doc = JSON.parse(terminal.stdout.join(""));
  // CPS1985 wage runs from 1 to 44.5 dollars an hour (R: range(CPS1985$wage)).
  assert.equal(doc.columns[0].min, 2080);
  assert.equal(doc.columns[0].max, 44.5 * 2080);
  assert.deepEqual(doc.columns[0].unit, { period: "year" });
  assert.deepEqual(doc.columns[0].notes, ["annualised (hourly x 2080 hours)"]);
});

Deno.test("the library's version is the one in deno.json", async () => {
  const config = JSON.parse(
    await Deno.readTextFile(new URL("../../deno.json", import.meta.url)),
  );
  assert.equal(VERSION, config.version);
});
