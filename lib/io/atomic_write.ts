/**
 * Writing an output file so that it is either whole or absent: the bytes
 * go to a temporary file beside the target, which is then renamed over it
 * (a rename within one folder is atomic on POSIX file systems). An existing
 * file is not replaced unless `force` says so.
 *
 * @module
 */

import { DataError, OptionError } from "../errors.ts";

/** Options of {@linkcode writeFileAtomic}. */
export interface AtomicWriteOptions {
  /**
   * Replace an existing file.
   * @default {false}
   */
  force?: boolean;
  /** The option that named the path, for messages (e.g. `--out`). */
  option?: string;
  /**
   * Permissions of the file written (e.g. `0o600` for a file only its
   * owner may read); default: the usual for new files.
   */
  mode?: number;
}

// Temporary files being written now, so that an interrupted run can remove
// them (see removePendingFiles).
const pending = new Set<string>();

/**
 * Removes the temporary files of writes still in progress: called when the
 * program is interrupted (Ctrl-C), so that nothing half-written is left.
 * The targets themselves are untouched: they are only ever replaced whole.
 *
 * @returns How many files were removed.
 */
export function removePendingFiles(): number {
  let removed = 0;
  for (const path of pending) {
    try {
      Deno.removeSync(path);
      removed++;
    } catch {
      // Already gone.
    }
  }
  pending.clear();
  return removed;
}

/**
 * Writes `data` to `path` atomically.
 *
 * @throws {OptionError} when the file exists and `force` is not set.
 * @throws {DataError} when the folder cannot be written.
 *
 * @example
 * ```ts ignore
 * import { writeFileAtomic } from "./atomic_write.ts";
 * await writeFileAtomic("model.json", "{}", { force: true });
 * ```
 */
export async function writeFileAtomic(
  path: string,
  data: string | Uint8Array,
  options: AtomicWriteOptions = {},
): Promise<void> {
  const option = options.option ?? "--out";
  if (!options.force && await exists(path)) {
    throw new OptionError(`${option}: ${path} already exists; add --force to replace it`);
  }
  const slash = path.lastIndexOf("/");
  const folder = slash >= 0 ? path.slice(0, slash + 1) : "";
  const temporary = `${folder}.${path.slice(slash + 1)}.${crypto.randomUUID()}.tmp`;
  const bytes = typeof data === "string" ? new TextEncoder().encode(data) : data;
  pending.add(temporary);
  try {
    const file = await Deno.open(temporary, {
      write: true,
      createNew: true,
      ...(options.mode !== undefined ? { mode: options.mode } : {}),
    });
    try {
      let written = 0;
      while (written < bytes.length) written += await file.write(bytes.subarray(written));
      await file.sync();
    } finally {
      file.close();
    }
    await Deno.rename(temporary, path);
    pending.delete(temporary);
  } catch (error) {
    pending.delete(temporary);
    await Deno.remove(temporary).catch(() => {});
    // Said without the temporary file's name, which means nothing to anyone.
    const why = error instanceof Deno.errors.NotFound
      ? "its folder does not exist"
      : error instanceof Deno.errors.PermissionDenied || error instanceof Deno.errors.NotCapable
      ? "not allowed to write there"
      : (error as Error).message.split("\n")[0].replace(/[:,]? ?(open|rename) '.*$/, "");
    throw new DataError(`${option}: cannot write ${path} (${why})`);
  }
}

/**
 * Checks, before any long work, that an output path can be written: it does
 * not exist (unless `force`) and its folder does.
 *
 * @throws {OptionError} when the file exists and `force` is not set.
 * @throws {DataError} when the folder does not exist.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { assertCanWrite } from "./atomic_write.ts";
 * await assertCanWrite(`${Deno.makeTempDirSync()}/new.csv`, false, "--out");
 * await assert.rejects(() => assertCanWrite("/no/such/folder/x.csv", false, "--out"), /folder does not exist/);
 * ```
 */
export async function assertCanWrite(path: string, force: boolean, option: string): Promise<void> {
  if (!force && await exists(path)) {
    throw new OptionError(`${option}: ${path} already exists; add --force to replace it`);
  }
  const slash = path.lastIndexOf("/");
  const folder = slash > 0 ? path.slice(0, slash) : slash === 0 ? "/" : ".";
  try {
    if (!(await Deno.stat(folder)).isDirectory) throw new Deno.errors.NotFound();
  } catch (error) {
    if (error instanceof Deno.errors.NotFound) {
      throw new DataError(`${option}: cannot write ${path} (its folder does not exist)`);
    }
    throw error;
  }
}

async function exists(path: string): Promise<boolean> {
  try {
    await Deno.lstat(path);
    return true;
  } catch (error) {
    if (error instanceof Deno.errors.NotFound) return false;
    throw new DataError(`cannot check ${path} (${(error as Error).message.split("\n")[0]})`);
  }
}
