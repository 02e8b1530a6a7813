// One profile's answer on the hand model (tests/lib/model/_hand_model.ts):
// the estimate exp(mean of the trees' logs + shift), the "how sure" and
// range intervals from type-7 quantiles written out in _quantile.ts, the
// reference tree's path with figures hidden below the privacy minimum, the
// support and its reasons, class shares, and the answers without an ensemble.
import assert from "node:assert/strict";
import { OptionError } from "../../../mod.ts";
import { openModel } from "../../../lib/model/model_session.ts";
import { rangeWarnings } from "../../../lib/model/profile.ts";
import { estimateProfile, profileSupport } from "../../../lib/model/estimate_answer.ts";
import { classModel, handModel, RESIDUALS, SHIFT, treeLogs, treeOnlyModel } from "./_hand_model.ts";
import { close, meanOf, type7 } from "./_quantile.ts";

const G2_5_NORTH = Float64Array.of(1, 5, 0);

Deno.test("the estimate, how sure, range and centre of a G2 with 5 years in North", () => {
  const answer = estimateProfile(openModel(handModel()), G2_5_NORTH, 0.9);
  const logs = treeLogs(1, 5);
  const m = meanOf(logs);
  close(answer.estimate, Math.exp(m + SHIFT));
  assert.deepEqual(answer.trees.length, 3);
  logs.forEach((v, b) => close(answer.trees[b], Math.exp(v + SHIFT)));
  close(answer.confidence!.low, Math.exp(type7(logs, 0.05) + SHIFT));
  close(answer.confidence!.high, Math.exp(type7(logs, 0.95) + SHIFT));
  // The range is not shifted: the residual grid's 5% and 95% points.
  close(answer.range!.low, Math.exp(m + type7(RESIDUALS, 0.05)));
  close(answer.range!.high, Math.exp(m + type7(RESIDUALS, 0.95)));
  assert.equal(answer.range!.coverage, 0.9);
  assert.deepEqual(answer.center, {
    kind: "median",
    shift: SHIFT,
    meanOverEstimate: 1.01,
    meanPay: answer.estimate * 1.01,
  });
  assert.equal(answer.jackknife, null);
  assert.equal(answer.jackknifeNeedsAnalystFile, false);
  close(answer.referenceTree, 50000);
  assert.deepEqual(answer.profile, { level: "G2", years: 5, site: "North" });
  assert.deepEqual(answer.target, {
    name: "pay_eur",
    scale: "log",
    currency: "EUR",
    period: "year",
  });
  assert.deepEqual(answer.warnings, []);
});

Deno.test("the reference tree's path: each split with its node's rows and pay", () => {
  const answer = estimateProfile(openModel(handModel()), G2_5_NORTH);
  assert.deepEqual(
    answer.pathSplits.map((s) => [s.step, s.feature, s.condition, s.rows, Math.round(s.value!)]),
    [[1, "level", "level >= G2", 16, 54000], [2, "site", "site in {North}", 10, 50000]],
  );
  assert.deepEqual(answer.path.map((p) => [p.feature, p.kind, p.levels, p.steps, p.rows]), [
    ["level", "ordinal", ["G2", "G3"], [1], 16],
    ["site", "categorical", ["North"], [2], 10],
  ]);
  assert.equal(answer.leaf.rows, 10);
  close(answer.leaf.value!, 50000);
});

Deno.test("a G1: the leaf of 4 people shows no pay, and 2 peers make the profile unusual", () => {
  const answer = estimateProfile(openModel(handModel()), Float64Array.of(0, 5, 0));
  assert.equal(answer.leaf.rows, 4);
  assert.equal(answer.leaf.value, null);
  assert.equal(answer.pathSplits[0].value, null);
  assert.equal(answer.path[0].value, null);
  assert.deepEqual(answer.support.peers, {
    features: ["level", "site"],
    levels: ["G1", "North"],
    rows: 2,
  });
  assert.equal(answer.support.unusual, true);
  assert.equal(answer.support.reasons.length, 1);
  assert.deepEqual(answer.support.reasons[0], {
    kind: "fewPeers",
    features: ["level", "site"],
    levels: ["G1", "North"],
    rows: 2,
  });
  assert.equal(answer.warnings.length, 1);
});

Deno.test("profileSupport: beyond the level's 99% of years, and outside the data", () => {
  const model = handModel();
  // G2's years run from 3 to 12 (1% and 99%).
  const above = profileSupport(model, Float64Array.of(1, 14, 0), 10);
  assert.equal(above.unusual, true);
  assert.deepEqual(above.reasons[0], {
    kind: "aboveLevelRange",
    feature: "years",
    value: 14,
    group: "level",
    level: "G2",
    bound: 12,
  });
  const below = profileSupport(model, Float64Array.of(1, 2, 0), 10);
  assert.deepEqual(below.reasons[0], {
    kind: "belowLevelRange",
    feature: "years",
    value: 2,
    group: "level",
    level: "G2",
    bound: 3,
  });
  // G3 has no level range; 25 years is outside the data (0 to 20).
  const outside = profileSupport(model, Float64Array.of(2, 25, 0), 6);
  assert.deepEqual(outside.reasons.length, 1);
  assert.deepEqual(outside.reasons[0], { kind: "outsideData", feature: "years" });
  // Missing years: no range to be outside of.
  assert.equal(profileSupport(model, Float64Array.of(1, NaN, 0), 10).unusual, false);
  // No one at G3 in South... is 2: below the privacy minimum of 5.
  const fewPeers = profileSupport(model, Float64Array.of(2, 8, 1), 6);
  assert.equal(fewPeers.peers!.rows, 2);
  assert.equal(fewPeers.unusual, true);
  // A pair nobody has.
  const none = {
    ...model,
    support: {
      ...model.support,
      peers: { features: ["level", "site"] as [string, string], counts: {} },
    },
  };
  assert.equal(profileSupport(none, G2_5_NORTH, 10).peers!.rows, 0);
  assert.equal(
    profileSupport({ ...model, support: { peers: null, levelRanges: [] } }, G2_5_NORTH, 10).peers,
    null,
  );
});

Deno.test("values outside the data are warned about once, with the caller's warnings first", () => {
  const model = handModel();
  const profile = Float64Array.of(1, 25, 0);
  // The caller's warnings hold the same range warning (as applySets gives it).
  const [outside] = rangeWarnings(model, profile);
  const answer = estimateProfile(openModel(model), profile, 0.9, [
    { kind: "valueOutsideData", feature: "site", value: 9, min: 0, max: 1 },
    outside,
  ]);
  assert.equal(
    answer.warnings[0].kind === "valueOutsideData" && answer.warnings[0].feature,
    "site",
  );
  assert.equal(
    answer.warnings.filter((w) => JSON.stringify(w) === JSON.stringify(outside)).length,
    1,
  );
  // Then the unusual-profile warning: years 25 is above G2's 12 and outside the data.
  assert.equal(answer.warnings.length, 3);
  assert.deepEqual(answer.support.reasons.length, 2);
});

Deno.test("trees that disagree more than the range is wide are warned about", () => {
  const model = handModel();
  const narrow = {
    ...model,
    residuals: { edges: Float64Array.of(Infinity), residuals: [Float64Array.of(-0.01, 0, 0.01)] },
  };
  // The trees' logs for a G2 with 5 years spread over ln(45000) to ln(58000).
  const answer = estimateProfile(openModel(narrow), G2_5_NORTH);
  assert(answer.confidence!.low < answer.range!.low);
  assert.equal(answer.warnings.length, 1);
});

Deno.test("without an ensemble: the reference tree's leaf, no interval, a geometric mean", () => {
  const answer = estimateProfile(openModel(treeOnlyModel()), G2_5_NORTH);
  close(answer.estimate, 50000);
  assert.equal(answer.confidence, null);
  assert.equal(answer.range, null);
  assert.deepEqual(answer.trees, []);
  assert.equal(answer.center!.kind, "geometric-mean");
  assert.equal(answer.warnings.length, 1);
  const raw = treeOnlyModel();
  raw.target = { ...raw.target, scale: "raw" };
  raw.reference = {
    ...raw.reference,
    tree: { ...raw.reference.tree, value: Float64Array.of(5, 4, 5.4, 5, 6) },
  };
  const rawAnswer = estimateProfile(openModel(raw), G2_5_NORTH);
  assert.equal(rawAnswer.estimate, 5);
  assert.equal(rawAnswer.center!.kind, "mean");
});

Deno.test("a raw-scale ensemble's centre is the mean; a log one without a shift, the geometric mean", () => {
  const model = handModel();
  const unshifted = estimateProfile(
    openModel({ ...model, target: { ...model.target, center: undefined } }),
    G2_5_NORTH,
  );
  assert.equal(unshifted.center!.kind, "geometric-mean");
  close(unshifted.estimate, Math.exp(meanOf(treeLogs(1, 5))));
  const raw = estimateProfile(
    openModel({ ...model, target: { ...model.target, scale: "raw" } }),
    G2_5_NORTH,
  );
  assert.equal(raw.center!.kind, "mean");
  close(raw.estimate, meanOf(treeLogs(1, 5)));
});

Deno.test("a class model: mean shares, the likeliest class, the trees' intervals", () => {
  // Years 5: the trees' junior shares 0.75 and 0.5.
  const answer = estimateProfile(openModel(classModel()), G2_5_NORTH, 0.5);
  assert.equal(answer.estimate, 0.625);
  assert.deepEqual(answer.classes!.shares, { junior: 0.625, senior: 0.375 });
  assert.equal(answer.classes!.predicted, "junior");
  // Two values' 25% and 75% points: a quarter and three quarters of the way.
  assert.deepEqual(answer.classes!.intervals, {
    junior: { low: 0.5625, high: 0.6875 },
    senior: { low: 0.3125, high: 0.4375 },
  });
  assert.equal(answer.referenceTree, 0.75);
  assert.equal(answer.center, null);
  // Years 15: 0.25 and 0.125 junior, so senior leads.
  assert.equal(
    estimateProfile(openModel(classModel()), Float64Array.of(1, 15, 0)).classes!.predicted,
    "senior",
  );
  const alone = estimateProfile(openModel({ ...classModel(), ensemble: null }), G2_5_NORTH);
  assert.equal(alone.classes!.intervals, null);
  assert.equal(alone.estimate, 0.75);
  assert.equal(alone.warnings.length, 1);
});

Deno.test("a coverage outside 0.5 to 0.99 is refused", () => {
  assert.throws(() => estimateProfile(openModel(handModel()), G2_5_NORTH, 0.3), OptionError);
});
