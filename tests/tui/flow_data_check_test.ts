// The guided flow's data check on tables of one's own: columns the default
// features leave out are shown unticked with the reason, and the model is
// fitted without them.
import assert from "node:assert/strict";
import { guidedFlow } from "../../tui/flow/guided_flow.ts";
import { flowDriver, KEY } from "./_flow_driver.ts";

const DEMO = new URL("../../fixtures/demo_company.csv", import.meta.url).pathname;

/** 100 people; `comment` has 60 distinct texts (identifier-like: > 50, > 100 / 2). */
function commentTable(pay: (r: number) => string = (r) => String(40000 + 900 * (r % 17))) {
  const lines = ["id,level,years,comment,pay"];
  for (let r = 0; r < 100; r++) {
    lines.push(`E${r},L${1 + (r % 4)},${r % 17},note ${r % 60},${pay(r)}`);
  }
  return lines.join("\n") + "\n";
}

Deno.test("an identifier-like column is shown unticked with the reason and left out of the fit", async () => {
  const dir = await Deno.makeTempDir();
  const path = `${dir}/comments.csv`;
  await Deno.writeTextFile(path, commentTable());
  const driver = flowDriver();
  const done = guidedFlow(driver.io, { demoPath: DEMO, trees: 10, workers: 1 });
  await driver.when("What do you want to work with?", KEY.down, KEY.enter);
  await driver.when("Path of the CSV file:", path, KEY.enter);
  await driver.when("Which column should paygrove estimate?", KEY.enter);
  await driver.when("Which attributes may explain it?", KEY.enter);
  await driver.when("Start the profile from", KEY.enter);
  await driver.when("What next?", KEY.up, KEY.enter);
  await done;
  const screen = driver.screen();
  assert.match(screen, /comment \(looks like an identifier: 60 levels in 100 rows\)/);
  assert.match(screen, /Features \(2\): level, years/);

  await Deno.remove(dir, { recursive: true });
});

Deno.test("implausible pay in the flow: said with its line, left out only when the person says so", async () => {
  const dir = await Deno.makeTempDir();
  const path = `${dir}/absurd.csv`;
  await Deno.writeTextFile(
    path,
    commentTable((r) => (r === 10 ? "1e308" : String(40000 + 900 * (r % 17)))),
  );
  // First "No": the first question comes again; then "Yes".
  const driver = flowDriver();
  const report = `${dir}/report.md`;
  const done = guidedFlow(driver.io, { demoPath: DEMO, trees: 10, workers: 1, report });
  await driver.when("What do you want to work with?", KEY.down, KEY.enter);
  await driver.when("Path of the CSV file:", path, KEY.enter);
  await driver.when("Which column should paygrove estimate?", KEY.enter);
  await driver.when("Which attributes may explain it?", KEY.enter);
  // Wrapped at spaces to the screen, as every sentence of the flow is.
  await driver.when(
    /"pay":\s+line\s+12\s+has\s+1e\+308;\s+no\s+plausible\s+pay\s+table\s+holds\s+such\s+a\s+value/,
  );
  await driver.when("Leave 1 row out and go on?", KEY.down, KEY.enter);
  await driver.when("What do you want to work with?", KEY.down, KEY.enter);
  await driver.when("Path of the CSV file:", path, KEY.enter);
  await driver.when("Which column should paygrove estimate?", KEY.enter);
  await driver.when("Which attributes may explain it?", KEY.enter);
  await driver.when("Leave 1 row out and go on?", KEY.enter);
  await driver.when("Start the profile from", KEY.enter);
  await driver.when("What next?", KEY.up, KEY.enter);
  await done;
  const screen = driver.screen().replace(/\s+/g, " ");
  assert.match(screen, /Choose again, or Ctrl-C to stop\./);
  assert.match(screen, /Rows: 99 used/);
  const said =
    /1 row left out, as you chose: its "pay" is more than 10,000 times from the median [\d,.]+ either way, beyond 10\^15, or not finite \(line 12\)\./;
  assert.match(screen, said);
  assert.doesNotMatch(screen, /∞|Infinity|NaN/);
  // The session report says it too.
  assert.match((await Deno.readTextFile(report)).replace(/\s+/g, " "), said);
  const json = JSON.parse(await Deno.readTextFile(`${dir}/report.json`));
  assert.deepEqual(json.leftOutImplausible, [{ column: "pay", count: 1, lines: [12] }]);
  await Deno.remove(dir, { recursive: true });
});
