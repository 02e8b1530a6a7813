// The attack of two model files fitted on sets of people that differ by
// one person (e.g. two `--where` fits shared on different days): the
// reference tree's root holds the mean log pay of everyone fitted, so
// n_A * root_A - n_B * root_B would be that person's log pay. With exact
// means it gave the pay to the cent; kept as lib/model/shareable_figures.ts
// keeps them, it must put the person no closer than the file's own
// estimate of them does. Demo table (invented), 120 people, each the one
// person between a cell of job family x level and that cell without them.
import assert from "node:assert/strict";
import { fitModel, loadTable, modelToText } from "../../mod.ts";
import { encodeRoster, pathsOf, readFile, score } from "./_model_attacks.ts";

const CSV = await Deno.readTextFile(
  new URL("../../fixtures/demo_company.csv", import.meta.url).pathname,
);
const [HEAD, ...LINES] = CSV.trim().split("\n");
const header = HEAD.split(",");
const at = (name: string) => header.indexOf(name);

async function fileOf(lines: string[]): Promise<string> {
  const table = loadTable([HEAD, ...lines].join("\n") + "\n", { target: "base_pay_eur" });
  const model = await fitModel(table, { target: "base_pay_eur", trees: 0, folds: 3, workers: 1 });
  return modelToText(model);
}

Deno.test("two files whose people differ by one give that person's pay no better than the estimate", async () => {
  // Cells of 15 to 40 people, the people of each taken in table order.
  const cells = new Map<string, string[]>();
  for (const line of LINES) {
    const c = line.split(",");
    const key = `${c[at("job_family")]}|${c[at("level")]}`;
    cells.set(key, [...(cells.get(key) ?? []), line]);
  }
  const chosen = [...cells.values()].filter((l) => l.length >= 15 && l.length <= 40);
  const attack: number[] = [];
  const own: number[] = [];
  const pay: number[] = [];
  let tried = 0;
  for (const members of chosen) {
    for (let i = 0; i < members.length && tried < 120; i += 3, tried++) {
      const a = readFile(await fileOf(members));
      const b = readFile(await fileOf(members.filter((_, k) => k !== i)));
      const doc = (file: ReturnType<typeof readFile>) => file.reference.value[0];
      // The subtraction, on the log scale the files are fitted on.
      attack.push(a.rowsUsed * doc(a) - b.rowsUsed * doc(b));
      // The file's own estimate of that person: the reference tree's leaf
      // (these files have no ensemble).
      const roster = encodeRoster(a, `${HEAD}\n${members[i]}\n`);
      const path = pathsOf([a.reference], roster)[0][0];
      own.push(a.reference.value[path[path.length - 1]]);
      pay.push(Number(members[i].split(",")[at("base_pay_eur")]));
    }
  }
  const truth = Float64Array.from(pay);
  const byAttack = score(Float64Array.from(attack), truth, Math.exp);
  const byEstimate = score(Float64Array.from(own), truth, Math.exp);
  console.log(
    `${tried} people: subtraction ${(100 * byAttack.within1).toFixed(1)}% within 1%, ` +
      `median error ${byAttack.medianError.toFixed(0)}; the file's own estimate ` +
      `${(100 * byEstimate.within1).toFixed(1)}%, ${byEstimate.medianError.toFixed(0)}; ` +
      `exact: ${(100 * byAttack.exact).toFixed(1)}%`,
  );
  assert.ok(byAttack.exact < 0.02, "pay to 0.01% for more than 1 person in 50");
  assert.ok(
    byAttack.within1 <= byEstimate.within1 + 0.05,
    "within 1% more often than the estimate",
  );
  assert.ok(byAttack.medianError >= 0.95 * byEstimate.medianError, "a smaller median error");
});
