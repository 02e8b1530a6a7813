import assert from "node:assert/strict";
import { DEFAULT_MISSING_TOKENS, missingTest, missingTestAt } from "../../../lib/table/missing.ts";

Deno.test("the default tokens, in any case and with spaces around, are missing", () => {
  const isMissing = missingTest();
  const missing = ["", " ", "\t", "NA", "na", "N/A", "n/a", "#N/A", "#n/a", "NaN", "nan", "NAN"];
  missing.push("null", "NULL", " Null ", "-", " - ", "\tNA\t");
  for (const text of missing) assert.equal(isMissing(text), true, JSON.stringify(text));
});

Deno.test("values, and texts that only contain a token, are not missing", () => {
  const isMissing = missingTest();
  const present = ["0", "-1", "--", "NAB", "nana", "N/A.", "none", "None", "nil", "#N/A!", "Na N"];
  present.push("-0", "NaNa", "nulls", "unknown", "0.0", "\u00a0NA\u00a0x");
  for (const text of present) assert.equal(isMissing(text), false, JSON.stringify(text));
});

Deno.test("a list of one's own replaces the default; the empty cell stays missing", () => {
  const isMissing = missingTest(["?", " Unknown "]);
  assert.equal(isMissing("?"), true);
  assert.equal(isMissing("unknown"), true);
  assert.equal(isMissing(" UNKNOWN"), true);
  assert.equal(isMissing(""), true);
  assert.equal(isMissing("   "), true);
  assert.equal(isMissing("NA"), false);
  assert.equal(isMissing("-"), false);
  assert.equal(isMissing("unknowns"), false);
});

Deno.test("an empty list leaves only blank cells missing", () => {
  const isMissing = missingTest([]);
  assert.equal(isMissing(""), true);
  assert.equal(isMissing("  "), true);
  assert.equal(isMissing("NA"), false);
  assert.equal(isMissing("x"), false);
});

Deno.test("the default list is the documented six", () => {
  assert.deepEqual([...DEFAULT_MISSING_TOKENS], ["NA", "N/A", "#N/A", "NaN", "null", "-"]);
});

// A second, plain implementation: trim, lower-case, look up.
Deno.test("the fast path agrees with trim-and-lookup on many texts", () => {
  const tokens = ["NA", "N/A", "#N/A", "NaN", "null", "-", "?"];
  const plain = (text: string) =>
    text.trim() === "" || tokens.map((t) => t.toLowerCase()).includes(text.trim().toLowerCase());
  const isMissing = missingTest(tokens);
  const pieces = ["", " ", "\t", "\n", "n", "N", "a", "A", "/", "#", "-", "?", "u", "l", "1"];
  let checked = 0;
  for (const a of pieces) {
    for (const b of pieces) {
      for (const c of pieces) {
        for (const d of ["", "l", " "]) {
          const text = a + b + c + d;
          assert.equal(isMissing(text), plain(text), JSON.stringify(text));
          checked++;
        }
      }
    }
  }
  assert.equal(checked, 15 ** 3 * 3);
});

Deno.test("a cell is missing whatever the case of its first letter, and a non-ASCII first letter gets the full test", () => {
  const isMissing = missingTest(["NA", "kelvin", "ñ/d"]);
  for (const cell of ["na", "Na", "NA", "nA", " NA ", "KELVIN", "\u212Aelvin", "Ñ/D", "ñ/d"]) {
    assert.equal(isMissing(cell), true, cell);
  }
  for (const cell of ["5", "NB", "G3", "Nairobi", "x"]) assert.equal(isMissing(cell), false, cell);
});

Deno.test("missingTestAt agrees with missingTest on the cell cut out of a row", () => {
  for (const tokens of [DEFAULT_MISSING_TOKENS, ["NA", "kelvin", "ñ/d", "0", "999", "-1"], []]) {
    const isMissing = missingTest(tokens);
    const isMissingAt = missingTestAt(tokens);
    const cells = ["", " ", "\t", "na", " NULL ", "-", "-1", "-12", "0", "0.5", "999", "9999"];
    cells.push("\u212Aelvin", "KELVIN", "Ñ/D", "N/A", "#n/a", "NaN", "nan5", "\u00a0NA\u00a0", "x");
    let checked = 0;
    for (const cell of cells) {
      for (const [before, after] of [["", ""], ["12,", ",34"], ["a;b;", "\n"]]) {
        const row = before + cell + after;
        const at = isMissingAt(row, before.length, before.length + cell.length);
        assert.equal(at, isMissing(cell), `${JSON.stringify(cell)} in ${JSON.stringify(row)}`);
        checked++;
      }
    }
    assert.equal(checked, cells.length * 3);
  }
  // Some of them are missing, some not, under the default list.
  const isMissingAt = missingTestAt();
  assert.deepEqual([isMissingAt("1,NA,2", 2, 4), isMissingAt("1,NA,2", 0, 1)], [true, false]);
});
