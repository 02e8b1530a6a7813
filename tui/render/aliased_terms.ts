/**
 * Words for the terms a least-squares fit left out as combinations of other
 * columns (the straight-line baseline of `fit`, the linear version of
 * `gap`).
 *
 * @module
 */

import type { AliasedTerm, DesignTerm } from "../../mod.ts";

/** At most this many terms are named in a sentence; --json lists them all. */
const NAMED = 6;

/**
 * One term in words: the column, its missing marker, or one of its levels.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { termText } from "./aliased_terms.ts";
 * assert.equal(termText({ feature: "site", kind: "level", level: "Eastgate" }), "site = Eastgate");
 * assert.equal(termText({ feature: "rating", kind: "missing" }), "whether rating is missing");
 * ```
 */
export function termText(term: DesignTerm): string {
  if (term.kind === "value") return term.feature;
  if (term.kind === "missing") return `whether ${term.feature} is missing`;
  return term.level === null ? `${term.feature} missing` : `${term.feature} = ${term.level}`;
}

function list(items: string[]): string {
  const shown = items.length > NAMED
    ? [...items.slice(0, NAMED - 1), `${items.length - NAMED + 1} more`]
    : items;
  return shown.length === 1
    ? shown[0]
    : `${shown.slice(0, -1).join(", ")} and ${shown[shown.length - 1]}`;
}

const WHY = "constant or a combination of the other columns (a level nobody there has, a " +
  "multiple of another column), so it adds nothing and counts as 0";

/**
 * The sentence under the accuracy table when the straight line left terms
 * out of some folds' fits; null when none.
 *
 * @param folds The cross-validation folds.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { straightLineSentence } from "./aliased_terms.ts";
 * const text = straightLineSentence([{ term: { feature: "months", kind: "value" }, folds: 10 }], 10);
 * assert.match(text!, /^The straight line leaves out months in all 10 folds: /);
 * assert.equal(straightLineSentence([], 10), null);
 * ```
 */
export function straightLineSentence(aliased: AliasedTerm[], folds: number): string | null {
  if (aliased.length === 0) return null;
  const items = aliased.map((a) =>
    `${termText(a.term)} ${
      a.folds === folds ? `in all ${folds} folds` : `in ${a.folds} of ${folds}`
    }`
  );
  return `The straight line leaves out ${list(items)}: in the rows ${
    aliased.length === 1 ? "it was" : "each was"
  } fitted on, ${aliased.length === 1 ? "it is" : "each is"} ${WHY} there.`;
}

/**
 * The sentence beside the gap check's linear version when its fit left
 * terms out; null when none.
 *
 * @param group The group column: a group left out has no linear figure.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { linearVersionSentence } from "./aliased_terms.ts";
 * const text = linearVersionSentence([{ feature: "level", kind: "value" }], "gender");
 * assert.match(text!, /^The linear version leaves out level: /);
 * ```
 */
export function linearVersionSentence(aliased: DesignTerm[], group: string): string | null {
  if (aliased.length === 0) return null;
  const groupLeftOut = aliased.some((t) => t.feature === group && t.kind === "level");
  return `The linear version leaves out ${list(aliased.map(termText))}: here ${
    aliased.length === 1 ? "it is" : "each is"
  } ${WHY}.${groupLeftOut ? " A group left out has no linear figure." : ""}`;
}
