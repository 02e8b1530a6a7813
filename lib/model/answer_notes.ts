/**
 * What an answer says beside its figures, as data: why a profile is
 * unusual for the data and what to bear in mind about an estimate or a
 * sweep. Each note is a `kind` and the figures it rests on; the terminal
 * words it (and `--json` gives both), so a script can act on a note
 * without reading English.
 *
 * @module
 */

/**
 * Why a profile is unusual for the data (one of `SupportAnswer.reasons`).
 *
 * - `fewPeers`: fewer people than the privacy minimum share the profile's
 *   levels of the two most important level attributes;
 * - `aboveLevelRange` / `belowLevelRange`: an attribute beyond what 99% of
 *   people at the profile's level have (`bound`, rounded to 4 digits);
 * - `outsideData`: a value outside the training data's range.
 */
export type SupportReason =
  | { kind: "fewPeers"; features: string[]; levels: string[]; rows: number }
  | {
    kind: "aboveLevelRange" | "belowLevelRange";
    feature: string;
    value: number;
    group: string;
    level: string;
    bound: number;
  }
  | { kind: "outsideData"; feature: string };

/**
 * A value of a profile outside the range of the data the model learned
 * from (trees give the same estimate beyond the data's edge as at it).
 */
export interface OutsideDataNote {
  kind: "valueOutsideData";
  /** The attribute. */
  feature: string;
  /** The profile's value. */
  value: number;
  /** The data's smallest value. */
  min: number;
  /** The data's largest value. */
  max: number;
}

/**
 * A note on an estimate, a comparison or a sweep.
 *
 * - `valueOutsideData`: see {@linkcode OutsideDataNote};
 * - `unusualProfile`: the profile is unusual for the data (its reasons);
 * - `noEnsemble`: the model was fitted without an ensemble: the estimate
 *   is the reference tree's leaf, with no interval;
 * - `treesDisagree`: the trees' spread is wider than comparable people's
 *   pay spread (few people like the profile);
 * - `ownPayIncluded`: the person named is one the model learned from; the
 *   estimate without their own pay (out of bag) is `outOfBag`;
 * - `inTrainingTable`: the person named is in the table the model was
 *   fitted on, and their out-of-bag estimate needs the analyst's file;
 * - `sweepBeyondData`: a sweep's grid reaches outside the data's range;
 * - `sweepUnusual`: the sweep's profile is unusual at these values.
 */
export type AnswerNote =
  | OutsideDataNote
  | { kind: "unusualProfile"; reasons: SupportReason[] }
  | { kind: "noEnsemble" }
  | { kind: "treesDisagree" }
  | { kind: "ownPayIncluded"; id: string; outOfBag: number }
  | { kind: "inTrainingTable"; id: string }
  | { kind: "sweepBeyondData"; feature: string; min: number; max: number }
  | { kind: "sweepUnusual"; feature: string; values: (string | number)[] }
  | {
    /**
     * The estimate falls as an attribute rises (the others held fixed) in a
     * model not constrained along it (fit's `increasing` would keep it from
     * falling): `from` and `to` the values between which it falls.
     */
    kind: "estimateFalls";
    feature: string;
    from: string | number;
    to: string | number;
  };

/**
 * The notes of a list without repeats (the same kind and figures said
 * once), in their first order.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { distinctNotes } from "./answer_notes.ts";
 * const notes = distinctNotes([
 *   { kind: "noEnsemble" },
 *   { kind: "valueOutsideData", feature: "years", value: 50, min: 0, max: 40 },
 *   { kind: "noEnsemble" },
 * ]);
 * assert.deepEqual(notes.map((n) => n.kind), ["noEnsemble", "valueOutsideData"]);
 * ```
 */
export function distinctNotes<T extends { kind: string }>(notes: readonly T[]): T[] {
  const seen = new Set<string>();
  return notes.filter((note) => {
    const key = JSON.stringify(note);
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}
