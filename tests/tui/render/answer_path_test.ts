// The estimate screens show the decision path merged: one condition per
// attribute, on the model of the invented demo company.
import assert from "node:assert/strict";
import {
  estimateProfile,
  explainPath,
  openModel,
  readTableFileForModel,
  rowProfile,
} from "../../../mod.ts";
import { renderEstimate, renderResult } from "../../../tui/render/answer_view.ts";
import { makeStyle } from "../../../tui/render/style.ts";
import { DEMO_PATH, demoModel } from "../../lib/model/_demo_model.ts";

const { model } = await demoModel();
const rows = await readTableFileForModel(model, DEMO_PATH);
const session = openModel(model);
const options = { style: makeStyle(false), width: 80, money: { currency: "EUR" } };

// A person whose path through the reference tree tests one attribute twice.
function repeatedPerson(): Float64Array {
  for (let r = 0; r < 2000; r++) {
    const profile = rowProfile(rows, r);
    const names = explainPath(model.reference.tree, model.features, profile).map((s) => s.feature);
    if (new Set(names).size < names.length) return profile;
  }
  throw new Error("no path of the demo tree repeats an attribute");
}

function pathBlock(lines: string[], heading: RegExp): string[] {
  const start = lines.findIndex((l) => heading.test(l));
  assert.ok(start >= 0, lines.join("\n"));
  const end = lines.findIndex((l, i) => i > start && (l === "" || /^\S/.test(l)));
  return lines.slice(start + 1, end < 0 ? undefined : end);
}

Deno.test("the estimate and result screens name each attribute of the path once, merged", () => {
  const profile = repeatedPerson();
  const answer = estimateProfile(session, profile);
  const raw = explainPath(model.reference.tree, model.features, profile);
  for (
    const [lines, heading] of [
      [renderEstimate(answer, options), /^Decision path of the reference tree/],
      [renderResult(answer, options), /^Decision path of one readable tree/],
    ] as const
  ) {
    const block = pathBlock(lines, heading).filter((l) => /^\s+\d+\.?\s/.test(l));
    const named = block.map((l) => l.trim().split(/\s+/)[1]);
    assert.equal(new Set(named).size, named.length, block.join("\n"));
    assert.ok(block.length < raw.length, block.join("\n"));
    // No raw comparison signs: what they mean together, in words.
    for (const l of block) assert.doesNotMatch(l, /<=|>=| > /, l);
  }
});

Deno.test("--json keeps the split steps beside the merged path", () => {
  const profile = repeatedPerson();
  const answer = estimateProfile(session, profile) as unknown as Record<string, unknown>;
  const raw = explainPath(model.reference.tree, model.features, profile);
  const splits = answer.pathSplits as { step: number; condition: string }[];
  assert.deepEqual(splits.map((s) => s.condition), raw.map((s) => s.condition));
  const path = answer.path as { steps: number[]; feature: string }[];
  assert.deepEqual(path.flatMap((c) => c.steps).sort((a, b) => a - b), splits.map((s) => s.step));
});
