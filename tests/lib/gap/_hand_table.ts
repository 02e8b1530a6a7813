/**
 * A pay table small enough to check by hand (invented): four families of
 * men and women with pay easy to average; family Kiln has only two women,
 * too few to report.
 *
 * @module
 */

/** The table as CSV (person, family, gender, years, pay). */
export const HAND_TABLE = [
  "person,family,gender,years,pay",
  ...[
    ["Bench", "Man", [50, 52, 54, 56, 58]],
    ["Bench", "Woman", [45, 47, 49, 51, 53]],
    ["Dock", "Man", [80, 82, 84, 86, 88, 90]],
    ["Dock", "Woman", [70, 76, 82, 88, 94, 100]],
    ["Kiln", "Man", [60, 61, 62, 63, 64]],
    ["Kiln", "Woman", [41, 43]],
    ["Yard", "Man", [30, 40, 50, 60, 70]],
    ["Yard", "Woman", [35, 45, 55, 65, 75]],
  ].flatMap(([family, gender, pays], i) =>
    (pays as number[]).map((p, j) => `P${i}${j},${family},${gender},${j + 1},${p}`)
  ),
].join("\n") + "\n";
