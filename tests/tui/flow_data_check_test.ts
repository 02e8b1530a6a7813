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
