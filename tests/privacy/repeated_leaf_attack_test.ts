// An attack on unpruned ensembles (an outside trial found it): an
// unpruned leaf of five drawn people whose pay is the same, or whose mean
// falls on one of them, has that person's pay as its value, and it repeats
// across trees. The attacker, with the shared file and a roster, takes for
// each person the leaf value that recurs most often among the trees they
// fall in (at least twice), in money. Before leaves were checked for this
// (lib/tree/diverse_leaves.ts: a leaf whose drawn members are paid the
// same is merged into its parent), `--prune none` gave 173 of the demo's
// 2,000 people their exact pay (8.6%). Pass: at most 1 in 100 people get
// their pay within 0.01%. Within 1% the repeated leaf does better than the
// averaged estimate (20.3% against 18.4% here): an unpruned leaf is the
// mean pay of a group of five, as close as such a mean is on a table whose
// pay follows its structure this tightly; the README says so and advises
// the default pruning for a file to share, which the stricter test
// (model_file_attack_test.ts) holds to the estimate's own closeness.
import assert from "node:assert/strict";
import { fitModel, loadTable, modelToText } from "../../mod.ts";
import { baseline, encodeRoster, pathsOf, readFile, score } from "./_model_attacks.ts";

const CSV = await Deno.readTextFile(
  new URL("../../fixtures/demo_company.csv", import.meta.url).pathname,
);

for (const scale of ["log", "raw"] as const) {
  Deno.test(`unpruned trees (${scale} scale): a leaf value repeated across trees is no one's pay`, async () => {
    const table = loadTable(CSV, { target: "base_pay_eur", file: "demo_company.csv" });
    const model = await fitModel(table, {
      target: "base_pay_eur",
      prune: "none",
      scale,
      trees: 60,
      workers: 1,
    });
    const file = readFile(modelToText(model));
    // The roster: the table itself, its pay column ignored by the encoder.
    const people = encodeRoster(file, CSV);
    const pay = Float64Array.from(
      CSV.trim().split("\n").slice(1),
      (l) => Number(l.split(",").at(-1)),
    );
    const toMoney = scale === "log" ? Math.exp : (v: number) => v;
    const paths = pathsOf(file.trees, people);
    const own = score(baseline(file, paths), pay, toMoney);
    const guess = baseline(file, paths);
    for (let i = 0; i < pay.length; i++) {
      const seen = new Map<number, number>();
      file.trees.forEach((t, b) => {
        const p = paths[b][i];
        const v = Math.round(toMoney(t.value[p[p.length - 1]]) * 100) / 100;
        seen.set(v, (seen.get(v) ?? 0) + 1);
      });
      const [value, times] = [...seen].sort((a, b) => b[1] - a[1])[0];
      if (times >= 2) guess[i] = scale === "log" ? Math.log(value) : value;
    }
    const attack = score(guess, pay, toMoney);
    console.log(
      `${scale}: own estimate within 1% ${(100 * own.within1).toFixed(1)}%; repeated-leaf ` +
        `attack within 1% ${(100 * attack.within1).toFixed(1)}%, exact ${
          (100 * attack.exact).toFixed(1)
        }%`,
    );
    assert.ok(attack.exact <= 0.01, `exact ${attack.exact}`);
    // Bounded, not equal: no more than 5 points above the estimate's.
    assert.ok(attack.within1 <= own.within1 + 0.05, `${attack.within1} vs ${own.within1}`);
  });
}
