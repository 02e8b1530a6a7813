// The guided flow through injected streams: each step's screen shows the
// figures the library gives for the same model and profile.
import assert from "node:assert/strict";
import {
  applyChanges,
  compareAnswer,
  DEMO_COLUMNS,
  estimateProfile,
  fitModel,
  gapCheck,
  loadTable,
  offeredLevers,
  openModel,
  readModelFile,
  typicalProfile,
  writeModelFile,
} from "../../mod.ts";
import { DEMO_READ, guidedFlow } from "../../tui/flow/guided_flow.ts";
import { formatPay, formatPercent } from "../../tui/render/numbers.ts";
import { flowDriver, KEY } from "./_flow_driver.ts";

const DEMO = new URL("../../fixtures/demo_company.csv", import.meta.url).pathname;
const TREES = 30;

// The model the flow fits (same table, options and default seed).
const table = loadTable(await Deno.readTextFile(DEMO), {
  ...DEMO_READ,
  file: "demo company (invented)",
  target: "base_pay_eur",
});
const model = await fitModel(table, {
  target: "base_pay_eur",
  // Every column but the identifier, the protected gender and the target:
  // the attributes the flow ticks by default.
  features: DEMO_COLUMNS.filter((c) => !["employee_id", "gender", "base_pay_eur"].includes(c)),
  trees: TREES,
  workers: 1,
});
const session = openModel(model);
const pay = (x: number) => formatPay(x, { currency: "EUR" });

// The demo table, the suggested pay column and attributes: the fit.
async function demoFitted(driver: ReturnType<typeof flowDriver>): Promise<void> {
  await driver.when("What do you want to work with?", KEY.enter);
  await driver.when("Which column should paygrove estimate?", KEY.enter);
  await driver.when("Which attributes may explain it?", KEY.enter);
  await driver.when("Check for pay gaps between groups first?", KEY.enter); // No
}

Deno.test("demo data, fit, typical person, promote one level, keep, undo, quit", async () => {
  const driver = flowDriver();
  const dir = await Deno.makeTempDir();
  const done = guidedFlow(driver.io, {
    demoPath: DEMO,
    trees: TREES,
    workers: 1,
    report: `${dir}/report.md`,
  });
  await demoFitted(driver);
  await driver.when("Start the profile from", KEY.enter);
  await driver.when("What next?", KEY.down, KEY.enter); // Promote one level
  await driver.when(/What next\?[\s\S]*What next\?/, KEY.down, KEY.down, KEY.down, KEY.enter);
  await driver.when("Name of this scenario", "promoted", KEY.enter);
  // Undo: the sixth choice once a change has been made.
  await driver.when("What next?", ...Array(5).fill(KEY.down), KEY.enter);
  // Quit: the last choice (up from the first wraps to the bottom).
  await driver.when("What next?", KEY.up, KEY.enter);
  await done;
  const screen = driver.screen();

  // The data check shows the protected column unticked, with the reason.
  assert.match(screen, /gender \(protected attribute; unticked by default\)/);
  // The summary: accuracy side by side.
  assert.match(screen, /ensemble, 30 trees/);
  // The typical person's estimate and intervals, as the library gives them.
  const base = typicalProfile(model);
  const first = estimateProfile(session, base, 0.9);
  assert.ok(screen.includes(`${pay(first.estimate)}`), pay(first.estimate));
  assert.ok(
    screen.includes(
      `median pay, 90% sure   ${pay(first.confidence!.low)} - ${pay(first.confidence!.high)}`,
    ),
  );
  assert.ok(
    screen.includes(`one person, 90% range  ${pay(first.range!.low)} - ${pay(first.range!.high)}`),
  );
  // The promotion: the paired difference and its interval.
  const promoted = applyChanges(model, base, ["level=+1"]).profile;
  const what = compareAnswer(session, base, promoted, 0.9);
  const d = what.difference;
  const line = `Change: +${pay(d.estimate)} (${formatPercent(d.relative.estimate, true)}) (90%: ` +
    `+${pay(d.low!)} to +${pay(d.high!)}`;
  assert.ok(screen.includes(line), line);
  assert.ok(screen.includes(`What-if: level G2 -> G3`));
  // Undo shows the typical person's estimate again, after the promotion.
  const afterPromotion = screen.slice(screen.indexOf(line));
  assert.ok(
    afterPromotion.includes(
      `Estimate of base_pay_eur: ${pay(first.estimate)} a year (median pay of people like this)`,
    ),
  );
  // The report holds the kept scenario with the promoted estimate.
  const report = await Deno.readTextFile(`${dir}/report.md`);
  assert.ok(report.includes(`| promoted | ${pay(what.changed.estimate)} |`), report);
  const json = JSON.parse(await Deno.readTextFile(`${dir}/report.json`));
  assert.equal(json.scenarios[0].name, "promoted");
  assert.match(json.caution, /not what anyone should be paid/);
  await Deno.remove(dir, { recursive: true });
});

Deno.test("an existing person by id, change one attribute, sweep a level attribute", async () => {
  // A tall terminal: the result shows the whole profile.
  const driver = flowDriver(60000, false, { rows: 40 });
  const done = guidedFlow(driver.io, { demoPath: DEMO, trees: TREES, workers: 1 });
  await demoFitted(driver);
  await driver.when("Start the profile from", KEY.down, KEY.enter);
  await driver.when("employee_id of the person", "FH99999", KEY.enter);
  await driver.when('No one has employee_id "FH99999"');
  // Clear the wrong id, then type a real one.
  await driver.when("employee_id of the person", ..."\x7f".repeat(7), "FH10003", KEY.enter);
  await driver.when("What next?", KEY.enter); // Change one attribute
  await driver.when("Change which attribute?", ...Array(4).fill(KEY.down), KEY.enter); // site
  await driver.when("site:", KEY.down, KEY.enter);
  await driver.when("What next?", KEY.down, KEY.down, KEY.enter); // Sweep
  await driver.when("Sweep which attribute?", KEY.down, KEY.enter); // level
  await driver.when("Estimate as level varies");
  await driver.when("What next?", KEY.up, KEY.enter); // Quit
  await done;
  const screen = driver.screen();
  // FH10003 is an Engineering G4 at Cinder Hill (fixtures/demo_company.csv).
  assert.match(screen, /for job_family Engineering, level G4, years_experience 16\.3/);
  assert.match(screen, /What-if: site Cinder Hill -> /);
  for (const level of ["G1", "G4", "G7"]) assert.match(screen, new RegExp(`\\n│ ${level} +│`));
});

Deno.test("--ascii: every character on screen is ASCII", async () => {
  const driver = flowDriver(60000, true);
  const done = guidedFlow(driver.io, { demoPath: DEMO, trees: TREES, workers: 1 });
  await driver.when("What do you want to work with?", KEY.enter);
  await driver.when("Which column should paygrove estimate?", KEY.enter);
  await driver.when("Which attributes may explain it?", KEY.enter);
  await driver.when("Check for pay gaps between groups first?", KEY.enter);
  await driver.when("Start the profile from", KEY.enter);
  await driver.when("What next?", KEY.down, KEY.down, KEY.enter); // Sweep
  await driver.when("Sweep which attribute?", KEY.down, KEY.enter);
  await driver.when("What next?", KEY.up, KEY.enter);
  await done;
  const screen = driver.screen();
  const wide = [...screen].filter((c) => c.charCodeAt(0) > 127);
  assert.deepEqual([...new Set(wide)], []);
  assert.match(screen, /EUR \d{2},\d{3}/);
});

Deno.test("an unusable CSV is said and the first question comes again; then a saved model", async () => {
  const dir = await Deno.makeTempDir();
  const broken = `${dir}/broken.csv`;
  await Deno.writeTextFile(broken, "level,pay\n");
  const saved = `${dir}/model.json`;
  await writeModelFile(saved, model);
  const driver = flowDriver();
  const done = guidedFlow(driver.io, { demoPath: DEMO, trees: TREES, workers: 1 });
  await driver.when("What do you want to work with?", KEY.down, KEY.enter);
  await driver.when("Path of the CSV file:", `${dir}/nothing.csv`, KEY.enter);
  await driver.when("No file at");
  await driver.when(
    "Path of the CSV file:",
    ..."\x7f".repeat(`${dir}/nothing.csv`.length),
    broken,
    KEY.enter,
  );
  await driver.when("has a header but no data rows");
  await driver.when("What do you want to work with?", KEY.down, KEY.down, KEY.enter);
  await driver.when("Path of the model file:", saved, KEY.enter);
  await driver.when("Start the profile from", KEY.enter);
  await driver.when("What next?", KEY.up, KEY.enter);
  await done;
  const screen = driver.screen();
  assert.match(screen, /Choose again, or Ctrl-C to stop\./);
  const first = estimateProfile(session, typicalProfile(model), 0.9);
  assert.ok(screen.includes(`Estimate of base_pay_eur: ${pay(first.estimate)} a year`));
  await Deno.remove(dir, { recursive: true });
});

Deno.test("a class target (level): shares as bars with intervals, and the confusion matrix", async () => {
  const driver = flowDriver();
  const done = guidedFlow(driver.io, { demoPath: DEMO, trees: TREES, workers: 1 });
  await driver.when("What do you want to work with?", KEY.enter);
  await driver.when(
    "Which column should paygrove estimate?",
    ...Array(5).fill(KEY.down),
    KEY.enter,
  );
  await driver.when("Which attributes may explain it?", KEY.enter);
  await driver.when("Start the profile from", KEY.enter);
  await driver.when("What next?", KEY.up, KEY.enter);
  await done;
  const screen = driver.screen();
  assert.match(screen, /Out-of-bag confusion matrix \(rows: actual class; columns: predicted\)/);
  assert.match(screen, /Most likely level: G\d/);
  assert.match(screen, /G\d +#+ +\d+\.\d% \(90%: \d+\.\d% - \d+\.\d%\)/);
});

Deno.test("Esc at a question stops the flow (as Ctrl-C does); arrow keys do not", async () => {
  const driver = flowDriver();
  const done = guidedFlow(driver.io, { demoPath: DEMO, trees: TREES, workers: 1 });
  // Each arrow must leave the question open and move the pointer: the next
  // screen is waited for, so an arrow that stopped the flow fails here.
  await driver.when("What do you want to work with?", KEY.down);
  await driver.when(/❯ A CSV pay table of your own/, KEY.up);
  await driver.when(/❯ The demo company/, "\x1b");
  await assert.rejects(() => done, (e) => (e as Error).name === "AbortPromptError");
});

Deno.test("step through every attribute, then save the model and a report", async () => {
  const dir = await Deno.makeTempDir();
  // A tall terminal: the result shows the whole profile.
  const driver = flowDriver(60000, false, { rows: 40 });
  const done = guidedFlow(driver.io, { demoPath: DEMO, trees: TREES, workers: 1 });
  await demoFitted(driver);
  await driver.when("Start the profile from", KEY.down, KEY.down, KEY.enter);
  await driver.when("job_family:", KEY.down, KEY.enter); // Field Service
  await driver.when("level (lowest first):", KEY.down, KEY.down, KEY.enter); // G2 -> G4
  await driver.when("years_experience (the data runs from 1 to 35.9):", "14", KEY.enter);
  await driver.when("years_at_company", KEY.enter);
  await driver.when("site:", KEY.enter);
  await driver.when("performance_rating", "NA", KEY.enter); // not known, as for a new hire
  await driver.when("education:", KEY.enter);
  await driver.when("remote:", KEY.enter);
  await driver.when("What next?", KEY.up, KEY.up, KEY.enter); // Save
  await driver.when("Save the model as:", `${dir}/m.json`, KEY.enter);
  await driver.when("Save a report of the scenarios as", `${dir}/r.md`, KEY.enter);
  await driver.when("Wrote the report");
  await driver.when("What next?", KEY.up, KEY.enter);
  await done;
  const screen = driver.screen();
  assert.match(screen, /for job_family Field Service, level G4, years_experience 14,/);
  assert.match(screen, /performance_rating \(missing\)/);
  const saved = await readModelFile(`${dir}/m.json`);
  assert.equal(saved.ensemble!.trees.length, TREES);
  const report = await Deno.readTextFile(`${dir}/r.md`);
  assert.match(report, /\| current \| €[\d,]+ \|/);
  assert.match(report, /not what anyone should be paid/);
  await Deno.remove(dir, { recursive: true });
});

Deno.test("from a newcomer's trial: values as typed, the person's own pay, a bad save path, what-ifs in the report", async () => {
  const dir = await Deno.makeTempDir();
  const driver = flowDriver();
  const done = guidedFlow(driver.io, { demoPath: DEMO, trees: TREES, workers: 1 });
  await demoFitted(driver);
  await driver.when("Start the profile from", KEY.down, KEY.enter);
  await driver.when("employee_id of the person (e.g. FH10001):", "fh10001", KEY.enter);
  // FH10001 is one of the model's own people: beside their pay, the
  // estimate of the trees that never saw them (the flow keeps the draws of
  // the model it fitted).
  await driver.when(
    /FH10001's pay in the table: €143,100; from trees that never saw FH10001:\s+€\d/,
  );
  // G7 is the top level: no promotion to show.
  await driver.when("What next?", KEY.down, KEY.enter);
  await driver.when("G7 is the top level: there is no promotion to show.");
  // A negative number is a value, not a step down.
  await driver.when("What next?", KEY.enter);
  await driver.when("Change which attribute?", ...Array(3).fill(KEY.down), KEY.enter);
  await driver.when("years_at_company (the data runs", "-1", KEY.enter);
  await driver.when("What-if: years_at_company 18.9 -> -1");
  // Save to a folder that does not exist: said, and the session goes on.
  await driver.when("What next?", KEY.up, KEY.up, KEY.enter);
  await driver.when("Save the model as:", `${dir}/no/such/m.json`, KEY.enter);
  await driver.when("save: cannot write");
  await driver.when("What next?", KEY.up, KEY.up, KEY.enter);
  await driver.when("Save the model as:", `${dir}/m.json`, KEY.enter);
  // The name offered is a page for any browser.
  await driver.when(
    /Save a report of the scenarios as[^]*paygrove-report\.html/,
    `${dir}/r.html`,
    KEY.enter,
  );
  await driver.when("Wrote the report");
  await driver.when("What next?", KEY.up, KEY.enter);
  await done;
  assert.match(
    driver.screen(),
    // Wrapped at spaces to the screen, as every sentence of the flow is.
    /save:\s+cannot\s+write\s+\S*no\/such\/m\.json\s+\(its\s+folder\s+does\s+not\s+exist\)/,
  );
  const html = await Deno.readTextFile(`${dir}/r.html`);
  const json = JSON.parse(await Deno.readTextFile(`${dir}/r.json`));
  assert.match(html, /<h2>What-if \(years_at_company 18\.9 to -1\) — The change<\/h2>/);
  // The what-if's change and the scenario's estimate, as the .json beside it has them.
  assert(html.includes(`data-value="${json.whatIfs[0].difference.estimate}"`));
  assert(html.includes(`data-value="${json.scenarios[0].estimate}"`));
  assert.doesNotMatch(html, /<script|\ssrc=/);
  await Deno.remove(dir, { recursive: true });
});

Deno.test("the gap step: women against men within job families, as paygrove gap gives it, and in the report", async () => {
  const dir = await Deno.makeTempDir();
  const driver = flowDriver(60000);
  const done = guidedFlow(driver.io, { demoPath: DEMO, trees: TREES, workers: 1 });
  await driver.when("What do you want to work with?", KEY.enter);
  await driver.when("Which column should paygrove estimate?", KEY.enter);
  await driver.when("Which attributes may explain it?", KEY.enter);
  await driver.when("Check for pay gaps between groups first?", KEY.up, KEY.enter); // Yes, by gender
  await driver.when("Compare which group with Man (the reference)?", KEY.enter); // Woman, the largest
  await driver.when("Compare within which categories of workers?", KEY.enter); // job_family
  await driver.when("Start the profile from", KEY.enter);
  await driver.when("What next?", KEY.up, KEY.up, KEY.enter); // Save
  await driver.when("Save the model as:", `${dir}/m.json`, KEY.enter);
  await driver.when("Save a report of the scenarios as", `${dir}/r.md`, KEY.enter);
  await driver.when("Wrote the report");
  await driver.when("What next?", KEY.up, KEY.enter);
  await done;
  const screen = driver.screen();
  assert.match(screen, /Pay gap by gender: Woman against Man/);
  const flagged = screen.split("\n").filter((l) => /unexpl\.\s*$/.test(l));
  assert.equal(flagged.length, 1, flagged.join("\n"));
  assert.match(flagged[0], /^Field Service /);
  assert.match(screen, /not proof of discrimination/);
  // The command line comes in shell continuation lines; joined, it is the one to run.
  assert.match(
    screen.replace(/ \\\n\s+/g, " "),
    /paygrove gap \S+demo_company\.csv --target base_pay_eur --group gender --groups Woman --within job_family/,
  );

  // The command line it names gives the same figures.
  const table = loadTable(await Deno.readTextFile(DEMO), { ...DEMO_READ, target: "base_pay_eur" });
  const report = await gapCheck(table, {
    target: "base_pay_eur",
    group: "gender",
    compare: ["Woman"],
    within: ["job_family"],
  });
  const field = report.categories.find((c) => c.name === "Field Service")!;
  assert.ok(!field.suppressed);
  if (!field.suppressed) {
    const f = field.gaps[0];
    const shown =
      `${formatPercent(f.adjusted!)} (${formatPercent(f.familyLow!).replace("%", "")}..` +
      `${formatPercent(f.familyHigh!).replace("%", "")})`;
    assert.ok(flagged[0].includes(shown), `${flagged[0]} vs ${shown}`);
  }
  const markdown = await Deno.readTextFile(`${dir}/r.md`);
  assert.match(markdown, /# Pay gap by gender/);
  assert.match(markdown, /\| Field Service \|/);
  const json = JSON.parse(await Deno.readTextFile(`${dir}/r.json`));
  assert.equal(json.gap.reference, "Man");
  await Deno.remove(dir, { recursive: true });
});

Deno.test("a protected attribute is never a what-if lever, even in a model fitted with it", async () => {
  const withGender = await fitModel(table, {
    target: "base_pay_eur",
    features: ["level", "job_family", "gender"],
    allowProtected: true,
    trees: 5,
    workers: 1,
  });
  const names = offeredLevers(withGender).map((i) => withGender.features[i].name);
  assert.deepEqual(names.sort(), ["job_family", "level"]);
  assert.ok(withGender.features.some((f) => f.name === "gender" && f.protected));
});

Deno.test("the gap step never tells the size of a group below the privacy minimum", async () => {
  // The demo table with only four non-binary people.
  const dir = await Deno.makeTempDir();
  let kept = 0;
  const lines = (await Deno.readTextFile(DEMO)).trim().split("\n").filter((line, i) =>
    i === 0 || !line.includes(",Non-binary,") || ++kept <= 4
  );
  await Deno.writeTextFile(`${dir}/demo.csv`, lines.join("\n") + "\n");
  const driver = flowDriver(60000);
  const done = guidedFlow(driver.io, { demoPath: `${dir}/demo.csv`, trees: TREES, workers: 1 });
  await driver.when("What do you want to work with?", KEY.enter);
  await driver.when("Which column should paygrove estimate?", KEY.enter);
  await driver.when("Which attributes may explain it?", KEY.enter);
  await driver.when("Check for pay gaps between groups first?", KEY.up, KEY.enter);
  await driver.when("Compare which group with Man (the reference)?");
  await driver.when("Non-binary (too few to report)", KEY.enter); // Woman, the largest
  await driver.when("Compare within which categories of workers?", KEY.enter);
  await driver.when("Start the profile from", KEY.enter);
  await driver.when("What next?", KEY.up, KEY.enter);
  await done;
  assert.doesNotMatch(driver.screen(), /Non-binary \(4 people\)|\b4 people\b/);
});

Deno.test("check an offer on the profile: the range with the offer marked, and its figures", async () => {
  const driver = flowDriver();
  const done = guidedFlow(driver.io, { demoPath: DEMO, trees: TREES, workers: 1 });
  await demoFitted(driver);
  await driver.when("Start the profile from", KEY.enter);
  // Check an offer: the seventh choice (after undo).
  await driver.when("What next?", ...Array(6).fill(KEY.down), KEY.enter);
  await driver.when("Offer (e.g.", "$61,000", KEY.enter);
  await driver.when("is in USD; the model's pay is in EUR");
  await driver.when("Offer (e.g.", ..."\x7f".repeat(7), "€61.000", KEY.enter);
  await driver.when("To reach the estimate");
  await driver.when("What next?", KEY.up, KEY.enter); // Quit
  await done;
  const screen = driver.screen();
  const profile = typicalProfile(model);
  const answer = estimateProfile(session, profile, 0.9);
  const { checkOffer, parseOffer } = await import("../../mod.ts");
  const offer = checkOffer(session, profile, answer, parseOffer(model, "61k"));
  const words = { under: "under", within: "inside", over: "above" }[offer.position!];
  assert.ok(
    screen.includes(`Offer €61,000: ${words} the 90% range, at range position`),
    screen.slice(-1500),
  );
  assert.ok(screen.includes(formatPercent(offer.shareBelow!)) || offer.shareBelow! % 1 === 0);
  assert.match(screen, /\n {2}offer +[ <^>]+ +€61,000\n/);
  assert.ok(screen.includes(`To reach the estimate: ${pay(answer.estimate)}`));
});

Deno.test("the explore screen from the flow: several moves with the arrow keys, a kept scenario, back to the menu", async () => {
  const driver = flowDriver(60000);
  const done = guidedFlow(driver.io, { demoPath: DEMO, trees: TREES, workers: 1 });
  await demoFitted(driver);
  await driver.when("Start the profile from", KEY.enter);
  await driver.when("What next?", KEY.enter); // Change one attribute
  // The last choice of the list: every attribute, with the arrow keys.
  await driver.when("Several, with the arrow keys (explore)", KEY.up, KEY.enter);
  await driver.when("Explore base_pay_eur");
  // Down to level, right: a promotion; keep it; leave with q.
  await driver.when("> job_family", "\x1b[B", "\x1b[C");
  await driver.when(/> level\s+G\d \*/, "k");
  await driver.when("Kept as scenario 1.", "q");
  await driver.when("Kept 1 (1 kept in all).");
  // The flow goes on from the explored profile: its result, then the menu.
  await driver.when("What next?", KEY.up, KEY.enter); // Quit
  await done;
  const raw = driver.raw();
  assert(raw.lastIndexOf("\x1b[?1049l") > raw.lastIndexOf("\x1b[?1049h"), "the screen restored");
});
