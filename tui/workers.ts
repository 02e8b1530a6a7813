/**
 * `--workers N` held to what can run at once: no more workers than cores
 * (each holds its own copy of the work's buffers, and more cannot run
 * together) and no more than trees (each worker grows at least one). A
 * capped number is said in one line on standard error, never refused.
 *
 * @module
 */

/**
 * The number of workers to use for `asked` (undefined: the library's
 * default, one per core).
 *
 * @param trees Trees to grow (0: none, so only the cores count).
 * @param say Where the note on a capped number goes.
 * @param cores Cores of this machine.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { cappedWorkers } from "./workers.ts";
 * const notes: string[] = [];
 * assert(cappedWorkers(1000, 200, (t) => notes.push(t), 2) === 2);
 * assert(notes[0] === "paygrove: --workers 1000 is more than this machine's 2 cores; using 2");
 * assert(cappedWorkers(8, 5, (t) => notes.push(t), 16) === 5);
 * assert(cappedWorkers(2, 200, (t) => notes.push(t), 4) === 2 && notes.length === 2);
 * assert(cappedWorkers(undefined, 200, (t) => notes.push(t), 4) === undefined);
 * ```
 */
export function cappedWorkers(
  asked: number | undefined,
  trees: number,
  say: (text: string) => void,
  cores: number = navigator.hardwareConcurrency ?? 1,
): number | undefined {
  if (asked === undefined) return undefined;
  const byTrees = trees > 0 && trees < cores;
  const cap = Math.max(1, byTrees ? trees : cores);
  if (asked <= cap) return asked;
  say(
    `paygrove: --workers ${asked} is more than ` +
      `${
        byTrees ? `the ${trees} trees` : `this machine's ${cores} core${cores === 1 ? "" : "s"}`
      }` +
      `; using ${cap}`,
  );
  return cap;
}
