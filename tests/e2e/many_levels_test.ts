// Text columns with thousands of levels, through the real CLI: a column of
// 2,000 levels once crashed fit after 17 s, and 10,000 or 50,000 levels gave
// no result in 280 s with 2-3 GB. Now an identifier-like column (more than
// 50 levels, more than half as many as rows) is said and left out; a
// categorical attribute is split on at most 1,000 levels (MAX_SPLIT_LEVELS),
// declared ones included; every run ends with a result or one sentence.
import assert from "node:assert/strict";
import { MAX_SPLIT_LEVELS } from "../../mod.ts";
import { paygrove } from "./_cli.ts";

const dir = await Deno.makeTempDir({ prefix: "paygrove-levels-" });

/** `rows` people; `team` cycles through `levels` names and adds to pay. */
async function teams(rows: number, levels: number): Promise<string> {
  const path = `${dir}/teams_${rows}_${levels}.csv`;
  const lines = ["id,level,years,team,pay"];
  for (let r = 0; r < rows; r++) {
    const level = 1 + (r % 5);
    const years = (r * 7) % 31;
    const team = (r * 7919) % levels;
    lines.push(
      `E${r},L${level},${years},team ${team},${
        30000 + 9000 * level + 600 * years + (team % 9) * 500
      }`,
    );
  }
  await Deno.writeTextFile(path, lines.join("\n") + "\n");
  return path;
}

function ok(result: { code: number; stdout: string; stderr: string }, what: string) {
  assert.equal(result.code, 0, `${what}: ${result.stderr}`);
  assert.doesNotMatch(result.stderr, /internal error|\.ts:\d+/, what);
}

Deno.test("2,000 levels in 10,000 rows: left out of the default fit with the bound, refused when named", async () => {
  const table = await teams(10000, 2000);
  const fit = await paygrove([
    "fit",
    table,
    "--target",
    "pay",
    "--trees",
    "10",
    "--out",
    `${dir}/m2000.json`,
    "--json",
  ]);
  ok(fit, "fit");
  const doc = JSON.parse(fit.stdout);
  assert.deepEqual(doc.features.map((f: { name: string }) => f.name), ["level", "years"]);
  assert.deepEqual(doc.dropped.find((d: { name: string }) => d.name === "team"), {
    name: "team",
    reason: "too many levels",
    detail: { kind: "too-many-levels", levels: 2000, limit: MAX_SPLIT_LEVELS },
  });
  const text = await paygrove([
    "fit",
    table,
    "--target",
    "pay",
    "--trees",
    "10",
    "--out",
    `${dir}/m2000b.json`,
  ]);
  ok(text, "fit text");
  assert.match(text.stdout, /team \(2,000 levels; at most 1,000 are split on\)/);
  const named = await paygrove([
    "fit",
    table,
    "--target",
    "pay",
    "--features",
    "level,team",
    "--out",
    `${dir}/never.json`,
  ]);
  assert.equal(named.code, 2, named.stderr);
  assert.match(
    named.stderr,
    /"team" has 2,000 levels; a categorical attribute is split on at most 1,000/,
  );
  for (
    const args of [
      ["review", table, "--target", "pay", "--trees", "10", "--json"],
      ["gap", table, "--target", "pay", "--group", "level", "--trees", "10", "--json"],
    ]
  ) {
    const result = await paygrove(args);
    ok(result, args[0]);
    assert.ok(!JSON.parse(result.stdout).features.includes("team"), args[0]);
  }
});

Deno.test("10,000 and 50,000 levels: identifier-like, said by schema, left out; declared, bounded", async () => {
  for (const [rows, levels] of [[12000, 10000], [60000, 50000]]) {
    const table = await teams(rows, levels);
    const schema = await paygrove(["schema", table, "--json"]);
    ok(schema, "schema");
    const team = JSON.parse(schema.stdout).columns.find((c: { name: string }) => c.name === "team");
    assert.deepEqual(team.identifierLike, { levels, rows });
    const schemaText = await paygrove(["schema", table]);
    ok(schemaText, "schema text");
    assert.match(
      schemaText.stdout.replace(/\s+/g, " "),
      new RegExp(
        `team: looks like an identifier \\(${levels.toLocaleString("en-US")} levels in ` +
          `${rows.toLocaleString("en-US")} rows\\); left out of models unless declared ` +
          `with --type team=categorical`,
      ),
    );
    const fit = await paygrove([
      "fit",
      table,
      "--target",
      "pay",
      "--trees",
      "5",
      "--out",
      `${dir}/m${levels}.json`,
      "--json",
    ]);
    ok(fit, `fit ${levels}`);
    assert.deepEqual(
      JSON.parse(fit.stdout).dropped.find((d: { name: string }) => d.name === "team").detail,
      { kind: "identifier-like", levels, rows },
    );
    // Declared categorical: no longer identifier-like, but over the bound.
    const declared = await paygrove([
      "fit",
      table,
      "--target",
      "pay",
      "--type",
      "team=categorical",
      "--trees",
      "5",
      "--out",
      `${dir}/d${levels}.json`,
      "--json",
    ]);
    ok(declared, `fit declared ${levels}`);
    assert.deepEqual(
      JSON.parse(declared.stdout).dropped.find((d: { name: string }) => d.name === "team").detail,
      { kind: "too-many-levels", levels, limit: MAX_SPLIT_LEVELS },
    );
  }
});

Deno.test("1,000 levels in 3,000 rows: used, and the review ends", async () => {
  // (review rather than fit: fit's linear baseline on 999 indicator columns
  // of three rows each is the least-squares code's own case.)
  const table = await teams(3000, MAX_SPLIT_LEVELS);
  const review = await paygrove(["review", table, "--target", "pay", "--trees", "10", "--json"]);
  ok(review, "review");
  assert.ok(JSON.parse(review.stdout).features.includes("team"));
});

Deno.test("a column of 2,000 levels as the target: refused in a sentence, not 8 GB later", async () => {
  const table = await teams(10000, 2000);
  const result = await paygrove(["fit", table, "--target", "team", "--out", `${dir}/cls.json`]);
  assert.equal(result.code, 2, result.stderr);
  assert.match(result.stderr, /"team" has 2,000 classes; a class target has at most 100/);
});
