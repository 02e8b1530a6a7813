import assert from "node:assert/strict";
import { parse } from "csv-parse/sync";
import { DataError } from "../../../lib/errors.ts";
import { CsvTokenizer, fieldText } from "../../../lib/table/csv_tokenizer.ts";

type Out = [string[], number][];

function tokenize(chunks: readonly string[], delimiter = ","): Out {
  const records: Out = [];
  const t = new CsvTokenizer(delimiter, "t.csv", (fields, line) => records.push([fields, line]));
  for (const chunk of chunks) t.push(chunk);
  t.end();
  return records;
}

// Every way of cutting the text in two, and one character at a time.
function everySplit(text: string, delimiter = ","): Out {
  const whole = tokenize([text], delimiter);
  for (let k = 0; k <= text.length; k++) {
    assert.deepEqual(tokenize([text.slice(0, k), text.slice(k)], delimiter), whole, `cut at ${k}`);
  }
  assert.deepEqual(tokenize([...text], delimiter), whole, "one character at a time");
  return whole;
}

function refusal(chunks: readonly string[]): DataError {
  try {
    tokenize(chunks);
  } catch (error) {
    assert.ok(error instanceof DataError, String(error));
    return error;
  }
  assert.fail("no error");
}

Deno.test("records and their first lines, by hand", () => {
  assert.deepEqual(everySplit("a,b\n1,2\n"), [[["a", "b"], 1], [["1", "2"], 2]]);
  // No final line break: the last record still comes out at end().
  assert.deepEqual(everySplit("a,b\n1,2"), [[["a", "b"], 1], [["1", "2"], 2]]);
  // Fields are not trimmed; empty fields are kept, a trailing delimiter is one more field.
  assert.deepEqual(everySplit(" a ,,b,\n"), [[[" a ", "", "b", ""], 1]]);
  assert.deepEqual(everySplit("x,"), [[["x", ""], 1]]);
});

Deno.test("CRLF, LF and lone CR each end a line, CRLF counting once", () => {
  assert.deepEqual(everySplit("a\r\nb\rc\nd"), [[["a"], 1], [["b"], 2], [["c"], 3], [["d"], 4]]);
  assert.deepEqual(everySplit('"x"\r\n"y"\r'), [[["x"], 1], [["y"], 2]]);
});

Deno.test("quoted fields hold delimiters, doubled quotes and line breaks; lines keep count", () => {
  const text = 'id,note\n1,"a, ""b""\r\nc"\n2,""\n3,"x\ry"\n4,z\n';
  assert.deepEqual(everySplit(text), [
    [["id", "note"], 1],
    [["1", 'a, "b"\r\nc'], 2],
    [["2", ""], 4],
    [["3", "x\ry"], 5],
    [["4", "z"], 7],
  ]);
});

Deno.test("a blank line is a record of one empty field (the reader skips it)", () => {
  assert.deepEqual(everySplit("a\n\nb\n"), [[["a"], 1], [[""], 2], [["b"], 3]]);
});

Deno.test("empty input gives no record", () => {
  assert.deepEqual(tokenize([]), []);
  assert.deepEqual(tokenize([""]), []);
  assert.deepEqual(tokenize(["", "", ""]), []);
});

Deno.test("semicolons and tabs as delimiters; a comma is then plain text", () => {
  assert.deepEqual(everySplit("a;b\n1,5;2\n", ";"), [[["a", "b"], 1], [["1,5", "2"], 2]]);
  assert.deepEqual(everySplit('a\tb\n"x\ty"\t2\n', "\t"), [[["a", "b"], 1], [["x\ty", "2"], 2]]);
});

Deno.test("a delimiter must be one character", () => {
  assert.throws(() => new CsvTokenizer(";;", "t.csv", () => {}), RangeError);
  assert.throws(() => new CsvTokenizer("", "t.csv", () => {}), RangeError);
  assert.equal(new CsvTokenizer("|", "t.csv", () => {}).delimiter, "|");
});

Deno.test("broken quoting is refused with the line it is on", () => {
  const open = refusal(['a,b\n1,2\n3,"never closed\n4,5\n']);
  assert.equal(open.message, "t.csv line 3: a quoted field starts here and is never closed");
  assert.deepEqual(open.location, { file: "t.csv", line: 3 });
  const notDoubled = refusal(['a\n"x\ny"z\n']);
  assert.equal(notDoubled.message, "t.csv line 3: a quote inside a quoted field is not doubled");
  const inside = refusal(['a,b\n1,x"y\n']);
  assert.equal(
    inside.message,
    "t.csv line 2: a quote appears inside an unquoted field; quote the whole field and write " +
      "each quote in it twice",
  );
  // The same error whatever the chunks.
  assert.equal(refusal(["a,b\n1,x", '"y\n']).message, inside.message);
});

Deno.test("a field longer than 64 KiB arriving in many chunks is read whole", () => {
  const long = "p".repeat(300_000);
  const text = `a,b\n"${long}",1\n2,3\n`;
  const chunks: string[] = [];
  for (let i = 0; i < text.length; i += 1000) chunks.push(text.slice(i, i + 1000));
  assert.deepEqual(tokenize(chunks), [[["a", "b"], 1], [[long, "1"], 2], [["2", "3"], 3]]);
});

// csv-parse 7.0.3 (npm, an outside RFC 4180 reader) with relax_column_count, as the
// reference for the fields of texts with every feature above. csv-parse settles the line
// break from the first one it meets, so each text keeps one kind outside quotes.
Deno.test("the same fields as csv-parse on mixed texts", () => {
  const texts = [
    'id,name,pay\r\n1,"Smith, J.",50000\r\n2,"O""Brien",61000\r\n3,,\r\n',
    'h\n"multi\nline\r\nfield"\n"",x\n',
    "a;b;c\r1;2;3\r4;5;6",
    '"=cmd|\' /C calc\'!A0","\u001b[31m",日本語\n😀,"a\u0000b"\n',
  ];
  for (const text of texts) {
    const delimiter = text.startsWith("a;") ? ";" : ",";
    const expected = parse(text, { delimiter, relax_column_count: true }) as string[][];
    assert.deepEqual(everySplit(text, delimiter).map(([fields]) => fields), expected);
  }
});

Deno.test("records given as bounds are the records given as strings, cut anywhere", () => {
  const texts = [
    'id,note\n1,"a, ""b""\nc"\n2,x\n',
    "a;b\r\n1;\r\n;2\r\n\r\n3;4",
    'x,"",y,\n"q",\n,\n',
    'a\tb\rc\t"d\r"\r',
  ];
  for (
    const [text, delimiter] of texts.map((
      t,
    ) => [t, t.includes(";") ? ";" : t.includes("\t") ? "\t" : ","])
  ) {
    const whole = tokenize([text], delimiter);
    for (let k = 0; k <= text.length; k++) {
      const records: Out = [];
      const t = CsvTokenizer.bounds(delimiter, "t.csv", (buffer, fields, line) => {
        const record = [];
        for (let f = 0; f < fields.count; f++) record.push(fieldText(buffer, fields, f));
        records.push([record, line]);
      });
      t.push(text.slice(0, k));
      t.push(text.slice(k));
      t.end();
      assert.deepEqual(records, whole, `cut at ${k}`);
    }
  }
  assert.deepEqual(tokenize(['x,"",y,\n'])[0], [["x", "", "y", ""], 1]);
});
