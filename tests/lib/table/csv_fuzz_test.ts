// Property-based CSV fuzzing (fast-check). Generated tables have random
// quoting, delimiters, line endings, missing cells, huge and tiny numbers,
// NaN/Infinity strings, very long fields, control characters and random
// column types. A valid table must read back cell for cell as generated,
// the same as csv-parse (an outside library) reads it and the same whatever
// the chunks it arrives in, and load with numbers equal to the numbers
// meant; a broken one must be refused with a DataError of one line naming
// its line. Nothing else may escape: no other error, no hang.
import assert from "node:assert/strict";
import fc from "fast-check";
import { parse } from "csv-parse/sync";
import { DataError, loadTable, loadTableChunks, OptionError } from "../../../mod.ts";
import { readCsv } from "../../../lib/table/read_csv.ts";

let loadedCount = 0;
const RUNS = Number(Deno.env.get("FUZZ_RUNS") ?? 150);

// Cell texts of several kinds; none is all whitespace (a blank record is
// skipped by design) and none has spaces at its ends (cells are trimmed).
const plainNumber = fc.oneof(
  fc.integer({ min: -1_000_000_000, max: 1_000_000_000 }).map(String),
  fc.double({ min: -1e12, max: 1e12, noNaN: true, noDefaultInfinity: true }).map((x) =>
    x.toFixed(3)
  ),
  fc.constantFrom("1e300", "1e-300", "0.0000001", "123456789012345678", "-0", "007", "40.10"),
);
const oddText = fc.oneof(
  fc.constantFrom("NaN", "Infinity", "-Infinity", "NA", "n/a", "-", "null", "1e400"),
  fc.string({ unit: "grapheme-ascii", minLength: 1, maxLength: 12 }),
  fc.string({ minLength: 1, maxLength: 3000 }),
  fc.constantFrom('say "hi"', "a,b", "a;b", "two\nlines", "tab\there", "bell\u0007", "x\r\ny"),
);
const levelText = fc.constantFrom("L1", "L2", "L3", "North", "South", "Field Service");

type Kind = "number" | "level" | "text";
const columnKind = fc.constantFrom<Kind>("number", "level", "text");

function cellOf(kind: Kind) {
  const base = kind === "number" ? plainNumber : kind === "level" ? levelText : oddText;
  // Some cells missing (empty).
  return fc.oneof({ weight: 9, arbitrary: base }, { weight: 1, arbitrary: fc.constant("") })
    .map((t) => t.trim())
    .filter((t) => !t.includes("\u0000"));
}

const table = fc.record({
  delimiter: fc.constantFrom(",", ";", "\t", "|"),
  eol: fc.constantFrom("\n", "\r\n"),
  quoteAll: fc.boolean(),
  kinds: fc.array(columnKind, { minLength: 1, maxLength: 6 }),
  rows: fc.integer({ min: 1, max: 25 }),
  seed: fc.integer(),
}).chain((spec) =>
  fc.record({
    spec: fc.constant(spec),
    cells: fc.array(fc.tuple(...spec.kinds.map(cellOf)), {
      minLength: spec.rows,
      maxLength: spec.rows,
    }),
  })
).filter(({ cells }) =>
  // A row of one empty cell is a blank line, which is skipped by design.
  cells.every((row) => !(row.length === 1 && row[0] === ""))
);

function field(text: string, delimiter: string, quoteAll: boolean): string {
  const needs = text.includes(delimiter) || /["\r\n]/.test(text);
  return needs || quoteAll ? `"${text.replace(/"/g, '""')}"` : text;
}

function csvText(
  spec: { delimiter: string; eol: string; quoteAll: boolean; kinds: Kind[] },
  cells: string[][],
) {
  const header = spec.kinds.map((k, i) => `${k}_${i}`);
  return [header, ...cells].map((row) =>
    row.map((t) => field(t, spec.delimiter, spec.quoteAll)).join(spec.delimiter)
  ).join(spec.eol) + spec.eol;
}

Deno.test("a valid generated table reads back cell for cell, as csv-parse reads it, in any chunks", async () => {
  await fc.assert(
    fc.asyncProperty(table, fc.array(fc.nat(), { maxLength: 6 }), async ({ spec, cells }, cuts) => {
      const text = csvText(spec, cells);
      const raw = readCsv(text, { delimiter: spec.delimiter });
      assert.deepEqual(raw.header, spec.kinds.map((k, i) => `${k}_${i}`));
      assert.equal(raw.lines.length, cells.length);
      spec.kinds.forEach((_, c) => assert.deepEqual(raw.cells[c], cells.map((row) => row[c])));
      // csv-parse, on the same text, finds the same records.
      const outside: string[][] = parse(text, {
        delimiter: spec.delimiter,
        relax_column_count: true,
      });
      assert.deepEqual(outside.slice(1).map((r) => r.map((t) => t.trim())), cells);
      // Loaded in chunks cut anywhere (even inside a character), the same table.
      const bytes = new TextEncoder().encode(text);
      const points = [...new Set(cuts.map((c) => c % (bytes.length + 1)))].sort((a, b) => a - b);
      const pieces: Uint8Array[] = [];
      let from = 0;
      for (const p of [...points, bytes.length]) {
        pieces.push(bytes.subarray(from, p));
        from = p;
      }
      async function* chunks() {
        yield* pieces;
      }
      let whole: unknown;
      try {
        whole = loadTable(bytes, { delimiter: spec.delimiter });
      } catch (error) {
        // A table can be unusable for its content (e.g. a numbers column
        // with one stray word); that is said as a DataError or OptionError.
        assert.ok(error instanceof DataError || error instanceof OptionError, String(error));
        assert.ok(!error.message.includes("\n"), error.message);
        return;
      }
      const streamed = await loadTableChunks(chunks(), { delimiter: spec.delimiter });
      loadedCount++;
      assert.deepEqual(streamed, whole);
      // Columns of plain numbers load as the numbers meant.
      const loaded = whole as ReturnType<typeof loadTable>;
      spec.kinds.forEach((kind, c) => {
        const column = loaded.columns[c];
        if (kind !== "number" || column.type !== "numeric") return;
        cells.forEach((row, r) => {
          const meant = row[c] === "" ? NaN : Number(row[c]);
          assert.ok(Object.is(column.values[r], meant) || column.values[r] === meant, `${row[c]}`);
        });
      });
    }),
    { numRuns: RUNS },
  );
});

// Ways to break a valid table, each with what the message must say.
const breakage = fc.constantFrom(
  "unclosed quote",
  "stray quote",
  "ragged row",
  "quote not doubled",
  "nul byte",
  "bad utf-8",
);

Deno.test("a broken table is refused with one line naming its line, never anything else", () => {
  fc.assert(
    fc.property(table, breakage, fc.nat(), ({ spec, cells }, how, where) => {
      const lines = csvText({ ...spec, quoteAll: false }, cells).split(spec.eol);
      lines.pop(); // the empty text after the last line break
      // Break one data row (lines[0] is the header), if the cells allow it.
      const at = 1 + (where % (lines.length - 1));
      const d = spec.delimiter;
      let bytes: Uint8Array;
      if (how === "unclosed quote") {
        lines[at] = `"open${d}${lines[at]}`;
        bytes = new TextEncoder().encode(lines.join(spec.eol) + spec.eol);
      } else if (how === "stray quote") {
        lines[at] = `x"y${d}${lines[at]}`;
        bytes = new TextEncoder().encode(lines.join(spec.eol) + spec.eol);
      } else if (how === "ragged row") {
        lines[at] = `${lines[at]}${d}extra`;
        bytes = new TextEncoder().encode(lines.join(spec.eol) + spec.eol);
      } else if (how === "quote not doubled") {
        lines[at] = `"a"b${d}${lines[at]}`;
        bytes = new TextEncoder().encode(lines.join(spec.eol) + spec.eol);
      } else {
        const text = new TextEncoder().encode(lines.join(spec.eol) + spec.eol);
        const cut = Math.min(text.length, 1 + (where % text.length));
        bytes = new Uint8Array([
          ...text.subarray(0, cut),
          how === "nul byte" ? 0 : 0xff,
          ...text.subarray(cut),
        ]);
      }
      // A quoted multi-line cell can make the breakage land inside quotes,
      // where it is text; then the table may be valid. Only errors are judged.
      try {
        loadTable(bytes, { delimiter: d });
      } catch (error) {
        assert.ok(error instanceof DataError || error instanceof OptionError, String(error));
        assert.ok(!error.message.includes("\n"), `more than one line: ${error.message}`);
        if (error instanceof DataError && how !== "nul byte") {
          assert.ok(
            error.location.line !== undefined || error.location.column !== undefined,
            `no line or column: ${error.message}`,
          );
        }
        return;
      }
      // Broken structurally, the table must not load when the break is outside quotes.
      const plainRows = cells.every((row) =>
        row.every((t) => !/["\r\n]/.test(t) && !t.includes(d))
      );
      if (plainRows && how !== "bad utf-8") assert.fail(`${how} was not refused`);
    }),
    { numRuns: RUNS },
  );
});

Deno.test("the fuzzer's valid tables mostly load (the typed comparison is not vacuous)", () => {
  // Run after the first property: most generated tables are usable ones.
  assert.ok(loadedCount >= RUNS / 3, `only ${loadedCount} of ${RUNS} loaded`);
});
