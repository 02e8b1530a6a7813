/**
 * A streaming RFC 4180 tokenizer: text arrives in chunks, records leave one
 * at a time as arrays of field text, each with the line it starts on. No
 * library streams CSV into columns without building an object per record
 * and a second copy of every field, which a table of a million rows cannot
 * afford; this does only what paygrove's tables need (one delimiter, double
 * quotes doubled inside quoted fields, CRLF, LF or CR line breaks), and its
 * behaviour is checked against csv-parse by a property test
 * (tests/lib/table/csv_fuzz_test.ts).
 *
 * @module
 */

import { DataError } from "../errors.ts";

const QUOTE = 34;
const CR = 13;
const LF = 10;

/** Receives each record: its fields (untrimmed) and the line it starts on. */
export type RecordSink = (fields: string[], line: number) => void;

/**
 * One record's fields where they lie in the text scanned: field k is
 * `text.slice(starts[k], ends[k])`, or, where `starts[k]` is -1 (a quoted
 * field), `quoted[k]`. The object and its arrays are reused for the next
 * record, so a sink reads them before it returns.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { CsvTokenizer, fieldText } from "./csv_tokenizer.ts";
 * const seen: string[][] = [];
 * const t = CsvTokenizer.bounds(",", "t.csv", (text, fields) => {
 *   seen.push(Array.from({ length: fields.count }, (_, k) => fieldText(text, fields, k)));
 * });
 * t.push('a,"b,c"\n1,2\n');
 * t.end();
 * assert.deepEqual(seen, [["a", "b,c"], ["1", "2"]]);
 * ```
 */
export interface FieldBounds {
  /** Number of fields. */
  count: number;
  /** Where each unquoted field starts in the text; -1 for a quoted field. */
  starts: Int32Array;
  /** Where each unquoted field ends (exclusive). */
  ends: Int32Array;
  /** Each quoted field's value (its doubled quotes made single). */
  quoted: string[];
}

/**
 * Receives each record as bounds in `text` (see {@linkcode FieldBounds})
 * and the line it starts on: fields are cut from the text only where the
 * sink needs them, so a reader can take numbers from a row without a
 * string per cell.
 */
export type BoundsSink = (text: string, fields: FieldBounds, line: number) => void;

/**
 * The text of field `k` of a record given as bounds.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { fieldText } from "./csv_tokenizer.ts";
 * const fields = { count: 2, starts: Int32Array.of(0, -1), ends: Int32Array.of(2, 0), quoted: ["", "x"] };
 * assert.equal(fieldText("ab,\"x\"", fields, 0), "ab");
 * assert.equal(fieldText("ab,\"x\"", fields, 1), "x");
 * ```
 */
export function fieldText(text: string, fields: FieldBounds, k: number): string {
  const start = fields.starts[k];
  return start < 0 ? fields.quoted[k] : text.slice(start, fields.ends[k]);
}

/**
 * Tokenizes CSV text pushed in chunks.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { CsvTokenizer } from "./csv_tokenizer.ts";
 * const records: [string[], number][] = [];
 * const t = new CsvTokenizer(",", "t.csv", (f, line) => records.push([f, line]));
 * t.push('id,note\n1,"a, ""b""');
 * t.push('\nc"\n2,x\n');
 * t.end();
 * assert.deepEqual(records, [[["id", "note"], 1], [["1", 'a, "b"\nc'], 2], [["2", "x"], 4]]);
 * ```
 */
export class CsvTokenizer {
  #buffer = "";
  // A record longer than one chunk is scanned again only once the text held
  // has doubled, so a huge field (or a quote never closed) costs linear time.
  #waitUntil = 0;
  #line = 1;
  #delimiter: number;
  #delimiterText: string;
  #file: string;
  #sink: BoundsSink;
  // The record being scanned, as bounds; reused from record to record.
  #fields: FieldBounds = {
    count: 0,
    starts: new Int32Array(16),
    ends: new Int32Array(16),
    quoted: [],
  };

  /**
   * @param delimiter One character.
   * @param file File name, for messages.
   * @param sink Called with each record.
   */
  constructor(delimiter: string, file: string, sink: RecordSink) {
    if (delimiter.length !== 1) throw new RangeError("the delimiter must be one character");
    this.#delimiter = delimiter.charCodeAt(0);
    this.#delimiterText = delimiter;
    this.#file = file;
    this.#sink = (text, fields, line) => {
      const record = new Array<string>(fields.count);
      for (let k = 0; k < fields.count; k++) record[k] = fieldText(text, fields, k);
      sink(record, line);
    };
  }

  /**
   * A tokenizer that gives each record as bounds in the text scanned
   * (see {@linkcode FieldBounds}) instead of an array of strings.
   *
   * @example
   * ```ts
   * import assert from "node:assert/strict";
   * import { CsvTokenizer } from "./csv_tokenizer.ts";
   * const counts: number[] = [];
   * const t = CsvTokenizer.bounds(";", "t.csv", (_, fields, line) => counts.push(fields.count, line));
   * t.push("a;b;c\n1;2;3\n");
   * t.end();
   * assert.deepEqual(counts, [3, 1, 3, 2]);
   * ```
   */
  static bounds(delimiter: string, file: string, sink: BoundsSink): CsvTokenizer {
    const tokenizer = new CsvTokenizer(delimiter, file, () => {});
    tokenizer.#sink = sink;
    return tokenizer;
  }

  // Adds one field to the record being scanned: unquoted from start to end,
  // or (start -1) the quoted value.
  #add(start: number, end: number, quoted: string): void {
    const f = this.#fields;
    if (f.count === f.starts.length) {
      const starts = new Int32Array(2 * f.count);
      const ends = new Int32Array(2 * f.count);
      starts.set(f.starts);
      ends.set(f.ends);
      f.starts = starts;
      f.ends = ends;
    }
    f.starts[f.count] = start;
    f.ends[f.count] = end;
    if (start < 0) f.quoted[f.count] = quoted;
    f.count++;
  }

  /** Adds text; every record complete in the text so far is passed on. */
  push(text: string): void {
    try {
      this.#buffer = this.#buffer.length === 0 ? text : this.#buffer + text;
    } catch (error) {
      throw this.#tooLong(error);
    }
    if (this.#buffer.length < this.#waitUntil) return;
    const used = this.#scan(false);
    this.#buffer = this.#buffer.slice(used);
    this.#waitUntil = this.#buffer.length > 65536 ? 2 * this.#buffer.length : 0;
  }

  // V8 strings end near 2^29 characters: one record that long is no table.
  #tooLong(error: unknown): unknown {
    if (!(error instanceof RangeError)) return error;
    return new DataError(
      `${this.#file} line ${this.#line}: a record of more than ${2 ** 28} characters; ` +
        `is a quote left open?`,
      { file: this.#file, line: this.#line },
    );
  }

  /** Ends the input: the last record (without a final line break) is passed on. */
  end(): void {
    this.#scan(true);
    this.#buffer = "";
  }

  // Scans whole records from the start of the buffer; returns how many
  // characters were consumed. Without `final`, a record that reaches the
  // end of the buffer waits for more text.
  #scan(final: boolean): number {
    const text = this.#buffer;
    const n = text.length;
    const d = this.#delimiter;
    let pos = 0;
    while (pos < n) {
      const startLine = this.#line;
      let lines = 0;
      const fields = this.#fields;
      fields.count = 0;
      let i = pos;
      let complete = false;
      for (;;) {
        // One field from i.
        if (i < n && text.charCodeAt(i) === QUOTE) {
          let value = "";
          let from = i + 1;
          let j = from;
          let closed = false;
          while (j < n) {
            const c = text.charCodeAt(j);
            if (c === QUOTE) {
              if (j + 1 < n && text.charCodeAt(j + 1) === QUOTE) {
                value += text.slice(from, j + 1);
                j += 2;
                from = j;
                continue;
              }
              if (j + 1 >= n && !final) break; // a doubled quote may follow
              closed = true;
              break;
            }
            if (c === LF) lines++;
            else if (c === CR && !(j + 1 < n && text.charCodeAt(j + 1) === LF)) lines++;
            j++;
          }
          if (!closed) {
            if (!final) return pos; // wait for the rest
            throw new DataError(
              `${this.#file} line ${startLine}: a quoted field starts here and is never closed`,
              { file: this.#file, line: startLine },
            );
          }
          value += text.slice(from, j);
          this.#add(-1, 0, value);
          i = j + 1;
          if (i >= n) {
            if (!final) return pos;
            complete = true;
            break;
          }
          const after = text.charCodeAt(i);
          if (after === d) {
            i++;
            continue;
          }
          if (after === LF || after === CR) {
            i = this.#lineBreak(text, i, final);
            if (i < 0) return pos;
            lines++;
            complete = true;
            break;
          }
          throw new DataError(
            `${this.#file} line ${startLine + lines}: a quote inside a quoted field is not doubled`,
            { file: this.#file, line: startLine + lines },
          );
        }
        // An unquoted field: up to the delimiter or the line break.
        let j = i;
        while (j < n) {
          const c = text.charCodeAt(j);
          if (c === d || c === LF || c === CR) break;
          if (c === QUOTE) {
            throw new DataError(
              `${this.#file} line ${startLine + lines}: a quote appears inside an unquoted ` +
                `field; quote the whole field and write each quote in it twice`,
              { file: this.#file, line: startLine + lines },
            );
          }
          j++;
        }
        if (j >= n && !final) return pos;
        this.#add(i, j, "");
        if (j >= n) {
          i = n;
          complete = true;
          break;
        }
        const c = text.charCodeAt(j);
        if (c === d) {
          i = j + 1;
          // A delimiter at the very end of the text: one more, empty field.
          if (i >= n) {
            if (!final) return pos;
            this.#add(n, n, "");
            complete = true;
            break;
          }
          continue;
        }
        i = this.#lineBreak(text, j, final);
        if (i < 0) return pos;
        lines++;
        complete = true;
        break;
      }
      if (!complete) return pos;
      this.#line = startLine + lines;
      pos = i;
      this.#sink(text, fields, startLine);
    }
    return pos;
  }

  // The position after a line break at i (CRLF counts once); -1 when a CR
  // ends the buffer and an LF might follow in the next chunk.
  #lineBreak(text: string, i: number, final: boolean): number {
    if (text.charCodeAt(i) === LF) return i + 1;
    if (i + 1 < text.length) return text.charCodeAt(i + 1) === LF ? i + 2 : i + 1;
    return final ? i + 1 : -1;
  }

  /** The delimiter, as given. */
  get delimiter(): string {
    return this.#delimiterText;
  }
}
