import assert from "node:assert/strict";
import {
  DataError,
  loadTable,
  loadTableChunks,
  type LoadTableOptions,
  OptionError,
} from "../../../mod.ts";
import type { Column } from "../../../lib/table/types.ts";

function column(csv: string, name: string, options: LoadTableOptions = {}): Column {
  const table = loadTable(csv, options);
  const found = table.columns.find((c) => c.name === name);
  assert.ok(found, `no column ${name}`);
  return found;
}

function dataFails(fn: () => unknown, message: string, line?: number) {
  assert.throws(fn, (error: unknown) => {
    assert.ok(error instanceof DataError, String(error));
    assert.equal(error.message, message);
    if (line !== undefined) assert.equal(error.location.line, line);
    return true;
  });
}

function optionFails(fn: () => unknown, message: string) {
  assert.throws(fn, (error: unknown) => {
    assert.ok(error instanceof OptionError, String(error));
    assert.equal(error.message, message);
    return true;
  });
}

const rows = (header: string, values: string[]) => [header, ...values].join("\n") + "\n";
const quoted = (...values: string[]) => values.map((v) => `"${v}"`);
const range = (n: number, f: (i: number) => string) => Array.from({ length: n }, (_, i) => f(i));

Deno.test("columns are stored as typed arrays", () => {
  const table = loadTable("family,level,pay\nSales,L1,50000\nOps,L2,61000\nSales,L1,\n");
  const [family, level, pay] = table.columns;
  assert.equal(family.type, "categorical");
  assert.ok(family.type === "categorical" && family.codes instanceof Int32Array);
  assert.deepEqual(family.type === "categorical" && [...family.codes], [1, 0, 1]);
  assert.deepEqual(family.type === "categorical" && family.levels, ["Ops", "Sales"]);
  assert.equal(level.type, "ordinal");
  assert.ok(pay.type === "numeric" && pay.values instanceof Float64Array);
  assert.deepEqual(pay.type === "numeric" && [...pay.values], [50000, 61000, NaN]);
  assert.equal(pay.missing, 1);
  assert.deepEqual([...table.lines], [2, 3, 4]);
});

Deno.test("type inference: numeric, categorical, identifier, constant", () => {
  const csv = rows(
    "employee,site,years,remote,country",
    range(
      30,
      (i) =>
        `E${1000 + i},${["North", "South", "Harbor"][i % 3]},${i % 7},${
          i % 2 ? "yes" : "no"
        },Ruritania`,
    ),
  );
  const table = loadTable(csv);
  assert.deepEqual(table.columns.map((c) => c.type), [
    "identifier",
    "categorical",
    "numeric",
    "categorical",
    "constant",
  ]);
  const constant = table.columns[4];
  assert.ok(constant.type === "constant" && constant.value === "Ruritania");
});

Deno.test("a numeric column named as an id and unique per row is an identifier", () => {
  const csv = rows("emp_id,pay", range(10, (i) => `${100 + i},${50000 + i}`));
  assert.equal(column(csv, "emp_id").type, "identifier");
  // The same numbers under another name stay numeric.
  assert.equal(column(csv.replace("emp_id", "floor"), "floor").type, "numeric");
});

Deno.test("ordinal levels like L1..L10 are ordered by their number", () => {
  const level = column(rows("level", ["L2", "L10", "L1", "L2", "L3"]), "level");
  assert.equal(level.type, "ordinal");
  assert.ok(level.type === "ordinal");
  assert.deepEqual(level.levels, ["L1", "L2", "L3", "L10"]);
  assert.deepEqual([...level.codes], [1, 3, 0, 1, 2]);
  const p = column(rows("grade", ["P 3", "P 1", "P 2"]), "grade");
  assert.ok(p.type === "ordinal" && p.levels.join() === "P 1,P 2,P 3");
});

Deno.test("a declared order makes a column ordinal in that order", () => {
  const csv = rows("title", ["Senior", "Associate", "Staff", "Senior", "Principal"]);
  const order = ["Associate", "Senior", "Staff", "Principal"];
  const title = column(csv, "title", { orders: { title: order } });
  assert.ok(title.type === "ordinal");
  assert.deepEqual(title.levels, order);
  assert.deepEqual([...title.codes], [1, 0, 2, 1, 3]);
  optionFails(
    () => loadTable(csv, { orders: { title: ["Associate", "Senior", "Staff"] } }),
    'order title: the data has level not in the order: "Principal" (line 6)',
  );
  optionFails(
    () => loadTable(csv, { types: { title: "ordinal" } }),
    "type title=ordinal needs an order: give order title=Associate,Principal,Senior,Staff " +
      "with the levels lowest first",
  );
});

Deno.test("missing values: the default tokens, case-insensitive, and a custom list", () => {
  const csv = rows("pay,site", ["50000,A", "NA,B", "n/a,null", "-,A", ",B", "61000,?"]);
  const pay = column(csv, "pay");
  assert.ok(pay.type === "numeric");
  assert.deepEqual([...pay.values], [50000, NaN, NaN, NaN, NaN, 61000]);
  assert.equal(pay.missing, 4);
  const site = column(csv, "site");
  assert.ok(site.type === "categorical");
  assert.equal(site.missing, 1);
  assert.deepEqual(site.levels, ["?", "A", "B"]);
  assert.equal(site.codes[2], -1);
  const custom = column(csv, "site", { missing: ["?"] });
  assert.ok(custom.type === "categorical");
  assert.deepEqual(custom.levels, ["A", "B", "null"]);
  assert.equal(custom.missing, 1);
});

Deno.test("a missing target excludes the row and is counted", () => {
  const table = loadTable(rows("site,pay", ["A,50000", "B,", "A,NA", "B,61000"]), {
    target: "pay",
  });
  assert.equal(table.rows, 2);
  assert.deepEqual(table.excluded, { count: 2, lines: [3, 4] });
  assert.deepEqual([...table.lines], [2, 5]);
  assert.ok(table.notes.includes('2 rows left out: the target "pay" is missing (first on line 3)'));
});

Deno.test("pay as people export it: currency, grouping, k, decimal comma", () => {
  const dollars = column(rows("base_pay", ['"$85,000"', '"$61,500"', "$99k"]), "base_pay");
  assert.ok(dollars.type === "numeric");
  assert.deepEqual([...dollars.values], [85000, 61500, 99000]);
  assert.deepEqual(dollars.money, { currency: "USD" });
  const euros = column(rows("salary", quoted("85.000,00 €", "61.500,50 €")), "salary", {
    decimal: ",",
  });
  assert.ok(euros.type === "numeric");
  assert.deepEqual([...euros.values], [85000, 61500.5]);
  assert.deepEqual(euros.money, { currency: "EUR" });
  const semicolon = loadTable("site;salary\nA;85.000,00\nB;61.500,50\n", { decimal: "," });
  assert.equal(semicolon.source.delimiter, ";");
  const pay = semicolon.columns[1];
  assert.ok(pay.type === "numeric" && pay.values[1] === 61500.5);
});

Deno.test("a pay column that mixes currencies is refused with the lines", () => {
  dataFails(
    () =>
      loadTable(rows("pay", quoted("$85,000", "€70,000", "$61,000", "€64,000")), { file: "t.csv" }),
    't.csv: "pay" mixes currencies (USD on lines 2, 4; EUR on lines 3, 5); pay in different ' +
      "currencies cannot be compared without exchange rates: convert it to one currency first",
    3,
  );
});

Deno.test("--currency names the currency, and cannot contradict the data", () => {
  const pay = column(rows("pay", quoted("$85,000", "$61,000")), "pay", { currency: "CAD" });
  assert.ok(pay.type === "numeric");
  assert.deepEqual(pay.money, { currency: "CAD" });
  optionFails(
    () => loadTable(rows("pay", quoted("€85,000", "€61,000")), { currency: "USD" }),
    'currency USD: "pay" is written in EUR (lines 2, 3)',
  );
});

Deno.test("hourly pay is annualised with --hours-per-year; mixed periods go to per year", () => {
  const hourly = column(rows("hourly_wage", ["20", "30.5"]), "hourly_wage", { hoursPerYear: 2000 });
  assert.ok(hourly.type === "numeric");
  assert.deepEqual([...hourly.values], [40000, 61000]);
  assert.deepEqual(hourly.money, { period: "year" });
  assert.deepEqual(hourly.notes, ["annualised (hourly x 2000 hours)"]);
  const kept = column(rows("hourly_wage", ["20", "30.5"]), "hourly_wage");
  assert.ok(kept.type === "numeric");
  assert.deepEqual(kept.money, { period: "hour" });
  const mixed = column(rows("pay", quoted("5,000/month", "70,000/year", "1,000 per week")), "pay");
  assert.ok(mixed.type === "numeric");
  assert.deepEqual([...mixed.values], [60000, 70000, 52000]);
  dataFails(
    () => loadTable(rows("pay", quoted("25/hour", "70,000/year")), { file: "t.csv" }),
    't.csv: "pay" mixes hourly pay (line 2) with pay per year (line 3); give hoursPerYear ' +
      "to annualise the hourly values",
    2,
  );
  const declared = column(rows("wage", ["5.1", "4.95"]), "wage", {
    periods: { wage: "hour" },
    hoursPerYear: 2080,
  });
  assert.ok(declared.type === "numeric");
  assert.equal(declared.values[0], 5.1 * 2080);
});

Deno.test("--fte makes part-time pay full-time-equivalent", () => {
  const csv = rows("pay,fte", ["40000,0.5", "60000,1", "30000,", "45000,0.75"]);
  const table = loadTable(csv, { fte: "fte" });
  const pay = table.columns[0];
  assert.ok(pay.type === "numeric");
  assert.deepEqual([...pay.values], [80000, 60000, NaN, 60000]);
  assert.equal(pay.missing, 1);
  const percent = loadTable(rows("pay,fte", ["40000,50", "60000,100"]), { fte: "fte" });
  assert.ok(percent.columns[0].type === "numeric");
  assert.deepEqual([...percent.columns[0].values], [80000, 60000]);
  dataFails(
    () => loadTable(rows("pay,fte", ["40000,0.5", "60000,-1"]), { fte: "fte", file: "t.csv" }),
    't.csv line 3: "fte" is -1, not a full-time-equivalent fraction between 0 and 1 (or a ' +
      "percentage up to 100)",
    3,
  );
});

Deno.test("a column numeric but for a few values is refused, quoting them", () => {
  const values = range(40, (i) => String(50000 + 1000 * i));
  values[3] = "abc";
  values[20] = "tbd";
  dataFails(
    () => loadTable(rows("pay", values), { file: "t.csv" }),
    't.csv: pay: line 5 has "abc", line 22 has "tbd", not a number (missing values may be ' +
      "written as empty, NA, N/A, #N/A, NaN, null or -)",
    5,
  );
  // Declared categorical, the same column loads.
  assert.equal(
    column(rows("pay", values), "pay", { types: { pay: "categorical" } }).type,
    "categorical",
  );
});

Deno.test("a column declared numeric must hold numbers", () => {
  dataFails(
    () =>
      loadTable(rows("site,pay", ["A,1", "B,x", "C,3"]), {
        file: "t.csv",
        types: { pay: "numeric" },
      }),
    't.csv: pay: line 3 has "x", not a number (missing values may be written as empty, NA, ' +
      "N/A, #N/A, NaN, null or -)",
    3,
  );
});

Deno.test("comma-decimal numbers read without --decimal get a hint", () => {
  // A comma file (a semicolon file's cells would settle the mark: see decimal_mark_test.ts).
  const values = range(20, (i) => `"${i},5"`);
  dataFails(
    () =>
      loadTable(rows("rating", values), {
        file: "t.csv",
        delimiter: ",",
        types: { rating: "numeric" },
      }),
    't.csv: rating: line 2 has "0,5", line 3 has "1,5", line 4 has "2,5", line 5 has "3,5", ' +
      'line 6 has "4,5", and 15 more, not a number; the values read as numbers with decimal "," ' +
      "(missing values may be written as empty, NA, N/A, #N/A, NaN, null or -)",
  );
});

Deno.test("the target must be usable", () => {
  dataFails(
    () => loadTable(rows("site,pay", ["A,50000", "B,50000"]), { file: "t.csv", target: "pay" }),
    't.csv: the target "pay" has fewer than 2 distinct values; there is nothing to predict',
  );
  dataFails(
    () => loadTable(rows("site,pay", ["A,", "B,NA"]), { file: "t.csv", target: "pay" }),
    't.csv: the target "pay" is missing on every row',
  );
  dataFails(
    () =>
      loadTable(rows("site,pay", ["A,high", "B,low", "C,high"]), {
        file: "t.csv",
        target: "pay",
        targetKind: "numeric",
      }),
    't.csv: pay: line 2 has "high", line 3 has "low", line 4 has "high", not a number ' +
      "(missing values may be written as empty, NA, N/A, #N/A, NaN, null or -)",
    2,
  );
  dataFails(
    () =>
      loadTable(rows("site,level", ["A,L1", "B,L2"]), {
        file: "t.csv",
        target: "level",
        targetKind: "numeric",
        types: { level: "ordinal" },
        orders: { level: ["L1", "L2"] },
      }),
    't.csv: the target "level" must be numeric pay, but it is ordinal (levels such as "L1", "L2")',
  );
  // A class target (e.g. level) is fine.
  const table = loadTable(rows("site,level", ["A,L1", "B,L2"]), {
    target: "level",
    targetKind: "class",
  });
  assert.equal(table.columns[1].type, "ordinal");
});

Deno.test("unknown column names in options list the columns", () => {
  const csv = rows("site,pay", ["A,1", "B,2"]);
  const listed = "the columns are: site, pay";
  optionFails(
    () => loadTable(csv, { target: "salary" }),
    `target: no column named "salary"; ${listed}`,
  );
  optionFails(
    () => loadTable(csv, { types: { wage: "numeric" } }),
    `type: no column named "wage"; ${listed}`,
  );
  optionFails(
    () => loadTable(csv, { orders: { level: ["a"] } }),
    `order: no column named "level"; ${listed}`,
  );
  optionFails(
    () => loadTable(csv, { protected: ["sex"] }),
    `protected: no column named "sex"; ${listed}`,
  );
  optionFails(() => loadTable(csv, { fte: "fte" }), `fte: no column named "fte"; ${listed}`);
  optionFails(
    () => loadTable(csv, { periods: { w: "hour" } }),
    `period: no column named "w"; ${listed}`,
  );
});

Deno.test("protected attributes are flagged by name and by option", () => {
  const table = loadTable(
    rows("gender,age_band,Essex_site,wage,team", ["F,30-39,A,1,x", "M,40-49,B,2,y"]),
    {
      protected: ["team"],
    },
  );
  assert.deepEqual(table.columns.map((c) => c.protected), [true, true, false, false, true]);
});

Deno.test("bytes are decoded with the given encoding", () => {
  const bytes = new Uint8Array([
    ...new TextEncoder().encode("site,pay\nZ"),
    0xfc,
    ...new TextEncoder().encode("rich,1\nBern,2\n"),
  ]);
  const table = loadTable(bytes, { encoding: "windows-1252" });
  const site = table.columns[0];
  assert.ok(site.type === "categorical");
  assert.deepEqual(site.levels, ["Bern", "Zürich"]);
});

Deno.test("a decimal-comma file read without --decimal gets a warning, not a guess", () => {
  // Comma-delimited: only a semicolon file's cells settle the mark.
  const csv = 'site,years,salary\nA,"5,5","72.500,00 €"\nB,2,"61.000,00 €"\nC,9,"95.250,00 €"\n';
  const table = loadTable(csv);
  assert.equal(table.columns[2].type, "categorical");
  const found = table.warnings.find((w) => w.kind === "decimal-mark");
  assert.equal(
    found?.message,
    '"years", "salary" read as numbers only with {decimal} ","; without it they are treated as text',
  );
  const declared = loadTable(csv, { decimal: "," });
  assert.equal(declared.warnings.find((w) => w.kind === "decimal-mark"), undefined);
  const salary = declared.columns[2];
  assert.ok(salary.type === "numeric");
  assert.deepEqual([...salary.values], [72500, 61000, 95250]);
});

Deno.test("a target named as pay must be numeric even without a declared kind", () => {
  dataFails(
    () => loadTable(rows("site,salary", ["A,high", "B,low"]), { file: "t.csv", target: "salary" }),
    't.csv: salary: line 2 has "high", line 3 has "low", not a number (missing values may be ' +
      "written as empty, NA, N/A, #N/A, NaN, null or -)",
    2,
  );
});

Deno.test("a pay column with stray text is refused, not made into levels", () => {
  const values = range(28, (i) => String(41000 + 1500 * i));
  values[6] = "TBD";
  values[19] = "TBD";
  dataFails(
    () => loadTable(rows("base_pay", values), { file: "t.csv" }),
    't.csv: base_pay: line 8 has "TBD", line 21 has "TBD", not a number (missing values may be ' +
      "written as empty, NA, N/A, #N/A, NaN, null or -)",
    8,
  );
  // A typed letter O among digits gets a hint.
  values[6] = '"85,0OO"';
  values[19] = "61000";
  assert.throws(() => loadTable(rows("base_pay", values)), /a letter O or l typed for a digit\?/);
  // A pay-named column of words stays categorical.
  assert.equal(column(rows("pay_band", ["A", "B", "A", "C"]), "pay_band").type, "categorical");
});

Deno.test("spreadsheet and pandas missing markers are missing", () => {
  const pay = column(rows("salary", ["51000", "#N/A", "NaN", "nan", "62000"]), "salary");
  assert.ok(pay.type === "numeric");
  assert.equal(pay.missing, 3);
});

Deno.test("a column of weekly hours is not taken for FTE percentages", () => {
  dataFails(
    () => loadTable(rows("pay,hours", ["40000,20", "60000,40"]), { fte: "hours", file: "t.csv" }),
    't.csv line 2: "hours" is 20, not a full-time-equivalent fraction between 0 and 1 (or a ' +
      "percentage up to 100)",
    2,
  );
});

Deno.test("mixed pay periods with values that state none are refused", () => {
  dataFails(
    () =>
      loadTable(rows("pay", quoted("4,000/month", "52,000", "61,000", "70,000/year")), {
        file: "t.csv",
      }),
    't.csv: "pay" mixes pay periods (month, year), and lines 3, 4 state none; give period ' +
      "pay=PERIOD for the values that do not say",
    3,
  );
});

Deno.test("rates paid per period are pay", () => {
  const rate = column(rows("hourly_rate", ["20.5", "31"]), "hourly_rate");
  assert.ok(rate.type === "numeric");
  assert.deepEqual(rate.money, { period: "hour" });
  assert.equal(column(rows("attrition_rate", ["0.1", "0.2"]), "attrition_rate").type, "numeric");
  const attrition = column(rows("attrition_rate", ["0.1", "0.2"]), "attrition_rate");
  assert.ok(attrition.type === "numeric" && attrition.money === undefined);
});

Deno.test("warnings count every line concerned, listing the first five", () => {
  const values = range(30, (i) => `e${i},${50000 + i}`);
  for (const i of [3, 9, 12, 15, 20, 25, 28]) values[i] = `e${i - 1},${50000 + i}`;
  const table = loadTable(rows("id,salary", values), { types: { id: "identifier" } });
  const found = table.warnings.find((w) => w.kind === "duplicate-identifier");
  assert.equal(found?.count, 7);
  assert.equal(
    found?.message,
    '"id": 7 identifiers repeat an earlier row (lines 5, 11, 14, 17, 22 and 2 more)',
  );
});

Deno.test("a decimal-comma pay column with stray text still gets the decimal hint", () => {
  const csv = 'site,base_salary\nA,"72.500,00 €"\nB,"61.000,00 €"\nC,"95.250,00 €"\nD,TBD\n';
  const found = loadTable(csv).warnings.find((w) => w.kind === "decimal-mark");
  assert.equal(
    found?.message,
    '"base_salary" reads as numbers only with {decimal} ","; without it it is treated as text',
  );
  // A column of words that happen to contain one number is no such column.
  const words = loadTable("site;team\nA;red\nB;blue\nC;1,5\n");
  assert.equal(words.warnings.find((w) => w.kind === "decimal-mark"), undefined);
});

Deno.test("a column declared numeric stays numeric when every cell is missing or equal", () => {
  const table = loadTable("id,rating,offer\na,,50000\nb,,50000\n", {
    types: { rating: "numeric", offer: "numeric" },
  });
  const [, rating, offer] = table.columns;
  assert.ok(rating.type === "numeric" && rating.values.every(Number.isNaN));
  assert.ok(offer.type === "numeric" && offer.values.every((v) => v === 50000));
  // Undeclared, the same columns are constant and left out of models.
  assert.equal(loadTable("id,rating,offer\na,,50000\nb,,50000\n").columns[2].type, "constant");
});

// Pinned before the reader learned to read numbers from the cells where they
// lie (without a string per cell): each cell that is almost a number reads
// exactly as Number() and the text reader read it, whole or in pieces.
const ALMOST_NUMBERS = rows("big,neg0,hex,spaced,comma,pay", [
  '1e400,-0,0x10, 12 ,"1,5",1',
  "2,3,4,5,6,2",
]);

async function loadPieces(csv: string, size: number, options: LoadTableOptions = {}) {
  const bytes = new TextEncoder().encode(csv);
  async function* pieces() {
    for (let i = 0; i < bytes.length; i += size) yield bytes.subarray(i, i + size);
  }
  return await loadTableChunks(pieces(), options);
}

Deno.test("cells that are almost numbers read as Number() reads them, whole or in pieces", async () => {
  const table = loadTable(ALMOST_NUMBERS);
  const [big, neg0, hex, spaced, comma] = table.columns;
  // Too large for a double, hexadecimal, a comma under the point mark: text.
  assert.deepEqual(big.type === "categorical" && big.levels, ["1e400", "2"]);
  assert.deepEqual(hex.type === "categorical" && hex.levels, ["0x10", "4"]);
  assert.deepEqual(comma.type === "categorical" && comma.levels, ["1,5", "6"]);
  // "-0" is negative zero; spaces around a number are trimmed.
  assert.ok(neg0.type === "numeric" && Object.is(neg0.values[0], -0) && neg0.values[1] === 3);
  assert.deepEqual(spaced.type === "numeric" && [...spaced.values], [12, 5]);
  assert.deepEqual(table.warnings.map((w) => w.kind), ["decimal-mark"]);
  for (const size of [1, 7]) assert.deepEqual(await loadPieces(ALMOST_NUMBERS, size), table);
});

Deno.test("signs, points, exponents and long digit runs read as Number() reads them", async () => {
  const csv = rows("x,y,z", [
    "-0,1e3,9007199254740993",
    "-0.0,.5,0.30000000000000004",
    "+5,-.5,1.7976931348623157e308",
    "007,40.,5e-324",
    "40.10,0.0000001,1.234567890123456789",
    '" 12 ",123456789012345678,123456789012345.6',
    "1.5E-3,-1e-7,12345678901234.56",
  ]);
  const table = loadTable(csv);
  const values = table.columns.map((c) => (c.type === "numeric" ? [...c.values] : c.type));
  const z = [9007199254740992, 0.30000000000000004, 1.7976931348623157e308, 5e-324];
  z.push(1.2345678901234567, 123456789012345.6, 12345678901234.56);
  assert.deepEqual(values, [
    [-0, -0, 5, 7, 40.1, 12, 0.0015],
    [1000, 0.5, -0.5, 40, 1e-7, 123456789012345680, -1e-7],
    z,
  ]);
  assert.ok(table.columns[0].type === "numeric" && Object.is(table.columns[0].values[1], -0));
  for (const size of [1, 3]) assert.deepEqual(await loadPieces(csv, size), table);
  // Infinity either way is text, wherever the first such cell comes.
  for (const cell of ["1e400", "-1e400", "Infinity"]) {
    const late = loadTable(rows("x", ["1", "2", cell])).columns[0];
    assert.deepEqual(late.type === "categorical" && late.levels.includes(cell), true);
  }
});

Deno.test("CRLF, CR, quotes, spaces, missing tokens and multi-byte text read the same in pieces", async () => {
  const csv = 'id,name,level,x,pay\r\n1,"café ""A""",L1, NA ,"50,000"\r\n' +
    '2,"line\r\nbreak",L2,n/a,61000\r\n3,€,L1,-,\r\n4,naïve,L3,"  7.50 ",55000\r\n';
  const table = loadTable(csv, { target: "pay" });
  const [id, name, level, x, pay] = table.columns;
  // "id" names rows: its texts are kept, the excluded row's left out.
  assert.deepEqual(id.type === "identifier" && id.values, ["1", "2", "4"]);
  assert.deepEqual(name.type === "categorical" && name.levels.sort(), [
    'café "A"',
    "line\r\nbreak",
    "naïve",
  ]);
  assert.deepEqual(level.type === "ordinal" && level.levels, ["L1", "L2", "L3"]);
  // One value besides the missing tokens: a constant, said as its number.
  assert.ok(x.type === "constant" && x.missing === 2 && x.value === "7.5");
  assert.deepEqual(pay.type === "numeric" && [...pay.values], [50000, 61000, 55000]);
  assert.deepEqual([...table.lines], [2, 3, 6]);
  for (const size of [1, 2, 5]) {
    assert.deepEqual(await loadPieces(csv, size, { target: "pay" }), table);
  }
  const cr = "a,pay\r1,2\r3,4\r";
  assert.deepEqual(await loadPieces(cr, 1), loadTable(cr));
  assert.deepEqual([...loadTable(cr).lines], [2, 3]);
});

Deno.test("a huge cell and a long run of digits are text, read the same in pieces", async () => {
  const csv = rows("name,n,pay", [`${"x".repeat(200_000)},${"1".repeat(300)},1`, "b,2,2"]);
  const table = loadTable(csv);
  const [name, n] = table.columns;
  assert.ok(name.type === "categorical" && name.levels[1] === "x".repeat(200_000));
  assert.deepEqual(n.type === "categorical" && n.levels, ["2", "1".repeat(300)]);
  assert.deepEqual(await loadPieces(csv, 4096), table);
});

Deno.test("bytes that are not UTF-8 are refused with their line, in pieces too", async () => {
  const bytes = new TextEncoder().encode("name,pay\nok,1\n" + "x,2\n".repeat(20_000));
  const bad = new Uint8Array([...bytes, 0xc3, 0x28, 0x2c, 0x33, 0x0a]);
  async function* pieces() {
    for (let i = 0; i < bad.length; i += 65536) yield bad.subarray(i, i + 65536);
  }
  const message = "input line 20003 is not valid utf-8 text; re-save the file as UTF-8, or " +
    "name its encoding (e.g. encoding windows-1252)";
  await assert.rejects(() => loadTableChunks(pieces()), (e: unknown) => {
    assert.ok(e instanceof DataError && e.message === message, String(e));
    return true;
  });
  assert.throws(
    () => loadTable(bad),
    (e: unknown) => e instanceof DataError && e.message === message,
  );
});
