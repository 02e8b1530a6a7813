/**
 * The one lookup of a name an option gives (a column, a model attribute, a
 * level): exact, then without case, else the nearest as data. The library
 * returns the match or throws {@linkcode UnknownNameError} carrying the
 * suggestion; the terminal layer words it.
 *
 * @module
 */

import { OptionError } from "../errors.ts";
import { LADDER, ladderOrder } from "./ordinal.ts";
import type { Column, Table } from "./types.ts";

/**
 * The distance between two words in edits (Levenshtein, letters compared
 * without case), for "did you mean".
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { editDistance } from "./column_named.ts";
 * assert.equal(editDistance("departmnt", "department"), 1);
 * assert.equal(editDistance("Sex", "sex"), 0);
 * ```
 */
export function editDistance(a: string, b: string): number {
  const row = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    let previous = row[0];
    row[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const saved = row[j];
      row[j] = Math.min(
        row[j] + 1,
        row[j - 1] + 1,
        previous + (a[i - 1].toLowerCase() === b[j - 1].toLowerCase() ? 0 : 1),
      );
      previous = saved;
    }
  }
  return row[b.length];
}

/**
 * The closest of `options` to `word`, if it is close enough to be a slip
 * (at most 2 edits, or a third of the word's length).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { nearest } from "./column_named.ts";
 * assert.equal(nearest("anual_salary", ["annual_salary", "site"]), "annual_salary");
 * assert.equal(nearest("postcode", ["annual_salary", "site"]), undefined);
 * ```
 */
export function nearest(word: string, options: readonly string[]): string | undefined {
  let best: string | undefined;
  let bestDistance = Infinity;
  for (const option of options) {
    const d = editDistance(word, option);
    if (d < bestDistance) {
      best = option;
      bestDistance = d;
    }
  }
  return best !== undefined && bestDistance <= Math.max(2, Math.floor(word.length / 3))
    ? best
    : undefined;
}

/** What a name matched: itself, another name differing only in case, or nothing. */
export type NameMatch =
  | { kind: "exact"; name: string }
  | { kind: "case"; name: string }
  | {
    kind: "unknown";
    /** The nearest name by edit distance, when one is close. */
    nearest?: string;
    /** For a level of a ladder (G1..G7): the end it lies beyond. */
    beyond?: { side: "above" | "below"; level: string };
  };

/**
 * Matches `asked` among `names`: exactly, else the one name equal without
 * case, else unknown with the nearest name (when close).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { matchName } from "./column_named.ts";
 * assert.deepEqual(matchName("sex", ["Sex", "pay"]), { kind: "case", name: "Sex" });
 * assert.deepEqual(matchName("pya", ["Sex", "pay"]), { kind: "unknown", nearest: "pay" });
 * ```
 */
export function matchName(asked: string, names: readonly string[]): NameMatch {
  if (names.includes(asked)) return { kind: "exact", name: asked };
  const lower = asked.toLowerCase();
  const folded = names.filter((n) => n.toLowerCase() === lower);
  if (folded.length === 1) return { kind: "case", name: folded[0] };
  const guess = nearest(asked, names);
  return guess === undefined ? { kind: "unknown" } : { kind: "unknown", nearest: guess };
}

/**
 * Matches a level as {@linkcode matchName} does, except that a level of
 * the same ladder as `levels` (`G8` among `G1..G7`) lying beyond its ends
 * is said to be above the highest or below the lowest level, not matched to
 * a name that is merely spelt alike.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { matchLevel } from "./column_named.ts";
 * assert.deepEqual(matchLevel("G8", ["G1", "G2", "G7"]), {
 *   kind: "unknown",
 *   beyond: { side: "above", level: "G7" },
 * });
 * assert.deepEqual(matchLevel("g2", ["G1", "G2"]), { kind: "case", name: "G2" });
 * ```
 */
export function matchLevel(asked: string, levels: readonly string[]): NameMatch {
  const match = matchName(asked, levels);
  if (match.kind !== "unknown") return match;
  const ladder = ladderOrder(levels);
  const rung = LADDER.exec(asked);
  if (ladder !== undefined && rung !== null) {
    const first = LADDER.exec(ladder[0])!;
    if (first[1].toLowerCase() === rung[1].toLowerCase()) {
      const rank = Number(rung[2]);
      const last = ladder[ladder.length - 1];
      if (rank > Number(LADDER.exec(last)![2])) {
        return { kind: "unknown", beyond: { side: "above", level: last } };
      }
      if (rank < Number(first[2])) {
        return { kind: "unknown", beyond: { side: "below", level: ladder[0] } };
      }
      // A rung missing inside the ladder: the nearest rung by number (the lower on a tie).
      let closest = ladder[0];
      for (const level of ladder) {
        const gap = Math.abs(Number(LADDER.exec(level)![2]) - rank);
        if (gap < Math.abs(Number(LADDER.exec(closest)![2]) - rank)) closest = level;
      }
      return { kind: "unknown", nearest: closest };
    }
  }
  return match;
}

/** What an {@linkcode UnknownNameError} was looking for. */
export type NameKind = "column" | "attribute" | "level";

/** The fields of an {@linkcode UnknownNameError}. */
export interface UnknownName {
  /** The option that gave the name (e.g. `within`; a flag given is kept). */
  option: string;
  /** What the name should have named. */
  what: NameKind;
  /** The name given. */
  asked: string;
  /** The names there are. */
  known: string[];
  /** For a level: the column (or attribute) it should be a level of. */
  column?: string;
  /** The nearest name by edit distance, when one is close. */
  nearest?: string;
  /** For a level of a ladder: the end it lies beyond. */
  beyond?: { side: "above" | "below"; level: string };
}

/**
 * An option named a column, attribute or level that is not there; the
 * lookup's findings (nearest name, ladder end) are fields, for the terminal
 * layer to word.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { UnknownNameError } from "./column_named.ts";
 * const error = new UnknownNameError("no column named \"sites\"", {
 *   option: "--where", what: "column", asked: "sites", known: ["site"], nearest: "site",
 * });
 * assert(error instanceof Error && error.nearest === "site" && error.name === "OptionError");
 * ```
 */
export class UnknownNameError extends OptionError implements UnknownName {
  /** The option that gave the name. */
  readonly option: string;
  /** What the name should have named. */
  readonly what: NameKind;
  /** The name given. */
  readonly asked: string;
  /** The names there are. */
  readonly known: string[];
  /** For a level: its column. */
  readonly column?: string;
  /** The nearest name, when one is close. */
  readonly nearest?: string;
  /** For a level of a ladder: the end it lies beyond. */
  readonly beyond?: { side: "above" | "below"; level: string };

  /**
   * @param message The plain sentence, for callers that do not word the fields.
   * @param fields What was looked for and found.
   */
  constructor(message: string, fields: UnknownName) {
    super(message);
    this.option = fields.option;
    this.what = fields.what;
    this.asked = fields.asked;
    this.known = fields.known;
    if (fields.column !== undefined) this.column = fields.column;
    if (fields.nearest !== undefined) this.nearest = fields.nearest;
    if (fields.beyond !== undefined) this.beyond = fields.beyond;
  }
}

/**
 * The error for a column name that matched nothing.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { unknownColumn } from "./column_named.ts";
 * const error = unknownColumn("--target", "Pya", ["site", "pay"]);
 * assert.equal(error.message, '--target: no column named "Pya"; the columns are: site, pay');
 * assert.equal(error.nearest, "pay");
 * ```
 */
export function unknownColumn(
  option: string,
  asked: string,
  columns: readonly string[],
): UnknownNameError {
  const match = matchName(asked, columns);
  return new UnknownNameError(
    `${option === "" ? "" : `{${option}}: `}no column named "${asked}"; the columns are: ${
      columns.join(", ")
    }`,
    {
      option,
      what: "column",
      asked,
      known: [...columns],
      ...(match.kind === "unknown" && match.nearest !== undefined
        ? { nearest: match.nearest }
        : {}),
    },
  );
}

/**
 * The error for a level that matched nothing.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { unknownLevel } from "./column_named.ts";
 * const error = unknownLevel("--where", "level", "G9", ["G1", "G2"]);
 * assert.deepEqual(error.beyond, { side: "above", level: "G2" });
 * ```
 */
export function unknownLevel(
  option: string,
  column: string,
  asked: string,
  levels: readonly string[],
): UnknownNameError {
  const match = matchLevel(asked, levels);
  const found: { nearest?: string; beyond?: { side: "above" | "below"; level: string } } =
    match.kind === "unknown" ? match : {};
  return new UnknownNameError(
    `{${option}}: "${column}" has no level "${asked}"; its levels are: ${levels.join(", ")}`,
    {
      option,
      what: "level",
      asked,
      column,
      known: [...levels],
      ...(found.nearest !== undefined ? { nearest: found.nearest } : {}),
      ...(found.beyond !== undefined ? { beyond: found.beyond } : {}),
    },
  );
}

/**
 * The column called `name`, or else the one column whose name differs from
 * it only in case.
 *
 * @param option The option that named it, for the message (e.g. `--within`).
 * @throws {UnknownNameError} naming the columns there are, with the nearest.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "./load_table.ts";
 * import { columnNamed } from "./column_named.ts";
 * const table = loadTable("site,pay\nNorth,50\nSouth,60\n");
 * assert(columnNamed(table, "site", "--where").name === "site");
 * assert(columnNamed(table, "Site", "--where").name === "site");
 * assert.throws(() => columnNamed(table, "sites", "--where"), /no column named "sites"; the columns are: site, pay/);
 * ```
 */
export function columnNamed(table: Pick<Table, "columns">, name: string, option: string): Column {
  const names = table.columns.map((c) => c.name);
  const match = matchName(name, names);
  if (match.kind === "unknown") throw unknownColumn(option, name, names);
  return table.columns[names.indexOf(match.name)];
}
