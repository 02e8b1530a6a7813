// Everyday tables and options that once ended in status 70 (a bug) or a
// model the program then called damaged: tiny tables, empty lists, locale
// tags in the wrong form. Each case runs the real CLI on a table written
// here and must end in 0, 1 or 2 with one clear line, never 70 or a stack.
import assert from "node:assert/strict";
import { paygrove, ROOT } from "./_cli.ts";

const dir = await Deno.makeTempDir({ prefix: "paygrove-everyday-" });
const demo = `${ROOT}fixtures/demo_company.csv`;
const model = `${dir}/demo.json`;
const fitted = await paygrove([
  "fit",
  demo,
  "--target",
  "base_pay_eur",
  "--trees",
  "5",
  "--folds",
  "3",
  "--out",
  model,
]);
if (fitted.code !== 0) throw new Error(`fit failed: ${fitted.stderr}`);

/** Asserts a run ended in `code` with one line and no trace of a bug. */
function clean(
  result: { code: number; stdout: string; stderr: string },
  code: number,
  what: string,
) {
  assert.equal(result.code, code, `${what}: ${result.stderr}`);
  assert.doesNotMatch(result.stderr, /internal error|\.ts:\d+| {4}at /, what);
  // One line; commander adds its usage hint under an option it refuses.
  const lines = result.stderr.trim().split("\n").filter((l) => l !== "(add --help for usage)");
  if (code !== 0) assert.equal(lines.length, 1, result.stderr);
}

Deno.test("a locale tag in the wrong form is refused the same way by every command", async () => {
  const runs: [string, string[]][] = [
    ["estimate", ["estimate", model]],
    ["compare", ["compare", model, "--change", "level=+1"]],
    ["sweep", ["sweep", model, "--vary", "level"]],
    ["inspect", ["inspect", model]],
    ["fit", ["fit", demo, "--target", "base_pay_eur", "--out", `${dir}/never.json`]],
    ["gap", ["gap", demo, "--target", "base_pay_eur", "--group", "gender"]],
    ["review", ["review", demo, "--target", "base_pay_eur"]],
    ["schema", ["schema", demo]],
  ];
  for (const [name, args] of runs) {
    for (const tag of ["en_US", "", "not a locale"]) {
      const result = await paygrove([...args, "--locale", tag]);
      clean(result, 2, `${name} --locale "${tag}"`);
      assert.match(
        result.stderr,
        new RegExp(`"${tag}" is not a locale tag such as en-US or de-DE`),
        `${name} --locale "${tag}"`,
      );
    }
  }
  // A good tag still works, and changes the figures' form.
  const german = await paygrove(["estimate", model, "--locale", "de-DE", "--json"]);
  clean(german, 0, "estimate --locale de-DE");
  const text = await paygrove(["estimate", model, "--locale", "de-DE"]);
  clean(text, 0, "estimate --locale de-DE");
  assert.match(text.stdout, /\d\.\d{3}/, "de-DE groups thousands with a point");
});

Deno.test("an empty --features list is refused before anything is fitted or written", async () => {
  for (
    const args of [
      ["fit", demo, "--target", "base_pay_eur", "--out", `${dir}/empty.json`],
      ["gap", demo, "--target", "base_pay_eur", "--group", "gender"],
      ["review", demo, "--target", "base_pay_eur"],
    ]
  ) {
    for (const list of ["", ",", " , "]) {
      const result = await paygrove([...args, "--features", list]);
      clean(result, 2, `${args[0]} --features "${list}"`);
      assert.match(result.stderr, /--features <columns>.*name at least one column/);
    }
  }
  assert.deepEqual([...Deno.readDirSync(dir)].map((e) => e.name).sort(), ["demo.json"]);
});

Deno.test("fit with every attribute dropped says so instead of writing a model without one", async () => {
  const table = `${dir}/ids_only.csv`;
  await Deno.writeTextFile(
    table,
    "id,pay\n" + Array.from({ length: 30 }, (_, i) => `E${i},${40000 + 700 * i}`).join("\n") + "\n",
  );
  const result = await paygrove(["fit", table, "--target", "pay", "--out", `${dir}/none.json`]);
  clean(result, 2, "fit with no attribute");
  assert.match(result.stderr, /no attributes are left to learn from/);
  await assert.rejects(Deno.stat(`${dir}/none.json`));
});
