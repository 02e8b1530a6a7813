// The guided flow on a terminal of 24 lines, through the injected streams
// kept as such a terminal shows them: what a screen is about is still in
// view when the next question is asked (the estimate's first line above
// the menu, the fit's one-sentence answer above the next question, a
// sweep's chart with the menu under it), and at 60 columns no line is
// longer than the terminal is wide. What a screen leaves out is one menu
// choice away.
import assert from "node:assert/strict";
import { estimateProfile, fitModel, loadTable, openModel, typicalProfile } from "../../mod.ts";
import { guidedFlow } from "../../tui/flow/guided_flow.ts";
import { eightAttributeCsv } from "./_eight_attributes.ts";
import { type FlowDriver, flowDriver, KEY, terminalLines } from "./_flow_driver.ts";

const DEMO = new URL("../../fixtures/demo_company.csv", import.meta.url).pathname;
const TREES = 30;
const dir = await Deno.makeTempDir();
const EIGHT = `${dir}/eight.csv`;
await Deno.writeTextFile(EIGHT, eightAttributeCsv());

// The model the flow fits on that table (every attribute ticked, the
// default seed): its typical person has a 7-condition path and a profile
// of two lines at 80 columns.
const model = await fitModel(loadTable(await Deno.readTextFile(EIGHT), { target: "pay" }), {
  target: "pay",
  trees: TREES,
  workers: 1,
});
const typical = estimateProfile(openModel(model), typicalProfile(model), 0.9);

Deno.test("the table behind these tests: a typical person with 7 conditions on their path", () => {
  assert.equal(model.features.length, 8);
  assert.equal(typical.path.length, 7);
});

// The line in view that starts with `start`, or a failure showing the view.
function inView(driver: FlowDriver, start: string | RegExp): number {
  const view = driver.inView();
  const at = view.findIndex((l) => typeof start === "string" ? l.startsWith(start) : start.test(l));
  assert.ok(at >= 0, `not in view: ${start}\n--- the 24 lines in view ---\n${view.join("\n")}`);
  return at;
}

// Waits for the menu and checks that the estimate it follows is in view.
async function menuUnderEstimate(driver: FlowDriver, target: string): Promise<void> {
  await driver.when("What next?");
  const estimate = inView(driver, `Estimate of ${target}:`);
  const menu = inView(driver, "? What next?");
  assert.ok(estimate < menu);
}

// From the menu in view: sweeps the `down`-th lever and checks that chart
// and menu share the screen.
async function sweepInView(driver: FlowDriver, down: number, feature: string, first: string) {
  driver.type(KEY.down, KEY.down, KEY.enter);
  await driver.when("Sweep which attribute?", ...Array(down).fill(KEY.down), KEY.enter);
  await driver.when("What next?");
  const title = inView(driver, `Estimate as ${feature} varies`);
  const view = driver.inView();
  // Every line of the chart (its y axis), then the x axis's labels.
  const axis = view.filter((l) => /[┤┼]/.test(l));
  assert.ok(axis.length >= 6, view.join("\n"));
  assert.ok(view.indexOf(axis[0]) === title + 1, view.join("\n"));
  inView(driver, new RegExp(`^ +${first} +\\S+$`));
  inView(driver, "? What next?");
  inView(driver, /Quit/);
}

// From the eight-attribute CSV to the first question after the fit.
async function eightFitted(driver: FlowDriver): Promise<void> {
  await driver.when("What do you want to work with?", KEY.down, KEY.enter);
  await driver.when("Path of the CSV file:", EIGHT, KEY.enter);
  await driver.when("Which column should paygrove estimate?", KEY.enter);
  await driver.when("Which attributes may explain it?", KEY.enter);
  await driver.when("Start the profile from");
  inView(driver, "In short:");
  inView(driver, /matters most\.$/);
  inView(driver, "? Start the profile from");
}

for (const columns of [80, 60]) {
  Deno.test(`${columns} x 24: the result, the whole path on asking, a sweep, the fit's answer`, async () => {
    const driver = flowDriver(90000, false, { columns, rows: 24 });
    const done = guidedFlow(driver.io, { demoPath: DEMO, trees: TREES, workers: 1 });
    await eightFitted(driver);
    driver.type(KEY.enter); // A typical person
    await menuUnderEstimate(driver, "pay");
    // What the result left out, on asking: the whole profile and path.
    const menu = driver.inView().join("\n");
    assert.match(menu, /Show the whole profile and decision path/);
    driver.type(...Array(8).fill(KEY.down), KEY.enter); // below "Pay ranges"
    await driver.when("What next? Show the whole profile and decision path");
    await driver.when("What next?");
    const screen = driver.screen();
    const whole = screen.slice(screen.lastIndexOf("What next? Show the whole"));
    for (const [i, step] of typical.path.entries()) {
      assert.match(whole, new RegExp(`\\n +${i + 1} +${step.condition.replace(/[.]/g, "\\.")} `));
    }
    assert.match(
      whole.replace(/\n +/g, " "),
      /for department Assembly, grade G6, site Northgate, shift night, years 15, tenure 5\.3, rating 3, contract permanent/,
    );
    // A promotion's what-if, in view with the menu; then a sweep of grade.
    driver.type(KEY.down, KEY.enter);
    await driver.when("What next?");
    inView(driver, "What-if: grade G6 -> G7");
    await sweepInView(driver, 1, "grade", "G1");
    driver.type(KEY.up, KEY.enter);
    await done;
    assert.deepEqual(
      driver.overflowed(),
      [],
      `wider than ${columns}:\n${driver.overflowed().join("\n")}`,
    );
  });
}

Deno.test("80 x 24, the demo: the fit's answer above the gap question, the result above the menu, a sweep", async () => {
  const driver = flowDriver(90000, false, { columns: 80, rows: 24 });
  const done = guidedFlow(driver.io, { demoPath: DEMO, trees: TREES, workers: 1 });
  await driver.when("What do you want to work with?", KEY.enter);
  await driver.when("Which column should paygrove estimate?", KEY.enter);
  await driver.when("Which attributes may explain it?", KEY.enter);
  await driver.when("Check for pay gaps between groups first?");
  inView(driver, "In short:");
  inView(driver, /matters most\.$/);
  driver.type(KEY.enter); // No
  await driver.when("Start the profile from", KEY.down, KEY.enter);
  await driver.when("employee_id of the person", "FH10001", KEY.enter);
  await menuUnderEstimate(driver, "base_pay_eur");
  await sweepInView(driver, 2, "years_experience", "1.1");
  driver.type(KEY.up, KEY.enter);
  await done;
  assert.deepEqual(driver.overflowed(), []);
});

Deno.test("the driver's terminal: cursor moves, erased lines and wrapping as a terminal does them", () => {
  const { lines, overflowed } = terminalLines("ab\ncd\x1b[1A\x1b[2K\x1b[Gxy\n\n123456", 4);
  assert.deepEqual(lines, ["xy", "cd", "1234", "56"]);
  assert.deepEqual(overflowed, ["1234"]);
});

for (const columns of [80, 60]) {
  Deno.test(`${columns} x 24: pay ranges, the range to post and the band table, in view`, async () => {
    const driver = flowDriver(90000, false, { columns, rows: 24 });
    const done = guidedFlow(driver.io, { demoPath: DEMO, trees: TREES, workers: 1 });
    await eightFitted(driver);
    driver.type(KEY.enter); // A typical person
    await menuUnderEstimate(driver, "pay");
    // "Pay ranges" sits where "Show the whole profile" sat before it.
    driver.type(...Array(7).fill(KEY.down), KEY.enter);
    await driver.when("? Which?");
    driver.type(KEY.enter); // the range to post
    await driver.when("What next?");
    // The range's own line stays in view above the menu.
    inView(driver, /^Range to post: [\d,.]+ to [\d,.]+$/);
    inView(driver, /current people share grade and department/);
    inView(driver, "? What next?");
    driver.type(...Array(7).fill(KEY.down), KEY.enter);
    await driver.when("? Which?");
    driver.type(KEY.down, KEY.enter); // the band table
    await driver.when("When you have read it:");
    inView(driver, "Pay bands by grade");
    inView(driver, /^cell +people/);
    inView(driver, /^Midpoint progression/);
    assert.deepEqual(driver.inView().filter((l) => l.length > columns), []);
    driver.type(KEY.enter);
    await driver.when("What next?");
    driver.type(KEY.up, KEY.enter); // Quit
    await done;
  });
}
