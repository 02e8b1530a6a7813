// The model commands run as a user runs them (a subprocess with the
// `paygrove` task's permissions), on the invented demo table. JSON fields
// are checked against the library's own answers for the same model file,
// and batch's out-of-bag estimates against an ensemble fitted here.
import assert from "node:assert/strict";
import {
  applyChanges,
  applyRow,
  applySets,
  bootstrapCounts,
  compareAnswer,
  crossValidateTree,
  diverseLeaves,
  estimateCenter,
  estimateProfile,
  fitEnsembleParallel,
  loadTableFile,
  makeDataset,
  openModel,
  readForModel,
  readModelFile,
  rowProfile,
  typicalProfile,
} from "../../mod.ts";
import { paygrove, ROOT } from "./_cli.ts";

const dir = await Deno.makeTempDir({ prefix: "paygrove-e2e-" });
const demo = `${ROOT}fixtures/demo_company.csv`;
const modelPath = `${dir}/demo.model.json`;
const analystPath = `${dir}/demo.analyst.json`;
const FIT = [
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
  "--analyst-file",
  analystPath,
];
const fitted = await paygrove([...FIT, "--json"]);
if (fitted.code !== 0) throw new Error(`fit failed: ${fitted.stderr}`);
const model = await readModelFile(modelPath);
const session = openModel(model);

function json(result: { code: number; stdout: string; stderr: string }) {
  assert.equal(result.code, 0, result.stderr);
  return JSON.parse(result.stdout);
}

function close(a: number, b: number, what: string): void {
  assert.ok(Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(b)), `${what}: ${a} vs ${b}`);
}

Deno.test("fit --json prints the summary document and writes the model", () => {
  const doc = JSON.parse(fitted.stdout);
  assert.equal(doc.target, "base_pay_eur");
  assert.equal(doc.scale, "log");
  assert.equal(doc.currency, "EUR");
  assert.equal(doc.rows, 2000);
  assert.equal(doc.rowsDropped, 0);
  assert.deepEqual(doc.dropped.map((d: { name: string }) => d.name).sort(), [
    "employee_id",
    "gender",
  ]);
  assert.equal(doc.ensemble.trees, 40);
  assert.equal(doc.referenceTree.leaves, model.reference.leaves);
  close(doc.ensemble.oobRmse, model.quality.ensemble!.money!.rmse, "oobRmse");
  close(doc.baselines.linearCvRmse, model.quality.linear!.money!.rmse, "linear");
  assert.ok(doc.pruningPath.length > 1 && doc.pruningPath[0].alpha === 0);
  assert.equal(doc.provenance.table.sha256.length, 64);
  assert.equal(doc.model.path, modelPath);
  // Nothing but the JSON on stdout.
  assert.equal(fitted.stdout.trim()[0], "{");
});

Deno.test("fit refuses to replace a model without --force, and replaces it with", async () => {
  const again = await paygrove(FIT);
  assert.equal(again.code, 2);
  assert.match(
    again.stderr,
    /--out: .*demo\.model\.json already exists; add --force to replace it/,
  );
  const copy = `${dir}/copy.json`;
  await Deno.copyFile(modelPath, copy);
  const forced = await paygrove([...FIT.slice(0, -2), "--trees", "0", "--out", copy, "--force"]);
  assert.equal(forced.code, 0, forced.stderr);
  assert.match(forced.stdout, /No ensemble \(--trees 0\): estimates carry no intervals/);
  assert.equal((await readModelFile(copy)).ensemble, null);
  // Its estimates say they carry no interval.
  const doc = json(await paygrove(["estimate", copy, "--json"]));
  assert.equal(doc.confidence, null);
  assert.ok(doc.warnings.some((w: string) => /no ensemble .* carries no interval/.test(w)));
});

Deno.test("estimate --json equals the library's answer for the same profile", () => {
  return (async () => {
    const doc = json(
      await paygrove([
        "estimate",
        modelPath,
        "--set",
        "level=G4",
        "--set",
        "job_family=Sales",
        "--json",
      ]),
    );
    const { profile } = applySets(model, typicalProfile(model), ["level=G4", "job_family=Sales"]);
    const expected = estimateProfile(session, profile, 0.9);
    close(doc.estimate, expected.estimate, "estimate");
    close(doc.confidence.low, expected.confidence!.low, "confidence.low");
    close(doc.range.high, expected.range!.high, "range.high");
    assert.equal(doc.confidence.coverage, 0.9);
    assert.deepEqual(
      doc.path.map((s: { condition: string }) => s.condition),
      expected.path.map((s) => s.condition),
    );
    assert.equal(doc.leaf.rows, expected.leaf.rows);
    assert.equal(doc.profile.level, "G4");
    assert.equal(doc.support.rows, expected.support.rows);
    assert.equal(typeof doc.support.unusual, "boolean");
    assert.equal(doc.trees.length, 40);
  })();
});

Deno.test("estimate from a row of the table starts from that person", async () => {
  const doc = json(
    await paygrove(["estimate", modelPath, "--table", demo, "--row", "FH10002", "--json"]),
  );
  assert.equal(doc.profile.level, "G1");
  assert.equal(doc.profile.job_family, "Engineering");
  assert.equal(doc.start, `row FH10002 of ${demo}`);
});

Deno.test("a junior level with twenty years at the company is flagged as unusual", async () => {
  const doc = json(
    await paygrove([
      "estimate",
      modelPath,
      "--set",
      "level=G1",
      "--set",
      "years_at_company=20",
      "--set",
      "years_experience=22",
      "--json",
    ]),
  );
  assert.equal(doc.support.unusual, true);
  assert.ok(
    doc.support.reasons.some((r: string) =>
      /years_at_company 20 is above what 99% of people at level G1 have/.test(r)
    ),
    doc.support.reasons.join("; "),
  );
});

Deno.test("compare: a promotion's paired difference equals the library's", async () => {
  const doc = json(
    await paygrove(["compare", modelPath, "--set", "level=G3", "--change", "level=+1", "--json"]),
  );
  const base = applySets(model, typicalProfile(model), ["level=G3"]).profile;
  const changed = applyChanges(model, base, ["level=+1"]).profile;
  const expected = compareAnswer(session, base, changed, 0.9);
  close(doc.difference.estimate, expected.difference.estimate, "difference");
  close(doc.difference.low, expected.difference.low!, "difference.low");
  close(doc.difference.high, expected.difference.high!, "difference.high");
  assert.deepEqual(doc.changes, [{ feature: "level", from: "G3", to: "G4" }]);
  assert.ok(doc.difference.low > 0, "a promotion raises the estimate on this table");
  assert.ok(doc.pathChange !== null && doc.pathChange.step >= 1);
});

Deno.test("sweep --json walks every level", async () => {
  const doc = json(await paygrove(["sweep", modelPath, "--vary", "level", "--json"]));
  assert.deepEqual(doc.points.map((p: { value: string }) => p.value), [
    "G1",
    "G2",
    "G3",
    "G4",
    "G5",
    "G6",
    "G7",
  ]);
  const estimates = doc.points.map((p: { estimate: number }) => p.estimate);
  assert.ok(
    estimates.every((e: number, i: number) => i === 0 || e > estimates[i - 1]),
    `${estimates}`,
  );
  const numeric = json(
    await paygrove([
      "sweep",
      modelPath,
      "--vary",
      "years_experience",
      "--from",
      "2",
      "--to",
      "20",
      "--steps",
      "7",
      "--json",
    ]),
  );
  assert.deepEqual(numeric.points.map((p: { value: number }) => p.value), [
    2,
    5,
    8,
    11,
    14,
    17,
    20,
  ]);
});

Deno.test("without the analyst's file, batch cannot tell training rows and says so", async () => {
  const run = await paygrove(["batch", modelPath, demo, "--json"]);
  const doc = json(run);
  assert.equal(doc.trainingRowsRecognised, false);
  assert.equal(doc.outOfBag, 0);
  assert.ok(doc.rows.every((r: { estimateSource: string }) => r.estimateSource === "ensemble"));
  const text = await paygrove(["batch", modelPath, demo, "--out", `${dir}/plain.csv`]);
  // The demo table is the very file the model was fitted on: that much is
  // known without the analyst's file, and said.
  assert.equal(doc.trainingTable, true);
  assert.match(
    text.stderr,
    /this is the table the model was fitted on: every row's estimate includes that person's own pay/,
  );
  const alone = await paygrove(["estimate", modelPath, "--table", demo, "--row", "FH10003"]);
  assert.equal(alone.code, 0, alone.stderr);
  assert.match(alone.stdout, /FH10003 is in the table the model was fitted on \(the same file\)/);
});

Deno.test("fit --analyst-file writes a file only its owner reads, which says what it is", async () => {
  const doc = JSON.parse(fitted.stdout);
  assert.deepEqual(doc.analystFile, { path: analystPath, rebuildsPay: true });
  assert.equal((await Deno.stat(analystPath)).mode! & 0o777, 0o600);
  assert.match(await Deno.readTextFile(analystPath), /rebuilds every person's pay/);
  // The model file itself is the shareable one: no seeds, no row keys.
  const shared = JSON.parse(await Deno.readTextFile(modelPath));
  assert.equal(shared.format, 2);
  assert.equal(shared.rowKeys, undefined);
  assert.equal(shared.ensemble.seeds, undefined);
});

Deno.test("batch on the training table gives each row its out-of-bag estimate", async () => {
  const out = `${dir}/scored.csv`;
  const run = await paygrove([
    "batch",
    modelPath,
    demo,
    "--analyst-file",
    analystPath,
    "--out",
    out,
  ]);
  assert.equal(run.code, 0, run.stderr);
  assert.match(
    run.stderr,
    /2000 rows scored \(2000 training rows given their out-of-bag estimate\); \d+ unusual for the data/,
  );
  const lines = (await Deno.readTextFile(out)).trim().split("\n");
  const header = lines[0].split(",");
  const col = (name: string) => header.indexOf(name);
  // The same ensemble fitted here, on the same table, seed and alpha.
  const table = await loadTableFile(demo, { target: "base_pay_eur" });
  const { dataset } = makeDataset(table, { target: "base_pay_eur" });
  if (dataset.target.kind !== "regression") throw new Error("regression expected");
  const logData = {
    ...dataset,
    target: { ...dataset.target, values: dataset.target.values.map(Math.log) },
  };
  // The exact alpha (the file keeps it to 4 significant digits) from the
  // same cross-validation the fit ran.
  const cv = crossValidateTree(logData, { folds: 5, seed: 7, grow: { minLeaf: 5 } });
  const alpha = cv.candidates[cv.best].alpha;
  assert.equal(model.ensemble!.alpha, Number(alpha.toPrecision(4)));
  const ensemble = await fitEnsembleParallel(logData, {
    trees: 40,
    seed: 7,
    prune: "alpha",
    alpha,
    grow: { minLeaf: 5 },
    workers: 1,
  });
  // Moved to a median by the median out-of-bag residual, which the file
  // keeps to 4 significant digits.
  const center = estimateCenter(ensemble.oob, logData.target.values);
  const shift = Number(center.shift.toPrecision(4));
  assert.equal(model.target.center!.shift, shift);
  // The shared trees merge leaves whose drawn people are paid the same
  // (lib/tree/diverse_leaves.ts): the same merge here, then each row's
  // out-of-bag mean over the trees that did not draw it.
  const pay = dataset.target.values;
  const shared = ensemble.trees.map((t, b) =>
    diverseLeaves(t, logData.features, bootstrapCounts(2000, ensemble.resamples, b), pay)
  );
  const counts = shared.map((_, b) => bootstrapCounts(2000, ensemble.resamples, b));
  for (let r = 0; r < 2000; r++) {
    const cells = lines[r + 1].split(",");
    assert.equal(cells[col("estimate_source")], "out-of-bag");
    let sum = 0;
    let n = 0;
    shared.forEach((t, b) => {
      if (counts[b][r] > 0) return;
      sum += t.value[applyRow(t, logData.features, r)];
      n++;
    });
    // Written with two decimals.
    assert.ok(
      Math.abs(Number(cells[col("estimate")]) - Math.exp(sum / n + shift)) <= 0.005,
      `row ${r}`,
    );
  }
});

Deno.test("batch on new rows: ordinary estimates, and offers placed in the range", async () => {
  const file = `${dir}/offers.csv`;
  await Deno.writeTextFile(
    file,
    "employee_id,job_family,level,years_experience,years_at_company,site,performance_rating,education,remote,offer\n" +
      'N1,Sales,G2,3,1,Millbrook,3,Bachelor,no,"€48,000"\n' +
      "N2,Engineering,G5,15,4,Harbourside,4,Master,no,60000\n",
  );
  const doc = json(await paygrove(["batch", modelPath, file, "--offer", "offer", "--json"]));
  const rows = readForModel(model, await Deno.readTextFile(file), file);
  doc.rows.forEach((row: Record<string, number | string>, r: number) => {
    const expected = estimateProfile(session, rowProfile(rows, r), 0.9);
    assert.equal(row.estimateSource, "ensemble");
    close(row.estimate as number, expected.estimate, "estimate");
    const offer = [48000, 60000][r];
    close(row.offerToEstimate as number, offer / expected.estimate, "offer_to_estimate");
    close(
      row.rangePosition as number,
      (offer - expected.range!.low) / (expected.range!.high - expected.range!.low),
      "range_position",
    );
    const where = offer < expected.range!.low
      ? "under"
      : offer > expected.range!.high
      ? "over"
      : "within";
    assert.equal(row.offerPosition, where);
  });
  assert.equal(doc.rows[1].offerPosition, "under");
});

Deno.test("inspect --json gives the model card", async () => {
  const doc = json(await paygrove(["inspect", modelPath, "--tree", "--json"]));
  assert.equal(doc.settings.trees, 40);
  assert.equal(doc.referenceTree.outline[0].rows, 2000);
  assert.match(doc.contents, /no one's pay/);
});

Deno.test("bad profile input gets clear messages", async () => {
  const cases: [string[], number, RegExp][] = [
    [
      ["--set", "levl=G3"],
      2,
      /--set: the model has no attribute "levl" \(did you mean "level"\?\); its attributes are: job_family, level/,
    ],
    [
      ["--set", "level=G9"],
      2,
      /--set: "level" has no level "G9": it is above the highest level, G7; its levels are: G1, G2, G3, G4, G5, G6, G7/,
    ],
    [
      ["--set", "years_experience=ten"],
      2,
      /--set: "years_experience" is a number, and "ten" is not one/,
    ],
    [
      ["--set", "gender=Woman"],
      2,
      /--set: "gender" is not used by this model \(protected attribute\)/,
    ],
    [["--row", "FH10002"], 2, /--row needs --table: the model file keeps no one's row/],
    [
      ["--table", demo, "--row", "NOBODY"],
      1,
      /--row: .*demo_company\.csv has no row with employee_id "NOBODY"/,
    ],
    [["--set", "level"], 2, /--set: expected COLUMN=VALUE, got "level"/],
  ];
  for (const [args, code, pattern] of cases) {
    const run = await paygrove(["estimate", modelPath, ...args]);
    assert.equal(run.code, code, `${args.join(" ")}: ${run.stderr}`);
    assert.match(run.stderr, pattern);
    assert.equal(run.stdout, "");
  }
  // Outside the training range: allowed, with a warning.
  const far = json(
    await paygrove(["estimate", modelPath, "--set", "years_experience=60", "--json"]),
  );
  assert.ok(
    far.warnings.some((w: string) => /years_experience 60 is outside the training data/.test(w)),
  );
  // A promotion beyond the top of the ladder.
  const top = await paygrove(["compare", modelPath, "--set", "level=G7", "--change", "level=+1"]);
  assert.equal(top.code, 2);
  assert.match(top.stderr, /--change: level=\+1 moves G7 beyond the ladder \(G1 to G7\)/);
});

Deno.test("a table that does not match the model is refused with the differences", async () => {
  const file = `${dir}/other.csv`;
  await Deno.writeTextFile(
    file,
    "job_family,level,years_experience,years_at_company,site,performance_rating,education,remote\n" +
      "Sales,G2,3,1,Moonbase,3,Bachelor,no\nLegal,G3,5,2,Eastgate,3,Bachelor,no\n",
  );
  const run = await paygrove(["batch", modelPath, file]);
  assert.equal(run.code, 1);
  assert.match(run.stderr, /does not match the model's schema/);
  assert.match(run.stderr, /"job_family" has level "Legal" the model never saw/);
  assert.match(run.stderr, /"site" has level "Moonbase" the model never saw/);
  const lacking = `${dir}/lacking.csv`;
  await Deno.writeTextFile(lacking, "job_family,level\nSales,G2\n");
  const short = await paygrove(["batch", modelPath, lacking]);
  assert.equal(short.code, 1);
  assert.match(
    short.stderr,
    /lacking\.csv does not match the model: it lacks the columns "years_experience"/,
  );
});

Deno.test("a damaged model file is refused, not trusted", async () => {
  const text = await Deno.readTextFile(modelPath);
  const broken = `${dir}/broken.json`;
  await Deno.writeTextFile(broken, text.slice(0, 1000));
  const run = await paygrove(["estimate", broken]);
  assert.equal(run.code, 1);
  assert.match(run.stderr, /broken\.json is not a complete paygrove model: it is not valid JSON/);
});

Deno.test("a protected attribute is a lever only in a model fitted with --allow-protected, with a caution", async () => {
  const out = `${dir}/protected.json`;
  const fit = await paygrove([
    ...FIT.slice(0, -2),
    "--trees",
    "5",
    "--allow-protected",
    "--out",
    out,
  ]);
  assert.equal(fit.code, 0, fit.stderr);
  assert.match(fit.stderr, /Caution: --allow-protected lets sex, race, age/);
  const run = await paygrove(["estimate", out, "--set", "gender=Woman", "--json"]);
  assert.equal(run.code, 0, run.stderr);
  assert.match(run.stderr, /Caution: --allow-protected/);
  assert.equal(JSON.parse(run.stdout).profile.gender, "Woman");
  // The file says so, and every command answering from it repeats the caution.
  assert.equal((await readModelFile(out)).settings.allowProtected, true);
  for (
    const args of [
      ["compare", out, "--change", "level=+1"],
      ["sweep", out, "--vary", "level"],
      ["batch", out, demo],
    ]
  ) {
    const answer = await paygrove(args);
    assert.equal(answer.code, 0, `${args[0]}: ${answer.stderr}`);
    assert.match(answer.stderr, /Caution: --allow-protected/, args[0]);
  }
  // Without --allow-protected the attribute is no lever.
  const plain = await paygrove(["estimate", modelPath, "--set", "gender=Woman"]);
  assert.equal(plain.code, 2);
  assert.match(plain.stderr, /"gender"/);
});

globalThis.addEventListener("unload", () => {
  try {
    Deno.removeSync(dir, { recursive: true });
  } catch {
    // Already gone.
  }
});

Deno.test("fixes from a newcomer's trial: each mistake gets a message and the right status", async () => {
  const noTarget = await paygrove(["fit", demo, "--out", `${dir}/x.json`]);
  assert.equal(noTarget.code, 2);
  assert.match(noTarget.stderr, /fit needs --target COLUMN: the column to estimate/);
  const tableAlone = await paygrove(["estimate", modelPath, "--table", demo]);
  assert.equal(tableAlone.code, 2);
  assert.match(tableAlone.stderr, /--table needs --row ID/);
  const empty = await paygrove(["estimate", modelPath, "--set", "years_experience="]);
  assert.equal(empty.code, 2);
  assert.match(empty.stderr, /"years_experience=" has no value; give one, or years_experience=NA/);
  const comma = await paygrove(["estimate", modelPath, "--set", "years_experience=10,5"]);
  assert.match(comma.stderr, /write decimals with a point: 10\.5/);
  const noFile = await paygrove([
    "estimate",
    modelPath,
    "--table",
    `${dir}/nosuch.csv`,
    "--row",
    "A",
  ]);
  assert.equal(noFile.code, 1);
  assert.match(noFile.stderr, /nosuch\.csv: no such file/);
});

Deno.test("a candidates table with its own id column, unknown levels listed together, case ignored", async () => {
  const file = `${dir}/cands.csv`;
  await Deno.writeTextFile(
    file,
    "candidate,job_family,level,years_experience,years_at_company,site,performance_rating,education,remote\n" +
      "C-1,sales,g3,8,0,Millbrook,,Bachelor,no\n",
  );
  const doc = json(
    await paygrove(["estimate", modelPath, "--table", file, "--row", "C-1", "--json"]),
  );
  assert.equal(doc.profile.level, "G3");
  assert.equal(doc.profile.job_family, "Sales");
  const bad = `${dir}/bad.csv`;
  await Deno.writeTextFile(
    bad,
    "candidate,job_family,level,years_experience,years_at_company,site,performance_rating,education,remote\n" +
      "C-1,Marketing,G9,8,0,Millbrook,,Bachelor,no\n",
  );
  const run = await paygrove(["batch", modelPath, bad]);
  assert.equal(run.code, 1);
  assert.match(run.stderr, /"job_family" has level "Marketing" the model never saw/);
  assert.match(run.stderr, /"level" has level "G9" the model never saw/);
});

Deno.test("a training row's estimate says it includes the person's own pay, with the out-of-bag figure", async () => {
  const doc = json(
    await paygrove([
      "estimate",
      modelPath,
      "--analyst-file",
      analystPath,
      "--table",
      demo,
      "--row",
      "FH10003",
      "--json",
    ]),
  );
  const scored = json(
    await paygrove(["batch", modelPath, demo, "--analyst-file", analystPath, "--json"]),
  );
  const oob = scored.rows.find((r: { input: { employee_id: string } }) =>
    r.input.employee_id === "FH10003"
  );
  assert.equal(oob.estimateSource, "out-of-bag");
  const euros = new Intl.NumberFormat("en-US", {
    style: "currency",
    currency: "EUR",
    maximumFractionDigits: 0,
    minimumFractionDigits: 0,
  }).format(oob.estimate);
  assert.ok(
    doc.warnings.some((w: string) =>
      w.startsWith("FH10003 is one of the people the model learned from") && w.endsWith(euros)
    ),
    doc.warnings.join(" | "),
  );
});

Deno.test("no-change comparisons, sweeps beyond the data and unusual batch rows are said so", async () => {
  const same = await paygrove(["compare", modelPath, "--set", "level=G2", "--change", "level=G2"]);
  assert.equal(same.code, 0, same.stderr);
  assert.match(same.stdout, /No change: the changed profile is the same as the base/);
  const far = json(
    await paygrove([
      "sweep",
      modelPath,
      "--vary",
      "years_experience",
      "--from",
      "0",
      "--to",
      "80",
      "--steps",
      "5",
      "--json",
    ]),
  );
  assert.ok(
    far.warnings.some((w: string) => /outside 1 to 35\.9 \(the data's range\)/.test(w)),
    far.warnings,
  );
  const file = `${dir}/odd.csv`;
  await Deno.writeTextFile(
    file,
    "job_family,level,years_experience,years_at_company,site,performance_rating,education,remote\n" +
      "Sales,G1,30,25,Millbrook,3,Bachelor,no\nSales,G3,9,2,Millbrook,3,Bachelor,no\n",
  );
  const doc = json(await paygrove(["batch", modelPath, file, "--json"]));
  assert.match(
    doc.rows[0].warnings,
    /years_at_company 25 is above what 99% of people at level G1 have/,
  );
  assert.equal(doc.rows[1].warnings, "");
});

Deno.test("a format-1 model file is read with the warning that it rebuilds pay", async () => {
  const old = `${ROOT}fixtures/legacy/format1_demo300.json`;
  const run = await paygrove(["estimate", old, "--set", "level=G3"]);
  assert.equal(run.code, 0, run.stderr);
  assert.match(run.stderr, /format 1\)\. It keeps each tree's resampling seed and the training/);
  assert.match(run.stderr, /rebuild every person's pay\. Do not share it/);
});

Deno.test("fit --increasing holds the ladder: the JSON, inspect and a sweep say so", async () => {
  const path = `${dir}/increasing.model.json`;
  // A name right but for its case is taken, with a note.
  const fit = await paygrove([
    "fit",
    demo,
    "--target",
    "base_pay_eur",
    "--trees",
    "20",
    "--folds",
    "5",
    "--increasing",
    "Level",
    "--out",
    path,
    "--json",
  ]);
  assert.equal(fit.code, 0, fit.stderr);
  assert.match(fit.stderr, /--increasing "Level" is taken as the column "level"/);
  assert.deepEqual(JSON.parse(fit.stdout).increasing, ["level"]);
  const inspect = await paygrove(["inspect", path]);
  assert.match(
    inspect.stdout.replace(/\s+/g, " "),
    /never falling as level rises \(--increasing\)/,
  );
  const sweep = JSON.parse((await paygrove(["sweep", path, "--vary", "level", "--json"])).stdout);
  const estimates = sweep.points.map((p: { estimate: number }) => p.estimate);
  for (let i = 1; i < estimates.length; i++) {
    assert.ok(estimates[i] >= estimates[i - 1], `${estimates}`);
  }
  // A column with no order is refused with the reason, status 2.
  const refused = await paygrove([
    "fit",
    demo,
    "--target",
    "base_pay_eur",
    "--increasing",
    "site",
    "--out",
    `${dir}/refused.model.json`,
  ]);
  assert.equal(refused.code, 2, refused.stderr);
  assert.match(refused.stderr, /--increasing: "site" is categorical/);
});
