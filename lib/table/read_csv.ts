/**
 * CSV bytes -> header and columns of cell text, with the source line of each
 * row. RFC 4180 parsing is csv-parse's; this module adds decoding, delimiter
 * detection and messages that name the file and line.
 *
 * @module
 */

import { parse } from "csv-parse/sync";
import { DataError, OptionError } from "../errors.ts";
import { CellColumn } from "./cell_column.ts";
import { CsvTokenizer, type FieldBounds, fieldText } from "./csv_tokenizer.ts";

/** Options for {@linkcode readCsv}. */
export interface ReadCsvOptions {
  /** File name used in messages. */
  file?: string;
  /** Field delimiter; detected among comma, semicolon and tab when not given. */
  delimiter?: string;
  /**
   * Text encoding of the bytes (a WHATWG encoding label).
   * @default {"utf-8"}
   */
  encoding?: string;
}

/** A CSV file as columns of cell text. */
export interface RawColumns {
  /** Header names, trimmed. */
  header: string[];
  /** `cells[c][r]`: the trimmed text of column c in data row r. */
  cells: string[][];
  /** The 1-based line on which each data row starts. */
  lines: number[];
  /** The delimiter used. */
  delimiter: string;
}

const CANDIDATE_DELIMITERS = [",", ";", "\t"];
const RAGGED_SHOWN = 5;

/**
 * Decodes bytes to text, refusing what is not text. A UTF-8 byte-order mark
 * is removed; UTF-16 with a byte-order mark is decoded.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { decodeText } from "./read_csv.ts";
 * const bytes = new Uint8Array([0xef, 0xbb, 0xbf, 0x61]);
 * assert(decodeText(bytes) === "a");
 * ```
 */
export function decodeText(bytes: Uint8Array, encoding = "utf-8", file = "input"): string {
  // The whole input as one last piece: the same checks as a file read in pieces.
  return new ChunkDecoder(encoding, file).decode(bytes, true);
}

function countLines(text: string, end: number): number {
  let line = 1;
  for (let i = 0; i < end; i++) if (text.charCodeAt(i) === 10) line++;
  return line;
}

/**
 * Picks the delimiter among comma, semicolon and tab that splits the first
 * lines into the same number of fields, preferring more fields.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { detectDelimiter } from "./read_csv.ts";
 * assert(detectDelimiter("a;b;c\n1,5;2;3\n") === ";");
 * ```
 */
export function detectDelimiter(text: string): string {
  let best = ",";
  let bestScore = -1;
  for (const delimiter of CANDIDATE_DELIMITERS) {
    // The records before any problem: text held back for detection may end
    // inside a quoted field that the next piece closes.
    const records: string[][] = [];
    try {
      parse(text, {
        delimiter,
        to_line: 50,
        relax_column_count: true,
        relax_quotes: true,
        skip_empty_lines: true,
        on_record: (record: string[]) => {
          records.push(record);
          return null;
        },
      });
    } catch {
      // Judged on the records read before the problem.
    }
    if (records.length === 0) continue;
    const width = records[0].length;
    if (width < 2) continue;
    const consistent = records.every((r) => r.length === width);
    // A consistent split outranks any inconsistent one; then more fields win.
    const score = (consistent ? 1_000 : 0) + width;
    if (score > bestScore) {
      best = delimiter;
      bestScore = score;
    }
  }
  return best;
}

/**
 * Parses CSV text into trimmed columns of cell text. Blank lines are
 * skipped. Refuses, with the file and line named: an empty file, a header
 * with no rows, blank or duplicate header names, rows whose field count
 * differs from the header's, and broken quoting.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { readCsv } from "./read_csv.ts";
 * const raw = readCsv('id,pay\n1,"85,000"\n');
 * assert(raw.cells[1][0] === "85,000" && raw.lines[0] === 2);
 * ```
 */
export function readCsv(text: string, options: ReadCsvOptions = {}): RawColumns {
  const reader = new CsvColumnsReader({ ...options, isMissing: () => false });
  reader.push(text);
  const read = reader.end();
  return {
    header: read.header,
    cells: read.columns.map((c) => c.texts()),
    lines: read.lines,
    delimiter: read.delimiter,
  };
}

/** What {@linkcode CsvColumnsReader} gives at the end: header, compact columns, lines. */
export interface ReadColumns {
  /** Header names, trimmed. */
  header: string[];
  /** One compact column of trimmed cells per header name. */
  columns: CellColumn[];
  /** The 1-based line on which each data row starts. */
  lines: number[];
  /** The delimiter used. */
  delimiter: string;
}

/** Options of {@linkcode CsvColumnsReader}. */
export interface ColumnsReaderOptions extends ReadCsvOptions {
  /** Which cell texts mean missing (kept compactly in numeric columns). */
  isMissing: (text: string) => boolean;
  /**
   * The same test on `text.slice(start, end)` (missingTestAt), so that a
   * number is read from a row without cutting its cell out; by default the
   * cell is cut out for `isMissing`.
   */
  isMissingAt?: (text: string, start: number, end: number) => boolean;
}

// Text held back to detect the delimiter: this many lines, or the whole input.
const DETECT_LINES = 50;

/**
 * Reads CSV text pushed in chunks straight into compact columns (see
 * cell_column.ts), without holding the rows: the streaming half of
 * {@linkcode readCsv}, with the same checks and messages.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { CsvColumnsReader } from "./read_csv.ts";
 * const reader = new CsvColumnsReader({ file: "t.csv", isMissing: (t) => t === "" });
 * reader.push("id;pay\na;85");
 * reader.push("000\nb;\n");
 * const read = reader.end();
 * assert(read.delimiter === ";" && read.columns[1].plain![0] === 85000);
 * assert(Number.isNaN(read.columns[1].plain![1]) && read.lines[1] === 3);
 * ```
 */
export class CsvColumnsReader {
  #options: ColumnsReaderOptions;
  #file: string;
  #pending = "";
  #tokenizer: CsvTokenizer | null = null;
  #header: string[] | undefined;
  #columns: CellColumn[] = [];
  #lines: number[] = [];
  #ragged: { line: number; fields: number }[] = [];
  #raggedCount = 0;
  #sawText = false;
  // Line breaks found so far in the text held back, and where the count stopped.
  #pendingBreaks = 0;
  #pendingScanned = 0;

  /** @param options File name, delimiter (detected when absent), missing test. */
  constructor(options: ColumnsReaderOptions) {
    this.#options = options;
    this.#file = options.file ?? "input";
    if (options.delimiter !== undefined && options.delimiter.length !== 1) {
      throw new OptionError(`the delimiter must be one character, got "${options.delimiter}"`);
    }
  }

  /** Adds the next piece of text. */
  push(text: string): void {
    if (!this.#sawText && text.trim() !== "") this.#sawText = true;
    if (this.#tokenizer !== null) {
      this.#tokenizer.push(text);
      return;
    }
    // Hold text back until the delimiter can be told from whole lines
    // (counted once each, LF or CR, so the text held is scanned once).
    this.#pending += text;
    const held = this.#pending;
    for (let i = this.#pendingScanned; i < held.length; i++) {
      const c = held.charCodeAt(i);
      if (c === 10 || (c === 13 && held.charCodeAt(i + 1) !== 10)) this.#pendingBreaks++;
    }
    this.#pendingScanned = held.length;
    if (this.#pendingBreaks >= DETECT_LINES) this.#start(false);
  }

  /** Ends the input and returns the columns. */
  end(): ReadColumns {
    if (this.#tokenizer === null) this.#start(true);
    this.#tokenizer!.end();
    const file = this.#file;
    if (!this.#sawText) throw new DataError(`${file} is empty`, { file });
    const header = this.#header;
    if (header === undefined) throw new DataError(`${file} is empty`, { file });
    if (this.#raggedCount > 0) {
      const shown = this.#ragged.map((r) => `line ${r.line} has ${r.fields}`).join(", ");
      const more = this.#raggedCount > this.#ragged.length
        ? `, and ${this.#raggedCount - this.#ragged.length} more`
        : "";
      const fields = `${header.length} field${header.length === 1 ? "" : "s"}`;
      throw new DataError(
        `${file}: ${this.#raggedCount} row${this.#raggedCount === 1 ? " does" : "s do"} not ` +
          `have the ${fields} of the header: ${shown}${more}` +
          (this.#options.delimiter
            ? ""
            : ` (delimiter detected: ${describeDelimiter(this.#tokenizer!.delimiter)}; give ` +
              `{delimiter} if the file uses another)`),
        { file, line: this.#ragged[0].line },
      );
    }
    if (this.#lines.length === 0) {
      throw new DataError(`${file} has a header but no data rows`, { file });
    }
    return {
      header,
      columns: this.#columns,
      lines: this.#lines,
      delimiter: this.#tokenizer!.delimiter,
    };
  }

  #start(final: boolean): void {
    const text = this.#pending;
    this.#pending = "";
    // Detect on whole lines only: a cut line would look ragged.
    const cut = final ? text.length : Math.max(text.lastIndexOf("\n"), text.lastIndexOf("\r")) + 1;
    const delimiter = this.#options.delimiter ?? detectDelimiter(text.slice(0, cut));
    this.#tokenizer = CsvTokenizer.bounds(
      delimiter,
      this.#file,
      (text, fields, line) => this.#record(text, fields, line),
    );
    this.#tokenizer.push(text);
  }

  // One record, as bounds in `text`: each cell goes to its column where it
  // lies (CellColumn.pushAt), cut out of the text only when needed.
  #record(text: string, fields: FieldBounds, line: number): void {
    const count = fields.count;
    if (count === 1 && fieldText(text, fields, 0).trim() === "") return;
    const header = this.#header;
    if (header === undefined) {
      const names = Array.from({ length: count }, (_, k) => fieldText(text, fields, k).trim());
      this.#header = checkHeader(names, this.#file, line);
      const { isMissing, isMissingAt } = this.#options;
      this.#columns = this.#header.map(() => new CellColumn(isMissing, isMissingAt));
      return;
    }
    if (count !== header.length) {
      this.#raggedCount++;
      if (this.#ragged.length < RAGGED_SHOWN) this.#ragged.push({ line, fields: count });
      return;
    }
    const columns = this.#columns;
    const starts = fields.starts;
    for (let c = 0; c < count; c++) {
      if (starts[c] < 0) columns[c].push(fields.quoted[c].trim());
      else columns[c].pushAt(text, starts[c], fields.ends[c]);
    }
    this.#lines.push(line);
  }
}

/**
 * Decodes bytes arriving in chunks, with the checks of {@linkcode decodeText}:
 * a byte-order mark (UTF-8 dropped, UTF-16 decoded), a NUL byte refused as
 * binary, text that is not valid in the encoding refused with its line.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { ChunkDecoder } from "./read_csv.ts";
 * const decoder = new ChunkDecoder("utf-8", "t.csv");
 * const bytes = new TextEncoder().encode("\ufeffcafé\n");
 * const text = decoder.decode(bytes.subarray(0, 5)) + decoder.decode(bytes.subarray(5), true);
 * assert(text === "café\n");
 * ```
 */
export class ChunkDecoder {
  #decoder: TextDecoder | null = null;
  #encoding: string;
  #file: string;
  #offset = 0;
  #lines = 1;
  #utf16 = false;
  #head: Uint8Array = new Uint8Array(0);
  // The bytes of a character begun at the end of the last chunk (UTF-8).
  #tail: Uint8Array = new Uint8Array(0);

  /**
   * @param encoding A WHATWG encoding label.
   * @param file File name, for messages.
   */
  constructor(encoding: string, file: string) {
    this.#encoding = encoding;
    this.#file = file;
  }

  /** Decodes the next chunk (`final` for the last). */
  decode(bytes: Uint8Array, final = false): string {
    let chunk = bytes;
    if (this.#decoder === null) {
      // A byte-order mark needs two bytes to be seen.
      if (this.#head.length + chunk.length < 2 && !final) {
        this.#head = concat(this.#head, chunk);
        return "";
      }
      chunk = concat(this.#head, chunk);
      this.#head = new Uint8Array(0);
      if (chunk.length >= 2 && chunk[0] === 0xff && chunk[1] === 0xfe) {
        this.#decoder = new TextDecoder("utf-16le");
        this.#utf16 = true;
        chunk = chunk.subarray(2);
      } else if (chunk.length >= 2 && chunk[0] === 0xfe && chunk[1] === 0xff) {
        this.#decoder = new TextDecoder("utf-16be");
        this.#utf16 = true;
        chunk = chunk.subarray(2);
      } else {
        try {
          this.#decoder = new TextDecoder(this.#encoding, { fatal: true, ignoreBOM: false });
        } catch {
          throw new OptionError(
            `{encoding}: unknown text encoding "${this.#encoding}" (e.g. utf-8, windows-1252, ` +
              `iso-8859-15)`,
          );
        }
      }
    }
    if (!this.#utf16) {
      const nul = chunk.indexOf(0);
      if (nul >= 0) {
        throw new DataError(
          `${this.#file} is not a text file (byte ${this.#offset + nul + 1} is a NUL byte); ` +
            `export the table as CSV`,
          { file: this.#file },
        );
      }
    }
    this.#offset += bytes.length;
    let text: string;
    try {
      text = this.#decoder.decode(chunk, { stream: !final });
    } catch {
      // Decoded again with the character the last chunk began, so the
      // first replacement character is the bad byte and not a cut one.
      const loose = new TextDecoder(this.#encoding).decode(concat(this.#tail, chunk));
      const line = this.#lines + countLines(loose, loose.indexOf("\ufffd")) - 1;
      throw new DataError(
        `${this.#file} line ${line} is not valid ${this.#encoding} text; re-save the file as ` +
          `UTF-8, or name its encoding (e.g. {encoding} windows-1252)`,
        { file: this.#file, line },
      );
    }
    for (let i = text.indexOf("\n"); i >= 0; i = text.indexOf("\n", i + 1)) this.#lines++;
    this.#tail = incompleteTail(chunk);
    return text;
  }
}

function concat(a: Uint8Array, b: Uint8Array): Uint8Array {
  if (a.length === 0) return b;
  const out = new Uint8Array(a.length + b.length);
  out.set(a);
  out.set(b, a.length);
  return out;
}

// The last bytes of `chunk` when they begin a UTF-8 character that the
// chunk does not finish (at most three), else none.
function incompleteTail(chunk: Uint8Array): Uint8Array {
  for (let back = 1; back <= Math.min(3, chunk.length); back++) {
    const byte = chunk[chunk.length - back];
    if ((byte & 0xc0) === 0x80) continue; // a continuation byte: look further back
    const length = byte >= 0xf0 ? 4 : byte >= 0xe0 ? 3 : byte >= 0xc0 ? 2 : 1;
    return length > back ? chunk.subarray(chunk.length - back) : new Uint8Array(0);
  }
  return new Uint8Array(0);
}

/**
 * Names a delimiter for people: "comma", "semicolon", "tab" or the quoted
 * character.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { describeDelimiter } from "./read_csv.ts";
 * assert.equal(describeDelimiter(";"), "semicolon");
 * assert.equal(describeDelimiter("\t"), "tab");
 * assert.equal(describeDelimiter("|"), '"|"');
 * ```
 */
export function describeDelimiter(delimiter: string): string {
  return ({ ",": "comma", ";": "semicolon", "\t": "tab" } as Record<string, string>)[delimiter] ??
    `"${delimiter}"`;
}

function checkHeader(header: string[], file: string, line: number): string[] {
  const seen = new Map<string, number>();
  for (let c = 0; c < header.length; c++) {
    const name = header[c];
    if (name === "") {
      throw new DataError(
        `${file} line ${line}: column ${c + 1} of the header has no name`,
        { file, line },
      );
    }
    const earlier = seen.get(name);
    if (earlier !== undefined) {
      throw new DataError(
        `${file} line ${line}: the header names "${name}" twice (columns ${earlier + 1} and ${
          c + 1
        })`,
        { file, line, column: name },
      );
    }
    seen.set(name, c);
  }
  return header;
}
