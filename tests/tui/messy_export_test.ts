// A messy export (semicolons, decimal commas, "31.940,00 €", windows-1252)
// in every command that reads a table: schema and fit read it without
// --decimal, the model remembers how, and batch, estimate --table and the
// guided flow read it with those defaults or with the options given.
import assert from "node:assert/strict";
import { run } from "../../tui/main.ts";
import { recordingTerminal } from "../../tui/terminal.ts";
import { readModelFile } from "../../mod.ts";
import { guidedFlow } from "../../tui/flow/guided_flow.ts";
import { flowDriver, KEY } from "./_flow_driver.ts";
import { messyExport } from "../_messy_export.ts";

const DEMO = new URL("../../fixtures/demo_company.csv", import.meta.url).pathname;
const messy = messyExport(300);
const dir = await Deno.makeTempDir({ prefix: "paygrove-messy-" });
const table = `${dir}/export.csv`;
await Deno.writeFile(table, messy.bytes);
const model = `${dir}/model.json`;

async function paygrove(args: string[]) {
  const terminal = recordingTerminal(100);
  const status = await run(args, terminal);
  return { status, out: terminal.stdout.join(""), err: terminal.stderr.join("") };
}

Deno.test("schema reads the messy export's pay and years as numbers without --decimal", async () => {
  const { status, out, err } = await paygrove(["schema", table, "--encoding", "windows-1252"]);
  assert.equal(status, 0, err);
  const compact = out.replace(/\s+/g, " ");
  const pays = messy.rows.map((r) => r.pay);
  const euro = (x: number) => `€${x.toLocaleString("en-US", { minimumFractionDigits: 2 })}`;
  assert.ok(
    compact.includes(
      `annual_salary │ numeric │ 0 │ ${euro(Math.min(...pays))} to ${euro(Math.max(...pays))}`,
    ),
    compact,
  );
  assert.match(compact, /years_experience │ numeric/);
  assert.match(compact, /decimal mark: comma, read from cells such as "23,6"/);
});

Deno.test("fit reads it, the model remembers how, and batch and estimate --table read it alike", async () => {
  const fit = await paygrove([
    "fit",
    table,
    "--encoding",
    "windows-1252",
    "--target",
    "annual_salary",
    "--trees",
    "20",
    "--workers",
    "1",
    "--out",
    model,
  ]);
  assert.equal(fit.status, 0, fit.err);
  const saved = await readModelFile(model);
  assert.equal(saved.read.decimal, ",");
  assert.equal(saved.read.encoding, "windows-1252");
  assert.equal(saved.rows.used, 300);
  assert.deepEqual(saved.features.map((f) => f.name), [
    "job_family",
    "level",
    "years_experience",
    "site",
    "remote",
  ]);

  // batch on the export with no reading option: the model's defaults.
  const batch = await paygrove(["batch", model, table, "--json"]);
  assert.equal(batch.status, 0, batch.err);
  const doc = JSON.parse(batch.out);
  assert.equal(doc.rows.length, 300);
  assert.equal(doc.rows[0].input.annual_salary, "143.100,00 €");
  // Every estimate is an average of training pay: inside its range.
  const pays = messy.rows.map((r) => r.pay);
  const [low, high] = [Math.min(...pays), Math.max(...pays)];
  assert.ok(doc.rows.every((r: { estimate: number }) => r.estimate >= low && r.estimate <= high));

  // estimate --table --row on it: the person of row FH10002, as read.
  const estimate = await paygrove([
    "estimate",
    model,
    "--table",
    table,
    "--row",
    "FH10002",
    "--json",
  ]);
  assert.equal(estimate.status, 0, estimate.err);
  const profile = JSON.parse(estimate.out).profile;
  assert.equal(profile.years_experience, messy.rows[1].years);
  assert.equal(profile.site, "Müllerstraße");

  // The same people exported the English way (commas, points, UTF-8): the
  // options given on the command line win over the model's defaults.
  const english = `${dir}/english.csv`;
  const lines = messy.text.trim().split("\r\n").map((line) =>
    line.split(";").map((cell) =>
      cell.endsWith(" €") ? String(Number(cell.replace(/[.€ ]/g, "").replace(",", "."))) : cell
        .replace(/^(\d+),(\d)$/, "$1.$2")
    ).join(",")
  );
  await Deno.writeTextFile(english, lines.join("\n") + "\n");
  const refused = await paygrove(["batch", model, english, "--json"]);
  assert.equal(refused.status, 1);
  const given = await paygrove([
    "batch",
    model,
    english,
    "--json",
    "--decimal",
    ".",
    "--delimiter",
    "comma",
    "--encoding",
    "utf-8",
  ]);
  assert.equal(given.status, 0, given.err);
  const same = JSON.parse(given.out);
  assert.deepEqual(
    same.rows.map((r: { estimate: number }) => r.estimate),
    doc.rows.map((r: { estimate: number }) => r.estimate),
  );
  const tableFlags = await paygrove([
    "estimate",
    model,
    "--table",
    english,
    "--row",
    "FH10002",
    "--decimal",
    ".",
    "--encoding",
    "utf-8",
    "--json",
  ]);
  assert.equal(tableFlags.status, 0, tableFlags.err);
  assert.equal(JSON.parse(tableFlags.out).profile.years_experience, messy.rows[1].years);
});

Deno.test("the guided flow reads the messy export and offers its pay as the column to estimate", async () => {
  const driver = flowDriver();
  const done = guidedFlow(driver.io, {
    demoPath: DEMO,
    trees: 10,
    workers: 1,
    read: { encoding: "windows-1252" },
  });
  await driver.when("What do you want to work with?", KEY.down, KEY.enter);
  await driver.when("Path of the CSV file:", table, KEY.enter);
  // The first choice offered is the pay column, read as money.
  await driver.when(/Which column should paygrove estimate\?[^]*❯ annual_salary/, KEY.enter);
  await driver.when("Which attributes may explain it?", KEY.enter);
  await driver.when("Start the profile from", KEY.enter);
  await driver.when("What next?", KEY.up, KEY.enter);
  await done;
  const screen = driver.screen().replace(/\s+/g, " ");
  assert.match(screen, /annual_salary numeric/);
  assert.match(screen, /Rows: 300 used/);
  assert.doesNotMatch(screen, /--decimal/);
});

Deno.test("the flow asks for the decimal mark where the file does not settle it", async () => {
  // Bonuses "1.500" are 1.5 or 1,500: only the person knows.
  const lines = ["id;level;bonus;pay"];
  for (let r = 0; r < 60; r++) {
    // Pay in whole units, so that only the bonus cells hold a point.
    lines.push(
      `E${r};L${1 + (r % 4)};${1 + (r % 5)}.${["000", "250", "500"][r % 3]};${
        40000 + 900 * (r % 17)
      }`,
    );
  }
  const path = `${dir}/ambiguous.csv`;
  await Deno.writeTextFile(path, lines.join("\n") + "\n");
  const driver = flowDriver();
  const done = guidedFlow(driver.io, { demoPath: DEMO, trees: 10, workers: 1 });
  await driver.when("What do you want to work with?", KEY.down, KEY.enter);
  await driver.when("Path of the CSV file:", path, KEY.enter);
  await driver.when(/What is "1\.000" in this file\?/, KEY.down, KEY.enter);
  await driver.when("Which column should paygrove estimate?", KEY.enter);
  await driver.when("Which attributes may explain it?", KEY.enter);
  await driver.when("Start the profile from", KEY.enter);
  await driver.when("What next?", KEY.up, KEY.enter);
  await done;
  const screen = driver.screen().replace(/\s+/g, " ");
  // Read as thousands: bonus from 1,000 to 5,500, pay from 40,000.
  assert.match(screen, /bonus numeric: 1,000 to 5,500/);
  assert.match(screen, /pay numeric: 40,000 to 54,400/);
});

Deno.test("deno task start takes the table-reading options", async () => {
  // No terminal in tests: the flow stops with its own sentence, not an unknown option.
  const { status, err } = await paygrove(["--decimal", ",", "--encoding", "windows-1252"]);
  assert.equal(status, 2);
  assert.match(err, /the guided flow needs a terminal/);
});

Deno.test({
  name: "clean up",
  fn: () => Deno.remove(dir, { recursive: true }),
});
