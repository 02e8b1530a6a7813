/**
 * CSV bytes -> header and columns of cell text, with the source line of each
 * row. RFC 4180 parsing is csv-parse's; this module adds decoding, delimiter
 * detection and messages that name the file and line.
 *
 * @module
 */

import { CsvError, parse } from "csv-parse/sync";
import { DataError, OptionError } from "../errors.ts";

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
  if (bytes.length >= 2 && bytes[0] === 0xff && bytes[1] === 0xfe) {
    return new TextDecoder("utf-16le").decode(bytes.subarray(2));
  }
  if (bytes.length >= 2 && bytes[0] === 0xfe && bytes[1] === 0xff) {
    return new TextDecoder("utf-16be").decode(bytes.subarray(2));
  }
  const nul = bytes.indexOf(0);
  if (nul >= 0) {
    throw new DataError(
      `${file} is not a text file (byte ${nul + 1} is a NUL byte); export the table as CSV`,
      { file },
    );
  }
  let decoder: TextDecoder;
  try {
    decoder = new TextDecoder(encoding, { fatal: true, ignoreBOM: false });
  } catch {
    throw new OptionError(
      `--encoding: unknown text encoding "${encoding}" (e.g. utf-8, windows-1252, iso-8859-15)`,
    );
  }
  try {
    return decoder.decode(bytes);
  } catch {
    const loose = new TextDecoder(encoding).decode(bytes);
    const bad = loose.indexOf("\ufffd");
    const line = countLines(loose, bad);
    throw new DataError(
      `${file} line ${line} is not valid ${encoding} text; re-save the file as UTF-8, ` +
        `or name its encoding (e.g. --encoding windows-1252)`,
      { file, line },
    );
  }
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
    let records: string[][];
    try {
      records = parse(text, {
        delimiter,
        to_line: 50,
        relax_column_count: true,
        relax_quotes: true,
        skip_empty_lines: true,
      });
    } catch {
      continue;
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
  const file = options.file ?? "input";
  if (text.trim() === "") throw new DataError(`${file} is empty`, { file });
  const delimiter = options.delimiter ?? detectDelimiter(text);
  let header: string[] | undefined;
  let cells: string[][] = [];
  const lines: number[] = [];
  const ragged: { line: number; fields: number }[] = [];
  let raggedCount = 0;
  let lastLine = 0;
  try {
    parse(text, {
      delimiter,
      relax_column_count: true,
      on_record: (record: string[], context: { lines: number }) => {
        const startLine = lastLine + 1;
        lastLine = context.lines;
        if (record.length === 1 && record[0].trim() === "") return null;
        if (header === undefined) {
          header = checkHeader(record.map((h) => h.trim()), file, startLine);
          cells = header.map(() => []);
          return null;
        }
        if (record.length !== header.length) {
          raggedCount++;
          if (ragged.length < RAGGED_SHOWN) ragged.push({ line: startLine, fields: record.length });
          return null;
        }
        for (let c = 0; c < record.length; c++) cells[c].push(record[c].trim());
        lines.push(startLine);
        return null;
      },
    });
  } catch (error) {
    if (error instanceof CsvError) throw csvProblem(error, file, lastLine + 1);
    throw error;
  }
  if (header === undefined) throw new DataError(`${file} is empty`, { file });
  if (raggedCount > 0) {
    const shown = ragged.map((r) => `line ${r.line} has ${r.fields}`).join(", ");
    const more = raggedCount > ragged.length ? `, and ${raggedCount - ragged.length} more` : "";
    const fields = `${header.length} field${header.length === 1 ? "" : "s"}`;
    throw new DataError(
      `${file}: ${raggedCount} row${raggedCount === 1 ? " does" : "s do"} not have the ` +
        `${fields} of the header: ${shown}${more}` +
        (options.delimiter
          ? ""
          : ` (delimiter detected: ${describeDelimiter(delimiter)}; give --delimiter if the ` +
            `file uses another)`),
      { file, line: ragged[0].line },
    );
  }
  if (lines.length === 0) {
    throw new DataError(`${file} has a header but no data rows`, { file });
  }
  return { header, cells, lines, delimiter };
}

/**
 * Names a delimiter for people: "comma", "semicolon", "tab" or the quoted
 * character.
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

function csvProblem(error: CsvError, file: string, recordLine: number): DataError {
  const what: Record<string, string> = {
    CSV_QUOTE_NOT_CLOSED: "a quoted field starts here and is never closed",
    CSV_INVALID_CLOSING_QUOTE: "a quote inside a quoted field is not doubled",
    INVALID_OPENING_QUOTE:
      "a quote appears inside an unquoted field; quote the whole field and write each quote in it twice",
    CSV_NON_TRIMABLE_CHAR_AFTER_CLOSING_QUOTE: "text follows the closing quote of a field",
  };
  const reason = what[error.code] ?? error.message.replace(/\s+/g, " ");
  return new DataError(`${file} line ${recordLine}: ${reason}`, { file, line: recordLine });
}
