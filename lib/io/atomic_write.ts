/**
 * Writing an output file so that it is either whole or absent: the bytes
 * go to a temporary file beside the target, which is then renamed over it
 * (a rename within one folder is atomic on POSIX file systems). An existing
 * file is not replaced unless `force` says so, and never when it is not a
 * regular file (a folder, a symbolic link, a FIFO, a device, a socket): a
 * rename would put a regular file in its place. A replaced file keeps its
 * mode; a new file of per-person pay (`private`) is created readable by its
 * owner only (0600), others with the usual mode (0666 less the umask).
 *
 * @module
 */

import { resolve } from "node:path";
import { DataError, OptionError } from "../errors.ts";

/** Options of {@linkcode writeFileAtomic}. */
export interface AtomicWriteOptions {
  /**
   * Replace an existing regular file.
   * @default {false}
   */
  force?: boolean;
  /** The option that named the path, for messages (e.g. `out`; a flag given is kept). */
  option?: string;
  /**
   * The file holds per-person pay: a new file is created with mode 0600.
   * @default {false}
   */
  private?: boolean;
}

// Temporary files being written now, so that an interrupted run can remove
// them (see removePendingFiles).
const pending = new Set<string>();

/**
 * Removes the temporary files of writes still in progress: called when the
 * program is stopped (Ctrl-C, SIGTERM, SIGHUP), so that nothing
 * half-written is left. The targets themselves are untouched: they are
 * only ever replaced whole.
 *
 * @returns How many files were removed.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { removePendingFiles } from "./atomic_write.ts";
 * assert(removePendingFiles() === 0);
 * ```
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
 * @param reading Files the run reads: the output may be none of them.
 * @throws {OptionError} when the path exists and `force` is not set, it
 * is not a regular file, or it is one of the files read.
 * @throws {DataError} when the folder cannot be written.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { writeFileAtomic } from "./atomic_write.ts";
 * const path = `${Deno.makeTempDirSync()}/review.csv`;
 * await writeFileAtomic(path, "id,pay\n", { private: true });
 * assert(Deno.readTextFileSync(path) === "id,pay\n");
 * assert(Deno.build.os === "windows" || (Deno.statSync(path).mode! & 0o777) === 0o600);
 * await assert.rejects(() => writeFileAtomic(path, "x"), /already exists/);
 * ```
 */
export async function writeFileAtomic(
  path: string,
  data: string | Uint8Array,
  options: AtomicWriteOptions = {},
): Promise<void> {
  const option = options.option ?? "out";
  const existing = await checkTarget(path, options.force ?? false, option);
  const temporary = temporaryBeside(path);
  const bytes = typeof data === "string" ? new TextEncoder().encode(data) : data;
  // The temporary file is the owner's alone while it fills; then it takes
  // the replaced file's mode, or stays 0600 for per-person pay (even over a
  // file others could read: what it holds now is not for them).
  const keep = !options.private && existing?.mode != null ? existing.mode & 0o777 : null;
  const restrict = keep !== null || options.private === true;
  pending.add(temporary);
  try {
    const file = await Deno.open(temporary, {
      write: true,
      createNew: true,
      ...(restrict ? { mode: 0o600 } : {}),
    });
    try {
      let written = 0;
      while (written < bytes.length) written += await file.write(bytes.subarray(written));
      await file.sync();
    } finally {
      file.close();
    }
    if (keep !== null && keep !== 0o600 && Deno.build.os !== "windows") {
      await Deno.chmod(temporary, keep);
    }
    // Checked again just before: what is there now must still be replaceable.
    await checkTarget(path, options.force ?? false, option);
    await Deno.rename(temporary, path);
    pending.delete(temporary);
  } catch (error) {
    pending.delete(temporary);
    await Deno.remove(temporary).catch(() => {});
    if (error instanceof OptionError || error instanceof DataError) throw error;
    throw new DataError(`{${option}}: cannot write ${path} (${writeProblem(error)})`);
  }
}

/**
 * Checks, before any long work, that an output path can be written: it is
 * not a folder or any other kind of file but a regular one, it does not
 * exist (unless `force`), and its folder exists and takes a new file (a
 * probe file is created there and removed at once).
 *
 * @param reading Files the run reads: the output may be none of them.
 * @throws {OptionError} when the path exists and `force` is not set, it
 * is not a regular file, or it is one of the files read.
 * @throws {DataError} when the folder does not exist or cannot be written.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { assertCanWrite } from "./atomic_write.ts";
 * const folder = Deno.makeTempDirSync();
 * await assertCanWrite(`${folder}/new.csv`, false, "--out");
 * await assert.rejects(() => assertCanWrite(folder, true, "--out"), /is a folder/);
 * await assert.rejects(() => assertCanWrite("/no/such/folder/x.csv", false, "--out"), /folder does not exist/);
 * ```
 */
export async function assertCanWrite(
  path: string,
  force: boolean,
  option: string,
  reading: readonly string[] = [],
): Promise<void> {
  for (const input of reading) {
    if (await sameFile(path, input)) {
      throw new OptionError(
        `{${option}}: ${path} is ${input}, which this run reads; write the output elsewhere`,
      );
    }
  }
  await checkTarget(path, force, option);
  const probe = temporaryBeside(path);
  pending.add(probe);
  try {
    (await Deno.open(probe, { write: true, createNew: true, mode: 0o600 })).close();
    await Deno.remove(probe);
  } catch (error) {
    await Deno.remove(probe).catch(() => {});
    throw new DataError(`{${option}}: cannot write ${path} (${writeProblem(error)})`);
  } finally {
    pending.delete(probe);
  }
}

/**
 * Whether two paths name the same file: the same path once made absolute
 * and normalised (`./x.json` is `x.json`), or, when both exist, the same
 * file on disk (a link, a different spelling).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { sameFile } from "./atomic_write.ts";
 * assert(await sameFile("out/x.json", "./out/../out/x.json"));
 * assert(!(await sameFile("x.json", "y.json")));
 * ```
 */
export async function sameFile(a: string, b: string): Promise<boolean> {
  if (resolve(a) === resolve(b)) return true;
  try {
    const [x, y] = await Promise.all([Deno.stat(a), Deno.stat(b)]);
    return x.dev === y.dev && x.ino !== null && x.ino === y.ino;
  } catch {
    return false;
  }
}

// What is at `path` now: null when nothing; refused when it may not be replaced.
async function checkTarget(
  path: string,
  force: boolean,
  option: string,
): Promise<Deno.FileInfo | null> {
  let info: Deno.FileInfo;
  try {
    info = await Deno.lstat(path);
  } catch (error) {
    if (error instanceof Deno.errors.NotFound) return null;
    throw new DataError(`{${option}}: cannot check ${path} (${firstLine(error)})`);
  }
  if (info.isDirectory) {
    throw new OptionError(`{${option}}: ${path} is a folder; give the path of a file to write`);
  }
  if (!info.isFile) {
    throw new OptionError(
      `{${option}}: ${path} is not a regular file (${kindOf(info)}); paygrove only replaces ` +
        `regular files, so give another path`,
    );
  }
  if (!force) {
    throw new OptionError(`{${option}}: ${path} already exists; add {force} to replace it`);
  }
  return info;
}

function kindOf(info: Deno.FileInfo): string {
  if (info.isSymlink) return "a symbolic link";
  if (info.isFifo) return "a FIFO";
  if (info.isCharDevice || info.isBlockDevice) return "a device";
  if (info.isSocket) return "a socket";
  return "not a plain file";
}

function temporaryBeside(path: string): string {
  const slash = path.lastIndexOf("/");
  const folder = slash >= 0 ? path.slice(0, slash + 1) : "";
  return `${folder}.${path.slice(slash + 1)}.${crypto.randomUUID()}.tmp`;
}

// Said without the temporary file's name, which means nothing to anyone.
function writeProblem(error: unknown): string {
  if (error instanceof Deno.errors.NotFound) return "its folder does not exist";
  if (error instanceof Deno.errors.PermissionDenied || error instanceof Deno.errors.NotCapable) {
    return "not allowed to write there";
  }
  const message = firstLine(error);
  if (/read-only file system/i.test(message)) return "the folder is read-only";
  if (/not a directory/i.test(message)) return "its folder is not a folder";
  return message.replace(/[:,]? ?(open|rename|remove|chmod) '.*$/, "");
}

function firstLine(error: unknown): string {
  return (error instanceof Error ? error.message : String(error)).split("\n")[0];
}
