/**
 * `paygrove inspect MODEL`: the model card.
 *
 * @module
 */

import { Command, type CommandUnknownOpts } from "@commander-js/extra-typings";
import wrapAnsi from "wrap-ansi";
import { treeOutline } from "../../mod.ts";
import { openModelFile } from "../open_model.ts";
import {
  describeTarget,
  renderAccuracy,
  renderImportance,
  renderTreeOutline,
} from "../render/model_view.ts";
import { formatLeaves, formatNumber } from "../render/numbers.ts";
import { localeTag } from "../table_flags.ts";
import type { Terminal } from "../terminal.ts";
import { provenanceLine } from "../render/cautions.ts";
import { forTerminal, jsonText, terminalText } from "../render/safe_text.ts";

/**
 * Builds the `inspect` command.
 *
 * @param terminal Where output goes.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable, writeModelFile } from "../../mod.ts";
 * import { recordingTerminal } from "../terminal.ts";
 * import { inspectCommand } from "./inspect.ts";
 * const model = await fitModel(loadTable(demoCompanyCsv({ rows: 120, seed: 1 })), {
 *   target: "base_pay_eur", trees: 3, folds: 3, workers: 1,
 * });
 * const path = `${Deno.makeTempDirSync()}/m.json`;
 * await writeModelFile(path, model);
 * const terminal = recordingTerminal(120);
 * await inspectCommand(terminal).parseAsync([path], { from: "user" });
 * const card = terminal.stdout.join("");
 * assert.match(card, /settings: 3 trees, min leaf 5, 3 folds, one-se rule/);
 * assert.match(card, new RegExp(`reference tree: ${model.reference.leaves} leaves`));
 * Deno.removeSync(path);
 * ```
 */
export function inspectCommand(terminal: Terminal): CommandUnknownOpts {
  return new Command("inspect")
    .description("Show a model's card: where it came from, its settings, accuracy and importance")
    .argument("<model>", "model file written by paygrove fit")
    .option("--tree", "also draw the reference tree as an outline")
    .option("--importance", "also show importance as bars")
    .option("--locale <tag>", "locale for numbers and money, e.g. de-DE", localeTag)
    .option("--json", "print one JSON document on stdout instead of text")
    .action(async (file, flags) => {
      const read = await openModelFile(terminal, file);
      if (flags.json) {
        const model = read;
        terminal.out(jsonText(
          {
            provenance: model.provenance,
            target: model.target,
            features: model.features,
            dropped: model.dropped,
            settings: model.settings,
            rows: model.rows,
            referenceTree: {
              leaves: model.reference.leaves,
              depth: model.reference.depth,
              alpha: model.reference.alpha,
              ...(flags.tree ? { outline: treeOutline(model) } : {}),
            },
            pruningPath: model.reference.pruningPath,
            ensemble: model.ensemble === null
              ? null
              : { trees: model.ensemble.trees.length, alpha: model.ensemble.alpha },
            quality: model.quality,
            importance: model.importance,
            contents: CONTENTS,
          },
        ));
        return;
      }
      const style = terminal.style;
      const view = { style, width: terminal.width, numbers: { locale: flags.locale } };
      // The text card draws from the model with its names made visible.
      const model = forTerminal(read);
      const p = model.provenance;
      // The table's SHA-256 is one word of 64 digits: whole where it fits on
      // a line of the card, else its first 12 digits, said (never cut in two).
      const sha256 = terminal.width - 4 >= p.table.sha256.length
        ? p.table.sha256
        : `${p.table.sha256.slice(0, 12)}... (sha256 shortened to fit the width; --json has it ` +
          `whole)`;
      const card = [
        `  fitted ${p.created} by paygrove ${p.paygrove} (model format ${p.format})`,
        `  on ${p.table.file}: ${formatNumber(p.table.rows, {})} rows read, ` +
        `${formatNumber(model.rows.used, {})} used; table sha256 ${sha256}`,
        `  target: ${describeTarget(model, {})}`,
        `  features: ${model.features.map((f) => `${f.name} (${f.kind})`).join(", ")}`,
        `  left out: ${
          model.dropped.map((d) => `${d.name} (${d.reason})`).join(", ") || "nothing"
        }`,
        `  settings: ${model.settings.trees} trees, min leaf ${model.settings.minLeaf}, ` +
        `${model.settings.folds} folds, ${model.settings.rule} rule, ` +
        `${model.settings.prune === "none" ? "unpruned" : "pruned at the minimum-CV alpha"}, ` +
        `seed ${model.settings.seed}, privacy minimum ${model.settings.privacyMin}` +
        (model.settings.increasing.length > 0
          ? `, never falling as ${model.settings.increasing.join(" or ")} rises (--increasing)`
          : "") +
        (model.settings.allowProtected ? style.caution(", protected attributes allowed") : ""),
        `  reference tree: ${formatLeaves(model.reference.leaves)}, depth ${model.reference.depth}`,
      ];
      const lines = [
        style.bold(`Model ${terminalText(file)}`),
        ...card.flatMap((line) =>
          wrapAnsi(line.trimStart(), terminal.width - 4, { hard: true }).split("\n").map((l, i) =>
            i === 0 ? `  ${l}` : `    ${l}`
          )
        ),
        "",
        ...renderAccuracy(model, view),
      ];
      if (flags.importance) lines.push("", ...renderImportance(model, view));
      if (flags.tree) {
        const what = model.target.kind === "classification"
          ? "the likeliest class with its share"
          : model.target.scale === "log"
          ? "geometric mean pay"
          : "mean pay";
        lines.push("", style.bold(`Reference tree (${what} and people in each node)`));
        // One push per line: a tree of 400,000 nodes is too many arguments
        // for one call.
        for (const line of renderTreeOutline(model, view)) lines.push(line);
      }
      lines.push(
        "",
        ...wrapAnsi(style.dim(CONTENTS), terminal.width).split("\n"),
        ...wrapAnsi(style.dim(provenanceLine(p)), terminal.width, { hard: true }).split("\n"),
      );
      terminal.out(lines.join("\n"));
    });
}

/**
 * What a model file holds, in one sentence.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable, writeModelFile } from "../../mod.ts";
 * import { recordingTerminal } from "../terminal.ts";
 * import { CONTENTS, inspectCommand } from "./inspect.ts";
 * const model = await fitModel(loadTable(demoCompanyCsv({ rows: 120, seed: 1 })), {
 *   target: "base_pay_eur", trees: 3, folds: 3, workers: 1,
 * });
 * const path = `${Deno.makeTempDirSync()}/m.json`;
 * await writeModelFile(path, model);
 * const terminal = recordingTerminal();
 * await inspectCommand(terminal).parseAsync([path, "--json"], { from: "user" });
 * assert.equal(JSON.parse(terminal.stdout.join("")).contents, CONTENTS);
 * Deno.removeSync(path);
 * ```
 */
export const CONTENTS = "The model file holds the schema, settings, trees (splits; node means " +
  "over at least the privacy minimum of people; counts of every training row per node), out-of-bag " +
  "residuals by estimate group as means of blocks of people, accuracy, importance and level-pair " +
  "head counts: no one's pay, and no trace of which people each tree drew. Share it as you would " +
  "a table of average pay of groups of five: with a manager, not in public.";
