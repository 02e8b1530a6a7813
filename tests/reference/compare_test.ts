// The rerun comparison (./_compare.ts): last-digit differences between
// processors pass, real differences fail and are shown with both values.
import assert from "node:assert/strict";
import { assertSameOutput, csvDifferences, jsonDifferences, RERUN_RTOL } from "./_compare.ts";

Deno.test("R's last digits on another processor (…109 for …111) do not fail a rerun", () => {
  // The case reported in issue 13: byte for byte, these two differ.
  const committed = '{"coefficients": {"education": {"estimate": 4.321394996291111}}}';
  const fresh = '{"coefficients": {"education": {"estimate": 4.321394996291109}}}';
  assert.notEqual(fresh, committed);
  assert.deepEqual(jsonDifferences(fresh, committed), []);
  assertSameOutput("fixtures/reference/x.json", fresh, committed);
});

Deno.test("a real difference fails, naming the place and both values", () => {
  const committed = '{"a": [1, 2, 3], "b": "lm"}';
  const fresh = '{"a": [1, 2.000001, 3], "b": "lm"}';
  assert.throws(
    () => assertSameOutput("fixtures/reference/x.json", fresh, committed),
    (error: Error) => {
      assert.match(
        error.message,
        /\$\.a\[1\]: fresh 2\.000001, committed 2 \(relative difference 5\.00e-7\)/,
      );
      assert.match(error.message, new RegExp(`relative ${RERUN_RTOL}`));
      return true;
    },
  );
});

Deno.test("text, keys, lengths and nulls are compared exactly", () => {
  assert.equal(jsonDifferences('{"a": null}', '{"a": 0}').length, 1);
  assert.equal(jsonDifferences('{"a": 1}', '{"b": 1}').length, 1);
  assert.equal(jsonDifferences("[1, 2]", "[1, 2, 3]").length, 1);
  assert.equal(csvDifferences("id,x\nA1,2\n", "id,x\nA2,2\n").length, 1);
  assert.equal(csvDifferences("id,x\nA1,2\n", "id,x\nA1,2\nA2,3\n").length, 1);
});

Deno.test("a value near zero among larger ones is compared on the array's scale", () => {
  // A pruning alpha from a difference of impurities: 2.3e-11 moving by 1e-17
  // is rounding, not a different result.
  assert.deepEqual(
    jsonDifferences("[0.1, 2.3119034356193502e-11]", "[0.1, 2.3119034356203502e-11]"),
    [],
  );
  assert.equal(jsonDifferences("[0.1, 2.3e-11]", "[0.1, 2.3e-9]").length, 1);
});
