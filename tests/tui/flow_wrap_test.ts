// Every sentence the guided flow says is wrapped at spaces to the screen:
// the implausible-pay warning and the protected-attribute caution are long
// single sentences that a terminal of 60 or 80 columns broke mid-word.
// Invented table: two rows' pay is 0 and -500.
import assert from "node:assert/strict";
import { guidedFlow } from "../../tui/flow/guided_flow.ts";
import { flowDriver, KEY } from "./_flow_driver.ts";

const DEMO = new URL("../../fixtures/demo_company.csv", import.meta.url).pathname;
const dir = await Deno.makeTempDir({ prefix: "paygrove-flow-wrap-" });
const table = `${dir}/pay.csv`;
const lines = ["grade,years,gender,pay"];
for (let i = 0; i < 80; i++) {
  const pay = i === 3 ? "0" : i === 7 ? "-500" : String(40000 + 1000 * (i % 5) + 37 * i);
  lines.push(`G${1 + (i % 5)},${i % 20},${["F", "M"][i % 2]},${pay}`);
}
await Deno.writeTextFile(table, lines.join("\n") + "\n");

for (const columns of [60, 80]) {
  Deno.test(`at ${columns} columns the flow's warning and caution stay inside the screen`, async () => {
    const driver = flowDriver(60000, false, { columns, rows: 40 });
    const done = guidedFlow(driver.io, { demoPath: DEMO, trees: 10, workers: 1 });
    await driver.when("What do you want to work with?", KEY.down, KEY.enter);
    await driver.when("Path of the CSV file:", table, KEY.enter);
    await driver.when("Which column should paygrove estimate?", KEY.enter);
    // Tick the protected attribute too (the last one listed), for its caution.
    await driver.when("Which attributes may explain it?", KEY.up, " ", KEY.enter);
    await driver.when(/Leave 2 rows out and go on\?/, KEY.enter);
    await driver.when("Start the profile from", KEY.enter);
    await driver.when("What next?", KEY.up, KEY.enter);
    await done;
    const screen = driver.screen();
    // Said, and whole words at the breaks.
    assert.match(screen.replace(/\s+/g, " "), /no plausible pay table holds such values/);
    assert.match(screen.replace(/\s+/g, " "), /Caution: you ticked a protected attribute/);
    assert.match(screen.replace(/\s+/g, " "), /more than 10,000 times from the median/);
    assert.deepEqual(
      driver.overflowed(),
      [],
      `wider than ${columns}:\n${driver.overflowed().join("\n")}`,
    );
  });
}
