/**
 * The guided flow's gap step: after the model summary, when the table has
 * a protected attribute (kept out of the model), the flow offers the pay-gap
 * check by it, within categories the user picks from the model's
 * attributes.
 *
 * @module
 */

import wrapAnsi from "wrap-ansi";
import { GAP_CAUTIONS, gapCheck, type Model, readForModel } from "../../mod.ts";
import { progressBar } from "../progress.ts";
import { renderGap } from "../render/gap_view.ts";
import type { NumberStyle } from "../render/numbers.ts";
import type { FlowIO } from "./flow_io.ts";

/**
 * The protected columns of a table the gap check can compare: columns of a
 * few named groups that the model does not use.
 */
export function gapGroupsOf(model: Model, tableText: string): { name: string; groups: string[] }[] {
  if (model.target.kind !== "regression") return [];
  const { table } = readForModel(model, tableText, model.provenance.table.file);
  const used = new Set(model.features.map((f) => f.name));
  return table.columns.flatMap((c) =>
    c.protected && !used.has(c.name) && (c.type === "categorical" || c.type === "ordinal") &&
      c.levels.length >= 2
      ? [{ name: c.name, groups: [...c.levels] }]
      : []
  );
}

/**
 * Offers the gap check; returns when it is shown or declined.
 *
 * @param tableText The table the model was fitted on.
 */
export async function offerGapCheck(
  io: FlowIO,
  model: Model,
  tableText: string,
  numbers: NumberStyle,
): Promise<void> {
  const candidates = gapGroupsOf(model, tableText);
  if (candidates.length === 0) return;
  const group = await io.choose(
    "Check for pay gaps between groups first?",
    [
      ...candidates.map((c) => ({
        name: `Yes, by ${c.name} (${c.groups.join(", ")})`,
        value: c.name,
        description: "raw and unexplained gaps, per category of workers; kept out of the model",
      })),
      { name: "No, go on to a profile", value: "" },
    ],
    "",
  );
  if (group === "") return;
  const groups = candidates.find((c) => c.name === group)!.groups;
  let compare: string[] | undefined;
  if (groups.length > 2) {
    compare = await io.tick(
      `Compare which groups with the reference group? (a category where any compared group ` +
        `has fewer than ${model.settings.privacyMin} people is not shown)`,
      groups.map((g) => ({ name: g, value: g, checked: true })),
    );
    if (compare.length === 0) compare = undefined;
  }
  const levelled = model.features.filter((f) => f.kind !== "numeric" && !f.protected);
  const within = await io.choose(
    "Compare within which categories of workers?",
    [
      ...levelled.map((f) => ({ name: f.name, value: f.name })),
      { name: "Everyone together (no categories)", value: "" },
    ],
    levelled[0]?.name ?? "",
  );
  const { table } = readForModel(model, tableText, model.provenance.table.file, true);
  const bar = progressBar({ progress: io.progress, width: io.width });
  let lines: string[];
  try {
    const report = await gapCheck(table, {
      target: model.target.name,
      group,
      compare,
      within: within === "" ? [] : [within],
      features: model.features.filter((f) => !f.protected).map((f) => f.name),
      privacyMin: model.settings.privacyMin,
      seed: model.settings.seed,
      onProgress: (stage, done, total) => bar.update(stage, done, total),
    });
    lines = renderGap(report, { style: io.style, width: io.width, numbers });
  } finally {
    bar.finish();
  }
  io.say(
    [
      "",
      ...lines,
      "",
      ...wrapAnsi(io.style.dim(GAP_CAUTIONS), io.width).split("\n"),
      io.style.dim("(paygrove gap on the command line gives the same, with --report and --json.)"),
    ].join("\n"),
  );
}
