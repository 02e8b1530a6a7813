/**
 * Building and editing the profile: from a typical person, an existing
 * person or step by step; which attribute a promotion moves; the levers a
 * what-if offers (the library's policy) and the question for one value.
 *
 * @module
 */

import {
  applySets,
  describeProfile,
  type Model,
  offeredLevers,
  type Profile,
  readForModel,
  rowProfile,
  typicalProfile,
} from "../../mod.ts";
import type { FlowIO } from "./flow_io.ts";

/**
 * The ordinal feature a promotion moves: the first named like a level, else
 * the first ordinal; -1 when there is none.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { promotionFeature } from "./profile_step.ts";
 * const model = (kinds: [string, string][]) =>
 *   ({ features: kinds.map(([name, kind]) => ({ name, kind })) }) as unknown as import("../../mod.ts").Model;
 * assert.equal(promotionFeature(model([["rating", "ordinal"], ["grade", "ordinal"]])), 1);
 * assert.equal(promotionFeature(model([["rating", "ordinal"], ["site", "categorical"]])), 0);
 * assert.equal(promotionFeature(model([["site", "categorical"]])), -1);
 * ```
 */
export function promotionFeature(model: Model): number {
  const ordinals = model.features.map((f, i) => ({ f, i })).filter(({ f }) => f.kind === "ordinal");
  const named = ordinals.find(({ f }) => /level|grade|band|rank/i.test(f.name));
  return (named ?? ordinals[0])?.i ?? -1;
}

/**
 * Asks how to start the profile, and builds it.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import {
 *   demoCompanyCsv, describeProfile, fitModel, loadTable, typicalProfile,
 * } from "../../mod.ts";
 * import { makeStyle } from "../render/style.ts";
 * import type { FlowIO } from "./flow_io.ts";
 * import { buildProfile } from "./profile_step.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }));
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * // Step through every attribute: level G5, 12 years of experience, the rest as typical.
 * const io: FlowIO = {
 *   say: () => {}, style: makeStyle(false), width: 80, ascii: false,
 *   choose: (message, choices, d) =>
 *     Promise.resolve(
 *       (message === "Start the profile from" ? "step" : message.startsWith("level") ? "G5" : d ??
 *         choices[0].value) as never,
 *     ),
 *   tick: () => Promise.resolve([]),
 *   ask: (message, o) =>
 *     Promise.resolve(message.startsWith("years_experience") ? "12" : o!.default!),
 * };
 * const { profile } = await buildProfile(io, model, null);
 * const typical = describeProfile(model, typicalProfile(model));
 * const built = describeProfile(model, profile);
 * assert.equal(built.level, "G5");
 * assert.equal(built.years_experience, 12);
 * assert.deepEqual([built.site, built.job_family], [typical.site, typical.job_family]);
 * ```
 */
export async function buildProfile(
  io: FlowIO,
  model: Model,
  tableText: string | null,
): Promise<{ profile: Profile; person?: { id: string; pay: number } }> {
  const id = model.read.identifier;
  const how = await io.choose("Start the profile from", [
    {
      name: "A typical person (median number, most common level of each attribute)",
      value: "typical" as const,
    },
    ...(id !== undefined && tableText !== null
      ? [{ name: `An existing person, by ${id}`, value: "row" as const }]
      : []),
    { name: "Step through every attribute", value: "step" as const },
  ]);
  let profile = typicalProfile(model);
  if (how === "row") {
    const rows = readForModel(model, tableText!, "the table");
    // Case does not matter; the question shows what an id looks like.
    const find = (text: string) =>
      rows.ids.findIndex((v) => v.toLowerCase() === text.trim().toLowerCase());
    const answer = await io.ask(`${id} of the person (e.g. ${rows.ids[0]}):`, {
      validate: (text) => find(text) >= 0 ? true : `No one has ${id} "${text.trim()}" in the table`,
    });
    const r = find(answer);
    profile = rowProfile(rows, r);
    const pay = rows.target?.[r];
    if (pay !== undefined && !Number.isNaN(pay)) {
      return { profile, person: { id: rows.ids[r], pay } };
    }
  } else if (how === "step") {
    // Values are set as typed (a negative number is a value, not a step).
    for (let f = 0; f < model.features.length; f++) {
      profile = applySets(model, profile, [
        `${model.features[f].name}=${await askValue(io, model, profile, f)}`,
      ]).profile;
    }
  }
  return { profile };
}

/**
 * Asks which attribute to change and its new value; returns `name=value`, or
 * null when the person chose the arrow-key screen instead (`offerExplore`).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import {
 *   demoCompanyCsv, fitModel, loadTable, offeredLevers, typicalProfile,
 * } from "../../mod.ts";
 * import { makeStyle } from "../render/style.ts";
 * import type { FlowIO } from "./flow_io.ts";
 * import { editOne } from "./profile_step.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }));
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * let offered: unknown[] = [];
 * const io: FlowIO = {
 *   say: () => {}, style: makeStyle(false), width: 80, ascii: false,
 *   choose: (message, choices) => {
 *     if (message !== "Change which attribute?") return Promise.resolve("Eastgate" as never);
 *     offered = choices.map((c) => c.value);
 *     return Promise.resolve(model.features.findIndex((f) => f.name === "site") as never);
 *   },
 *   tick: () => Promise.resolve([]),
 *   ask: () => Promise.resolve(""),
 * };
 * assert.equal(await editOne(io, model, typicalProfile(model)), "site=Eastgate");
 * assert.deepEqual(offered, offeredLevers(model));
 * ```
 */
export async function editOne(
  io: FlowIO,
  model: Model,
  profile: Profile,
  offerExplore = false,
): Promise<string | null> {
  const shown = describeProfile(model, profile);
  const f = await io.choose(
    "Change which attribute?",
    [
      ...offeredLevers(model).map((i) => ({
        name: `${model.features[i].name} (now ${shown[model.features[i].name] ?? "missing"})`,
        value: i,
      })),
      ...(offerExplore ? [{ name: EXPLORE_CHOICE, value: -1 }] : []),
    ],
  );
  if (f === -1) return null;
  return `${model.features[f].name}=${await askValue(io, model, profile, f)}`;
}

/**
 * The last choice of "Change which attribute?" where the flow can run the
 * explore screen: every attribute at once, with the arrow keys.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { EXPLORE_CHOICE } from "./profile_step.ts";
 * assert.match(EXPLORE_CHOICE, /arrow keys/);
 * ```
 */
export const EXPLORE_CHOICE = "Several, with the arrow keys (explore)";

/**
 * Asks a value with the prompt that fits the attribute; the current value is the default.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable, typicalProfile } from "../../mod.ts";
 * import { makeStyle } from "../render/style.ts";
 * import type { FlowIO } from "./flow_io.ts";
 * import { askValue } from "./profile_step.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }));
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * let check: ((text: string) => string | true) | undefined;
 * const io: FlowIO = {
 *   say: () => {}, style: makeStyle(false), width: 80, ascii: false,
 *   choose: () => Promise.resolve("" as never),
 *   tick: () => Promise.resolve([]),
 *   ask: (_message, o) => ((check = o!.validate), Promise.resolve(" 7.5 ")),
 * };
 * const years = model.features.findIndex((f) => f.name === "years_experience");
 * assert.equal(await askValue(io, model, typicalProfile(model), years), "7.5");
 * assert.equal(check!("na"), true); // not known
 * assert.match(String(check!("seven")), /^Type a number such as /);
 * ```
 */
export async function askValue(
  io: FlowIO,
  model: Model,
  profile: Profile,
  f: number,
): Promise<string> {
  const feature = model.features[f];
  const current = profile[f];
  if (feature.kind === "numeric") {
    const range = feature.range!;
    // A line of text, so that "NA" can say "not known" (a new hire has no
    // rating); anything else must read as a number.
    const missing = feature.missing > 0 ? "; NA if not known" : "";
    const text = await io.ask(
      `${feature.name} (the data runs from ${range.min} to ${range.max}${missing}):`,
      {
        default: Number.isNaN(current) ? "NA" : String(Number(current.toPrecision(10))),
        validate: (t) =>
          t.trim().toUpperCase() === "NA" || Number.isFinite(Number(t.trim())) && t.trim() !== ""
            ? true
            : `Type a number such as ${range.min}${missing ? ", or NA" : ""}`,
      },
    );
    return text.trim().toUpperCase() === "NA" ? "NA" : text.trim();
  }
  const levels = feature.levels!;
  const order = feature.kind === "ordinal" ? " (lowest first)" : "";
  return await io.choose(
    `${feature.name}${order}:`,
    levels.map((level) => ({ name: level, value: level })),
    Number.isNaN(current) ? undefined : levels[current],
  );
}
