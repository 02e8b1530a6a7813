// Outputs never land on what a run reads or on each other, whatever their
// spelling, and a file that holds what rebuilds pay is its owner's alone
// even when it replaces one others could read. Attacks from a hostile trial
// (each ended in status 0 with the target replaced before these checks).
import assert from "node:assert/strict";
import { demoCompanyCsv } from "../../mod.ts";
import { paygrove } from "./_cli.ts";

const dir = await Deno.makeTempDir({ prefix: "paygrove-outputs-" });
const table = `${dir}/in.csv`;
const tableText = demoCompanyCsv({ rows: 200, seed: 4 });
await Deno.writeTextFile(table, tableText);
const FIT = ["fit", table, "--target", "base_pay_eur", "--trees", "5", "--folds", "3"];

Deno.test("the analyst's file may not be the model file under another spelling", async () => {
  const run = await paygrove(
    [...FIT, "--out", `${dir}/x.json`, "--analyst-file", `${dir}/./x.json`, "--force"],
  );
  assert.equal(run.code, 2, run.stderr);
  assert.match(run.stderr, /is the --out file; the two must be apart/);
  assert.deepEqual([...Deno.readDirSync(dir)].map((e) => e.name).sort(), ["in.csv"]);
});

Deno.test("no output replaces the table the run reads", async () => {
  for (
    const args of [
      [...FIT, "--out", table, "--force"],
      [
        ...FIT,
        "--out",
        `${dir}/m.json`,
        "--analyst-file",
        `${dir}/../${dir.split("/").pop()}/in.csv`,
        "--force",
      ],
      ["review", table, "--target", "base_pay_eur", "--trees", "10", "--out", table, "--force"],
      ["gap", table, "--target", "base_pay_eur", "--group", "gender", "--report", table, "--force"],
    ]
  ) {
    const run = await paygrove(args);
    assert.equal(run.code, 2, `${args.join(" ")}: ${run.stderr}`);
    assert.match(run.stderr, /which this run reads; write the output elsewhere/);
    assert.equal(await Deno.readTextFile(table), tableText);
  }
});

Deno.test("an analyst's file replacing a readable file becomes its owner's alone", async () => {
  const target = `${dir}/a.json`;
  await Deno.writeTextFile(target, "{}");
  await Deno.chmod(target, 0o644);
  const run = await paygrove(
    [...FIT, "--out", `${dir}/m2.json`, "--analyst-file", target, "--force"],
  );
  assert.equal(run.code, 0, run.stderr);
  assert.equal((await Deno.stat(target)).mode! & 0o777, 0o600);
});

Deno.test("the guided flow's --report replaces nothing without --force, and is Markdown", async () => {
  const victim = `${dir}/victim.md`;
  await Deno.writeTextFile(victim, "keep me");
  await Deno.writeTextFile(`${dir}/victim.json`, "keep me too");
  const run = await paygrove(["--report", victim]);
  assert.equal(run.code, 2, run.stderr);
  assert.match(run.stderr, /victim\.md already exists; add --force to replace it/);
  // The .json beside it is checked too.
  await Deno.remove(victim);
  const again = await paygrove(["--report", victim]);
  assert.equal(again.code, 2, again.stderr);
  assert.match(again.stderr, /victim\.json already exists; add --force to replace it/);
  assert.equal(await Deno.readTextFile(`${dir}/victim.json`), "keep me too");
  const named = await paygrove(["--report", `${dir}/model`]);
  assert.equal(named.code, 2);
  assert.match(named.stderr, /should end in \.html .* or \.md/);
});
