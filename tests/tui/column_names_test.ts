// Names and typos (issue 14): every option that names a column suggests the
// nearest one, takes a name right but for its case with a note, and levels
// beyond a ladder's ends are said as such.
import assert from "node:assert/strict";
import { run } from "../../tui/main.ts";
import { recordingTerminal } from "../../tui/terminal.ts";

const dir = await Deno.makeTempDir({ prefix: "paygrove-names-" });
const table = `${dir}/staff.csv`;
{
  const lines = ["id,department,level,years,Sex,annual_salary"];
  for (let r = 0; r < 120; r++) {
    const level = 1 + (r % 7);
    lines.push(
      `E${r},${["Lab", "Sales", "Ops"][r % 3]},G${level},${r % 20},${r % 2 ? "F" : "M"},${
        30000 + 6000 * level + 250 * (r % 20) + 400 * (r % 3)
      }`,
    );
  }
  await Deno.writeTextFile(table, lines.join("\n") + "\n");
}
const model = `${dir}/model.json`;

async function paygrove(args: string[]) {
  const terminal = recordingTerminal(200);
  const status = await run(args, terminal);
  return { status, out: terminal.stdout.join(""), err: terminal.stderr.join("") };
}

const COLUMNS = "the columns are: id, department, level, years, Sex, annual_salary";

Deno.test("a misspelt column in any option is answered with the nearest column", async () => {
  const cases: [string[], string][] = [
    [
      ["fit", table, "--target", "anual_salary", "--out", model],
      `paygrove: --target: no column named "anual_salary" (did you mean "annual_salary"?); ${COLUMNS}\n`,
    ],
    [
      ["fit", table, "--target", "annual_salary", "--features", "level,yeras", "--out", model],
      `paygrove: --features: no column named "yeras" (did you mean "years"?); ${COLUMNS}\n`,
    ],
    [
      ["gap", table, "--target", "annual_salary", "--group", "Sex", "--within", "departmnt"],
      `paygrove: --within: no column named "departmnt" (did you mean "department"?); ${COLUMNS}\n`,
    ],
    [
      ["review", table, "--target", "annual_salary", "--where", "departmen=Lab"],
      `paygrove: --where: no column named "departmen" (did you mean "department"?); ${COLUMNS}\n`,
    ],
  ];
  for (const [args, message] of cases) {
    const { status, err } = await paygrove(args);
    assert.equal(status, 2, err);
    assert.equal(err, message);
  }
});

Deno.test("a column right but for its case is taken, with a note", async () => {
  const { status, err } = await paygrove([
    "fit",
    table,
    "--target",
    "Annual_Salary",
    "--features",
    "Level,YEARS",
    "--where",
    "Department=Lab",
    "--where",
    "department=Sales",
    "--trees",
    "10",
    "--workers",
    "1",
    "--out",
    model,
    "--json",
  ]);
  assert.equal(status, 0, err);
  for (
    const [option, asked, name] of [
      ["--target", "Annual_Salary", "annual_salary"],
      ["--features", "Level", "level"],
      ["--features", "YEARS", "years"],
      ["--where", "Department", "department"],
    ]
  ) {
    assert.ok(
      err.includes(`paygrove: note: ${option} "${asked}" is taken as the column "${name}"\n`),
      err,
    );
  }
});

Deno.test("a level beyond a ladder's end is said as such; other levels get the nearest", async () => {
  const fit = await paygrove([
    "fit",
    table,
    "--target",
    "annual_salary",
    "--trees",
    "10",
    "--workers",
    "1",
    "--out",
    model,
    "--force",
  ]);
  assert.equal(fit.status, 0, fit.err);
  const levels = "its levels are: G1, G2, G3, G4, G5, G6, G7";
  const cases: [string[], string][] = [
    [
      ["estimate", model, "--set", "level=G8"],
      `paygrove: --set: "level" has no level "G8": it is above the highest level, G7; ${levels}\n`,
    ],
    [
      ["estimate", model, "--set", "level=G0"],
      `paygrove: --set: "level" has no level "G0": it is below the lowest level, G1; ${levels}\n`,
    ],
    [
      ["estimate", model, "--set", "department=Sale"],
      `paygrove: --set: "department" has no level "Sale" (did you mean "Sales"?); its levels are: Lab, Ops, Sales\n`,
    ],
    [
      ["fit", table, "--target", "annual_salary", "--where", "level=G9", "--out", `${dir}/m2.json`],
      `paygrove: --where: "level" has no level "G9": it is above the highest level, G7; ${levels}\n`,
    ],
  ];
  for (const [args, message] of cases) {
    const { status, err } = await paygrove(args);
    assert.equal(status, 2, err);
    assert.equal(err, message);
  }
});

Deno.test({ name: "clean up", fn: () => Deno.remove(dir, { recursive: true }) });
