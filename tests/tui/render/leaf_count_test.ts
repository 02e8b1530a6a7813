// A reference tree pruned to its root is "1 leaf" wherever its size is
// written (the accuracy table, the model summary, the model card), not
// "1 leaves", as a fit on a table with no pattern once showed. The model
// is the demo's with its reference tree's sizes set by hand, run through
// the real renderers.
import assert from "node:assert/strict";
import { renderAccuracy, renderModelSummary } from "../../../tui/render/model_view.ts";
import { makeStyle } from "../../../tui/render/style.ts";
import { demoModel } from "../../lib/model/_demo_model.ts";

const { model } = await demoModel();
const options = { style: makeStyle(false), width: 200, numbers: {} };

function withLeaves(leaves: number, fullLeaves: number) {
  const path = model.reference.pruningPath.map((step, i) =>
    i === 0 ? { ...step, leaves: fullLeaves } : step
  );
  return { ...model, reference: { ...model.reference, leaves, pruningPath: path } };
}

Deno.test("one leaf is written in the singular, more in the plural", () => {
  const root = withLeaves(1, 1);
  const table = renderAccuracy(root, options).join("\n");
  assert.match(table, /tree, 1 leaf\b/);
  assert.doesNotMatch(table, /1 leaves/);
  const summary = renderModelSummary(root, options).join(" ").replace(/\s+/g, " ");
  assert.match(summary, /Reference tree: 1 leaf, depth \d+, pruned from 1 leaf at alpha/);

  const grown = withLeaves(44, 315);
  assert.match(renderAccuracy(grown, options).join("\n"), /tree, 44 leaves/);
  const text = renderModelSummary(grown, options).join(" ").replace(/\s+/g, " ");
  assert.match(text, /Reference tree: 44 leaves, depth \d+, pruned from 315 leaves/);
});
