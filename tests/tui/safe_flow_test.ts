// The guided flow on a table whose names are attacks (tests/e2e/_hostile.ts):
// the screen, the questions and their choices show control characters
// visibly, and the session report writes no markup from the data.
import assert from "node:assert/strict";
// @ts-types="@types/markdown-it"
import MarkdownIt from "markdown-it";
import { guidedFlow } from "../../tui/flow/guided_flow.ts";
import { ATTACK, hostileCsv, rawControl } from "../e2e/_hostile.ts";
import { flowDriver, KEY } from "./_flow_driver.ts";

const DEMO = new URL("../../fixtures/demo_company.csv", import.meta.url).pathname;

// What would act on a terminal; the prompts' own cursor moves (other CSI
// sequences) are theirs and are left aside.
const ACTING = [
  ["BEL", "\x07"],
  ["OSC", "\x1b]"],
  ["clear screen", "\x1b[2J"],
  ["conceal", "\x1b[8m"],
  ["backspace", "\b"],
  ["C1 CSI", "\u009b"],
  ["right-to-left override", "\u202e"],
] as const;

Deno.test("the flow shows hostile names visibly, in screens, questions and choices", async () => {
  const dir = await Deno.makeTempDir();
  const table = `${dir}/pay.csv`;
  await Deno.writeTextFile(table, await hostileCsv());
  const report = `${dir}/report.md`;
  const driver = flowDriver();
  const done = guidedFlow(driver.io, { demoPath: DEMO, trees: 20, workers: 1, report });
  await driver.when("What do you want to work with?", KEY.down, KEY.enter);
  await driver.when("Path of the CSV file", table, KEY.enter);
  await driver.when("Which column should paygrove estimate?", KEY.enter);
  await driver.when("Which attributes may explain it?", KEY.enter);
  // The gap check by gender (its groups are names of attacks), within job families.
  await driver.when("Check for pay gaps between groups first?", KEY.up, KEY.enter);
  await driver.when("Compare which group with", KEY.enter);
  await driver.when("Compare within which categories of workers?", KEY.enter);
  await driver.when("Start the profile from", KEY.enter);
  // Change the site: its levels are the choices.
  await driver.when("What next?", KEY.enter);
  await driver.when("Change which attribute?", ...Array(4).fill(KEY.down), KEY.enter);
  await driver.when("site:", KEY.down, KEY.enter);
  // Sweep the job family, then save the model (the report goes to --report).
  await driver.when("What next?", KEY.down, KEY.down, KEY.enter);
  await driver.when("Sweep which attribute?", KEY.enter);
  await driver.when("What next?", KEY.up, KEY.up, KEY.enter); // Save, second from the bottom
  await driver.when("Save the model as", `${dir}/model.json`, KEY.enter);
  await driver.when("What next?", KEY.up, KEY.enter);
  await done;

  const raw = driver.raw();
  for (const [what, text] of ACTING) {
    const at = raw.indexOf(text);
    assert.equal(
      at,
      -1,
      `${what} reached the screen: ${JSON.stringify(raw.slice(at - 40, at + 40))}`,
    );
  }
  const screen = driver.screen();
  // Shown, as escapes: the schema, the choices of site, the gap groups, the sweep.
  for (
    const shown of [
      String.raw`\x1b]0;pwned\x07Cinder`,
      String.raw`\x1b[2JEast`,
      String.raw`\u202eOps`,
      String.raw`\u009b31mSales`,
      String.raw`years\x1b[8m_exp`,
      String.raw`\x1b[2Jnb`,
    ]
  ) {
    assert.ok(screen.includes(shown), `${shown} is not on the screen`);
  }

  const markdown = await Deno.readTextFile(report);
  assert.equal(rawControl(markdown), null, rawControl(markdown) ?? "");
  // Rendered by markdown-it 15.0.3 (not ours): no HTML, no link from the data.
  const html = new MarkdownIt({ html: true }).render(markdown);
  assert.doesNotMatch(html, /<script|<img/i);
  assert.doesNotMatch(html, /href="http:\/\/evil"/);
  // The JSON beside it: the exact names, no raw control character.
  const jsonText = await Deno.readTextFile(`${dir}/report.json`);
  assert.equal(rawControl(jsonText), null, rawControl(jsonText) ?? "");
  assert.ok(jsonText.includes("\\u202eOps") || jsonText.includes("\\u009b31mSales"));
  const json = JSON.parse(jsonText);
  assert.equal(json.gap.groups.includes(ATTACK.img) || json.gap.reference === ATTACK.img, true);
  await Deno.remove(dir, { recursive: true });
});
