import assert from "node:assert/strict";
import fc from "fast-check";
import { CellColumn } from "../../../lib/table/cell_column.ts";
import { missingTest, missingTestAt } from "../../../lib/table/missing.ts";

const isMissing = missingTest();

function column(texts: readonly string[]): CellColumn {
  const c = new CellColumn(isMissing);
  for (const t of texts) c.push(t);
  return c;
}

// The plain model the compact column must agree with: every text kept as is; numbers while
// every cell is a plain decimal (or missing), Number(text) each, NaN for missing.
const PLAIN = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;
function model(texts: readonly string[]): { plain: number[] | null; texts: string[] } {
  const values: number[] = [];
  for (const t of texts) {
    if (isMissing(t)) values.push(NaN);
    else if (t.length <= 100 && PLAIN.test(t) && Number.isFinite(Number(t))) values.push(Number(t));
    else return { plain: null, texts: [...texts] };
  }
  return { plain: values, texts: [...texts] };
}

Deno.test("numbers that do not give their text back keep their text", () => {
  const texts = ["85000", "40.10", "007", "-0", "+5", ".5", "-.5", "1e3", "1E3", "40.", "-0.0"];
  texts.push("0.0000001", "123456789012345678", "NA", "", "0", "-12.25", "3.14159265358979");
  const c = column(texts);
  assert.deepEqual(c.texts(), texts);
  const plain = c.plain!;
  assert.deepEqual(Array.from(plain.subarray(0, 11)), [
    85000,
    40.1,
    7,
    -0,
    5,
    0.5,
    -0.5,
    1000,
    1000,
    40,
    -0,
  ]);
  assert.ok(Number.isNaN(plain[13]) && Number.isNaN(plain[14]) && plain[12] === 123456789012345678);
  assert.equal(c.length, texts.length);
});

Deno.test("the first cell that is no number turns the column into text, earlier cells kept", () => {
  const c = column(["1", "2.50", "NA", "", "L2", "3", "L2"]);
  assert.equal(c.plain, null);
  assert.deepEqual(c.texts(), ["1", "2.50", "NA", "", "L2", "3", "L2"]);
  // Infinity and numbers too large for a double are text, not numbers.
  assert.equal(column(["1", "1e400"]).plain, null);
  assert.equal(column(["Infinity"]).plain, null);
  assert.equal(column(["1".repeat(101)]).plain, null);
});

Deno.test("an empty column has no cells and an empty plain array", () => {
  const c = column([]);
  assert.equal(c.length, 0);
  assert.deepEqual(Array.from(c.plain!), []);
  assert.deepEqual(c.texts(), []);
  assert.deepEqual(c.numberLikeTexts(), []);
});

Deno.test("more than 1,024 cells grow the store and keep every value", () => {
  const texts = Array.from({ length: 5000 }, (_, i) => (i % 7 === 0 ? `${i}.50` : String(i * 3)));
  const c = column(texts);
  assert.equal(c.plain!.length, 5000);
  assert.equal(c.plain![4999], 4999 * 3);
  assert.equal(c.plain![4998], 4998.5);
  assert.deepEqual(c.texts(), texts);
});

Deno.test("numberLikeTexts lists distinct texts with a digit and a point or comma", () => {
  const numeric = column(["1.5", "2", "1.5", "40.10", "NA", "3,5"]);
  // "3,5" is not a plain number: the column is text from there on.
  assert.deepEqual(numeric.numberLikeTexts(), ["1.5", "40.10", "3,5"]);
  const plain = column(["1.5", "2", "1.5", "40.10", "NA", "7.25"]);
  assert.deepEqual(plain.numberLikeTexts(), ["1.5", "40.10", "7.25"]);
  assert.deepEqual(plain.numberLikeTexts(2), ["1.5", "40.10"]);
  assert.deepEqual(column(["North", "1,000", "x.", ".y"]).numberLikeTexts(), ["1,000"]);
});

Deno.test("keep retains the rows given, their aside texts included", () => {
  const numeric = column(["1", "40.10", "NA", "7", "007"]);
  numeric.keep([1, 3, 4]);
  assert.equal(numeric.length, 3);
  assert.deepEqual(Array.from(numeric.plain!), [40.1, 7, 7]);
  assert.deepEqual(numeric.texts(), ["40.10", "7", "007"]);
  const text = column(["a", "b", "c", "d"]);
  text.keep([0, 3]);
  assert.deepEqual(text.texts(), ["a", "d"]);
  const none = column(["1", "2"]);
  none.keep([]);
  assert.equal(none.length, 0);
  assert.deepEqual(none.texts(), []);
  // Cells pushed after keep follow on.
  none.push("5");
  assert.deepEqual(none.texts(), ["5"]);
});

Deno.test("hostile texts are kept byte for byte", () => {
  const texts = [
    "=cmd|' /C calc'!A0",
    "\u001b[31mred",
    "a\u0000b",
    "日本語",
    "😀",
    "1".repeat(70000),
  ];
  assert.deepEqual(column(texts).texts(), texts);
});

Deno.test("the compact column agrees with the plain model on generated columns", () => {
  const cell = fc.oneof(
    fc.integer({ min: -1e9, max: 1e9 }).map(String),
    fc.double({ noNaN: true, noDefaultInfinity: true }).map(String),
    fc.double({ min: -1e6, max: 1e6, noNaN: true }).map((x) => x.toFixed(2)),
    fc.constantFrom("NA", "", "-", "007", "-0", "+1", ".5", "1.", "0.000001", "1e-7", "L1", "1,5"),
    fc.stringMatching(/^-?\d{1,20}(\.\d{0,20})?$/),
  );
  fc.assert(
    fc.property(fc.array(cell, { maxLength: 60 }), fc.boolean(), (texts, numeric) => {
      const cells = numeric ? texts.filter((t) => t !== "L1" && t !== "1,5") : texts;
      const c = column(cells);
      const expected = model(cells);
      assert.deepEqual(c.texts(), expected.texts);
      if (expected.plain === null) assert.equal(c.plain, null);
      else assert.deepEqual(Array.from(c.plain!), expected.plain);
    }),
    { seed: 15, numRuns: 400 },
  );
});

// pushAt must be push of the trimmed cell, whatever the cell and what lies
// around it in the row: the same texts, the same numbers (-0 kept apart from
// 0), the same turn to text.
function sameAsPush(cells: readonly string[], tokens?: readonly string[]) {
  const isMissing = missingTest(tokens);
  const byText = new CellColumn(isMissing);
  const byBounds = new CellColumn(isMissing, missingTestAt(tokens));
  const row = "x," + cells.join(",") + ",y";
  let start = 2;
  for (const cell of cells) {
    byText.push(cell.trim());
    byBounds.pushAt(row, start, start + cell.length);
    start += cell.length + 1;
  }
  assert.deepEqual(byBounds.texts(), byText.texts());
  assert.deepEqual(
    byBounds.plain && Array.from(byBounds.plain),
    byText.plain && Array.from(byText.plain),
  );
  assert.equal(byBounds.length, cells.length);
  // The distinct texts counted as cells came in: those of the texts, in
  // order of first appearance (none for numbers, none past the limit).
  for (const c of [byText, byBounds]) {
    const counted = c.distinct(65_536);
    if (c.plain !== null) {
      assert.equal(counted, null);
      continue;
    }
    const expected = new Map<string, number>();
    for (const t of c.texts()) expected.set(t, (expected.get(t) ?? 0) + 1);
    if (expected.size > 65_536) assert.equal(counted, null);
    else assert.deepEqual(counted && [...counted], [...expected]);
  }
  return byBounds;
}

Deno.test("pushAt reads each cell as push reads it trimmed", () => {
  const cells = ["85000", "40.10", "007", "-0", "+5", ".5", "-.5", "1e3", "40.", "-0.0", "0"];
  cells.push("0.00001", "0.000009", "0.0000001", "-0.5", "123456789012345", "1234567890123456");
  cells.push("9007199254740993", "0.1", "0.30000000000000004", " 12 ", "\u00a012\u00a0", "1e400");
  cells.push("NA", "", " ", "-", "n/a", "0x10", "12.5.1", "1-2", "--1", "-", "3");
  const c = sameAsPush(cells);
  // A number read from its characters is Number() of them.
  assert.ok(Object.is(c.texts()[3], "-0") && c.texts()[0] === "85000");
  // Tokens of one's own that look like numbers are missing, not numbers.
  const own = sameAsPush(["1", "999", "-1", "2.5", "0"], ["999", "-1", "0"]);
  assert.deepEqual(Array.from(own.plain!), [1, NaN, NaN, 2.5, NaN]);
  // A text column shares each repeated level, cut out once.
  const levels = sameAsPush([
    "L1",
    "L2",
    "x",
    "L1",
    " L2",
    "L2 ",
    "",
    "NA",
    "\u00e9t\u00e9",
    "\u00e9t\u00e9",
  ]);
  assert.deepEqual(levels.texts(), ["L1", "L2", "x", "L1", "L2", "L2", "", "NA", "été", "été"]);
});

Deno.test("pushAt agrees with push on generated cells and rows", () => {
  const cell = fc.oneof(
    fc.integer({ min: -1e9, max: 1e9 }).map(String),
    fc.double({ noNaN: true, noDefaultInfinity: true }).map(String),
    fc.double({ min: -1e6, max: 1e6, noNaN: true }).map((x) =>
      x.toFixed(fc.sample(fc.nat(6), 1)[0])
    ),
    fc.constantFrom(
      "NA",
      "",
      " ",
      "-",
      "007",
      "-0",
      "+1",
      ".5",
      "1.",
      "0.000001",
      "1e-7",
      "L1",
      "L2",
    ),
    fc.stringMatching(/^ ?-?\d{1,17}(\.\d{0,17})? ?$/),
    fc.string({ maxLength: 4 }).filter((t) => !t.includes(",")),
  );
  fc.assert(
    fc.property(fc.array(cell, { maxLength: 60 }), (cells) => {
      sameAsPush(cells);
    }),
    { seed: 16, numRuns: 500 },
  );
  // Many distinct levels: past the shared limit the texts are no longer shared, still equal.
  sameAsPush(Array.from({ length: 70_000 }, (_, i) => `k${i % 66_000}`));
});
