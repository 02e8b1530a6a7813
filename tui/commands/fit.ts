/**
 * `paygrove fit TABLE --target COL --out MODEL`: fits the reference tree and
 * the ensemble, prints the model summary and writes the model file.
 *
 * @module
 */

import { resolveColumnFlags } from "../column_names.ts";
import wrapAnsi from "wrap-ansi";
import { Command, type CommandUnknownOpts, Option } from "@commander-js/extra-typings";
import {
  assertCanWrite,
  fitModel,
  type Model,
  OptionError,
  sameFile,
  writeAnalystFile,
  writeModelFile,
} from "../../mod.ts";
import { progressBar } from "../progress.ts";
import { moneyStyle, renderModelSummary } from "../render/model_view.ts";
import { assertApart, checkHtmlReport, writeHtmlReport } from "../report_file.ts";
import { formatNumber } from "../render/numbers.ts";
import type { Terminal } from "../terminal.ts";
import { wordedWarnings } from "../option_words.ts";
import { collectWhere, MAX_TREES, seedOption, wholeNumber } from "../option_values.ts";
import { cappedWorkers } from "../workers.ts";
import { columnList, list, loadOptions, readTable, withTableFlags } from "../table_flags.ts";
import { PROTECTED_CAUTION, withCautions } from "../render/cautions.ts";
import { forTerminal, jsonText, terminalText } from "../render/safe_text.ts";
import {
  assertFiniteFigures,
  dataCheckLines,
  droppedReason,
  leftOutJson,
  screenPayFlags,
} from "../data_check.ts";

/**
 * The `fit --json` document.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { fitJson } from "./fit.ts";
 * const model = await fitModel(loadTable(demoCompanyCsv({ rows: 120, seed: 1 })), {
 *   target: "base_pay_eur", trees: 3, folds: 3, workers: 1,
 * });
 * const doc = fitJson(model, "m.json", 1234) as {
 *   rows: number; ensemble: { trees: number; oobRmse: number }; model: unknown;
 * };
 * assert.equal(doc.rows, 120);
 * assert.equal(doc.ensemble.trees, 3);
 * assert.equal(doc.ensemble.oobRmse, model.quality.ensemble!.money!.rmse);
 * assert.deepEqual(doc.model, { path: "m.json", bytes: 1234 });
 * ```
 */
export function fitJson(
  model: Model,
  out: string,
  bytes: number,
  analystFile: string | null = null,
): Record<string, unknown> {
  const q = model.quality;
  const regression = model.target.kind === "regression";
  const chosen = model.reference.pruningPath.find((p) => p.alpha === model.reference.alpha);
  return {
    target: model.target.name,
    kind: model.target.kind,
    scale: model.target.scale,
    currency: model.target.money?.currency ?? null,
    period: model.target.money?.period ?? null,
    rows: model.rows.used,
    rowsDropped: model.rows.dropped,
    features: model.features.map((f) => ({ name: f.name, kind: f.kind, levels: f.levels ?? null })),
    dropped: model.dropped,
    referenceTree: {
      leaves: model.reference.leaves,
      depth: model.reference.depth,
      alpha: model.reference.alpha,
      ...(regression
        ? {
          cvRmse: q.reference.money!.rmse,
          cvMae: q.reference.money!.mae,
          cvRmseLog: q.reference.log?.rmse ?? null,
          cvRmseSe: q.reference.rmseSe ?? null,
        }
        : { cvAccuracy: q.reference.accuracy, cvError: chosen?.cvError ?? null }),
    },
    pruningPath: model.reference.pruningPath.map((p) => ({
      alpha: p.alpha,
      leaves: p.leaves,
      risk: p.risk,
      cvError: p.cvError,
    })),
    ensemble: model.ensemble === null ? null : {
      trees: model.ensemble.trees.length,
      alpha: model.ensemble.alpha,
      ...(regression
        ? {
          oobRmse: q.ensemble!.money!.rmse,
          oobMae: q.ensemble!.money!.mae,
          oobR2: q.ensemble!.money!.r2,
          oobRmseLog: q.ensemble!.log?.rmse ?? null,
          oobR2Log: q.ensemble!.log?.r2 ?? null,
        }
        : { oobAccuracy: q.ensemble!.accuracy, classes: q.ensemble!.classes }),
    },
    baselines: regression
      ? {
        constantRmse: q.constantInSample.money!.rmse,
        constantCvRmse: q.constant.money!.rmse,
        linearCvRmse: q.linear!.money!.rmse,
        constantCvRmseLog: q.constant.log?.rmse ?? null,
        linearCvRmseLog: q.linear!.log?.rmse ?? null,
      }
      : { constantAccuracy: q.constantInSample.accuracy, constantCvAccuracy: q.constant.accuracy },
    quality: q,
    importance: model.importance,
    proxies: model.proxies ?? [],
    increasing: model.settings.increasing,
    model: { path: out, bytes },
    analystFile: analystFile === null ? null : { path: analystFile, rebuildsPay: true },
    seconds: model.seconds,
    provenance: model.provenance,
  };
}

/**
 * Builds the `fit` command.
 *
 * @param terminal Where output goes.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, readModelFile } from "../../mod.ts";
 * import { recordingTerminal } from "../terminal.ts";
 * import { fitCommand } from "./fit.ts";
 * const dir = Deno.makeTempDirSync();
 * Deno.writeTextFileSync(`${dir}/pay.csv`, demoCompanyCsv({ rows: 120, seed: 1 }));
 * const terminal = recordingTerminal();
 * await fitCommand(terminal).parseAsync([
 *   `${dir}/pay.csv`, "--target", "base_pay_eur", "--trees", "3", "--folds", "3",
 *   "--workers", "1", "--out", `${dir}/m.json`,
 * ], { from: "user" });
 * const model = await readModelFile(`${dir}/m.json`);
 * assert.equal(model.ensemble!.trees.length, 3);
 * assert(!model.features.some((f) => f.name === "gender")); // protected: left out
 * assert.match(terminal.stdout.join(""), /^paygrove fit: .*pay\.csv -> .*m\.json/);
 * Deno.removeSync(dir, { recursive: true });
 * ```
 */
export function fitCommand(terminal: Terminal): CommandUnknownOpts {
  return withTableFlags(
    new Command("fit")
      .description(
        "Fit the reference tree and the ensemble on a pay table, print the model summary and " +
          "write the model file",
      )
      .argument("<table>", "CSV file to learn from"),
  )
    .option(
      "--features <columns>",
      "the attributes to use, comma-separated (default: all usable)",
      columnList,
    )
    .option("--drop <columns>", "attributes to leave out, comma-separated", list)
    .option(
      "--where <column=value>",
      "keep only rows with this value (repeat: values of one column are alternatives)",
      collectWhere,
    )
    .option("--allow-protected", "allow protected attributes (sex, race, age...) as features")
    .option(
      "--increasing <columns>",
      "attributes along which the estimate must never fall, the others held fixed " +
        "(numeric or ordinal, comma-separated; e.g. level)",
      columnList,
    )
    .option(
      "--drop-implausible",
      "leave out rows whose pay no pay table holds (more than 10,000 times from the median, " +
        "beyond 10^15, or not finite) instead of stopping",
    )
    .addOption(
      new Option("--scale <scale>", "fit pay on its log (default for money) or raw scale")
        .choices(["log", "raw"] as const),
    )
    .option(
      "--trees <n>",
      "trees in the ensemble; 0 fits the reference tree alone",
      wholeNumber(0, MAX_TREES),
      200,
    )
    .option("--min-leaf <n>", "fewest people in a leaf", wholeNumber(1), 5)
    .option("--folds <k>", "cross-validation folds for the reference tree", wholeNumber(2), 10)
    .addOption(
      new Option("--rule <rule>", "how the reference tree's size is chosen")
        .choices(["one-se", "min"] as const)
        .default("one-se" as const),
    )
    .addOption(
      new Option("--prune <how>", "'none' grows the ensemble's trees without pruning")
        .choices(["none"] as const),
    )
    .option("--seed <s>", "seed of folds, resamples and shuffles", seedOption, 1)
    .option(
      "--workers <n>",
      "parallel workers (default: one per core from 10,000 rows at 200 trees, else 1)",
      wholeNumber(1),
    )
    .option(
      "--privacy-min <n>",
      "smallest group whose mean pay is ever shown (at least 3)",
      wholeNumber(1),
      5,
    )
    .requiredOption("--out <model>", "where to write the model file (safe to share)")
    .option(
      "--analyst-file <file>",
      "also write the analyst's file (out-of-bag estimates of training rows, the jackknife); " +
        "with a staff list it rebuilds everyone's pay: keep it private",
    )
    .option(
      "--report <file>",
      "also write a report to open in any browser (HTML; name it .html)",
    )
    .option("--force", "replace an existing model file (and report)")
    .option("--json", "print one JSON document on stdout instead of text")
    .action(async (file, flags) => {
      if (flags.target === undefined) {
        throw new OptionError(
          "fit needs --target COLUMN: the column to estimate (e.g. --target base_pay)",
        );
      }
      await assertCanWrite(flags.out, flags.force ?? false, "--out", [file]);
      if (flags.report !== undefined) {
        await assertApart([["--out", flags.out], ["--report", flags.report]]);
        await checkHtmlReport(flags.report, flags.force ?? false, [file]);
      }
      if (flags.analystFile !== undefined) {
        // Never the model file under another spelling (./m.json), nor the table.
        if (await sameFile(flags.analystFile, flags.out)) {
          throw new OptionError(
            `--analyst-file: ${flags.analystFile} is the --out file; the two must be apart ` +
              `(the model file can be shared, the analyst's file never)`,
          );
        }
        await assertCanWrite(flags.analystFile, flags.force ?? false, "--analyst-file", [file]);
      }
      const options = loadOptions(flags, file);
      const progress = progressBar(terminal);
      const read = await readTable(file, options, progress);
      // Every option naming a column: matched without case (with a note) or refused
      // with the nearest column.
      Object.assign(flags, resolveColumnFlags(read, flags, terminal));
      // Implausible pay stops the fit (or is left out); a rating or score
      // target is not pay and is not screened.
      const { table, leftOut } = screenPayFlags(
        read,
        [{ column: flags.target, moneyOnly: true }],
        flags.dropImplausible ?? false,
      );
      if (flags.allowProtected) {
        terminal.err(terminal.errStyle.caution(PROTECTED_CAUTION));
      }
      let model: Model;
      try {
        model = await fitModel(table, {
          target: flags.target,
          features: flags.features,
          drop: flags.drop,
          where: flags.where,
          allowProtected: flags.allowProtected,
          increasing: flags.increasing,
          scale: flags.scale,
          trees: flags.trees,
          minLeaf: flags.minLeaf,
          folds: flags.folds,
          rule: flags.rule,
          prune: flags.prune === "none" ? "none" : "alpha-min",
          seed: flags.seed,
          workers: cappedWorkers(flags.workers, flags.trees, terminal.err),
          privacyMin: flags.privacyMin,
          loadOptions: options,
          onProgress: (stage, done, total) => progress.update(stage, done, total),
        });
      } finally {
        progress.finish();
      }
      // No infinite or undefined figure is written or shown.
      assertFiniteFigures(fitJson(model, flags.out, 0), flags.target);
      const { bytes, sha256 } = await writeModelFile(flags.out, model, flags.force ?? false);
      if (flags.analystFile !== undefined) {
        await writeAnalystFile(flags.analystFile, model, sha256, {
          force: flags.force ?? false,
          option: "--analyst-file",
        });
      }
      if (flags.report !== undefined) {
        await writeHtmlReport(flags.report, flags.force ?? false, model.provenance, {
          title: `A pay model of ${model.target.name}`,
          question: "What does our pay structure pay for, and how accurately can it be estimated?",
          // Loaded for a report only: the chart library adds 0.14 s to every start-up.
          sections: (await import("../render/html/fit_html.ts")).fitSections(
            model,
            [
              ...leftOut.map((l) => `${l.count} rows left out for implausible ${l.column}.`),
              ...wordedWarnings(table.warnings).map((w) => w.message),
            ],
            moneyStyle(model, { locale: flags.locale }),
          ),
        });
      }
      const folds = { requested: flags.folds, used: model.settings.folds };
      const extra = {
        folds,
        leftOutImplausible: leftOutJson(leftOut),
        dataWarnings: wordedWarnings(table.warnings),
      };
      if (flags.json) {
        terminal.out(
          jsonText({ ...fitJson(model, flags.out, bytes, flags.analystFile ?? null), ...extra }),
        );
        return;
      }
      const style = terminal.style;
      const view = {
        style,
        width: terminal.width,
        numbers: { locale: flags.locale, currency: flags.currency },
      };
      terminal.out(
        withCautions(
          [
            ...wrapAnsi(
              style.bold(
                `paygrove fit: ${terminalText(file)} -> ${terminalText(flags.out)} ` +
                  `(${formatNumber(bytes / 1e6, {}, 1)} MB) ` +
                  `in ${formatNumber(model.seconds, {}, 1)} s`,
              ),
              terminal.width,
            ).split("\n"),
            ...(flags.analystFile === undefined ? [] : wrapAnsi(
              style.warn(
                `Analyst's file: ${terminalText(flags.analystFile)} (readable by you alone). ` +
                  `With a staff list it rebuilds every person's pay: keep it with the pay table, ` +
                  `never share it. ${terminalText(flags.out)} can go to a manager without it.`,
              ),
              terminal.width,
            ).split("\n")),
            ...(folds.used < folds.requested
              ? wrapAnsi(
                style.warn(
                  `Cross-validation used ${folds.used} folds, not ${folds.requested}: the table ` +
                    `has ${model.rows.used} rows, and each fold needs at least one.`,
                ),
                terminal.width,
              ).split("\n")
              : []),
            ...dataCheckLines(table, leftOut, file, { style, width: terminal.width }),
            ...renderModelSummary(
              forTerminal({
                ...model,
                dropped: model.dropped.map((d) => ({ ...d, reason: droppedReason(d) })),
                // The rows left out for implausible pay are said above; the
                // summary's count is of rows missing the target (or --where).
                rows: {
                  ...model.rows,
                  dropped: model.rows.dropped - leftOut.reduce((n, l) => n + l.count, 0),
                },
              }),
              view,
            ),
          ],
          forTerminal(model.provenance),
          style,
          terminal.width,
        ),
      );
    });
}
