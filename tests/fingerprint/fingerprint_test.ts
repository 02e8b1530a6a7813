// The learner made faster grows the same trees: the default fit of the demo
// table and CPS1988 gives, tree by tree, the same predictions on every row,
// the same out-of-bag means and the same permutation importance as the
// fingerprint taken before the speed work (tests/fingerprint/fingerprint.json,
// written by ensemble_fingerprint.ts). The reference tree's cross-validated
// errors may move in their last bits where a faster scoring sums in another
// order: within 1e-9 relative (the model file keeps 4 significant digits).
import assert from "node:assert/strict";
import { type Fingerprint, fingerprint, FINGERPRINTED } from "./ensemble_fingerprint.ts";

const root = new URL("../../", import.meta.url).pathname;
const expected: Record<string, Fingerprint> = JSON.parse(
  await Deno.readTextFile(`${root}tests/fingerprint/fingerprint.json`),
);

function near(a: number, b: number, what: string): void {
  assert.ok(Math.abs(a - b) <= 1e-9 * Math.max(Math.abs(a), Math.abs(b)), `${what}: ${a} vs ${b}`);
}

for (const { name, file, target } of FINGERPRINTED) {
  Deno.test(`${name}: the default fit's trees, out-of-bag means and importance are unchanged`, async () => {
    const got = await fingerprint(file, target, root);
    const want = expected[name];
    assert.equal(got.trees, want.trees);
    assert.equal(got.predictions, want.predictions, "every tree's predictions on every row");
    assert.equal(got.outOfBag, want.outOfBag, "every row's out-of-bag mean");
    // Exact: the importance is computed from the same trees, draws and rows.
    assert.deepEqual(got.permutation, want.permutation);
    assert.deepEqual(got.permutationSd, want.permutationSd);
    assert.equal(got.path.length, want.path.length);
    got.path.forEach((step, i) => {
      const w = want.path[i];
      assert.equal(step.leaves, w.leaves, `path step ${i}: leaves`);
      for (const key of ["alpha", "risk", "cvError", "cvSe"] as const) {
        near(step[key], w[key], `path step ${i}: ${key}`);
      }
    });
  });
}
