/**
 * Loading a pay table from a file path.
 *
 * @module
 */

import { DataError } from "../errors.ts";
import { loadTableChunks, type LoadTableOptions } from "./load_table.ts";
import type { Table } from "./types.ts";

/**
 * Reads a CSV file and loads it with {@linkcode loadTable}; the path names
 * the file in every message.
 *
 * @throws {DataError} when the file cannot be read or its data cannot be used.
 *
 * @example
 * ```ts ignore
 * import { loadTableFile } from "./load_table_file.ts";
 * const table = await loadTableFile("fixtures/cps1988.csv", { target: "wage" });
 * ```
 */
export async function loadTableFile(
  path: string,
  options: Omit<LoadTableOptions, "file"> = {},
  onProgress?: (bytesRead: number, bytesTotal: number) => void,
): Promise<Table> {
  let file: Deno.FsFile;
  try {
    file = await Deno.open(path);
    if ((await file.stat()).isDirectory) {
      file.close();
      throw new Deno.errors.IsADirectory();
    }
  } catch (error) {
    throw new DataError(readProblem(path, error), { file: path });
  }
  const total = (await file.stat()).size;
  // Read piece by piece: the text of a large table is never held whole.
  async function* chunks(): AsyncGenerator<Uint8Array> {
    let read = 0;
    try {
      for await (const chunk of file.readable) {
        read += chunk.length;
        onProgress?.(read, total);
        yield chunk;
      }
    } catch (error) {
      throw new DataError(readProblem(path, error), { file: path });
    }
  }
  return await loadTableChunks(chunks(), { ...options, file: path });
}

function readProblem(path: string, error: unknown): string {
  if (error instanceof Deno.errors.NotFound) return `${path}: no such file`;
  if (error instanceof Deno.errors.IsADirectory) return `${path} is a folder, not a CSV file`;
  if (error instanceof Deno.errors.PermissionDenied || error instanceof Deno.errors.NotCapable) {
    return `${path}: not allowed to read it (${(error as Error).message.split("\n")[0]})`;
  }
  return `${path}: cannot read it (${(error as Error).message})`;
}
