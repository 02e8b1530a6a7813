import assert from "node:assert/strict";
import { decodeText, detectDelimiter, readCsv } from "../../../lib/table/read_csv.ts";
import { DataError } from "../../../lib/errors.ts";

function fails(fn: () => unknown, message: string, line?: number) {
  assert.throws(fn, (error: unknown) => {
    assert.ok(error instanceof DataError, String(error));
    assert.equal(error.message, message);
    if (line !== undefined) assert.equal(error.location.line, line);
    return true;
  });
}

// RFC 4180 section 2: quoted fields may hold commas, line breaks and doubled quotes.
Deno.test("readCsv keeps RFC 4180 quoted fields whole", () => {
  const raw = readCsv('id,note,pay\r\n1,"Smith, J.","85,000"\r\n2,"two\nlines","say ""hi"""\r\n');
  assert.deepEqual(raw.header, ["id", "note", "pay"]);
  assert.deepEqual(raw.cells[1], ["Smith, J.", "two\nlines"]);
  assert.deepEqual(raw.cells[2], ["85,000", 'say "hi"']);
  assert.deepEqual(raw.lines, [2, 3]);
});

Deno.test("readCsv numbers rows by their first line, past blank lines and multi-line fields", () => {
  const raw = readCsv('a,b\n1,"x\ny\nz"\n\n\n3,4\n');
  assert.deepEqual(raw.lines, [2, 7]);
});

Deno.test("decodeText drops a UTF-8 byte-order mark and decodes UTF-16", () => {
  const bom = new Uint8Array([0xef, 0xbb, 0xbf, ...new TextEncoder().encode("pay\n1\n")]);
  assert.equal(decodeText(bom), "pay\n1\n");
  const utf16 = new Uint8Array([0xff, 0xfe, 0x61, 0x00, 0x0a, 0x00]);
  assert.equal(decodeText(utf16), "a\n");
});

Deno.test("detectDelimiter picks the delimiter that splits rows evenly", () => {
  assert.equal(detectDelimiter("a,b,c\n1,2,3\n"), ",");
  assert.equal(detectDelimiter("a;b;c\n1,5;2,5;3\n"), ";");
  assert.equal(detectDelimiter("a\tb\n1,000\t2\n"), "\t");
  assert.equal(readCsv("a;b\n1,5;2\n").cells[0][0], "1,5");
});

Deno.test("bad files are refused with file and line named", () => {
  fails(() => readCsv("", { file: "t.csv" }), "t.csv is empty");
  fails(() => readCsv("\n\n  \n", { file: "t.csv" }), "t.csv is empty");
  fails(() => readCsv("a,b\n", { file: "t.csv" }), "t.csv has a header but no data rows");
  fails(
    () => readCsv("a,b,a\n1,2,3\n", { file: "t.csv" }),
    't.csv line 1: the header names "a" twice (columns 1 and 3)',
    1,
  );
  fails(
    () => readCsv("a,,b\n1,2,3\n", { file: "t.csv" }),
    "t.csv line 1: column 2 of the header has no name",
  );
  fails(
    () => readCsv('a,b\n1,2\n3,"4\n5,6\n', { file: "t.csv" }),
    "t.csv line 3: a quoted field starts here and is never closed",
    3,
  );
  fails(
    () => readCsv('a,b\n1,x"y\n', { file: "t.csv" }),
    "t.csv line 2: a quote appears inside an unquoted field; quote the whole field and " +
      "write each quote in it twice",
    2,
  );
});

Deno.test("ragged rows are refused with the first few line numbers", () => {
  const rows = ["a,b,c", "1,2,3", "1,2", "1,2,3", "1,2,3,4"];
  for (let i = 0; i < 6; i++) rows.push("9");
  fails(
    () => readCsv(rows.join("\n"), { file: "t.csv", delimiter: "," }),
    "t.csv: 8 rows do not have the 3 fields of the header: line 3 has 2, line 5 has 4, " +
      "line 6 has 1, line 7 has 1, line 8 has 1, and 3 more",
    3,
  );
});

Deno.test("binary and wrongly encoded files are refused", () => {
  fails(
    () => decodeText(new Uint8Array([0x50, 0x4b, 0x03, 0x04, 0x00, 0x01]), "utf-8", "pay.xlsx"),
    "pay.xlsx is not a text file (byte 5 is a NUL byte); export the table as CSV",
  );
  // "café" in Windows-1252 on line 2: 0xe9 is not valid UTF-8.
  const latin = new Uint8Array([...new TextEncoder().encode("name\ncaf"), 0xe9, 0x0a]);
  fails(
    () => decodeText(latin, "utf-8", "t.csv"),
    "t.csv line 2 is not valid utf-8 text; re-save the file as UTF-8, or name its encoding " +
      "(e.g. encoding windows-1252)",
    2,
  );
  assert.equal(decodeText(latin, "windows-1252"), "name\ncafé\n");
});

// From a review of the streaming reader (each case failed before its fix).
import { ChunkDecoder, CsvColumnsReader } from "../../../lib/table/read_csv.ts";
import { loadTable } from "../../../lib/table/load_table.ts";

Deno.test("a number written '-.5' reads back as written, and stays one level", () => {
  assert.deepEqual(readCsv("a,b\n-.5,x\n").cells[0], ["-.5"]);
  const table = loadTable("dept,x\nA,-.5\nB,abc\nC,-.5\nD,abc\n");
  const x = table.columns[1];
  assert.ok(x.type === "categorical" || x.type === "ordinal");
  if (x.type === "categorical" || x.type === "ordinal") assert.deepEqual(x.levels, ["-.5", "abc"]);
});

Deno.test("the delimiter is found even when the held-back text ends inside a quoted field", () => {
  const reader = new CsvColumnsReader({ file: "t.csv", isMissing: (t) => t === "" });
  reader.push('a;b\n"x' + "\n".repeat(49));
  reader.push('y";2\n');
  const read = reader.end();
  assert.equal(read.delimiter, ";");
  assert.deepEqual(read.columns[0].texts(), ["x" + "\n".repeat(49) + "y"]);
});

Deno.test("invalid UTF-8 is placed on its line when a chunk cuts a character in two", () => {
  const bytes = new Uint8Array([
    ...new TextEncoder().encode("name\ncafé\nb\nc\n"),
    0xff,
    0x0a,
  ]);
  const cut = new TextEncoder().encode("name\ncaf").length + 1; // inside the é
  const decoder = new ChunkDecoder("utf-8", "t.csv");
  decoder.decode(bytes.subarray(0, cut));
  fails(() => decoder.decode(bytes.subarray(cut), true), decodeMessage(5), 5);
});

function decodeMessage(line: number): string {
  return `t.csv line ${line} is not valid utf-8 text; re-save the file as UTF-8, or name its ` +
    "encoding (e.g. encoding windows-1252)";
}

Deno.test("a UTF-16 byte-order mark is seen even when the first piece holds one byte", () => {
  const decoder = new ChunkDecoder("utf-8", "t.csv");
  const utf16 = new Uint8Array([0xff, 0xfe, 0x61, 0x00, 0x0a, 0x00]);
  const text = decoder.decode(utf16.subarray(0, 1)) + decoder.decode(utf16.subarray(1), true);
  assert.equal(text, "a\n");
});

Deno.test("line breaks may be CRLF, LF or CR anywhere in a file (a choice: exports mix them)", () => {
  assert.deepEqual(readCsv("a,b\r\n1,2\n3,4\r5,6\r\n").cells[1], ["2", "4", "6"]);
  assert.deepEqual(readCsv("a,b\r\n1,2\n3,4\r5,6\r\n").lines, [2, 3, 4]);
});

Deno.test("a delimiter of more than one character is an option error, not a crash", () => {
  assert.throws(
    () => readCsv("a;;b\n1;;2\n", { delimiter: ";;" }),
    /the delimiter must be one character/,
  );
});
