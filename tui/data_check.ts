/**
 * What the library found in a table, in words: columns that look like
 * identifiers, columns with more levels than the split search takes, and
 * why a column was left out of a model. The library returns these as data;
 * this module is where they become sentences, the same in every command.
 *
 * @module
 */

import type { DroppedColumn, SchemaSummary } from "../mod.ts";

function count(n: number): string {
  return n.toLocaleString("en-US");
}

/**
 * The note on a column that looks like it names rows.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { identifierLikeNote } from "./data_check.ts";
 * assert.equal(
 *   identifierLikeNote("comment", { levels: 250, rows: 300 }),
 *   "looks like an identifier (250 levels in 300 rows); left out of models unless declared " +
 *     "with --type comment=categorical",
 * );
 * ```
 */
export function identifierLikeNote(
  name: string,
  detail: { levels: number; rows: number },
): string {
  return `looks like an identifier (${count(detail.levels)} levels in ${count(detail.rows)} ` +
    `rows); left out of models unless declared with --type ${name}=categorical`;
}

/**
 * A schema summary with the identifier-like note added to such columns'
 * notes, for the text view (the JSON keeps the figures as data).
 */
export function withWordedNotes(summary: SchemaSummary): SchemaSummary {
  return {
    ...summary,
    columns: summary.columns.map((c) =>
      c.identifierLike
        ? { ...c, notes: [...c.notes, identifierLikeNote(c.name, c.identifierLike)] }
        : c
    ),
  };
}

/**
 * Why a column was left out of a model, in a few words.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { droppedReason } from "./data_check.ts";
 * assert.equal(
 *   droppedReason({
 *     name: "team",
 *     reason: "too many levels",
 *     detail: { kind: "too-many-levels", levels: 2000, limit: 1000 },
 *   }),
 *   "2,000 levels; at most 1,000 are split on",
 * );
 * assert.equal(droppedReason({ name: "id", reason: "identifier" }), "identifier");
 * ```
 */
export function droppedReason(dropped: DroppedColumn): string {
  const detail = dropped.detail;
  if (detail?.kind === "too-many-levels") {
    return `${count(detail.levels)} levels; at most ${count(detail.limit)} are split on`;
  }
  if (detail?.kind === "identifier-like") {
    return `looks like an identifier: ${count(detail.levels)} levels in ${count(detail.rows)} rows`;
  }
  return dropped.reason;
}
