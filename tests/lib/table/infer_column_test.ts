import assert from "node:assert/strict";
import { DataError, OptionError } from "../../../lib/errors.ts";
import {
  inferColumn,
  type InferColumnOptions,
  inferPlainColumn,
} from "../../../lib/table/infer_column.ts";
import { missingTest } from "../../../lib/table/missing.ts";
import type { Column } from "../../../lib/table/types.ts";

const base: InferColumnOptions = {
  file: "t.csv",
  decimal: ".",
  isMissing: missingTest(),
  protected: false,
};
// Row r is on line r + 2 (line 1 is the header).
const linesFor = (n: number) => Int32Array.from({ length: n }, (_, r) => r + 2);
const infer = (name: string, cells: string[], options: Partial<InferColumnOptions> = {}) =>
  inferColumn(name, cells, linesFor(cells.length), { ...base, ...options });
const MISSING_SAID = "(missing values may be written as empty, NA, N/A, #N/A, NaN, null or -)";

function levelsOf(column: Column): string[] {
  assert.ok(column.type === "categorical" || column.type === "ordinal", column.type);
  return Array.from(column.codes, (k) => (k < 0 ? "?" : column.levels[k]));
}
function thrown<T extends Error>(run: () => unknown, kind: new (...a: never[]) => T): T {
  try {
    run();
  } catch (error) {
    assert.ok(error instanceof kind, String(error));
    return error as T;
  }
  assert.fail("no error");
}

Deno.test("numbers with missing cells are numeric, missing counted and NaN", () => {
  const column = infer("years", ["2", "NA", "9.5", "", "-1"]);
  assert.equal(column.type, "numeric");
  assert.equal(column.missing, 2);
  const values = Array.from((column as { values: Float64Array }).values);
  assert.deepEqual(values.map((v) => (Number.isNaN(v) ? "NaN" : v)), [2, "NaN", 9.5, "NaN", -1]);
  assert.equal((column as { money?: unknown }).money, undefined);
  assert.deepEqual(column.notes, []);
});

Deno.test("one distinct value, or none, is a constant column with a note", () => {
  const one = infer("country", ["DE", "DE", "NA"]);
  assert.equal(one.type, "constant");
  assert.equal((one as { value?: string }).value, "DE");
  assert.deepEqual(one.notes, ['every value is "DE"; left out of models']);
  const numbers = infer("grade", ["5", "5.0", "5"]);
  assert.equal(numbers.type, "constant");
  assert.equal((numbers as { value?: string }).value, "5");
  const none = infer("rating", ["", "NA", "n/a"]);
  assert.equal(none.type, "constant");
  assert.equal((none as { value?: string }).value, undefined);
  assert.deepEqual(none.notes, ["every value is missing; left out of models"]);
  assert.equal(none.missing, 3);
  // An empty column (no rows) is constant too.
  assert.equal(infer("x", []).type, "constant");
});

Deno.test("a column declared numeric stays numeric with one value or none", () => {
  const one = infer("offer", ["90000"], { type: "numeric" });
  assert.equal(one.type, "numeric");
  const none = infer("rating", ["NA", ""], { type: "numeric" });
  assert.equal(none.type, "numeric");
  assert.equal(none.missing, 2);
});

Deno.test("pay amounts settle their currency; periods named in the column's name apply", () => {
  const euros = infer("salary", ["€50,000", "€61,500", "NA"]);
  assert.equal(euros.type, "numeric");
  const values = (euros as { values: Float64Array }).values;
  assert.deepEqual(Array.from(values.subarray(0, 2)), [50000, 61500]);
  assert.equal((euros as { money?: { currency?: string } }).money?.currency, "EUR");
  const monthly = infer("monthly_pay", ["4000", "5000"], { hoursPerYear: 2080 });
  assert.deepEqual((monthly as { money?: unknown }).money, { period: "month" });
  const annualised = infer("pay", ["4000", "50000/year"], { period: "month" });
  assert.deepEqual(Array.from((annualised as { values: Float64Array }).values), [48000, 50000]);
});

Deno.test("numeric identifiers by name; unique texts by count", () => {
  const ids = infer("employee_id", ["101", "102", "103", "104"]);
  assert.equal(ids.type, "identifier");
  assert.deepEqual((ids as { values: string[] }).values, ["101", "102", "103", "104"]);
  assert.deepEqual(ids.notes, ["names rows; never used as a feature"]);
  // Without an identifier word the same numbers are numeric.
  assert.equal(infer("floor", ["101", "102", "103", "104"]).type, "numeric");
  // A declared numeric id stays numeric.
  assert.equal(infer("employee_id", ["101", "102"], { type: "numeric" }).type, "numeric");
  // 20 distinct names are identifiers; 19 are levels.
  const names = (n: number) =>
    Array.from({ length: n }, (_, i) => `person ${String.fromCharCode(65 + i)}`);
  assert.equal(infer("name", names(20)).type, "identifier");
  assert.equal(infer("name", names(19)).type, "categorical");
  // A declared identifier keeps its text; missing cells become "".
  const declared = infer("code", ["x", "NA", "y"], { type: "identifier" });
  assert.deepEqual((declared as { values: string[] }).values, ["x", "", "y"]);
});

Deno.test("levels are sorted with numbers in numeric order; codes follow the rows", () => {
  const column = infer("team", ["b10", "a", "b9", "NA", "a"]);
  assert.equal(column.type, "categorical");
  assert.deepEqual((column as { levels: string[] }).levels, ["a", "b9", "b10"]);
  assert.deepEqual(levelsOf(column), ["b10", "a", "b9", "?", "a"]);
  assert.equal(column.missing, 1);
});

Deno.test("a ladder is ordinal with a note; declared categorical keeps it unordered", () => {
  const ladder = infer("level", ["L10", "L2", "L1", "L2"]);
  assert.equal(ladder.type, "ordinal");
  assert.deepEqual((ladder as { levels: string[] }).levels, ["L1", "L2", "L10"]);
  assert.deepEqual(ladder.notes, ["ordered by the number in each level: L1 < L2 < L10"]);
  const declared = infer("level", ["L10", "L2", "L1"], { type: "categorical" });
  assert.equal(declared.type, "categorical");
  assert.deepEqual((declared as { levels: string[] }).levels, ["L1", "L2", "L10"]);
});

Deno.test("a declared order makes the column ordinal and is checked", () => {
  const order = ["Junior", "Mid", "Senior"];
  const column = infer("grade", ["Senior", "Junior", "NA"], { order });
  assert.equal(column.type, "ordinal");
  assert.deepEqual((column as { levels: string[] }).levels, order);
  assert.deepEqual(levelsOf(column), ["Senior", "Junior", "?"]);
  const twice = thrown(() => infer("grade", ["Mid"], { order: ["Mid", "Mid"] }), OptionError);
  assert.equal(twice.message, "order grade: a level is listed twice");
  const unknown = thrown(
    () => infer("grade", ["Junior", "Lead", "Mid", "Lead"], { order: ["Junior", "Mid"] }),
    OptionError,
  );
  assert.equal(
    unknown.message,
    'order grade: the data has level not in the order: "Lead" (line 3)',
  );
  const needs = thrown(() => infer("grade", ["Mid", "Junior"], { type: "ordinal" }), OptionError);
  assert.equal(
    needs.message,
    "type grade=ordinal needs an order: give order grade=Junior,Mid with the levels lowest first",
  );
});

Deno.test("a numeric column with a stray text is refused, quoting it with its line", () => {
  const cells = Array.from({ length: 30 }, (_, i) => String(30 + i));
  cells.push("n.a.");
  const error = thrown(() => infer("years", cells), DataError);
  assert.equal(
    error.message,
    `t.csv: years: line 32 has "n.a.", not a number; if the column is not numeric, declare it ` +
      `with type years=categorical ${MISSING_SAID}`,
  );
  assert.deepEqual(error.location, { file: "t.csv", line: 32, column: "years" });
});

Deno.test("the message hints at a decimal comma and at a letter typed for a digit", () => {
  // A pay column with fewer than half its values failing must be numbers.
  const comma = thrown(() => infer("pay", ["50000", "1,5", "61000", "72000", "2,25"]), DataError);
  assert.match(comma.message, /^t\.csv: pay: line 3 has "1,5", line 6 has "2,25", not a number/);
  assert.match(comma.message, /the values read as numbers with decimal ","/);
  // A pay column gets no type hint.
  assert.doesNotMatch(comma.message, /type/);
  const slip = thrown(() => infer("salary", ["50000", "85,0OO", "61000"]), DataError);
  assert.match(slip.message, /; a letter O or l typed for a digit\?/);
  // Half or more failing in a pay column: text, not numbers.
  assert.equal(infer("pay", ["50000", "1,5", "2,25"]).type, "categorical");
});

Deno.test("more than five failures are counted; control characters and long cells are shortened", () => {
  const cells = Array.from({ length: 10 }, (_, i) => `x${i}\u001b`);
  cells.push(..."12345678".split(""));
  const error = thrown(() => infer("age", cells, { type: "numeric" }), DataError);
  assert.match(error.message, /^t\.csv: age: line 2 has "x0\?", line 3 has "x1\?",/);
  assert.match(error.message, /line 6 has "x4\?", and 5 more, not a number \(missing/);
  const long = thrown(() => infer("age", ["1", "y".repeat(60)], { type: "numeric" }), DataError);
  assert.match(long.message, new RegExp(`"${"y".repeat(37)}\\.\\.\\."`));
});

Deno.test("a column declared numeric names only the missing tokens given", () => {
  const error = thrown(
    () => infer("age", ["1", "?x"], { type: "numeric", missingTokens: ["?"] }),
    DataError,
  );
  assert.match(error.message, /\(missing values may be written as empty or \?\)$/);
});

Deno.test("many levels, more than half the rows, are flagged as naming rows", () => {
  // 60 comments over 100 rows: too few distinct for an identifier (95%), too many for levels.
  const cells = Array.from({ length: 100 }, (_, i) => `comment ${i % 60}`);
  const column = infer("comment", cells);
  assert.equal(column.type, "categorical");
  assert.deepEqual((column as { identifierLike?: unknown }).identifierLike, {
    levels: 60,
    rows: 100,
  });
  // 50 levels is not enough.
  const fifty = infer("comment", Array.from({ length: 90 }, (_, i) => `c${i % 50}`));
  assert.equal((fifty as { identifierLike?: unknown }).identifierLike, undefined);
});

Deno.test("inferPlainColumn: the same column from numbers, or undefined where text is needed", () => {
  const values = Float64Array.of(2, NaN, 9.5);
  const lines = linesFor(3);
  const texts = () => ["2", "NA", "9.5"];
  const plain = inferPlainColumn("years", values, lines, base, texts)!;
  const full = infer("years", texts());
  assert.deepEqual(plain, full);
  assert.equal(
    inferPlainColumn("years", values, lines, { ...base, decimal: "," }, texts),
    undefined,
  );
  assert.equal(
    inferPlainColumn("years", values, lines, { ...base, order: ["2"] }, texts),
    undefined,
  );
  assert.equal(
    inferPlainColumn("years", values, lines, { ...base, type: "categorical" }, texts),
    undefined,
  );
  assert.equal(
    inferPlainColumn("x", Float64Array.of(NaN), linesFor(1), base, () => ["NA"]),
    undefined,
  );
  const ids = inferPlainColumn("id", Float64Array.of(7, 8), linesFor(2), base, () => ["007", "8"]);
  assert.equal(ids?.type, "identifier");
  assert.deepEqual((ids as { values: string[] }).values, ["007", "8"]);
  const constant = inferPlainColumn("x", Float64Array.of(3, 3), linesFor(2), base, () => []);
  assert.equal(constant?.type, "constant");
  const pay = inferPlainColumn("pay", Float64Array.of(10, 20), linesFor(2), {
    ...base,
    period: "hour",
    hoursPerYear: 2000,
  }, () => []);
  assert.deepEqual(Array.from((pay as { values: Float64Array }).values), [20000, 40000]);
});

// A text column is inferred from its distinct texts when they are few, from
// each cell past 65,536 of them; both read as before (pinned on the code
// that read every cell).
Deno.test("few distinct texts and very many infer as cell by cell, codes and missing included", () => {
  const options = {
    file: "t.csv",
    decimal: "." as const,
    isMissing: missingTest(),
    protected: false,
  };
  const many = Array.from({ length: 70_000 }, (_, i) => (i % 7 === 0 ? "NA" : `k${i % 66_000}`));
  const lines = Array.from({ length: many.length }, (_, i) => i + 2);
  const code = inferColumn("code", many, lines, options);
  assert.deepEqual([code.type, code.missing], ["identifier", 10_000]);
  const few = Array.from(
    { length: 1000 },
    (_, i) => (i % 5 === 0 ? "n/a" : i % 3 === 0 ? "12" : `L${i % 4}`),
  );
  const grade = inferColumn("grade", few, lines, options);
  assert.ok(grade.type === "categorical" && grade.missing === 200);
  assert.deepEqual(grade.levels, ["12", "L0", "L1", "L2", "L3"]);
  assert.deepEqual([...grade.codes.slice(0, 10)], [-1, 2, 3, 0, 1, -1, 0, 4, 1, 0]);
  // One stray text among pay, or among 99 distinct numbers, is quoted back, not made levels.
  const pay = Array.from({ length: 100 }, (_, i) => (i === 7 ? "TBD" : `${50000 + i}`));
  assert.throws(
    () => inferColumn("pay", pay, lines, options),
    /pay: line 9 has "TBD", not a number/,
  );
  const mostly = Array.from({ length: 100 }, (_, i) => (i === 7 ? "TBD" : `${i}`));
  assert.throws(
    () => inferColumn("x", mostly, lines, options),
    /declare it with type x=categorical/,
  );
});
