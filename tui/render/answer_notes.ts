/**
 * An answer's notes in words: the library returns why a profile is unusual
 * and what to bear in mind about an estimate as data (a kind and its
 * figures); these are their sentences on the screen, in the batch table's
 * warnings column and beside the codes in `--json`.
 *
 * @module
 */

import type { AnswerNote, SupportReason } from "../../mod.ts";
import { formatNumber, formatPay, type NumberStyle } from "./numbers.ts";

/**
 * One reason a profile is unusual for the data, as a clause.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { supportReasonText } from "./answer_notes.ts";
 * assert.equal(
 *   supportReasonText({ kind: "fewPeers", features: ["level", "site"], levels: ["G7", "North"], rows: 2 }),
 *   "only 2 people in the training data have level G7 and site North",
 * );
 * assert.equal(
 *   supportReasonText({
 *     kind: "aboveLevelRange", feature: "years", value: 35, group: "level", level: "G1", bound: 12.5,
 *   }),
 *   "years 35 is above what 99% of people at level G1 have (up to 12.5)",
 * );
 * assert.equal(supportReasonText({ kind: "outsideData", feature: "years" }), "years is outside the data");
 * ```
 */
export function supportReasonText(reason: SupportReason): string {
  switch (reason.kind) {
    case "fewPeers": {
      const n = reason.rows;
      return `${n === 0 ? "no one" : `only ${n} ${n === 1 ? "person" : "people"}`} in the ` +
        `training data ${n === 1 ? "has" : "have"} ${reason.features[0]} ${reason.levels[0]} and ` +
        `${reason.features[1]} ${reason.levels[1]}`;
    }
    case "aboveLevelRange":
      return `${reason.feature} ${reason.value} is above what 99% of people at ${reason.group} ` +
        `${reason.level} have (up to ${reason.bound})`;
    case "belowLevelRange":
      return `${reason.feature} ${reason.value} is below what 99% of people at ${reason.group} ` +
        `${reason.level} have (from ${reason.bound})`;
    case "outsideData":
      return `${reason.feature} is outside the data`;
  }
}

/**
 * One note of an estimate, a comparison or a sweep as a sentence (amounts
 * written in `money`).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { answerNoteText } from "./answer_notes.ts";
 * const money = { currency: "EUR", locale: "en-US" };
 * assert.equal(
 *   answerNoteText({ kind: "valueOutsideData", feature: "years", value: 50, min: 0, max: 40 }, money),
 *   "years 50 is outside the training data (0 to 40); trees give the same estimate beyond the " +
 *     "data's edge as at it",
 * );
 * assert.match(answerNoteText({ kind: "noEnsemble" }, money), /fitted with --trees 0/);
 * assert.match(
 *   answerNoteText({ kind: "ownPayIncluded", id: "E0042", outOfBag: 61234 }, money),
 *   /^E0042 is one of the people .* it is €61,234$/,
 * );
 * assert.equal(
 *   answerNoteText({ kind: "sweepUnusual", feature: "years", values: [10.825, 35] }, money),
 *   "unusual for the data (few comparable people) at years 10.83, 35; treat those estimates with care",
 * );
 * assert.match(
 *   answerNoteText({ kind: "estimateFalls", feature: "level", from: "G4", to: "G5" }, money),
 *   /^the estimate falls as level rises from G4 to G5, .* --increasing level keeps/,
 * );
 * ```
 */
export function answerNoteText(note: AnswerNote, money: NumberStyle): string {
  switch (note.kind) {
    case "valueOutsideData":
      return `${note.feature} ${note.value} is outside the training data (${note.min} to ` +
        `${note.max}); trees give the same estimate beyond the data's edge as at it`;
    case "unusualProfile":
      return `unusual profile for this data: ${note.reasons.map(supportReasonText).join("; ")}. ` +
        `Estimates for it rest on few comparable people; treat them with care`;
    case "noEnsemble":
      return "this model has no ensemble (fitted with --trees 0): the estimate is the " +
        "reference tree's leaf and carries no interval";
    case "treesDisagree":
      return "the trees disagree about such a profile more than comparable people's pay differs: " +
        "there are few people like it, so both intervals rest on little";
    case "ownPayIncluded":
      return `${note.id} is one of the people the model learned from, so this estimate includes ` +
        `their own pay; leaving them out (the out-of-bag estimate, as batch gives it) it is ` +
        formatPay(note.outOfBag, money);
    case "inTrainingTable":
      return `${note.id} is in the table the model was fitted on (the same file), so this ` +
        `estimate includes their own pay; with the analyst's file (--analyst-file) paygrove ` +
        `gives the estimate of the trees that never saw them`;
    case "sweepBeyondData":
      return `${note.feature} outside ${note.min} to ${note.max} (the data's range) gets the ` +
        `estimate at the nearest edge: trees cannot extrapolate`;
    case "estimateFalls":
      return `the estimate falls as ${note.feature} rises from ${numberOrText(note.from, money)} ` +
        `to ${numberOrText(note.to, money)}, the rest held (often a thin or noisy part of the ` +
        `table). ` +
        `This model is not constrained along ${note.feature}; fitting with --increasing ` +
        `${note.feature} keeps the estimate from falling`;
    case "sweepUnusual":
      // Values written as the sweep's table writes them (2 decimals).
      return `unusual for the data (few comparable people) at ${note.feature} ` +
        `${
          note.values.map((v) => (typeof v === "number" ? formatNumber(v, money, 2) : v)).join(", ")
        }; treat those estimates with care`;
  }
}

function numberOrText(v: string | number, money: NumberStyle): string {
  return typeof v === "number" ? formatNumber(v, money, 2) : v;
}

/**
 * An answer's notes worded: `warnings` as sentences with their codes
 * beside them (`warningCodes`), and where the answer has support, its
 * `reasons` as clauses with theirs (`reasonCodes`): the `--json` document
 * and the screen read the same sentences.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { wordedNotes } from "./answer_notes.ts";
 * const answer = {
 *   estimate: 60000,
 *   warnings: [{ kind: "treesDisagree" as const }],
 *   support: { rows: 2, unusual: true, reasons: [{ kind: "outsideData" as const, feature: "years" }] },
 * };
 * const doc = wordedNotes(answer, { locale: "en-US" });
 * assert.equal(doc.estimate, 60000);
 * assert.match(doc.warnings[0], /^the trees disagree/);
 * assert.deepEqual(doc.warningCodes, [{ kind: "treesDisagree" }]);
 * assert.deepEqual(doc.support.reasons, ["years is outside the data"]);
 * assert.equal(doc.support.reasonCodes[0].kind, "outsideData");
 * ```
 */
export function wordedNotes<
  T extends { warnings: AnswerNote[]; support?: { reasons: SupportReason[] } },
>(
  answer: T,
  money: NumberStyle,
): Omit<T, "warnings" | "support"> & {
  warnings: string[];
  warningCodes: AnswerNote[];
  support: T["support"] extends undefined ? undefined
    : Omit<NonNullable<T["support"]>, "reasons"> & {
      reasons: string[];
      reasonCodes: SupportReason[];
    };
} {
  const worded: Record<string, unknown> = {
    ...answer,
    warnings: answer.warnings.map((note) => answerNoteText(note, money)),
    warningCodes: answer.warnings,
  };
  if (answer.support !== undefined) {
    worded.support = {
      ...answer.support,
      reasons: answer.support.reasons.map(supportReasonText),
      reasonCodes: answer.support.reasons,
    };
  }
  // deno-lint-ignore no-explicit-any
  return worded as any;
}
