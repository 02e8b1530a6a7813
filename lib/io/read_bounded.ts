/**
 * Reading a JSON file that paygrove wrote (a model, an analyst's file) in
 * pieces with a size bound, so that a device, a stream or a huge file is
 * refused at its first piece or at the bound, never read whole first.
 *
 * @module
 */

import { DataError } from "../errors.ts";

/** Options of {@linkcode readTextBounded}. */
export interface ReadBoundedOptions {
  /** The most bytes read before the file is refused. */
  maxBytes: number;
  /** What the file should be, for messages (e.g. "model file"). */
  what: string;
}

/**
 * The text of a JSON file, read in 1 MiB pieces: refused when its first
 * character (after spaces) is not "{", when it holds a NUL byte in its
 * first piece, when it passes `maxBytes`, or when it is not UTF-8.
 *
 * @throws {DataError} naming the file and what is wrong.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { readTextBounded } from "./read_bounded.ts";
 * const path = Deno.makeTempFileSync();
 * Deno.writeTextFileSync(path, '{"kind":"x"}');
 * assert.equal(await readTextBounded(path, { maxBytes: 100, what: "model file" }), '{"kind":"x"}');
 * await assert.rejects(
 *   () => readTextBounded(path, { maxBytes: 5, what: "model file" }),
 *   /larger than 5 bytes: not a paygrove model file/,
 * );
 * await assert.rejects(
 *   () => readTextBounded("/dev/zero", { maxBytes: 2 ** 30, what: "model file" }),
 *   /is not a paygrove model file/,
 * );
 * ```
 */
export async function readTextBounded(path: string, options: ReadBoundedOptions): Promise<string> {
  const { maxBytes, what } = options;
  const notIt = (why = "") =>
    new DataError(`${path} is not a paygrove ${what}${why}`, { file: path });
  let file: Deno.FsFile;
  try {
    file = await Deno.open(path, { read: true });
  } catch (error) {
    if (error instanceof Deno.errors.NotFound) {
      throw new DataError(`${path}: no such ${what}`, { file: path });
    }
    throw new DataError(`${path}: cannot read it (${firstLine(error)})`, { file: path });
  }
  const pieces: Uint8Array[] = [];
  let total = 0;
  try {
    if ((await file.stat()).isDirectory) {
      throw new DataError(`${path} is a folder, not a ${what}`, { file: path });
    }
    const buffer = new Uint8Array(1 << 20);
    while (true) {
      let read: number | null;
      try {
        read = await file.read(buffer);
      } catch (error) {
        throw new DataError(`${path}: cannot read it (${firstLine(error)})`, { file: path });
      }
      if (read === null) break;
      if (total === 0 && !startsAsJson(buffer.subarray(0, read))) throw notIt();
      total += read;
      if (total > maxBytes) {
        throw new DataError(`${path} is larger than ${size(maxBytes)}: not a paygrove ${what}`, {
          file: path,
        });
      }
      pieces.push(buffer.slice(0, read));
    }
  } finally {
    file.close();
  }
  const bytes = new Uint8Array(total);
  let at = 0;
  for (const piece of pieces) {
    bytes.set(piece, at);
    at += piece.length;
  }
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    throw notIt(" (not UTF-8 text)");
  }
}

// JSON text: the first character after spaces is "{", and no NUL byte.
function startsAsJson(first: Uint8Array): boolean {
  let i = 0;
  while (
    i < first.length &&
    (first[i] === 0x20 || first[i] === 0x0a || first[i] === 0x0d || first[i] === 0x09)
  ) i++;
  return (i === first.length || first[i] === 0x7b) && !first.includes(0);
}

function size(bytes: number): string {
  return bytes >= 2 ** 20 && bytes % 2 ** 20 === 0 ? `${bytes / 2 ** 20} MiB` : `${bytes} bytes`;
}

function firstLine(error: unknown): string {
  return (error as Error).message.split("\n")[0];
}
