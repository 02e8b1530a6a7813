/**
 * The what-if loop: the result for the current profile, then the menu
 * (change, promote, sweep, keep, compare scenarios, undo, offer, pay
 * ranges, start over, save, quit) until the person quits.
 *
 * @module
 */

import { errorWords } from "../option_words.ts";
import {
  applyChanges,
  applySets,
  bandTable,
  checkOffer,
  type CompareAnswer,
  compareAnswer,
  DataError,
  describeProfile,
  estimateProfile,
  type ModelRows,
  type ModelSession,
  offeredLevers,
  OptionError,
  outOfBagEstimate,
  parseOffer,
  postingRange,
  type Profile,
  readForModel,
  sweepAnswer,
  sweepValues,
  typicalProfile,
} from "../../mod.ts";
import { fitResult, renderCompare, renderOffer, renderSweep } from "../render/answer_view.ts";
import { forTerminal, terminalGuard, terminalText } from "../render/safe_text.ts";
import { formatPay, type NumberStyle } from "../render/numbers.ts";
import wrapAnsi from "wrap-ansi";
import type { FlowIO } from "./flow_io.ts";
import { KeyInterrupt } from "../stop_signals.ts";
import type { Scenario } from "./report.ts";
import { screenRows, wrapped } from "./screen_room.ts";
import { buildProfile, editOne, promotionFeature } from "./profile_step.ts";
import { renderScenarios } from "./scenarios_view.ts";
import { renderBands, renderPosting } from "../render/bands_view.ts";
import { save, writeReport } from "./save_step.ts";
import type { SessionOptions } from "./guided_flow.ts";

/** The menu's choices. */
export type Next =
  | "change"
  | "whole"
  | "promote"
  | "explore"
  | "offer"
  | "ranges"
  | "sweep"
  | "keep"
  | "list"
  | "undo"
  | "restart"
  | "save"
  | "quit";

/**
 * The profile, its history, the scenarios kept, until quit.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable, openModel } from "../../mod.ts";
 * import { makeStyle } from "../render/style.ts";
 * import type { FlowIO } from "./flow_io.ts";
 * import { whatIfLoop } from "./what_if_loop.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 120, seed: 1 }), { currency: "EUR" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 3, folds: 3, workers: 1 });
 * // The typical person, promoted once, then quit.
 * const next = ["promote", "quit"];
 * const said: string[] = [];
 * const io: FlowIO = {
 *   say: (text) => void said.push(text), style: makeStyle(false), width: 80, ascii: false,
 *   choose: (message, choices) =>
 *     Promise.resolve((message === "What next?" ? next.shift() : choices[0].value) as never),
 *   tick: () => Promise.resolve([]),
 *   ask: () => Promise.resolve(""),
 * };
 * const options = { demoPath: "", gap: null, leftOut: null, written: new Set<string>() };
 * await whatIfLoop(io, openModel(model), null, { currency: "EUR" }, options);
 * assert(said.some((text) => /^\nWhat-if: level G\d -> G\d\n/.test(text)));
 * assert(said.at(-1)!.startsWith("Done."));
 * assert.deepEqual(next, []);
 * ```
 */
export async function whatIfLoop(
  io: FlowIO,
  session: ModelSession,
  tableText: string | null,
  money: NumberStyle,
  options: SessionOptions,
): Promise<void> {
  const { model } = session;
  const view = { style: io.style, width: io.width, money };
  const result = { ...view, compact: true };
  let built = await buildProfile(io, model, tableText);
  let profile = built.profile;
  const history: Profile[] = [];
  const scenarios: Scenario[] = [];
  const whatIfs: CompareAnswer[] = [];
  let answer = estimateProfile(session, profile, 0.9);
  const ladder = promotionFeature(model);
  // The table read for the model once, when pay ranges first ask for it.
  let rows: ModelRows | null = null;
  const typical = describeProfile(model, typicalProfile(model));
  // The menu under every screen of the loop; `whole` when the result was
  // shortened to fit the screen above it.
  const menu = (whole: boolean) => [
    { name: "Change one attribute", value: "change" as const },
    ...(ladder >= 0
      ? [{ name: `Promote one ${model.features[ladder].name}`, value: "promote" as const }]
      : []),
    { name: "Sweep one attribute (chart)", value: "sweep" as const },
    { name: "Keep this profile as a scenario", value: "keep" as const },
    { name: `Show the scenarios side by side (${scenarios.length})`, value: "list" as const },
    // Always listed, so the choices keep their places; off until there is a change.
    {
      name: "Undo the last change",
      value: "undo" as const,
      ...(history.length === 0 ? { disabled: "(nothing to undo yet)" } : {}),
    },
    // After undo, so that the choices above keep their places.
    ...(model.target.kind === "regression"
      ? [{ name: "Check an offer against this profile", value: "offer" as const }]
      : []),
    ...(session.reader !== null && !model.features.some((f) => f.protected)
      ? [{ name: "Pay ranges: the range to post, the bands", value: "ranges" as const }]
      : []),
    ...(whole
      ? [{ name: "Show the whole profile and decision path", value: "whole" as const }]
      : []),
    { name: "Start over with a new profile", value: "restart" as const },
    { name: "Save the model and a report", value: "save" as const },
    { name: "Quit", value: "quit" as const },
  ];
  // Lines the menu takes (its question, the choices in view), so that
  // what is shown above it can stay in view on a screen of `rows`.
  const menuLines = 1 + menu(true).length;
  const room = () => screenRows(io) - menuLines;
  // The result within the room the menu leaves (less the lines said beside it).
  const fitted = (extra: number) =>
    fitResult(forTerminal(answer), {
      ...result,
      maxLines: room() - extra,
      typical: forTerminal(typical),
    });
  // Said under the estimate's line: the person's own pay, and a caution.
  const beside = (): string[] => {
    const lines: string[] = [];
    if (built.person) {
      // The person is one of the model's own: their estimate leans toward
      // their pay, so the one from trees that never saw them is said beside
      // it; after a change the pay is theirs as they are, not the changed
      // profile's.
      const who = terminalText(built.person.id);
      const own = profile === built.profile;
      const oob = own ? outOfBagEstimate(session, built.person.id, profile) : null;
      lines.push(
        ...wrapAnsi(
          io.style.dim(
            own
              ? `${who}'s pay in the table: ${formatPay(built.person.pay, money)}; ` +
                (oob !== null
                  ? `from trees that never saw ${who}: ${formatPay(oob, money)}`
                  : "the estimate includes their own pay")
              : `${who} as they are (before the changes) is paid ` +
                formatPay(built.person.pay, money),
          ),
          io.width - 2,
        ).split("\n").map((l) => `  ${l}`),
      );
    }
    if (model.settings.allowProtected) {
      lines.push(io.style.caution("Caution: a protected attribute shapes this estimate."));
    }
    return lines;
  };
  const showResult = () => {
    const said = beside();
    const lines = fitted(said.length).lines;
    lines.splice(1, 0, ...said);
    io.say(["", ...lines].join("\n"));
  };
  showResult();
  for (;;) {
    // The whole result is offered whenever the current one would not fit.
    const cut = fitted(beside().length).cut;
    const next: Next = await io.choose("What next?", menu(cut), undefined, true);
    if (next === "quit") break;
    try {
      await act(next);
    } catch (error) {
      // Esc inside an action goes back to this menu; a file that cannot be
      // written is said, and nothing of the session is lost.
      if ((error as Error).name === "AbortPromptError") {
        io.say(io.style.dim("(cancelled)"));
        continue;
      }
      if (error instanceof DataError || error instanceof OptionError) {
        io.say(io.style.warn(`! ${terminalGuard(errorWords(error), false)}`));
        continue;
      }
      throw error;
    }
  }
  if (options.report !== undefined) {
    await writeReport(
      io,
      model,
      scenarios.length > 0 ? scenarios : [{ name: "current", answer }],
      whatIfs,
      options.report,
      options.gap,
      options.leftOut,
      (options.force ?? false) || options.written.has(options.report),
    );
  }
  io.say(
    wrapped(
      io,
      io.style.dim("Done. Figures describe the current pay structure; see the cautions above."),
    ).join("\n"),
  );

  async function act(next: Next): Promise<void> {
    const canExplore = io.explore !== undefined;
    if (next === "change" || next === "promote") {
      let changed: Profile;
      if (next === "promote") {
        const f = model.features[ladder];
        if (profile[ladder] >= f.levels!.length - 1) {
          io.say(
            io.style.warn(
              `${terminalText(f.levels![profile[ladder]])} is the top ${terminalText(f.name)}: ` +
                `there is no promotion to show.`,
            ),
          );
          return;
        }
        changed = applyChanges(model, profile, [`${f.name}=+1`]).profile;
      } else {
        // The list of attributes ends with the arrow-key screen, for moving several.
        const edit = await editOne(io, model, profile, canExplore);
        if (edit === null) return await act("explore");
        changed = applySets(model, profile, [edit]).profile;
      }
      const what = compareAnswer(session, profile, changed, 0.9);
      const shown = renderCompare(forTerminal(what), { ...view, compact: true, maxLines: room() });
      io.say(["", ...shown].join("\n"));
      whatIfs.push(what);
      history.push(profile);
      profile = changed;
      answer = what.changed;
    } else if (next === "offer") {
      const text = await io.ask("Offer (e.g. 61000, 61k or 61,000):", {
        validate: (t: string) => {
          try {
            parseOffer(model, t);
            return true;
          } catch (error) {
            if (error instanceof OptionError) return errorWords(error).replace(/^--offer:? /, "");
            throw error;
          }
        },
      });
      const offer = parseOffer(model, text);
      const checked = { ...answer, offer: checkOffer(session, profile, answer, offer) };
      io.say(["", ...renderOffer(forTerminal(checked), view)].join("\n"));
    } else if (next === "sweep") {
      const f = await io.choose(
        "Sweep which attribute?",
        offeredLevers(model).map((i) => ({ name: model.features[i].name, value: i })),
      );
      const sweep = sweepAnswer(session, profile, f, sweepValues(model, f, { steps: 12 }), 0.9);
      // The table first, then the chart, sized to stay in view with the menu.
      io.say(["", ...renderSweep(forTerminal(sweep), { ...view, chartLines: room() })].join("\n"));
    } else if (next === "ranges") {
      const by = ladder >= 0 ? model.features[ladder].name : null;
      const which = await io.choose("Which?", [
        { name: "The range to post for this role, as a new hire", value: "posting" as const },
        ...(tableText !== null && by !== null
          ? [{ name: `The pay bands by ${by}, from the table`, value: "bands" as const }]
          : []),
      ]);
      rows ??= tableText === null ? null : readForModel(model, tableText, "the table");
      if (which === "posting") {
        // Comparable people: those at the role's level and, where the model
        // has one, in its first attribute of categories (a job family).
        const family = model.features.find((f, j) => f.kind === "categorical" && j !== ladder);
        const named = [by, family?.name].filter((n): n is string => n !== undefined && n !== null);
        const posting = postingRange(session, profile, named, rows, { coverage: 0.8 });
        io.say(["", ...renderPosting(forTerminal(posting), { ...view, brief: true })].join("\n"));
      } else {
        const table = bandTable(session, rows!, { by: [by!] });
        io.say(
          ["", ...renderBands(forTerminal(table), { ...view, chart: false, brief: true })]
            .join("\n"),
        );
        // The table is taller than what the menu leaves in view: one step back instead.
        await io.choose(
          "When you have read it:",
          [{ name: "Back to the menu", value: 0 }],
          undefined,
          true,
        );
      }
    } else if (next === "whole") {
      io.say(["", ...fitResult(forTerminal(answer), result).lines].join("\n"));
    } else if (next === "keep") {
      const name = await io.ask("Name of this scenario:", {
        default: `scenario ${scenarios.length + 1}`,
      });
      scenarios.push({ name, answer });
      io.say(io.style.dim(`Kept "${terminalText(name)}" (${scenarios.length} kept).`));
    } else if (next === "explore") {
      const explored = await io.explore!(session, profile, money);
      for (const kept of explored.kept) {
        scenarios.push({ name: kept.name, answer: estimateProfile(session, kept.profile, 0.9) });
      }
      if (explored.status === 130) throw new KeyInterrupt();
      if (!explored.profile.every((v, i) => Object.is(v, profile[i]))) {
        history.push(profile);
        profile = explored.profile;
        answer = estimateProfile(session, profile, 0.9);
      }
      if (explored.kept.length > 0) {
        io.say(io.style.dim(`Kept ${explored.kept.length} (${scenarios.length} kept in all).`));
      }
      showResult();
    } else if (next === "list") {
      io.say(renderScenarios(forTerminal(scenarios), money, io).join("\n"));
    } else if (next === "undo") {
      profile = history.pop()!;
      answer = estimateProfile(session, profile, 0.9);
      showResult();
    } else if (next === "restart") {
      history.length = 0;
      built = await buildProfile(io, model, tableText);
      profile = built.profile;
      answer = estimateProfile(session, profile, 0.9);
      showResult();
    } else if (next === "save") {
      await save(
        io,
        model,
        scenarios.length > 0 ? scenarios : [{ name: "current", answer }],
        whatIfs,
        options,
      );
    }
  }
}
