/**
 * A progress bar on standard error, shown only on a terminal: one line
 * redrawn in place with the stage, a bar, steps done and time left.
 *
 * @module
 */

import type { Terminal } from "./terminal.ts";

const STAGES: Record<string, string> = {
  "cross-validation": "reference tree",
  trees: "ensemble trees",
  importance: "importance",
  reading: "reading the table (MB)",
  "pay model": "pay model trees",
  "group model": "group model trees",
  proxies: "proxy checks",
};

/** A progress reporter: `update` as work advances, `finish` at the end. */
export interface Progress {
  /** Reports `done` of `total` steps of a stage. */
  update(stage: string, done: number, total: number): void;
  /** Clears the line. */
  finish(): void;
}

/**
 * The bar for a terminal; a silent reporter where standard error is not a
 * terminal (scripts and pipes get no control characters).
 *
 * @param now The clock in milliseconds (tests pass their own).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { progressBar } from "./progress.ts";
 * const shown: string[] = [];
 * let t = 0;
 * const bar = progressBar({ progress: (s: string) => shown.push(s) }, 30, () => (t += 1000));
 * bar.update("trees", 50, 200);
 * assert(shown[0].startsWith("ensemble trees [#####") && shown[0].includes("50/200"));
 * ```
 */
export function progressBar(
  terminal: Pick<Terminal, "progress"> & { width?: number },
  width: number = Math.max(10, Math.min(30, (terminal.width ?? 80) - 50)),
  now: () => number = () => performance.now(),
): Progress {
  const draw = terminal.progress;
  if (draw === undefined) return { update() {}, finish() {} };
  let stage = "";
  let started = now();
  let last = -Infinity;
  return {
    update(name, done, total) {
      const t = now();
      if (name !== stage) {
        stage = name;
        started = t;
      }
      // At most ten redraws a second, and always the last.
      if (t - last < 100 && done < total) return;
      last = t;
      const share = total > 0 ? done / total : 0;
      const cells = Math.round(share * width);
      const elapsed = (t - started) / 1000;
      const left = done > 0 && done < total ? (elapsed / done) * (total - done) : 0;
      const eta = done > 0 && done < total ? `, ${Math.ceil(left)} s left` : "";
      // Cross-validation counts the full tree and then each fold.
      const unit = name === "cross-validation" ? ` (${total - 1}-fold CV)` : "";
      draw(
        `${STAGES[name] ?? name}${unit} [${"#".repeat(cells)}${" ".repeat(width - cells)}] ` +
          `${done}/${total}${eta}`,
      );
    },
    finish() {
      draw("");
    },
  };
}
