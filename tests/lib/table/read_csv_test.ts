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
      "(e.g. --encoding windows-1252)",
    2,
  );
  assert.equal(decodeText(latin, "windows-1252"), "name\ncafé\n");
});
