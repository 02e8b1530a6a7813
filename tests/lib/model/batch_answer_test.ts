// Batch scoring on the hand model (tests/lib/model/_hand_model.ts): a
// training row gets the mean of the trees that never drew it, worked out
// here from bootstrapCounts and the trees' splits; other rows the
// ensemble's estimate; refused rows nothing; offers placed in the range.
import assert from "node:assert/strict";
import { bootstrapCounts, OptionError } from "../../../mod.ts";
import { openModel } from "../../../lib/model/model_session.ts";
import { readForModel } from "../../../lib/model/model_table.ts";
import { batchAnswer, outOfBagEstimate } from "../../../lib/model/batch_answer.ts";
import { rowKey } from "../../../lib/model/fit_model.ts";
import {
  classModel,
  handModel,
  RESIDUALS,
  SHIFT,
  TRAINING,
  trainingCsv,
  treeLogs,
  treeOnlyModel,
} from "./_hand_model.ts";
import { close, meanOf, type7 } from "./_quantile.ts";

const HEADER = "employee_id,level,years,site,pay_eur\n";

// The out-of-bag estimate of training row i by hand: the trees whose
// counts leave it out.
function oobByHand(i: number): number | null {
  const model = handModel();
  const [, level, years] = TRAINING[i];
  const logs = treeLogs(level, years).filter((_, b) =>
    bootstrapCounts(20, model.analyst!.resamples, b)[i] === 0
  );
  return logs.length === 0 ? null : Math.exp(meanOf(logs) + SHIFT);
}

Deno.test("training rows get their out-of-bag estimate, the others the ensemble's", () => {
  const model = handModel();
  const rows = readForModel(model, trainingCsv() + "new1,G2,5,North,\n", "hand.csv");
  const out = batchAnswer(openModel(model), rows, 0.9);
  assert.equal(out.length, 21);
  let oob = 0;
  TRAINING.forEach(([, level, years], i) => {
    const byHand = oobByHand(i);
    if (byHand === null) {
      assert.equal(out[i].estimateSource, "ensemble");
      close(out[i].estimate!, Math.exp(meanOf(treeLogs(level, years)) + SHIFT));
    } else {
      oob++;
      assert.equal(out[i].estimateSource, "out-of-bag", `row ${i}`);
      close(out[i].estimate!, byHand);
    }
  });
  assert(oob >= 10, "most rows were left out by some tree");
  const last = out[20];
  assert.equal(last.estimateSource, "ensemble");
  const logs = treeLogs(1, 5);
  close(last.estimate!, Math.exp(meanOf(logs) + SHIFT));
  close(last.ciLow!, Math.exp(type7(logs, 0.05) + SHIFT));
  close(last.rangeHigh!, Math.exp(meanOf(logs) + type7(RESIDUALS, 0.95)));
  close(last.referenceTree!, 50000);
  assert.equal(last.refused, null);
  assert.deepEqual(last.reasons, []);
});

Deno.test("outOfBagEstimate: a training row's identifier and attributes, else null", () => {
  const session = openModel(handModel());
  const i = TRAINING.findIndex((_, r) => oobByHand(r) !== null);
  const [id, level, years, site] = TRAINING[i];
  close(outOfBagEstimate(session, id, Float64Array.of(level, years, site))!, oobByHand(i)!);
  assert.equal(outOfBagEstimate(session, id, Float64Array.of(level, years + 1, site)), null);
  assert.equal(outOfBagEstimate(session, "", Float64Array.of(level, years, site)), null);
  assert.equal(
    outOfBagEstimate(
      openModel({ ...handModel(), analyst: null }),
      id,
      Float64Array.of(level, years, site),
    ),
    null,
  );
  assert.equal(
    outOfBagEstimate(openModel(treeOnlyModel()), id, Float64Array.of(level, years, site)),
    null,
  );
});

Deno.test("a key held by two training rows says neither", () => {
  const model = handModel();
  const [id, level, years, site] = TRAINING[0];
  const key = rowKey(id, [level, years, site]);
  // Row 1's key replaced by row 0's.
  const keys = model.analyst!.rowKeys!;
  model.analyst = { ...model.analyst!, rowKeys: keys.slice(0, 12) + key + keys.slice(24) };
  assert.equal(outOfBagEstimate(openModel(model), id, Float64Array.of(level, years, site)), null);
});

Deno.test("offers are placed against each row's range", () => {
  const model = handModel();
  const rows = readForModel(
    model,
    HEADER + "a,G2,5,North,\nb,G2,5,North,\nc,G2,5,North,\nd,G2,5,North,\n",
    "new.csv",
  );
  const logs = treeLogs(1, 5);
  const m = meanOf(logs);
  const low = Math.exp(m + type7(RESIDUALS, 0.05));
  const high = Math.exp(m + type7(RESIDUALS, 0.95));
  const estimate = Math.exp(m + SHIFT);
  const offers = Float64Array.of(low, Math.exp(m), high * 2, NaN);
  const out = batchAnswer(openModel(model), rows, 0.9, offers);
  // At the range's low end: share 5%.
  assert.equal(out[0].offerPosition, "within");
  close(out[0].rangePosition!, 0);
  close(out[0].shareBelow!, 0.05);
  // At the unshifted centre: the grid's middle point, share 0.5.
  close(out[1].offerToEstimate!, Math.exp(m) / estimate);
  close(out[1].rangePosition!, (Math.exp(m) - low) / (high - low));
  close(out[1].shareBelow!, 0.5);
  assert.equal(out[2].offerPosition, "over");
  assert.equal(out[2].shareBelow, 1);
  assert.equal(out[3].offerToEstimate, null);
  assert.equal(out[3].offerPosition, null);
});

Deno.test("refused rows are not scored; without an ensemble the reference tree's leaf", () => {
  const model = handModel();
  const rows = readForModel(model, HEADER + "a,G1,5,North,\nb,G3,5,South,\n", "new.csv");
  rows.refused = [{ row: 1, line: 3, reasons: ['site "West" is a level the model never saw'] }];
  const out = batchAnswer(openModel(model), rows, 0.9, Float64Array.of(45000, 45000));
  assert.equal(out[1].estimateSource, "not-scored");
  assert.equal(out[1].estimate, null);
  assert.equal(out[1].refused, rows.refused[0].reasons[0]);
  assert.equal(out[1].offerPosition, null);
  // Row a is a G1 with only 2 peers in North: its warning says so.
  assert.deepEqual(out[0].reasons, [
    { kind: "fewPeers", features: ["level", "site"], levels: ["G1", "North"], rows: 2 },
  ]);
  const tree = batchAnswer(openModel(treeOnlyModel()), rows, 0.9, Float64Array.of(45000, NaN));
  assert.equal(tree[0].estimateSource, "reference-tree");
  close(tree[0].estimate!, 40000);
  close(tree[0].offerToEstimate!, 45000 / 40000);
  assert.equal(tree[0].rangePosition, null);
});

Deno.test("a class model and a coverage outside 0.5 to 0.99 are refused", () => {
  const rows = readForModel(handModel(), HEADER + "a,G1,5,North,\n", "new.csv");
  assert.throws(() => batchAnswer(openModel(classModel()), rows), OptionError);
  assert.throws(() => batchAnswer(openModel(handModel()), rows, 0.2), OptionError);
});

Deno.test("each row's parts add up to its own estimate: out-of-bag rows from their trees", () => {
  const model = handModel();
  const rows = readForModel(
    model,
    trainingCsv() + "new1,G2,5,North,\nb,G3,5,South,\n",
    "hand.csv",
  );
  rows.refused = [{ row: 21, line: 23, reasons: ['site "West" is a level the model never saw'] }];
  const out = batchAnswer(openModel(model), rows, 0.9, null, true);
  let oob = 0;
  for (const [i, row] of out.slice(0, 21).entries()) {
    const c = row.contributions!;
    // On log pay: the starting figure times each part's factor is the estimate.
    const product = c.parts.reduce((p, part) => p * (1 + part.percent!), c.base);
    close(product, row.estimate!, 1e-9);
    close(c.estimate, row.estimate!, 1e-9);
    if (row.estimateSource === "out-of-bag") {
      oob++;
      // From the trees that left the row out, and from them only.
      const leftOut = [0, 1, 2].filter((b) =>
        bootstrapCounts(20, model.analyst!.resamples, b)[i] === 0
      );
      assert.equal(c.trees, leftOut.length);
    } else {
      assert.equal(c.trees, 3);
    }
  }
  assert(oob >= 10);
  // The refused row (a level the model never saw) has no parts; without the
  // option no row has the field.
  assert.equal(out[21].estimateSource, "not-scored");
  assert.equal(out[21].contributions, null);
  assert(!("contributions" in batchAnswer(openModel(model), rows, 0.9)[0]));
});
