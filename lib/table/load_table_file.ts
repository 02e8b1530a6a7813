/**
 * Loading a pay table from a file path, piece by piece and up to a stated
 * size, so that an endless or enormous input (a FIFO fed forever,
 * `/dev/zero`, a wrong file) stops with a message instead of filling the
 * memory: binary and badly encoded input is refused at its first piece,
 * and reading stops at the bound.
 *
 * @module
 */

import { DataError, OptionError } from "../errors.ts";
import { loadTableChunks, type LoadTableOptions } from "./load_table.ts";
import { ChunkDecoder } from "./read_csv.ts";
import type { Table } from "./types.ts";

/**
 * The largest table {@linkcode loadTableFile} reads: 1 GiB, about ten
 * million rows of a typical pay table (a million rows of ten columns is
 * about 100 MB).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTableFile, TABLE_MAX_BYTES } from "./load_table_file.ts";
 * // A file one byte over the bound (sparse: nothing is written) is refused unread.
 * const path = Deno.makeTempFileSync({ suffix: ".csv" });
 * Deno.truncateSync(path, TABLE_MAX_BYTES + 1);
 * await assert.rejects(() => loadTableFile(path), /is larger than the 1024 MiB paygrove reads/);
 * Deno.removeSync(path);
 * ```
 */
export const TABLE_MAX_BYTES = 2 ** 30;

// The most read from a table file at once.
const READ_PIECE = 2 ** 20;

/**
 * The largest table read whole as text ({@linkcode readTableText}: a table
 * scored against a model, `--table`, the guided flow's table): 256 MiB,
 * well within what one JavaScript string can hold (about 512 Mi characters).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { readTableText, TEXT_TABLE_MAX_BYTES } from "./load_table_file.ts";
 * // A file one byte over the bound (sparse: nothing is written) is refused unread.
 * const path = Deno.makeTempFileSync({ suffix: ".csv" });
 * Deno.truncateSync(path, TEXT_TABLE_MAX_BYTES + 1);
 * await assert.rejects(() => readTableText(path), /is larger than the 256 MiB paygrove reads/);
 * Deno.removeSync(path);
 * ```
 */
export const TEXT_TABLE_MAX_BYTES = 2 ** 28;

/**
 * Reads a CSV file and loads it with {@linkcode loadTable}; the path names
 * the file in every message.
 *
 * @param maxBytes Reading stops with a DataError past this many bytes.
 * @throws {DataError} when the file cannot be read, is larger than
 * `maxBytes`, or its data cannot be used.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTableFile } from "./load_table_file.ts";
 * const path = Deno.makeTempFileSync({ suffix: ".csv" });
 * Deno.writeTextFileSync(path, "level,pay\nL1,50\nL2,61\n");
 * assert((await loadTableFile(path, { target: "pay" })).rows === 2);
 * await assert.rejects(() => loadTableFile(path, {}, undefined, 10), /larger than/);
 * ```
 */
export async function loadTableFile(
  path: string,
  options: Omit<LoadTableOptions, "file"> = {},
  onProgress?: (bytesRead: number, bytesTotal: number) => void,
  maxBytes: number = TABLE_MAX_BYTES,
): Promise<Table> {
  const file = await openTable(path, maxBytes);
  const total = (await file.stat()).size;
  // Read piece by piece: the text of a large table is never held whole.
  // Pieces of up to 1 MiB read straight from the file, not the 64 KiB of its
  // stream: each piece costs a wait for the read and a pass through the
  // stream's promises, which was a tenth of loading a million rows. Each
  // piece a copy of what was read: the decoder keeps the end of a piece.
  async function* chunks(): AsyncGenerator<Uint8Array> {
    let read = 0;
    const buffer = new Uint8Array(READ_PIECE);
    try {
      for (;;) {
        const got = await file.read(buffer);
        if (got === null) break;
        const chunk = buffer.slice(0, got);
        read += chunk.length;
        if (read > maxBytes) throw new DataError(tooLarge(path, maxBytes), { file: path });
        onProgress?.(read, total);
        yield chunk;
      }
    } catch (error) {
      if (error instanceof DataError) throw error;
      throw new DataError(readProblem(path, error), { file: path });
    }
  }
  try {
    return await loadTableChunks(chunks(), { ...options, file: path });
  } finally {
    // Closed at the end, or when the reader stopped early (an error at the first piece).
    try {
      file.close();
    } catch {
      // Already closed.
    }
  }
}

/**
 * Reads a text table whole, piece by piece: each piece is decoded as it
 * comes (a NUL byte or text invalid in `encoding` stops the read at once),
 * and reading stops past `maxBytes`.
 *
 * @param encoding A WHATWG encoding label (a byte-order mark overrides it).
 * @throws {DataError} when the file cannot be read, is not text, or is
 * larger than `maxBytes`.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { readTableText } from "./load_table_file.ts";
 * const path = Deno.makeTempFileSync({ suffix: ".csv" });
 * Deno.writeTextFileSync(path, "\ufeffid,pay\n1,50\n");
 * assert((await readTableText(path)) === "id,pay\n1,50\n");
 * await assert.rejects(() => readTableText(path, "utf-8", 4), /larger than/);
 * ```
 */
export async function readTableText(
  path: string,
  encoding = "utf-8",
  maxBytes: number = TEXT_TABLE_MAX_BYTES,
): Promise<string> {
  const file = await openTable(path, maxBytes);
  const decoder = new ChunkDecoder(encoding, path);
  const pieces: string[] = [];
  let read = 0;
  try {
    for await (const chunk of file.readable) {
      read += chunk.length;
      if (read > maxBytes) throw new DataError(tooLarge(path, maxBytes), { file: path });
      pieces.push(decoder.decode(chunk));
    }
  } catch (error) {
    try {
      file.close();
    } catch {
      // Already closed by the stream.
    }
    if (error instanceof DataError || error instanceof OptionError) throw error;
    throw new DataError(readProblem(path, error), { file: path });
  }
  pieces.push(decoder.decode(new Uint8Array(0), true));
  return pieces.join("");
}

// Opens a table file, refusing a folder and a regular file over the bound.
async function openTable(path: string, maxBytes: number): Promise<Deno.FsFile> {
  let file: Deno.FsFile;
  let info: Deno.FileInfo;
  try {
    file = await Deno.open(path);
    info = await file.stat();
  } catch (error) {
    throw new DataError(readProblem(path, error), { file: path });
  }
  if (info.isDirectory || (info.isFile && info.size > maxBytes)) {
    file.close();
    throw new DataError(
      info.isDirectory
        ? readProblem(path, new Deno.errors.IsADirectory())
        : tooLarge(path, maxBytes),
      { file: path },
    );
  }
  return file;
}

function tooLarge(path: string, maxBytes: number): string {
  return `${path} is larger than the ${Math.round(maxBytes / 2 ** 20)} MiB paygrove reads ` +
    `as a table; reading stopped there (is it the right file? a larger table can be split ` +
    `into parts)`;
}

function readProblem(path: string, error: unknown): string {
  if (error instanceof Deno.errors.NotFound) return `${path}: no such file`;
  if (error instanceof Deno.errors.IsADirectory) return `${path} is a folder, not a CSV file`;
  if (error instanceof Deno.errors.PermissionDenied || error instanceof Deno.errors.NotCapable) {
    return `${path}: not allowed to read it (${(error as Error).message.split("\n")[0]})`;
  }
  return `${path}: cannot read it (${(error as Error).message.split("\n")[0]})`;
}
