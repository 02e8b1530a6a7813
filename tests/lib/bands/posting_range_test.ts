// The range to post for one role (lib/bands/posting_range.ts): the role as
// a new hire, the range equal to `estimate`'s for that profile, the
// comparable people and the share inside recounted from the table, the
// privacy minimum, and the refusal of a model that uses a protected attribute.
import assert from "node:assert/strict";
import {
  applySets,
  demoCompanyCsv,
  estimateProfile,
  fitModel,
  loadTable,
  openModel,
  readForModel,
  typicalProfile,
} from "../../../mod.ts";
import { postingRange } from "../../../lib/bands/posting_range.ts";

const csv = demoCompanyCsv({ rows: 800, seed: 12 });
const model = await fitModel(loadTable(csv, { target: "base_pay_eur" }), {
  target: "base_pay_eur",
  trees: 20,
  folds: 3,
  workers: 1,
});
const rows = readForModel(model, csv, "demo.csv");
const session = openModel(model);

Deno.test("the posting range is estimate's range for the role as a new hire, and its comparable people recounted", () => {
  const { profile } = applySets(model, typicalProfile(model), [
    "level=G2",
    "job_family=Engineering",
  ]);
  const posting = postingRange(session, profile, ["level", "job_family"], rows, { coverage: 0.8 });
  // As a new hire: years at the company at the training minimum, nothing else moved.
  const tenure = model.features.findIndex((f) => f.name === "years_at_company");
  const role = Float64Array.from(profile);
  role[tenure] = model.features[tenure].range!.min;
  const answer = estimateProfile(session, role, 0.8);
  assert.equal(posting.estimate, answer.estimate);
  assert.deepEqual([posting.low, posting.high], [answer.range!.low, answer.range!.high]);
  assert.deepEqual(posting.newHire, ["years_at_company"]);
  assert.equal(posting.profile.level, "G2");
  // Comparable: G2 engineers of the table, and how many of them the range holds.
  const level = model.features.findIndex((f) => f.name === "level");
  const family = model.features.findIndex((f) => f.name === "job_family");
  let people = 0;
  let inside = 0;
  for (let r = 0; r < rows.rows; r++) {
    if (
      rows.features[level][r] !== profile[level] || rows.features[family][r] !== profile[family]
    ) continue;
    people++;
    if (rows.target![r] >= posting.low && rows.target![r] <= posting.high) inside++;
  }
  assert(people >= 5);
  assert.deepEqual(posting.comparable, {
    named: ["level", "job_family"],
    people,
    inside: inside / people,
  });
  assert.deepEqual(posting.criteria, model.features.map((f) => f.name));
  // Without the table: no figure of current people.
  assert.equal(postingRange(session, profile, ["level"], null).comparable, null);
});

Deno.test("fewer comparable people than the privacy minimum: their count and share are withheld", () => {
  const { profile } = applySets(model, typicalProfile(model), ["level=G7", "job_family=People"]);
  const posting = postingRange(session, profile, ["level", "job_family"], rows, { privacyMin: 50 });
  assert.deepEqual(posting.comparable, {
    named: ["level", "job_family"],
    people: null,
    inside: null,
  });
});

Deno.test("a model that uses a protected attribute gives no posting range", async () => {
  const withGender = await fitModel(loadTable(csv, { target: "base_pay_eur" }), {
    target: "base_pay_eur",
    trees: 5,
    folds: 3,
    workers: 1,
    allowProtected: true,
  });
  assert(withGender.features.some((f) => f.protected));
  assert.throws(
    () => postingRange(openModel(withGender), typicalProfile(withGender), ["level"], null),
    /objective criteria.*protected attributes \(gender\)/,
  );
});
