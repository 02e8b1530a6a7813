import assert from "node:assert/strict";
import { DataError, OptionError } from "../../lib/errors.ts";

Deno.test("a DataError keeps its sentence, name and location", () => {
  const error = new DataError('line 12 has "n/a", not a number', {
    file: "pay.csv",
    line: 12,
    column: "pay",
  });
  assert.ok(error instanceof Error);
  assert.equal(error.name, "DataError");
  assert.equal(error.message, 'line 12 has "n/a", not a number');
  assert.deepEqual(error.location, { file: "pay.csv", line: 12, column: "pay" });
  assert.equal(String(error), 'DataError: line 12 has "n/a", not a number');
  assert.ok(error.stack?.includes("errors_test.ts"));
});

Deno.test("a DataError without a location has an empty one", () => {
  const error = new DataError("the table has no rows");
  assert.deepEqual(error.location, {});
  assert.equal(error.location.line, undefined);
});

Deno.test("an OptionError is told apart from a DataError and from other errors", () => {
  const option = new OptionError('--target: no column named "salry"');
  assert.equal(option.name, "OptionError");
  assert.equal(option.message, '--target: no column named "salry"');
  assert.ok(option instanceof Error);
  assert.ok(!(option instanceof DataError));
  assert.ok(!(new DataError("x") instanceof OptionError));
  assert.ok(!(new RangeError("x") instanceof DataError));
});

Deno.test("hostile text in a message is kept as given (quoting is the terminal layer's job)", () => {
  const text = "\u001b[2J=cmd|' /C calc'!A0\u0000";
  assert.equal(new DataError(text).message, text);
  assert.equal(new OptionError(text).message, text);
});
