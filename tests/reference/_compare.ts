/**
 * Comparing a fresh run of a reference script (R, scikit-learn) with the
 * committed fixture: text exactly, numbers to a relative tolerance, so the
 * last digits a different processor or BLAS prints do not fail the check.
 * Every difference found is listed, with both values.
 *
 * @module
 */

import assert from "node:assert/strict";

/**
 * The relative tolerance of the reruns: two numbers agree when they differ
 * by at most this times the largest magnitude among them and the other
 * numbers of the same array (JSON) or column (CSV). Scaling by the array
 * keeps values that come from a difference near zero (such as a pruning
 * alpha of 2e-11 among alphas of 0.1) from failing on rounding alone.
 */
export const RERUN_RTOL = 1e-12;

/** At most this many differences are listed in a failure. */
const SHOWN = 20;

/** One difference between a fresh output and the committed one. */
export interface Difference {
  where: string;
  fresh: string;
  committed: string;
  relative?: number;
}

function numbersDiffer(a: number, b: number, scale: number, rtol: number): boolean {
  if (a === b) return false;
  if (!Number.isFinite(a) || !Number.isFinite(b)) return true;
  return Math.abs(a - b) > rtol * Math.max(Math.abs(a), Math.abs(b), scale);
}

function relativeDifference(a: number, b: number): number {
  return Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b));
}

function largest(values: unknown[]): number {
  let max = 0;
  for (const v of values) if (typeof v === "number") max = Math.max(max, Math.abs(v));
  return max;
}

function walk(
  fresh: unknown,
  committed: unknown,
  where: string,
  scale: number,
  rtol: number,
  out: Difference[],
): void {
  if (typeof fresh === "number" && typeof committed === "number") {
    if (numbersDiffer(fresh, committed, scale, rtol)) {
      out.push({
        where,
        fresh: String(fresh),
        committed: String(committed),
        relative: relativeDifference(fresh, committed),
      });
    }
    return;
  }
  if (Array.isArray(fresh) && Array.isArray(committed)) {
    if (fresh.length !== committed.length) {
      out.push({
        where: `${where} (length)`,
        fresh: String(fresh.length),
        committed: String(committed.length),
      });
      return;
    }
    const s = Math.max(largest(fresh), largest(committed));
    fresh.forEach((v, i) => walk(v, committed[i], `${where}[${i}]`, s, rtol, out));
    return;
  }
  if (
    fresh !== null && committed !== null && typeof fresh === "object" &&
    typeof committed === "object" && !Array.isArray(fresh) && !Array.isArray(committed)
  ) {
    const a = fresh as Record<string, unknown>;
    const b = committed as Record<string, unknown>;
    const keysA = Object.keys(a);
    const keysB = Object.keys(b);
    if (keysA.join("\u0000") !== keysB.join("\u0000")) {
      out.push({ where: `${where} (keys)`, fresh: keysA.join(", "), committed: keysB.join(", ") });
      return;
    }
    for (const key of keysA) walk(a[key], b[key], `${where}.${key}`, 0, rtol, out);
    return;
  }
  if (fresh !== committed) {
    out.push({ where, fresh: JSON.stringify(fresh), committed: JSON.stringify(committed) });
  }
}

/**
 * The differences between two JSON texts: keys, strings, booleans, nulls
 * and array lengths exactly, numbers to `rtol` (see {@linkcode RERUN_RTOL}).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { jsonDifferences } from "./_compare.ts";
 * assert.equal(jsonDifferences('{"b": [4.321394996291109]}', '{"b": [4.321394996291111]}').length, 0);
 * assert.equal(jsonDifferences('{"b": [4.3214]}', '{"b": [4.3215]}').length, 1);
 * assert.equal(jsonDifferences('{"name": "lm"}', '{"name": "glm"}').length, 1);
 * ```
 */
export function jsonDifferences(
  fresh: string,
  committed: string,
  rtol: number = RERUN_RTOL,
): Difference[] {
  return valueDifferences(JSON.parse(fresh), JSON.parse(committed), rtol);
}

/**
 * The same comparison as {@linkcode jsonDifferences} on parsed values.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { valueDifferences } from "./_compare.ts";
 * assert.deepEqual(valueDifferences({ a: [1, 2] }, { a: [1, 2] }), []);
 * ```
 */
export function valueDifferences(
  fresh: unknown,
  committed: unknown,
  rtol: number = RERUN_RTOL,
): Difference[] {
  const out: Difference[] = [];
  walk(fresh, committed, "$", 0, rtol, out);
  return out;
}

const NUMBER = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/;

/**
 * The differences between two CSV texts written without quoting (as R's
 * `write.csv(quote = FALSE)` writes them): the same lines and fields; a
 * field that is a number on both sides to `rtol` of its column's largest
 * magnitude, any other field exactly.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { csvDifferences } from "./_compare.ts";
 * assert.equal(csvDifferences("a,b\n1.0000000000000002,x\n", "a,b\n1,x\n").length, 0);
 * assert.equal(csvDifferences("a,b\n1,x\n", "a,b\n1,y\n").length, 1);
 * ```
 */
export function csvDifferences(
  fresh: string,
  committed: string,
  rtol: number = RERUN_RTOL,
): Difference[] {
  const split = (text: string) => text.split(/\r?\n/).map((line) => line.split(","));
  const a = split(fresh);
  const b = split(committed);
  if (a.length !== b.length) {
    return [{ where: "lines", fresh: String(a.length), committed: String(b.length) }];
  }
  const scale: number[] = [];
  for (const rows of [a, b]) {
    for (const row of rows) {
      row.forEach((field, j) => {
        if (NUMBER.test(field)) scale[j] = Math.max(scale[j] ?? 0, Math.abs(Number(field)));
      });
    }
  }
  const out: Difference[] = [];
  a.forEach((row, i) => {
    if (row.length !== b[i].length) {
      out.push({
        where: `line ${i + 1} (fields)`,
        fresh: String(row.length),
        committed: String(b[i].length),
      });
      return;
    }
    row.forEach((field, j) => {
      const other = b[i][j];
      if (field === other) return;
      const where = `line ${i + 1}, field ${j + 1}`;
      if (NUMBER.test(field) && NUMBER.test(other)) {
        const x = Number(field);
        const y = Number(other);
        if (numbersDiffer(x, y, scale[j] ?? 0, rtol)) {
          out.push({ where, fresh: field, committed: other, relative: relativeDifference(x, y) });
        }
        return;
      }
      out.push({ where, fresh: field, committed: other });
    });
  });
  return out;
}

/**
 * Fails, listing the differences (both values and their relative
 * difference), when a fresh file differs from the committed one.
 *
 * @param name The committed file, for the message.
 *
 * @example
 * ```ts
 * import { assertSameOutput } from "./_compare.ts";
 * assertSameOutput("fixtures/x.json", '{"a": 1}', '{"a": 1.0000000000000002}');
 * ```
 */
export function assertSameOutput(name: string, fresh: string, committed: string): void {
  assertNoDifferences(
    name,
    name.endsWith(".csv") ? csvDifferences(fresh, committed) : jsonDifferences(fresh, committed),
  );
}

/**
 * Fails, listing them, when there are differences.
 *
 * @param name The committed file, for the message.
 *
 * @example
 * ```ts
 * import { assertNoDifferences, valueDifferences } from "./_compare.ts";
 * assertNoDifferences("fixtures/x.json", valueDifferences([0.1], [0.1]));
 * ```
 */
export function assertNoDifferences(name: string, differences: Difference[]): void {
  if (differences.length === 0) return;
  const lines = differences.slice(0, SHOWN).map((d) =>
    `  ${d.where}: fresh ${d.fresh}, committed ${d.committed}` +
    (d.relative === undefined ? "" : ` (relative difference ${d.relative.toExponential(2)})`)
  );
  if (differences.length > SHOWN) lines.push(`  and ${differences.length - SHOWN} more`);
  assert.fail(
    `${name} differs from a fresh run beyond a relative ${RERUN_RTOL} ` +
      `(${differences.length} difference${differences.length === 1 ? "" : "s"}):\n` +
      lines.join("\n"),
  );
}
