/**
 * The gap report's and the review's notes in words: the library returns
 * each note as data (a kind and its figures), and these are its sentences
 * on the screen, in the Markdown report and beside the codes in `--json`.
 *
 * @module
 */

import type { GapNote, GapReport, PayReview, ReviewNote } from "../../mod.ts";

/** A share as a whole or one-decimal percentage, as the notes write it. */
function percent(share: number, digits: number): string {
  return (100 * share).toFixed(digits);
}

/**
 * One gap note as a sentence.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { gapNoteText } from "./report_notes.ts";
 * const note = { kind: "fragileAdjustment" as const, people: 60, r2: 0.31, linear: { group: "Woman", gap: 0.042 } };
 * assert.equal(
 *   gapNoteText(note),
 *   "Take the adjusted gap with care: only 60 people, and the other factors explain only 31% of " +
 *     "the spread of log pay out of bag, so the adjusted gap is fragile: it moves with what the " +
 *     "trees get wrong. Compare the linear version (4.2% for Woman).",
 * );
 * assert.match(gapNoteText({ kind: "groupsTooFew", groups: ["X"], privacyMin: 5 }), /^X: too few/);
 * ```
 */
export function gapNoteText(note: GapNote): string {
  switch (note.kind) {
    case "fragileAdjustment": {
      const linear = note.linear
        ? ` Compare the linear version (${percent(note.linear.gap, 1)}% for ${note.linear.group}).`
        : "";
      return `Take the adjusted gap with care: ` +
        (note.people !== null ? `only ${note.people} people` : "") +
        (note.people !== null && note.r2 !== null ? ", and " : "") +
        (note.r2 !== null
          ? `the other factors explain only ${percent(Math.max(0, note.r2), 0)}% of the ` +
            `spread of log pay out of bag`
          : "") +
        `, so the adjusted gap is fragile: it moves with what the trees get wrong.` +
        linear;
    }
    case "groupsTooFew":
      return `${note.groups.join(", ")}: too few to report (fewer than ${note.privacyMin} people ` +
        `each), so never compared; no figure here tells how many they are.`;
    case "otherGroupsLeftOut":
      return `${note.people} people of other groups than ${note.compared.join(" and ")} are left ` +
        `out of this comparison.`;
    case "categoriesTooFew":
      return `Too few to report: ${note.categories.join(", ")}, where ${note.group} has fewer ` +
        `than ${note.privacyMin} people` +
        (note.compareInstead !== null
          ? `; leave ${note.group} out of the comparison (--groups ${
            note.compareInstead.join(",")
          }) to see them.`
          : ".");
    case "complementaryWithheld":
      return `Also withheld: ${note.categories.join(", ")}, so that the hidden categories cannot ` +
        `be worked out by subtracting the shown ones from the overall figures.`;
    case "overallWithheld":
      return `The overall figures are withheld: a group has fewer than ${note.privacyMin} people, ` +
        `or the hidden categories could be worked out from them.`;
    case "variableNotPay":
      return `"${note.column}" does not look like pay (no currency, not named like pay); it is ` +
        `gapped as variable pay all the same, and left out of the factors.`;
    case "variableNotFactor":
      return `The variable pay "${note.column}" is not one of the factors.`;
    case "residualDifference":
      return "The residual difference compares the groups' average out-of-bag pay residuals " +
        "from the pay model alone; it tends to understate the gap when a group is concentrated " +
        "in some levels or families, because the pay model then learns part of the gap as the " +
        "level's.";
  }
}

/**
 * One review note as a sentence.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { reviewNoteText } from "./report_notes.ts";
 * const note = { kind: "categoriesTooFew" as const, categories: ["Lab"], privacyMin: 5, alsoWithheld: ["Sales"] };
 * assert.equal(
 *   reviewNoteText(note),
 *   "Too few to report: Lab (fewer than 5 people); also withheld: Sales, so that those cannot " +
 *     "be worked out from the totals.",
 * );
 * assert.match(reviewNoteText({ kind: "fragileRanges", people: null, r2: 0.404 }), /explain 40% of/);
 * ```
 */
export function reviewNoteText(note: ReviewNote): string {
  switch (note.kind) {
    case "categoriesTooFew":
      return `Too few to report: ${note.categories.join(", ")} (fewer than ${note.privacyMin} ` +
        `people)` +
        (note.alsoWithheld.length > 0
          ? `; also withheld: ${note.alsoWithheld.join(", ")}, so that those cannot be worked ` +
            `out from the totals.`
          : ".");
    case "fragileRanges":
      return `Take the ranges with care: ` +
        (note.people !== null ? `only ${note.people} people, ` : "") +
        `and the factors explain ${percent(Math.max(0, note.r2), 0)}% of the spread ` +
        `of log pay out of bag; ranges are then wide, and who falls outside them says little.`;
  }
}

/**
 * A gap report as its JSON document gives it: the notes in words, and
 * beside them their codes (`noteCodes`), so a script can act on a note
 * without reading English.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { gapJson } from "./report_notes.ts";
 * const report = { notes: [{ kind: "residualDifference" as const }] } as unknown as import("../../mod.ts").GapReport;
 * const doc = gapJson(report);
 * assert.deepEqual(doc.noteCodes, [{ kind: "residualDifference" }]);
 * assert.match(doc.notes[0], /^The residual difference compares/);
 * ```
 */
export function gapJson(report: GapReport): Omit<GapReport, "notes"> & {
  notes: string[];
  noteCodes: GapNote[];
} {
  return { ...report, notes: report.notes.map(gapNoteText), noteCodes: report.notes };
}

/**
 * A review as its JSON document gives it: notes in words and their codes.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { reviewJson } from "./report_notes.ts";
 * const review = { notes: [{ kind: "fragileRanges" as const, people: 40, r2: 0.2 }] } as unknown as import("../../mod.ts").PayReview;
 * const doc = reviewJson(review);
 * assert.equal(doc.noteCodes[0].kind, "fragileRanges");
 * assert.match(doc.notes[0], /^Take the ranges with care: only 40 people, /);
 * ```
 */
export function reviewJson(review: PayReview): Omit<PayReview, "notes"> & {
  notes: string[];
  noteCodes: ReviewNote[];
} {
  return { ...review, notes: review.notes.map(reviewNoteText), noteCodes: review.notes };
}
