// Small-group and complementary suppression, on tables of counts worked
// through the rule by hand.
import assert from "node:assert/strict";
import { suppressSmallGroups } from "../../../lib/gap/suppress.ts";

Deno.test("nothing small: everything shown", () => {
  assert.deepEqual(suppressSmallGroups([[40, 30], [20, 5], [50, 12]], 5), {
    hidden: [false, false, false],
    primary: [false, false, false],
    overallHidden: false,
  });
});

Deno.test("one small category: the next with the smallest smallest group hides too, ties by size", () => {
  // Category 1 has 2 women. Categories 2 and 4 both have 12 in their
  // smallest group; 4 has fewer people (27 against 62), so 4 is hidden.
  // Then categories 1 and 4 hold 35 and 14: enough.
  const s = suppressSmallGroups([[40, 30], [20, 2], [50, 12], [60, 25], [15, 12]], 5);
  assert.deepEqual(s.hidden, [false, true, false, false, true]);
  assert.deepEqual(s.primary, [false, true, false, false, false]);
  assert.equal(s.overallHidden, false);
});

Deno.test("two small categories that together are still too small take a third", () => {
  // Categories 1 and 2 hold 2 + 1 = 3 women: category 3 (25) is added
  // before category 0 (30).
  const s = suppressSmallGroups([[40, 30], [20, 2], [50, 1], [60, 25]], 5);
  assert.deepEqual(s.hidden, [false, true, true, true]);
  assert.deepEqual(s.primary, [false, true, true, false]);
  assert.equal(s.overallHidden, false);
  // Together 2 + 4 = 6 are enough: no third.
  const t = suppressSmallGroups([[40, 30], [20, 2], [50, 4], [60, 25]], 5);
  assert.deepEqual(t.hidden, [false, true, true, false]);
});

Deno.test("a group too small overall withholds the overall figure", () => {
  // 2 + 1 women in all: the overall figure goes; the small categories are
  // hidden for themselves only.
  const s = suppressSmallGroups([[40, 2], [20, 1], [50, 0]], 5);
  assert.deepEqual(s, {
    hidden: [true, true, true],
    primary: [true, true, true],
    overallHidden: true,
  });
  // A lone category is the overall figure.
  assert.deepEqual(suppressSmallGroups([[40, 3]], 5), {
    hidden: [true],
    primary: [true],
    overallHidden: true,
  });
  assert.deepEqual(suppressSmallGroups([[40, 30]], 5).hidden, [false]);
});

Deno.test("a group absent from a category counts 0 there", () => {
  const s = suppressSmallGroups([[10, 10], [10], [10, 10], [10, 10]], 5);
  assert.deepEqual(s.primary, [false, true, false, false]);
  // Hidden: category 1 (0 in group 1) with category 0, the first of the
  // equally small ones (10 each, 20 people each).
  assert.deepEqual(s.hidden, [true, true, false, false]);
  assert.equal(s.overallHidden, false);
});
