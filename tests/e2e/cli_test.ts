// End-to-end checks of the paygrove command: exit statuses, messages and the
// JSON schema document, run as a user runs it.
import assert from "node:assert/strict";
import { HAS_SCRIPT, paygrove, paygroveOnTerminal, ROOT } from "./_cli.ts";

// deno-lint-ignore no-control-regex
const ANSI = /\x1b\[/;

Deno.test("schema --json prints one document with rows and typed columns", async () => {
  const result = await paygrove(["schema", "fixtures/cps1988.csv", "--target", "wage", "--json"]);
  assert.equal(result.code, 0, result.stderr);
  assert.equal(result.stderr, "");
  const doc = JSON.parse(result.stdout);
  assert.equal(doc.rows, 28155);
  assert.deepEqual(
    doc.columns.map((c: { name: string; type: string }) => `${c.name}:${c.type}`),
    [
      "wage:numeric",
      "education:numeric",
      "experience:numeric",
      "ethnicity:categorical",
      "smsa:categorical",
      "region:categorical",
      "parttime:categorical",
    ],
  );
  const region = doc.columns[5];
  assert.deepEqual(region.levels, ["midwest", "northeast", "south", "west"]);
  assert.equal(region.protected, false);
  assert.equal(doc.columns[3].protected, true);
  assert.equal(doc.columns[1].min, 0);
  assert.equal(doc.columns[1].max, 18);
  assert.equal(doc.columns[0].missing, 0);
});

Deno.test("schema prints a readable table without colour when piped", async () => {
  const result = await paygrove(["schema", "fixtures/cps1985.csv", "--currency", "USD"]);
  assert.equal(result.code, 0, result.stderr);
  assert.doesNotMatch(result.stdout, ANSI);
  const lines = result.stdout.split("\n");
  assert.equal(lines[0], "fixtures/cps1985.csv: 534 rows, 11 columns");
  const wage = lines.find((l) => l.startsWith("│ wage "));
  assert.ok(wage?.includes("$1.00 to $44.50 (USD)"), wage);
  const gender = lines.find((l) => l.startsWith("│ gender "));
  assert.match(gender ?? "", /2 levels: female, male\s+│ yes/);
  assert.ok(result.stdout.includes("Protected attributes (age, ethnicity, gender, married)"));
});

Deno.test("--version and --help succeed", async () => {
  const version = await paygrove(["--version"]);
  assert.equal(version.code, 0);
  const config = JSON.parse(await Deno.readTextFile(`${ROOT}deno.json`));
  assert.equal(version.stdout.trim(), config.version);
  const help = await paygrove(["--help"]);
  assert.equal(help.code, 0);
  assert.match(help.stdout, /schema \[options\] <table>/);
  const schemaHelp = await paygrove(["schema", "--help"]);
  assert.equal(schemaHelp.code, 0);
  assert.match(schemaHelp.stdout, /--target <column>/);
});

Deno.test("bad usage exits 2 with a hint", async () => {
  const unknown = await paygrove(["schema", "--bogus"]);
  assert.equal(unknown.code, 2);
  assert.equal(unknown.stderr, "error: unknown option '--bogus'\n(add --help for usage)\n");
  const missingArg = await paygrove(["schema"]);
  assert.equal(missingArg.code, 2);
  const badValue = await paygrove(["schema", "fixtures/cps1985.csv", "--type", "wage=money"]);
  assert.equal(badValue.code, 2);
  assert.match(badValue.stderr, /a type must be one of numeric, categorical, ordinal, identifier/);
  const column = await paygrove(["schema", "fixtures/cps1985.csv", "--target", "salary"]);
  assert.equal(column.code, 2);
  assert.equal(
    column.stderr,
    'paygrove: --target: no column named "salary"; the columns are: wage, education, ' +
      "experience, age, ethnicity, region, gender, occupation, sector, union, married\n",
  );
});

Deno.test("bad data exits 1 with one line and no stack trace", async () => {
  const dir = await Deno.makeTempDir({ prefix: "paygrove-e2e-" });
  try {
    const ragged = `${dir}/ragged.csv`;
    await Deno.writeTextFile(ragged, "site,pay\nA,1\nB,2,3\n");
    const cases: [string[], string][] = [
      [["schema", `${dir}/none.csv`], `paygrove: ${dir}/none.csv: no such file\n`],
      [["schema", dir], `paygrove: ${dir} is a folder, not a CSV file\n`],
      [
        ["schema", ragged],
        `paygrove: ${ragged}: 1 row does not have the 2 fields of the header: line 3 has 3 ` +
        `(delimiter detected: comma; give --delimiter if the file uses another)\n`,
      ],
    ];
    for (const [args, message] of cases) {
      const result = await paygrove(args);
      assert.equal(result.code, 1, args.join(" "));
      assert.equal(result.stderr, message);
      assert.equal(result.stdout, "");
    }
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});

// `script` (util-linux) gives the command a pseudo-terminal, so colour
// switches on unless NO_COLOR is set.
Deno.test({
  name: "colour on a terminal, none with NO_COLOR",
  ignore: !HAS_SCRIPT,
  fn: async () => {
    const coloured = await paygroveOnTerminal(["schema", "fixtures/cps1985.csv"]);
    assert.match(coloured.screen, ANSI);
    const plain = await paygroveOnTerminal(["schema", "fixtures/cps1985.csv"], { noColor: true });
    assert.doesNotMatch(plain.screen, ANSI);
  },
});

Deno.test({
  name: "help on a terminal needs no permission beyond the task's",
  ignore: !HAS_SCRIPT,
  fn: async () => {
    const { code, screen } = await paygroveOnTerminal(["--help"]);
    assert.equal(code, 0, screen);
    assert.match(screen, /Usage: paygrove/);
    assert.doesNotMatch(screen, /NotCapable|requests env access|internal error/);
  },
});

Deno.test("a misspelled command is named, with a suggestion", async () => {
  const result = await paygrove(["shema", "fixtures/cps1985.csv"]);
  assert.equal(result.code, 2);
  assert.match(result.stderr, /unknown command 'shema'/);
  assert.match(result.stderr, /Did you mean schema\?/);
});

Deno.test("without a terminal the guided flow points to the subcommands and exits 2", async () => {
  const bare = await paygrove([]);
  assert.equal(bare.code, 2);
  assert.match(
    bare.stderr,
    /the guided flow needs a terminal to ask its questions, and standard input is not one\. In scripts use the subcommands: paygrove fit, estimate/,
  );
  assert.equal(bare.stdout, "");
});

Deno.test("an unknown encoding is bad usage", async () => {
  const result = await paygrove(["schema", "fixtures/cps1985.csv", "--encoding", "latin-9x"]);
  assert.equal(result.code, 2);
  assert.equal(
    result.stderr,
    'paygrove: --encoding: unknown text encoding "latin-9x" (e.g. utf-8, windows-1252, ' +
      "iso-8859-15)\n",
  );
});

Deno.test("every task runs without network permission", async () => {
  const config = JSON.parse(await Deno.readTextFile(`${ROOT}deno.json`));
  let sets = 0;
  for (const [name, command] of Object.entries(config.tasks as Record<string, string>)) {
    if (!/^([A-Z_]+=\S+ )*deno (run|test|bench)/.test(command)) continue;
    assert.doesNotMatch(command, /--allow-net|--allow-all|\s-A\b|\s-N\b/, name);
    // A task names its permissions either as flags or as a permission set of
    // deno.json (`-P` is the set named "default", `-P=NAME` another).
    const set = command.match(/\s(?:-P|--permission-set)(?:=(\S+))?\s/);
    if (set === null) {
      assert.match(command, /--deny-net/, name);
      continue;
    }
    sets++;
    const permissions = config.permissions?.[set[1] ?? "default"];
    assert.ok(permissions, `${name}: no permission set ${set[1] ?? "default"} in deno.json`);
    assert.deepEqual(permissions.net, { deny: true }, name);
    assert.equal(permissions.all, undefined, name);
  }
  assert.equal(sets, 2, "start and paygrove use the permission set");
});

Deno.test("the program's tasks turn off Deno's update check", async () => {
  // Without it, `deno run` looks up dl.deno.land (a DNS query leaves the
  // machine) before the program starts; --deny-net does not cover it.
  const config = JSON.parse(await Deno.readTextFile(`${ROOT}deno.json`));
  for (const name of ["start", "paygrove"]) {
    assert.match(config.tasks[name], /^DENO_NO_UPDATE_CHECK=1 deno run /, name);
  }
});

Deno.test("demo-data writes the invented company's table, and keeps an existing file", async () => {
  const { demoCompanyCsv } = await import("../../mod.ts");
  const out = await paygrove(["demo-data", "--rows", "5", "--seed", "9"]);
  assert.equal(out.code, 0, out.stderr);
  assert.equal(out.stdout, demoCompanyCsv({ rows: 5, seed: 9 }));
  const dir = await Deno.makeTempDir();
  const file = `${dir}/demo.csv`;
  const first = await paygrove(["demo-data", "--rows", "3", "--out", file]);
  assert.equal(first.code, 0, first.stderr);
  assert.match(first.stderr, /3 invented people \(Fernhollow Instruments \(invented\)\) ->/);
  const again = await paygrove(["demo-data", "--out", file]);
  assert.equal(again.code, 2);
  assert.match(again.stderr, /already exists; add --force/);
  assert.equal(await Deno.readTextFile(file), demoCompanyCsv({ rows: 3 }));
  await Deno.remove(dir, { recursive: true });
});

Deno.test("numbers typed as options are refused unless written as such, with their bounds", async () => {
  // Number("") is 0: `--trees ""` once fitted the reference tree alone, and
  // `--seed ""` used seed 0, without a word. batch took any --coverage.
  const demo = `${ROOT}fixtures/demo_company.csv`;
  const out = `${await Deno.makeTempDir()}/never.json`;
  const fit = ["fit", demo, "--target", "base_pay_eur", "--out", out];
  const cases: [string[], RegExp][] = [
    [
      [...fit, "--trees", ""],
      /--trees <n>' argument '' is invalid\. expected a whole number from 0 to 10,000/,
    ],
    [[...fit, "--trees", "20000"], /from 0 to 10,000, got "20000"/],
    [[...fit, "--trees", "1e2"], /got "1e2"/],
    [[...fit, "--seed", ""], /expected a whole number from 0 to 2,147,483,647, got ""/],
    [[...fit, "--seed", "4294967297"], /from 0 to 2,147,483,647/],
    [["demo-data", "--rows", "20000000"], /from 1 to 10,000,000/],
    [["review", demo, "--target", "base_pay_eur", "--coverage", "1"], /full coverage/],
    [["batch", out, demo, "--coverage", "5"], /a coverage from 0\.5 to 0\.99/],
    [["estimate", out, "--coverage", "0.3"], /a coverage from 0\.5 to 0\.99/],
    [["gap", demo, "--target", "base_pay_eur", "--group", "gender", "--threshold", ""], /a share/],
  ];
  for (const [args, message] of cases) {
    const result = await paygrove(args);
    assert.equal(result.code, 2, `${args.join(" ")}: ${result.stderr}`);
    assert.match(result.stderr, message, args.join(" "));
  }
  await assert.rejects(Deno.stat(out), Deno.errors.NotFound);
});

Deno.test("a header that starts with two byte-order marks names its first column plainly", async () => {
  const dir = await Deno.makeTempDir();
  const path = `${dir}/two_marks.csv`;
  await Deno.writeTextFile(path, "\ufeff\ufeffid,level,pay\nE1,L1,50000\nE2,L2,60000\n");
  const result = await paygrove(["schema", path, "--json"]);
  assert.equal(result.code, 0, result.stderr);
  const names = JSON.parse(result.stdout).columns.map((c: { name: string }) => c.name);
  assert.deepEqual(names, ["id", "level", "pay"]);
});

Deno.test("with --json a refusal is also one JSON document on stdout: its kind, options and place", async () => {
  const dir = await Deno.makeTempDir();
  try {
    await Deno.writeTextFile(`${dir}/pay.csv`, "level,pay\nG1,50000\nG2,oops\nG1,51000\n");
    // A pay column with a word in it: a data error naming the line.
    const out = ["--out", `${dir}/m.model`];
    const data = await paygrove(["fit", `${dir}/pay.csv`, "--target", "pay", ...out, "--json"]);
    assert.equal(data.code, 1, data.stderr);
    const dataDoc = JSON.parse(data.stdout).error;
    assert.equal(dataDoc.kind, "data");
    assert.deepEqual(dataDoc.location, { file: `${dir}/pay.csv`, line: 3, column: "pay" });
    assert.match(data.stderr, /^paygrove: /);
    assert.equal(`paygrove: ${dataDoc.message}\n`, data.stderr);
    // A value below its bound: an option error naming both options.
    const option = await paygrove([
      "fit",
      "fixtures/demo_company.csv",
      "--target",
      "base_pay_eur",
      "--min-leaf",
      "2",
      ...out,
      "--json",
    ]);
    assert.equal(option.code, 2, option.stderr);
    assert.deepEqual(JSON.parse(option.stdout).error.options, ["--min-leaf", "--privacy-min"]);
    // An attacker's column name in the refusal: in the JSON it is the exact
    // text with its escape written as \u001b, never a raw control character.
    await Deno.writeTextFile(`${dir}/evil.csv`, "level,\x1b[2Jpay\nG1,50000\nG2,oops\nG1,51000\n");
    const evil = await paygrove([
      "fit",
      `${dir}/evil.csv`,
      "--target",
      "\x1b[2Jpay",
      ...out,
      "--json",
    ]);
    assert.equal(evil.code, 2, evil.stderr);
    assert.doesNotMatch(evil.stdout, ANSI);
    assert.match(evil.stdout, /\\u001b\[2Jpay/);
    assert.ok(JSON.parse(evil.stdout).error.message.startsWith('only 3 rows have "\x1b[2Jpay"'));
    // On stderr the name is shown with its escape made visible.
    assert.doesNotMatch(evil.stderr, ANSI);
    // Without --json, stdout stays empty.
    const plain = await paygrove(["fit", `${dir}/pay.csv`, "--target", "pay", ...out]);
    assert.equal(plain.code, 1);
    assert.equal(plain.stdout, "");
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});
