// The recruiter's path as a user runs it: `estimate --offer` and `batch`
// with offers, a refused row, the warnings column, the closing summary,
// the provenance file and the exit status that says rows were refused.
// Figures are checked against the library's answers for the same model
// file (tests/lib/model/offer_test.ts recounts them from the file itself).
import assert from "node:assert/strict";
import {
  applySets,
  checkOffer,
  estimateProfile,
  openModel,
  parseOffer,
  readModelFile,
  typicalProfile,
} from "../../mod.ts";
import { parse } from "csv-parse/sync";
import { run } from "../../tui/main.ts";
import { recordingTerminal } from "../../tui/terminal.ts";
import { paygrove, ROOT } from "./_cli.ts";

const dir = await Deno.makeTempDir({ prefix: "paygrove-offer-" });
const demo = `${ROOT}fixtures/demo_company.csv`;
const modelPath = `${dir}/demo.model.json`;
const fitted = await paygrove([
  "fit",
  demo,
  "--target",
  "base_pay_eur",
  "--currency",
  "EUR",
  "--period",
  "base_pay_eur=year",
  "--trees",
  "40",
  "--folds",
  "5",
  "--seed",
  "7",
  "--out",
  modelPath,
]);
if (fitted.code !== 0) throw new Error(`fit failed: ${fitted.stderr}`);
const model = await readModelFile(modelPath);
const session = openModel(model);

const HEADER = "candidate,job_family,level,years_experience,years_at_company,site," +
  "performance_rating,education,remote,offer";
const ROWS = [
  'C-101,Sales,G3,8,0,Millbrook,,Bachelor,no,"€52,000"',
  'C-102,Engineering,G9,14,0,Harbourside,,Master,yes,"€98,500"',
  "C-103,Engineering,G1,60,0,Harbourside,,Master,yes,61k",
  "=C-104,Engineering,G3,8,2,Eastgate,3,Bachelor,no,61k",
];

Deno.test("estimate --offer places the offer and --json says what the screen says", async () => {
  const args = [
    "estimate",
    modelPath,
    "--set",
    "level=G3",
    "--set",
    "job_family=Engineering",
    "--set",
    "years_experience=8",
    "--offer",
    "€61.000",
  ];
  const doc = JSON.parse((await paygrove([...args, "--json"])).stdout);
  const p = applySets(model, typicalProfile(model), [
    "level=G3",
    "job_family=Engineering",
    "years_experience=8",
  ]).profile;
  const answer = estimateProfile(session, p, 0.9);
  const expected = checkOffer(session, p, answer, parseOffer(model, "€61.000"));
  assert.deepEqual(doc.offer, JSON.parse(JSON.stringify(expected)));
  assert.equal(doc.offer.amount, 61000);
  assert.match(doc.offer.readAs, /groups thousands/);
  const text = await paygrove(args);
  assert.equal(text.code, 0, text.stderr);
  const pos = doc.offer.position === "within"
    ? "inside"
    : doc.offer.position === "under"
    ? "under"
    : "above";
  assert.match(text.stdout, new RegExp(`Offer €61,000: ${pos} the 90% range, at range position`));
  assert.match(text.stdout, /\n {2}offer +.*[<^>].* +€61,000\n/);
  assert.match(text.stdout, /of comparable people are paid less than this offer|every comparable/);
  assert.match(text.stdout, /To reach the estimate: €/);
  // A bad offer is a usage error, said before anything else.
  const bad = await paygrove(["estimate", modelPath, "--offer", "$61,000"]);
  assert.equal(bad.code, 2);
  assert.match(bad.stderr, /--offer: "\$61,000" is in USD; the model's pay is in EUR/);
});

Deno.test("batch scores the rows it can, lists the refused one and ends with status 3", async () => {
  const file = `${dir}/candidates.csv`;
  await Deno.writeTextFile(file, [HEADER, ...ROWS].join("\n") + "\n");
  const out = `${dir}/scored.csv`;
  const result = await paygrove(["batch", modelPath, file, "--offer", "offer", "--out", out]);
  assert.equal(result.code, 3, result.stderr);
  assert.match(
    result.stderr,
    /1 row of .*candidates\.csv not scored:\n {2}line 3.*: level "G9" is a level the model never saw/,
  );
  assert.match(
    result.stderr,
    /3 rows scored, 1 refused \(listed above\).*; offers: 1 under, 1 within, 1 over the 90% range; 1 unusual for the data, see the warnings column -> .*scored\.csv; provenance in .*scored\.provenance\.json/,
  );
  const lines = (await Deno.readTextFile(out)).trim().split("\n");
  const header = lines[0].split(",");
  assert.deepEqual(header.slice(-6), [
    "offer_to_estimate",
    "range_position",
    "offer_position",
    "share_paid_less",
    "warnings",
    "model_sha256",
  ]);
  assert.ok(!header.includes("provenance"));
  assert.equal(lines.length, 5);
  const sha = model.provenance.modelFile!.sha256;
  for (const line of lines.slice(1)) assert.ok(line.endsWith(`,${sha.slice(0, 12)}`), line);
  assert.match(lines[2], /,not-scored,.*"not scored: level ""G9"" is a level the model never saw"/);
  // The unusual row says why in its warnings column; the ordinary ones are empty.
  assert.match(lines[3], /years_experience 60 is above what 99% of people at level G1 have/);
  assert.match(lines[1], /,under,[0-9.]+,,[0-9a-f]{12}$/);
  // The identifier that would start a formula is written as text.
  assert.ok(lines[4].startsWith(`"'=C-104"`), lines[4]);
  // Per-person pay stays private; the provenance file names the model in full.
  assert.equal((await Deno.stat(out)).mode! & 0o777, 0o600);
  const provenance = JSON.parse(await Deno.readTextFile(`${dir}/scored.provenance.json`));
  assert.equal(provenance.provenance.modelFile.sha256, sha);
  assert.equal(provenance.modelSha256Column, sha.slice(0, 12));
  assert.deepEqual(provenance.summary, {
    scored: 3,
    under: 1,
    within: 1,
    over: 1,
    noOffer: 0,
    unusual: 1,
  });
  assert.equal(provenance.refused, 1);
});

Deno.test("batch --contributions adds each attribute's part, which multiply to the estimate", async () => {
  const file = `${dir}/parts.csv`;
  await Deno.writeTextFile(
    file,
    [
      HEADER.replace(",offer", ""),
      "C-101,Sales,G3,8,0,Millbrook,,Bachelor,no",
      "C-103,Engineering,G1,6,0,Harbourside,,Master,yes",
    ].join("\n") + "\n",
  );
  const result = await paygrove(["batch", modelPath, file, "--contributions"]);
  assert.equal(result.code, 0, result.stderr);
  const [head, ...rows] = result.stdout.trim().split("\n");
  const header = head.split(",");
  const names = model.features.map((f) => f.name);
  const from = header.indexOf("parts_from");
  assert.deepEqual(header.slice(from, from + 1 + names.length), [
    "parts_from",
    ...names.map((n) => `part_${n}`),
  ]);
  for (const line of rows) {
    // No quoted cells in these rows: a plain split reads them.
    const cells = line.split(",");
    const estimate = Number(cells[header.indexOf("estimate")]);
    const product = names.reduce(
      (p, _, j) => p * (1 + Number(cells[from + 1 + j])),
      Number(cells[from]),
    );
    // Cells are rounded (money to cents, shares to 6 decimals).
    assert.ok(Math.abs(product / estimate - 1) < 1e-5, `${product} vs ${estimate}`);
  }
  // The level's part of a G1 is below 0: a lower level than the table's average.
  const g1 = rows[1].split(",");
  assert.ok(Number(g1[header.indexOf("part_level")]) < 0);
});

Deno.test("batch --json lists the refused rows and the summary, with status 3", async () => {
  const file = `${dir}/candidates.csv`;
  const result = await paygrove(["batch", modelPath, file, "--offer", "offer", "--json"]);
  assert.equal(result.code, 3, result.stderr);
  const doc = JSON.parse(result.stdout);
  assert.deepEqual(doc.refusedRows, [{
    row: 1,
    line: 3,
    reasons: ['level "G9" is a level the model never saw'],
  }]);
  assert.equal(doc.rows[1].estimate, null);
  assert.equal(doc.rows[1].estimateSource, "not-scored");
  assert.equal(doc.scored, 3);
  assert.equal(doc.summary.under, 1);
  // Without --out, piped: CSV on stdout, the provenance said on stderr.
  const piped = await paygrove(["batch", modelPath, file]);
  assert.equal(piped.code, 3);
  assert.ok(piped.stdout.startsWith(`${HEADER},estimate,`));
  assert.match(piped.stderr, /model [0-9a-f]{12} is paygrove .*model sha256 [0-9a-f]{64}/);
});

Deno.test("batch on a terminal prints one readable line per row", async () => {
  const file = `${dir}/candidates.csv`;
  const terminal = { ...recordingTerminal(100), outIsTerminal: true };
  const code = await run(["batch", modelPath, file, "--offer", "offer"], terminal);
  assert.equal(code, 3);
  const out = terminal.stdout.join("").trimEnd().split("\n");
  assert.equal(out.length, 5);
  assert.match(out[0], /^id +estimate +range +offer \(range position\)$/);
  assert.match(out[1], /^row 1 +€\d{2},\d{3} +€\d{2},\d{3} - €\d{2},\d{3} +under \(-0\.\d\d\)$/);
  // Why a row was not scored is listed below the table, on stderr.
  assert.match(out[2], /^row 2 +not scored +see below$/);
  assert.match(terminal.stderr.join(""), /line 3: level "G9" is a level the model never saw/);
  assert.match(out[3], /^row 3 .* over \(\d\.\d\d\) +! unusual$/);
  assert.match(out[4], /^=C-104|^row 4 .* within \(0\.\d\d\)$/);
  assert.ok(!terminal.stdout.join("").includes(",ensemble,"), "no raw CSV on a terminal");
});

Deno.test("batch with every row refused refuses the table (status 1)", async () => {
  const file = `${dir}/all_bad.csv`;
  await Deno.writeTextFile(file, `${HEADER}\n${ROWS[1]}\n`);
  const result = await paygrove(["batch", modelPath, file, "--offer", "offer"]);
  assert.equal(result.code, 1);
  assert.match(result.stderr, /does not match the model's schema/);
});

Deno.test("batch --contributions on two workers writes the same CSV as on one", async () => {
  // Enough rows that the parts go to the workers (ON_WORKERS_FROM).
  const lines = (await Deno.readTextFile(demo)).trim().split("\n").slice(0, 401);
  const file = `${dir}/four_hundred.csv`;
  await Deno.writeTextFile(file, lines.join("\n") + "\n");
  const one = await paygrove(["batch", modelPath, file, "--contributions", "--workers", "1"]);
  const two = await paygrove(["batch", modelPath, file, "--contributions", "--workers", "2"]);
  assert.equal(one.code, 0, one.stderr);
  assert.equal(two.code, 0, two.stderr);
  assert.equal(two.stdout, one.stdout);
  // Every row scored, its parts filled in (the lib's own test covers
  // training rows read by their out-of-bag trees, which need the analyst's file).
  const [head, ...body] = parse(one.stdout) as string[][];
  assert.equal(body.length, 400);
  const from = head.indexOf("parts_from");
  assert.ok(body.every((cells) => Number(cells[from]) > 0 && cells[from + 1] !== ""));
});

Deno.test("batch --contributions names each part after its column, whatever the name", async () => {
  // Column names a spreadsheet or a terminal would act on.
  const names = ['=HYPERLINK("http://x")', "level, grade", 'say "hi"', "\u001b[31mred"];
  const rows = Array.from(
    { length: 60 },
    (_, i) =>
      [
        `P${i}`,
        `G${1 + (i % 3)}`,
        i % 2 ? "North" : "South",
        String(i % 7),
        `x${i % 4}`,
        40000 + 900 * (i % 3) + 37 * i,
      ]
        .join(","),
  );
  const header = ["id", ...names.map((n) => `"${n.replaceAll('"', '""')}"`), "pay"].join(",");
  const table = `${dir}/hostile.csv`;
  await Deno.writeTextFile(table, [header, ...rows].join("\n") + "\n");
  const model = `${dir}/hostile.model.json`;
  const fit = await paygrove([
    "fit",
    table,
    "--target",
    "pay",
    "--trees",
    "10",
    "--folds",
    "3",
    "--out",
    model,
  ]);
  assert.equal(fit.code, 0, fit.stderr);
  const result = await paygrove(["batch", model, table, "--contributions"]);
  assert.equal(result.code, 0, result.stderr);
  const [head] = parse(result.stdout, { to_line: 1 }) as string[][];
  for (const name of names) {
    const cell = head.find((h) => h.startsWith("part_") && h.includes(name.slice(1, 6)));
    assert.ok(
      cell !== undefined,
      `no part column for ${JSON.stringify(name)}: ${head.join(" | ")}`,
    );
    // Written as data: no cell opens with a formula sign, no raw escape.
    assert.ok(!/^[=+\-@]/.test(cell) && !cell.includes("\u001b"), cell);
  }
});
