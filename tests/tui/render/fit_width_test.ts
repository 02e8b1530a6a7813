// Tables at 60 and 80 columns: every renderer given a width keeps each line
// within it, and every figure of its table appears whole on one line (never
// wrapped in the middle), on the model of the invented demo company.
import assert from "node:assert/strict";
import {
  compareAnswer,
  describeSchema,
  estimateProfile,
  loadTableFile,
  openModel,
  sweepAnswer,
  sweepValues,
  typicalProfile,
} from "../../../mod.ts";
import { renderCompare, renderEstimate, renderSweep } from "../../../tui/render/answer_view.ts";
import { renderAccuracy } from "../../../tui/render/model_view.ts";
import { formatPay } from "../../../tui/render/numbers.ts";
import { renderSchema } from "../../../tui/render/schema_view.ts";
import { makeStyle } from "../../../tui/render/style.ts";
import { DEMO_LOAD, DEMO_PATH, demoModel } from "../../lib/model/_demo_model.ts";

const { model } = await demoModel();
const session = openModel(model);
const style = makeStyle(false);
const money = { currency: "EUR" };
const pay = (x: number) => formatPay(x, money);

function fits(lines: string[], width: number, figures: string[]): void {
  const long = lines.filter((l) => l.length > width);
  assert.deepEqual(long, [], `lines longer than ${width}:\n${long.join("\n")}`);
  for (const figure of figures) {
    assert.ok(
      lines.some((l) => l.includes(figure)),
      `${figure} is not whole on one line:\n${lines.join("\n")}`,
    );
  }
}

for (const width of [60, 80]) {
  Deno.test(`schema at ${width} columns`, async () => {
    const table = await loadTableFile(DEMO_PATH, DEMO_LOAD);
    const summary = describeSchema(table);
    const lines = renderSchema(summary, { file: "demo_company.csv", style, width, numbers: money });
    fits(lines, width, summary.columns.map((c) => c.name));
  });

  Deno.test(`model accuracy at ${width} columns`, () => {
    const lines = renderAccuracy(model, { style, width, numbers: money });
    const q = model.quality;
    fits(
      lines,
      width,
      [q.reference.money!.rmse, q.ensemble!.money!.rmse, q.linear!.money!.rmse].map(pay),
    );
  });

  Deno.test(`estimate at ${width} columns`, () => {
    const answer = estimateProfile(session, typicalProfile(model));
    const lines = renderEstimate(answer, { style, width, money });
    fits(lines, width, [pay(answer.estimate), ...answer.path.map((c) => c.condition)]);
  });

  Deno.test(`what-if at ${width} columns`, () => {
    const base = typicalProfile(model);
    const level = model.features.findIndex((f) => f.name === "level");
    const changed = Float64Array.from(base);
    changed[level] = base[level] + 1;
    const answer = compareAnswer(session, base, changed);
    const lines = renderCompare(answer, { style, width, money });
    fits(lines, width, [pay(answer.base.estimate), pay(answer.changed.estimate)]);
  });

  Deno.test(`sweep at ${width} columns`, () => {
    const level = model.features.findIndex((f) => f.name === "level");
    const answer = sweepAnswer(session, typicalProfile(model), level, sweepValues(model, level));
    const lines = renderSweep(answer, { style, width, money });
    fits(
      lines,
      width,
      answer.points.flatMap((p) => [pay(p.estimate), pay(p.range!.low), pay(p.range!.high)]),
    );
  });
}
