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
  #sink: RecordSink;

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
    this.#sink = sink;
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
      const fields: string[] = [];
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
          fields.push(value);
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
        fields.push(text.slice(i, j));
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
            fields.push("");
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
      this.#sink(fields, startLine);
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
