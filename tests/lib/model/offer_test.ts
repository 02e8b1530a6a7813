// The one-offer check against a recount from the model file itself: the
// file is read and its trees walked by the outsider's code of
// tests/privacy/_model_attacks.ts (its own JSON reader and tree walk), and
// the share of comparable people paid less than an offer is found by
// bisection on R's type-7 quantile of the profile's group of kept residuals
// (written here), not by the library's inverse.
import assert from "node:assert/strict";
import {
  applySets,
  batchAnswer,
  checkOffer,
  estimateProfile,
  modelFromText,
  modelToText,
  openModel,
  OptionError,
  parseOffer,
  readForModel,
  RowsRefusedError,
  typicalProfile,
} from "../../../mod.ts";
import { encodeRoster, pathsOf, readFile } from "../../privacy/_model_attacks.ts";
import { demoModel } from "./_demo_model.ts";

const { model: fitted } = await demoModel();
const text = modelToText(fitted);
// The model as a reader of the file has it (shared figures as written).
const model = modelFromText(text, "demo.model.json");
const session = openModel(model);
const file = readFile(text);

const HEADER =
  "employee_id,job_family,level,years_experience,years_at_company,site,performance_rating," +
  "education,remote";

// R's type 7 quantile of sorted values at p.
function type7(sorted: Float64Array, p: number): number {
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, sorted.length - 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

// The recount: the trees' mean log estimate from the outsider's walk, the
// group whose estimates it falls among, and the p whose quantile reaches
// log(offer) - mean, by bisection (where the quantile rises strictly).
function recount(csvRow: string, offer: number) {
  const roster = encodeRoster(file, `${HEADER}\n${csvRow}\n`);
  const paths = pathsOf(file.trees, roster);
  let sum = 0;
  file.trees.forEach((t, b) => {
    const path = paths[b][0];
    sum += t.value[path[path.length - 1]];
  });
  const center = sum / file.trees.length;
  const edges = file.residuals!.edges;
  let g = 0;
  while (g < edges.length - 1 && center > edges[g]) g++;
  const grid = file.residuals!.grids[g];
  const r = Math.log(offer) - center;
  let lo = 0;
  let hi = 1;
  if (r <= grid[0]) return { center, share: 0, grid };
  if (r >= grid[grid.length - 1]) return { center, share: 1, grid };
  for (let i = 0; i < 200; i++) {
    const mid = (lo + hi) / 2;
    if (type7(grid, mid) < r) lo = mid;
    else hi = mid;
  }
  return { center, share: (lo + hi) / 2, grid };
}

function profileOf(csvRow: string) {
  const rows = readForModel(model, `${HEADER}\n${csvRow}\n`, "row.csv");
  return Float64Array.from(rows.features, (v) => v[0]);
}

const LAB_G3 = "X1,Engineering,G3,8,2,Eastgate,3,Bachelor,no";
const SALES_G5 = "X2,Sales,G5,14,4,Harbourside,4,Master,no";

Deno.test("the offer's share and position agree with a recount from the model file", () => {
  for (const row of [LAB_G3, SALES_G5]) {
    const profile = profileOf(row);
    const answer = estimateProfile(session, profile, 0.9);
    const range = answer.range!;
    for (const offer of [range.low * 1.01, answer.estimate * 0.97, answer.estimate * 1.04]) {
      const check = checkOffer(session, profile, answer, parseOffer(model, String(offer)));
      const expected = recount(row, offer);
      // The estimate is the walk's moved by the file's median shift; the
      // range (and so the share) is read around the walk's own centre.
      const shift = model.target.center?.shift ?? 0;
      assert.ok(
        Math.abs(Math.exp(expected.center + shift) - answer.estimate) < 1e-6 * answer.estimate,
        "the walk and the answer see the same estimate",
      );
      assert.ok(
        Math.abs(check.shareBelow! - expected.share) < 1e-9,
        `${row} ${offer}: ${check.shareBelow} vs recount ${expected.share}`,
      );
      assert.ok(
        Math.abs(check.rangePosition! - (offer - range.low) / (range.high - range.low)) < 1e-12,
      );
      assert.equal(check.position, "within");
      assert.ok(Math.abs(check.offerToEstimate - offer / answer.estimate) < 1e-12);
      assert.equal(check.reach.estimate.offer, answer.estimate);
      assert.ok(Math.abs(check.reach.estimate.change - (answer.estimate - offer)) < 1e-9);
      assert.equal(check.reach.rangeLow!.offer, range.low);
    }
  }
});

Deno.test("the range's ends read their nominal shares, at every coverage", () => {
  const profile = profileOf(LAB_G3);
  for (const coverage of [0.5, 0.8, 0.9, 0.99]) {
    const answer = estimateProfile(session, profile, coverage);
    const { low, high } = answer.range!;
    const tail = (1 - coverage) / 2;
    const atLow = checkOffer(session, profile, answer, parseOffer(model, String(low)));
    const atHigh = checkOffer(session, profile, answer, parseOffer(model, String(high)));
    assert.equal(atLow.position, "within");
    assert.equal(atHigh.position, "within");
    assert.equal(atLow.rangePosition, 0);
    assert.equal(atHigh.rangePosition, 1);
    assert.ok(Math.abs(atLow.shareBelow! - tail) < 1e-12, `${coverage}: ${atLow.shareBelow}`);
    assert.ok(Math.abs(atHigh.shareBelow! - (1 - tail)) < 1e-12, `${coverage}`);
    // A cent inside and outside: the share moves with the offer, the
    // position flips at the ends.
    const inside = checkOffer(session, profile, answer, parseOffer(model, String(low + 0.01)));
    const under = checkOffer(session, profile, answer, parseOffer(model, String(low - 0.01)));
    assert.equal(under.position, "under");
    assert.ok(under.rangePosition! < 0 && inside.rangePosition! > 0);
    assert.ok(under.shareBelow! <= tail + 1e-9 && inside.shareBelow! >= tail - 1e-9);
  }
});

Deno.test("offers far outside the range: no one below, everyone below", () => {
  const profile = profileOf(SALES_G5);
  const answer = estimateProfile(session, profile, 0.9);
  const { low, high } = answer.range!;
  const far = checkOffer(session, profile, answer, parseOffer(model, "1000"));
  assert.equal(far.position, "under");
  assert.equal(far.shareBelow, 0);
  assert.ok(Math.abs(far.rangePosition! - (1000 - low) / (high - low)) < 1e-12);
  assert.equal(far.reach.rangeLow!.change, low - 1000);
  const rich = checkOffer(session, profile, answer, parseOffer(model, "10M"));
  assert.equal(rich.position, "over");
  assert.equal(rich.shareBelow, 1);
  assert.ok(rich.reach.estimate.change < 0, "already above the estimate");
});

Deno.test("offers are read like the table's amounts", () => {
  for (const text of ["61000", "61k", "61,000", "€61,000", "€61.000", "61.000 €", "EUR 61000"]) {
    assert.equal(parseOffer(model, text).amount, 61000, text);
  }
  assert.equal(
    parseOffer(model, "€61.000").readAs,
    `read "€61.000" as 61000: a mark before ` +
      `exactly three digits groups thousands in an offer`,
  );
  assert.equal(parseOffer(model, "61,000").readAs, null);
  assert.equal(parseOffer(model, "61000.5").amount, 61000.5);
  const refused: [string, RegExp][] = [
    ["$61,000", /is in USD; the model's pay is in EUR/],
    ["30/hour", /pay per hour; the model's pay is per year/],
    ["sixty", /"sixty" is not an amount/],
    ["0", /above zero/],
    ["-5k", /above zero/],
  ];
  for (const [t, pattern] of refused) {
    assert.throws(
      () => parseOffer(model, t),
      (e) => e instanceof OptionError && pattern.test(e.message),
      t,
    );
  }
});

Deno.test("batch gives each row the share estimate --offer gives", () => {
  const csv = `${HEADER},offer\n${LAB_G3},61000\n${SALES_G5},90000\n`;
  const rows = readForModel(model, csv, "offers.csv", false, ["offer"]);
  const offers = rows.table.columns.find((c) => c.name === "offer")!;
  assert.equal(offers.type, "numeric");
  const scored = batchAnswer(session, rows, 0.9, Float64Array.from(offers.values));
  [LAB_G3, SALES_G5].forEach((row, r) => {
    const offer = [61000, 90000][r];
    assert.ok(Math.abs(scored[r].shareBelow! - recount(row, offer).share) < 1e-9);
  });
});

Deno.test("one unknown level refuses its row, not the others", () => {
  const csv = `${HEADER}\n${LAB_G3}\nX9,Engineering,G9,8,2,Moonbase,3,Bachelor,no\n${SALES_G5}\n`;
  let caught: unknown;
  try {
    readForModel(model, csv, "three.csv");
  } catch (error) {
    caught = error;
  }
  assert.ok(caught instanceof RowsRefusedError, String(caught));
  // Still the whole table's refusal for callers that need every row.
  assert.match(caught.message, /three\.csv does not match the model's schema/);
  assert.deepEqual(caught.rows.refused, [{
    row: 1,
    line: 3,
    reasons: [
      'level "G9" is a level the model never saw',
      'site "Moonbase" is a level the model never saw',
    ],
  }]);
  assert.equal(caught.rows.rows, 3);
  assert.ok(caught.rows.features.every((v) => Number.isNaN(v[1])));
  assert.deepEqual(
    Array.from(caught.rows.features, (v) => v[0]),
    Array.from(profileOf(LAB_G3)),
  );
  // A cell that is not a number in a number column still refuses the
  // whole table, as before.
  assert.throws(
    () => readForModel(model, `${HEADER}\n${LAB_G3.replace(",8,", ",eight,")}\n`, "t.csv"),
    (e) =>
      !(e instanceof RowsRefusedError) &&
      /t\.csv: years_experience: line 2 has "eight", not a number/.test((e as Error).message),
  );
});

Deno.test("the typical profile's offer check without an ensemble has no range", () => {
  const bare = openModel({ ...model, ensemble: null });
  const profile = applySets(model, typicalProfile(model), []).profile;
  const answer = estimateProfile(bare, profile, 0.9);
  const check = checkOffer(bare, profile, answer, parseOffer(model, "50k"));
  assert.equal(check.position, null);
  assert.equal(check.shareBelow, null);
  assert.equal(check.reach.rangeLow, null);
  assert.equal(check.reach.estimate.offer, answer.estimate);
});
