// Attacks on the gap check's outputs (text, JSON, Markdown report): no
// quartile bound is one person's pay, and a group too small to report is
// compared with no one, while its size cannot be worked out from the counts
// shown. The demo table (fixtures/demo_company.csv) is invented.
import assert from "node:assert/strict";
import { paygrove, ROOT } from "./_cli.ts";

const dir = await Deno.makeTempDir({ prefix: "paygrove-gap-privacy-" });
const demo = `${ROOT}fixtures/demo_company.csv`;
const demoText = await Deno.readTextFile(demo);

function pays(csv: string): number[] {
  const [head, ...lines] = csv.trim().split("\n");
  const at = head.split(",").indexOf("base_pay_eur");
  return lines.map((l) => Number(l.split(",")[at]));
}

Deno.test("no quartile bound in any output is one person's pay, nor the top earner's", async () => {
  const report = `${dir}/q.md`;
  const base = ["gap", demo, "--target", "base_pay_eur", "--group", "gender", "--trees", "20"];
  const text = await paygrove([...base, "--report", report]);
  assert.equal(text.code, 0, text.stderr);
  const doc = JSON.parse((await paygrove([...base, "--json"])).stdout);
  const sorted = pays(demoText).sort((a, b) => a - b);
  const top = sorted[sorted.length - 1];
  const bottom = sorted[0];
  assert.equal(doc.quartiles.length, 4);
  assert.equal(doc.quartiles[0].low, null);
  assert.equal(doc.quartiles[3].high, null);
  // Each cut, recounted here: the mean of the 5 pays nearest it (3 below,
  // 2 above); quartiles of 500 people each (the demo's 2,000, every one
  // with a gender).
  for (let q = 1; q < 4; q++) {
    const near = sorted.slice(500 * q - 3, 500 * q + 2);
    const mean = near.reduce((a, b) => a + b, 0) / 5;
    assert.ok(Math.abs(doc.quartiles[q].low - mean) < 1e-9, `cut ${q}: ${doc.quartiles[q].low}`);
    assert.equal(doc.quartiles[q - 1].high, doc.quartiles[q].low);
  }
  // Nor in words: the top and bottom pay, to the euro or rounded as a
  // table would print them, appear in no output.
  const shown = (x: number) => [
    x.toLocaleString("en-US"),
    String(x),
    Math.round(x / 1000).toLocaleString("en-US") + "k",
  ];
  const outputs = [text.stdout, await Deno.readTextFile(report)];
  for (const out of outputs) {
    for (const word of [...shown(top), ...shown(bottom)]) {
      assert.ok(!out.includes(word), `"${word}" appears in an output`);
    }
  }
  assert.match(text.stdout, /and above/);
});

Deno.test("a group of three is compared with no one, and no count tells its size", async () => {
  // The demo table with only three non-binary people left.
  let kept = 0;
  const lines = demoText.trim().split("\n").filter((line, i) => {
    if (i === 0 || !line.includes(",Non-binary,")) return true;
    return ++kept <= 3;
  });
  const table = `${dir}/three.csv`;
  await Deno.writeTextFile(table, lines.join("\n") + "\n");
  const report = `${dir}/three.md`;
  const base = ["gap", table, "--target", "base_pay_eur", "--group", "gender", "--trees", "20"];
  const text = await paygrove([...base, "--report", report]);
  assert.equal(text.code, 0, text.stderr);
  const run = await paygrove([...base, "--json"]);
  assert.equal(run.code, 0, run.stderr);
  const doc = JSON.parse(run.stdout);
  // Women and men are still compared: one tiny group does not hide them.
  assert.deepEqual(doc.groups, ["Woman"]);
  assert.equal(doc.overall.suppressed, false);
  assert.deepEqual(doc.leftOut, { people: null, tooFew: ["Non-binary"] });
  // No count left in the document adds up to it: the people analysed are
  // those of the groups compared, and neither the rows left out nor the
  // table's own row count is given.
  assert.equal(doc.provenance.table.rows, undefined);
  const women = doc.overall.gaps[0].rows;
  const men = doc.overall.gaps[0].referenceRows;
  assert.equal(doc.rows, women + men);
  for (const q of doc.quartiles) assert.equal(q.shares["Non-binary"], undefined);
  const all = lines.length - 1;
  for (const out of [text.stdout, text.stderr, await Deno.readTextFile(report), run.stdout]) {
    assert.ok(!out.includes(all.toLocaleString("en-US")), "the table's size appears");
    assert.ok(!out.includes(String(all)), "the table's size appears");
    assert.ok(!/\b3 (people|non-binary)/i.test(out), "the group's size appears");
  }
  assert.match(text.stdout, /Non-binary: too few to report/);
});
