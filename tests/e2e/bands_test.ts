// `paygrove bands` as a user runs it: JSON, the CSV (read back by
// csv-parse), the Markdown report, and the refusals with their exit status.
import assert from "node:assert/strict";
import { parse } from "csv-parse/sync";
import { fitDemoModel, paygrove, ROOT } from "./_cli.ts";

const dir = await Deno.makeTempDir({ prefix: "paygrove-bands-" });
const demo = `${ROOT}fixtures/demo_company.csv`;
const model = `${dir}/demo.model.json`;
await fitDemoModel(model);

Deno.test("bands --json, --out and --report say the same bands", async () => {
  const out = `${dir}/bands.csv`;
  const report = `${dir}/bands.md`;
  const run = await paygrove([
    "bands",
    model,
    "--table",
    demo,
    "--by",
    "level,site",
    "--out",
    out,
    "--report",
    report,
    "--json",
  ]);
  assert.equal(run.code, 0, run.stderr);
  const doc = JSON.parse(run.stdout);
  assert.deepEqual(doc.by, ["level", "site"]);
  assert.deepEqual(doc.method, { kind: "coverage", coverage: 0.8 });
  const rows = parse(await Deno.readTextFile(out), { columns: true }) as Record<string, string>[];
  assert.equal(rows.length, doc.cells.length);
  rows.forEach((row, i) => {
    const cell = doc.cells[i];
    assert.deepEqual([row.level, row.site], cell.key);
    assert.equal(row.suppressed, String(cell.suppressed));
    if (!cell.suppressed) {
      assert.equal(Number(row.band_mid), Number(cell.band.mid.toFixed(2)));
      assert.equal(Number(row.people), cell.people);
    } else assert.equal(row.people, "");
  });
  const md = await Deno.readTextFile(report);
  assert.match(md, /^# Pay bands by level x site/);
  assert.match(md, /paygrove gap/);
  const first = doc.cells.find((c: { suppressed: boolean }) => !c.suppressed);
  assert.ok(md.includes(`| ${first.key.join(" / ")} | ${first.people.toLocaleString("en-US")} |`));
});

Deno.test("bands refuses, with status 2: no table, both ways of building, a numeric --by", async () => {
  const noTable = await paygrove(["bands", model]);
  assert.equal(noTable.code, 2);
  assert.match(noTable.stderr, /--table FILE: the model file holds no one's pay/);
  const both = await paygrove([
    "bands",
    model,
    "--table",
    demo,
    "--coverage",
    "0.8",
    "--spread",
    "40%",
  ]);
  assert.equal(both.code, 2);
  assert.match(both.stderr, /give one/);
  const numeric = await paygrove(["bands", model, "--table", demo, "--by", "years_experience"]);
  assert.equal(numeric.code, 2);
  assert.match(numeric.stderr, /numeric; cells need levels/);
});

Deno.test("bands never writes over a file without --force", async () => {
  const out = `${dir}/kept.csv`;
  await Deno.writeTextFile(out, "keep me\n");
  const run = await paygrove(["bands", model, "--table", demo, "--out", out]);
  assert.notEqual(run.code, 0);
  assert.equal(await Deno.readTextFile(out), "keep me\n");
});

Deno.test("bands --posting: the range for one role, its comparable people, and the refusals", async () => {
  const run = await paygrove([
    "bands",
    model,
    "--posting",
    "--set",
    "level=G3",
    "--set",
    "job_family=Sales",
    "--table",
    demo,
    "--json",
  ]);
  assert.equal(run.code, 0, run.stderr);
  const doc = JSON.parse(run.stdout);
  assert.equal(doc.profile.level, "G3");
  assert.deepEqual(doc.newHire, ["years_at_company"]);
  assert.ok(doc.low < doc.estimate && doc.estimate < doc.high);
  assert.deepEqual(doc.comparable.named, ["level", "job_family"]);
  assert.ok(doc.comparable.people >= 5 && doc.comparable.inside > 0);
  const text = await paygrove(["bands", model, "--posting", "--set", "level=G3"]);
  assert.equal(text.code, 0, text.stderr);
  assert.match(text.stdout, /^Range to post: €[\d,]+ to €[\d,]+/);
  assert.match(text.stdout, /needs --table/);
  const noRole = await paygrove(["bands", model, "--posting"]);
  assert.equal(noRole.code, 2);
  assert.match(noRole.stderr, /--posting needs the role/);
  // A model fitted with gender among its attributes: no posting range.
  const protectedModel = `${dir}/with_gender.model.json`;
  const fit = await paygrove([
    "fit",
    demo,
    "--target",
    "base_pay_eur",
    "--allow-protected",
    "--trees",
    "10",
    "--folds",
    "3",
    "--out",
    protectedModel,
  ]);
  assert.equal(fit.code, 0, fit.stderr);
  const refused = await paygrove(["bands", protectedModel, "--posting", "--set", "level=G3"]);
  assert.equal(refused.code, 2);
  assert.match(refused.stderr, /objective criteria/);
});

Deno.test("bands on a table that does not fit the model: said in one message, no stack trace", async () => {
  const lines = (await Deno.readTextFile(demo)).trim().split("\n");
  const header = lines[0].split(",");
  // A level the model never saw.
  const levelAt = header.indexOf("level");
  const odd = lines.slice(0, 30).map((line, i) => {
    if (i !== 29) return line;
    const cells = line.split(",");
    cells[levelAt] = "G9";
    return cells.join(",");
  });
  await Deno.writeTextFile(`${dir}/odd.csv`, odd.join("\n") + "\n");
  // The other rows are banded; the screen and the JSON say one was left out.
  const unseen = await paygrove(["bands", model, "--table", `${dir}/odd.csv`]);
  assert.equal(unseen.code, 0, unseen.stderr);
  assert.match(unseen.stdout.replace(/\s+/g, " "), /1 row left out: the model cannot score/);
  assert.match(unseen.stdout.replace(/\s+/g, " "), /line 30: .*"G9"/);
  const unseenJson = await paygrove(["bands", model, "--table", `${dir}/odd.csv`, "--json"]);
  const doc = JSON.parse(unseenJson.stdout);
  assert.equal(doc.notScored.rows, 1);
  assert.equal(doc.notScored.first.line, 30);
  const counted = doc.cells.reduce(
    (n: number, c: { people?: number }) => n + (c.people ?? 0),
    0,
  );
  assert(counted <= 28, `${counted} people banded of the 28 the model can score`);
  assert(!doc.cells.some((c: { key: string[] }) => c.key.includes("G9")));
  // Every row at a level the model never saw: the whole table is refused.
  const allOdd = [
    lines[0],
    ...lines.slice(1, 8).map((line) => {
      const cells = line.split(",");
      cells[levelAt] = "G9";
      return cells.join(",");
    }),
  ];
  await Deno.writeTextFile(`${dir}/all_odd.csv`, allOdd.join("\n") + "\n");
  const allUnseen = await paygrove(["bands", model, "--table", `${dir}/all_odd.csv`]);
  assert.equal(allUnseen.code, 1);
  assert.match(allUnseen.stderr, /"G9" the model never saw/);
  // No pay column: the quartiles and who sits outside need current pay.
  const payAt = header.indexOf("base_pay_eur");
  const noPay = lines.slice(0, 30).map((line) =>
    line.split(",").filter((_, c) => c !== payAt).join(",")
  );
  await Deno.writeTextFile(`${dir}/no_pay.csv`, noPay.join("\n") + "\n");
  const withoutPay = await paygrove(["bands", model, "--table", `${dir}/no_pay.csv`]);
  assert.equal(withoutPay.code, 2);
  assert.match(withoutPay.stderr, /bands need current pay/);
  for (const run of [allUnseen, withoutPay]) assert.doesNotMatch(run.stderr, /\bat .*\.ts:\d+/);
});

Deno.test("bands TABLE --target fits first: the same bands as fit, then bands on the model", async () => {
  const alone = await paygrove([
    "bands",
    demo,
    "--target",
    "base_pay_eur",
    "--currency",
    "EUR",
    "--trees",
    "30",
    "--workers",
    "1",
    "--json",
  ]);
  assert.equal(alone.code, 0, alone.stderr);
  // The same default fit, by `fit`, then bands on its model file.
  const defaults = `${dir}/defaults.model.json`;
  const fit = await paygrove([
    "fit",
    demo,
    "--target",
    "base_pay_eur",
    "--currency",
    "EUR",
    "--trees",
    "30",
    "--workers",
    "1",
    "--out",
    defaults,
  ]);
  assert.equal(fit.code, 0, fit.stderr);
  const two = await paygrove(["bands", defaults, "--table", demo, "--json"]);
  assert.equal(two.code, 0, two.stderr);
  const a = JSON.parse(alone.stdout);
  const b = JSON.parse(two.stdout);
  assert.equal(a.cells.length, b.cells.length);
  a.cells.forEach((cell: { suppressed: boolean; band?: { mid: number } }, i: number) => {
    assert.equal(cell.suppressed, b.cells[i].suppressed);
    if (!cell.suppressed) {
      assert(Math.abs(cell.band!.mid / b.cells[i].band.mid - 1) < 1e-9, `cell ${i}`);
    }
  });
  // --target and --table together are two tables: refused before fitting.
  const both = await paygrove(["bands", demo, "--target", "base_pay_eur", "--table", demo]);
  assert.equal(both.code, 2);
  assert.match(both.stderr, /give one/);
  // The posting view from a table alone, refused before a fit when the role is missing.
  const noRole = await paygrove(["bands", demo, "--target", "base_pay_eur", "--posting"]);
  assert.equal(noRole.code, 2);
  assert.match(noRole.stderr, /--posting needs the role/);
});

Deno.test("bands --people: everyone's place in the band, owner-only, never in the shared outputs", async () => {
  const people = `${dir}/people.csv`;
  const out = `${dir}/shared_bands.csv`;
  const run = await paygrove([
    "bands",
    model,
    "--table",
    demo,
    "--by",
    "level,site",
    "--people",
    people,
    "--out",
    out,
    "--json",
  ]);
  assert.equal(run.code, 0, run.stderr);
  if (Deno.build.os !== "windows") {
    assert.equal((await Deno.stat(people)).mode! & 0o777, 0o600);
  }
  const doc = JSON.parse(run.stdout);
  const rows = parse(await Deno.readTextFile(people), { columns: true }) as Record<
    string,
    string
  >[];
  const table = parse(await Deno.readTextFile(demo), { columns: true }) as Record<
    string,
    string
  >[];
  assert.equal(rows.length, table.length);
  // Row by row: the person's own pay and cell, compa-ratio and position from
  // the band of their cell in the JSON, by hand.
  for (let i = 0; i < rows.length; i++) {
    const row = rows[i];
    assert.equal(row.employee_id, table[i].employee_id);
    assert.equal(Number(row.pay), Number(table[i].base_pay_eur));
    const cell = doc.cells.find((c: { key: string[] }) =>
      c.key[0] === row.level && c.key[1] === row.site
    );
    if (cell.suppressed) {
      assert.equal(row.compa_ratio, "");
      continue;
    }
    const pay = Number(row.pay);
    assert(Math.abs(Number(row.compa_ratio) - pay / cell.band.mid) < 1e-6);
    assert(
      Math.abs(
        Number(row.range_position) - (pay - cell.band.min) / (cell.band.max - cell.band.min),
      ) < 1e-6,
    );
  }
  // Nothing per person reaches what is shared: no compa-ratio or position
  // column, and no one's pay as a figure, in the JSON or the band table.
  for (const shared of [run.stdout, await Deno.readTextFile(out)]) {
    assert.doesNotMatch(shared, /compa_ratio|range_position|FH1\d{4}/);
  }
  // The per-person file is never written over, nor onto the table or the model.
  for (const target of [people, demo, model]) {
    const again = await paygrove(["bands", model, "--table", demo, "--people", target]);
    assert.equal(again.code, 2, target);
  }
});

Deno.test("bands on CPS1985 and CPS1988 (no ladder: --by region), from the table alone", async () => {
  for (const [file, by] of [["cps1985.csv", "region"], ["cps1988.csv", "region"]]) {
    const run = await paygrove([
      "bands",
      `${ROOT}fixtures/${file}`,
      "--target",
      "wage",
      "--by",
      by,
      "--trees",
      "20",
      "--json",
    ]);
    assert.equal(run.code, 0, run.stderr);
    const doc = JSON.parse(run.stdout);
    const shown = doc.cells.filter((c: { suppressed: boolean }) => !c.suppressed);
    assert(shown.length >= 2, file);
    for (const c of shown) {
      assert(c.band.min < c.band.mid && c.band.mid < c.band.max, file);
      // The band is built to hold 80% of the cell's people: inside it are
      // between half and all of them (the held-out measure is in bench/).
      const inside = 1 - (c.outside.below + c.outside.above) / c.people;
      assert(inside > 0.5 && inside <= 1, `${file} ${c.key}: ${inside}`);
    }
    // No ladder: without --by, bands says what to give.
    const noBy = await paygrove(["bands", `${ROOT}fixtures/${file}`, "--target", "wage"]);
    assert.equal(noBy.code, 2);
    assert.match(noBy.stderr, /--by/);
  }
});
