// The implausible-pay rule at its edges. Each table below is small enough
// that its median is known by hand, so the boundary values are exact.
import assert from "node:assert/strict";
import {
  DataError,
  findImplausiblePay,
  ImplausiblePayError,
  loadTable,
  PAY_CEILING,
  PLAUSIBLE_FACTOR,
  screenPay,
} from "../../../mod.ts";

/** A pay column of the given cells (line of cell i is i + 2). */
function pay(cells: string[], name = "pay") {
  return loadTable(`${name}\n${cells.join("\n")}\n`, { target: name });
}

Deno.test("the bounds are 10^4 times the median either way, and 10^15", () => {
  assert.equal(PLAUSIBLE_FACTOR, 1e4);
  assert.equal(PAY_CEILING, 1e15);
  // Median of 40,000, 50,000 and 60,000 (with one more value at either end
  // it stays 50,000: five values, the third).
  const at = (low: string, high: string) =>
    findImplausiblePay(pay(["40000", "50000", "60000", low, high]), "pay");
  // Exactly 10^4 times: plausible on both sides.
  assert.equal(at("5", "500000000"), null);
  // Just beyond: implausible on both sides.
  const beyond = at("4.99", "500000001")!;
  assert.equal(beyond.median, 50000);
  assert.deepEqual(beyond.lines, [5, 6]);
  assert.deepEqual(beyond.values, [4.99, 500000001]);
});

Deno.test("zero, negative, tiny and huge pay are implausible; missing cells are not", () => {
  const table = pay(["50000", "0", "-1e308", "1e-300", "1e308", "", "61000", "58000", "NA"]);
  const found = findImplausiblePay(table, "pay")!;
  // Median of the seven values present: -1e308, 0, 1e-300, 50000, 58000, 61000, 1e308 -> 50000.
  assert.equal(found.median, 50000);
  assert.equal(found.count, 4);
  assert.deepEqual(found.lines, [3, 4, 5, 6]);
});

Deno.test("a column of huge but alike values is implausible by the ceiling alone", () => {
  const cells = ["2e15", "3e15", "2.5e15"];
  assert.equal(findImplausiblePay(pay(cells), "pay")!.count, 3);
  assert.equal(findImplausiblePay(pay(["9e14", "8e14", "7e14"]), "pay"), null);
});

Deno.test("screenPay refuses, or leaves out and counts the rows with the excluded ones", () => {
  const table = pay(["50000", "1e308", "NA", "61000", "58000"]);
  assert.equal(table.excluded.count, 1); // the missing target
  assert.throws(
    () => screenPay(table, "pay"),
    (e) =>
      e instanceof ImplausiblePayError && e instanceof DataError && e.location.line === 3 &&
      e.message ===
        'input: "pay": line 3 has 1e+308; no plausible pay table holds such a value (more than ' +
          "10,000 times from the median 59,500 either way, beyond 10^15, or not finite)",
  );
  const { table: kept, leftOut } = screenPay(table, "pay", { leaveOut: true });
  assert.equal(kept.rows, 3);
  assert.deepEqual(Array.from(kept.lines), [2, 5, 6]);
  assert.equal(kept.excluded.count, 2);
  assert.equal(leftOut!.count, 1);
  const column = kept.columns[0];
  assert.deepEqual(column.type === "numeric" && Array.from(column.values), [50000, 61000, 58000]);
});

Deno.test("several values are listed, the first five with the count of the rest", () => {
  const cells = ["50000", "51000", "52000", "53000", "54000", "55000", "56000", "57000"];
  cells.push(...["1", "2", "3", "4", "5", "6", "7"].map((d) => `${d}e300`));
  // Median of 15 values: the 8th smallest, 57,000.
  assert.throws(
    () => screenPay(pay(cells), "pay"),
    (e) =>
      e instanceof ImplausiblePayError &&
      e.message.startsWith(
        'input: "pay": lines 10, 11, 12, 13, 14 and 2 more have 1e+300, 2e+300, 3e+300, 4e+300 ' +
          "and 5e+300; no plausible pay table holds such values (more than 10,000 times from the " +
          "median 57,000",
      ),
  );
});

Deno.test("every row implausible: a DataError even when leaving them out", () => {
  assert.throws(
    () => screenPay(pay(["2e15", "3e15"]), "pay", { leaveOut: true }),
    (e) => e instanceof DataError && /every row's "pay" is implausible/.test(e.message),
  );
});

Deno.test("moneyOnly leaves a column that is not money alone; non-numeric columns are never screened", () => {
  const rating = loadTable("rating,level\n0,L1\n3,L2\n4,L1\n5,L2\n", { target: "rating" });
  assert.equal(screenPay(rating, "rating", { moneyOnly: true }).leftOut, null);
  assert.throws(() => screenPay(rating, "rating"), ImplausiblePayError);
  assert.equal(screenPay(rating, "level").leftOut, null);
});

Deno.test("without the distance from the median (variable pay), only size and finiteness count", () => {
  const bonus = loadTable("bonus,pay\n0,50000\n0,51000\n1000,52000\n2e15,53000\n20000000,54000\n", {
    target: "pay",
  });
  // The median bonus is 1,000: with the distance rule the zeros
  // (more than 10,000 times below) and 20,000,000 (above) would be
  // implausible; without it only 2e15 is.
  assert.equal(findImplausiblePay(bonus, "bonus")!.count, 4);
  const found = findImplausiblePay(bonus, "bonus", false)!;
  assert.deepEqual([found.count, found.lines, found.ratio], [1, [5], false]);
  assert.throws(
    () => screenPay(bonus, "bonus", { ratio: false }),
    (e) =>
      e instanceof ImplausiblePayError &&
      e.message ===
        'input: "bonus": line 5 has 2000000000000000; no plausible pay table holds such a value ' +
          "(beyond 10^15, or not finite)",
  );
});
