// Text columns with many levels: identifier-like columns (more than 50
// levels, and more levels than half the rows with a value) are said and left
// out of the default features; a categorical feature splits on at most
// MAX_SPLIT_LEVELS levels, declared ones included. The counts below are set
// by the tables written here, so each expectation is known in advance.
import assert from "node:assert/strict";
import {
  loadTable,
  makeDataset,
  MAX_CLASSES,
  MAX_SPLIT_LEVELS,
  OptionError,
} from "../../../mod.ts";

/** A table of `rows` rows whose column `team` cycles through `levels` texts. */
function table(rows: number, levels: number, extra = ""): string {
  const lines = ["level,team,pay"];
  for (let r = 0; r < rows; r++) {
    lines.push(`L${1 + (r % 3)},team ${r % levels}${extra},${40000 + 37 * r}`);
  }
  return lines.join("\n") + "\n";
}

function team(text: string, types?: Record<string, "categorical">) {
  const loaded = loadTable(text, { target: "pay", ...(types ? { types } : {}) });
  return loaded.columns.find((c) => c.name === "team")!;
}

Deno.test("a text column of more than 50 levels and more than half as many as rows is identifier-like", () => {
  // 51 levels in 100 rows: both conditions hold.
  const like = team(table(100, 51));
  assert.equal(like.type, "categorical");
  assert.deepEqual(like.type === "categorical" && like.identifierLike, { levels: 51, rows: 100 });
  // 50 levels in 60 rows: more than half, but not more than 50 levels.
  const fifty = team(table(60, 50));
  assert.equal(fifty.type === "categorical" && fifty.identifierLike, undefined);
  // 60 levels in 120 rows: exactly half, not more.
  const half = team(table(120, 60));
  assert.equal(half.type === "categorical" && half.identifierLike, undefined);
  // 61 levels in 120 rows: more than half.
  const over = team(table(120, 61));
  assert.deepEqual(over.type === "categorical" && over.identifierLike, { levels: 61, rows: 120 });
});

Deno.test("missing cells do not count as rows with a value", () => {
  // 55 levels in 100 rows with a value, 100 more rows missing: 55 > 50.
  const lines = table(100, 55).trimEnd().split("\n");
  for (let r = 0; r < 100; r++) lines.push(`L1,,${50000 + r}`);
  const column = team(lines.join("\n") + "\n");
  assert.deepEqual(column.type === "categorical" && column.identifierLike, {
    levels: 55,
    rows: 100,
  });
});

Deno.test("a declared categorical column is never identifier-like", () => {
  const declared = team(table(100, 51), { team: "categorical" });
  assert.equal(declared.type, "categorical");
  assert.equal(declared.type === "categorical" && declared.identifierLike, undefined);
});

Deno.test("an identifier-like column is left out of the default features, kept when named", () => {
  const loaded = loadTable(table(100, 51), { target: "pay" });
  const { dataset, dropped } = makeDataset(loaded, { target: "pay" });
  assert.deepEqual(dataset.features.map((f) => f.name), ["level"]);
  assert.deepEqual(dropped, [{
    name: "team",
    reason: "identifier-like",
    detail: { kind: "identifier-like", levels: 51, rows: 100 },
  }]);
  const named = makeDataset(loaded, { target: "pay", features: ["level", "team"] });
  assert.deepEqual(named.dataset.features.map((f) => f.name), ["level", "team"]);
});

Deno.test("a categorical feature splits on at most MAX_SPLIT_LEVELS levels, declared ones included", () => {
  assert.equal(MAX_SPLIT_LEVELS, 1000);
  // MAX_SPLIT_LEVELS levels, each twice: kept.
  const at = loadTable(table(2 * MAX_SPLIT_LEVELS, MAX_SPLIT_LEVELS), { target: "pay" });
  assert.deepEqual(makeDataset(at, { target: "pay" }).dataset.features.map((f) => f.name), [
    "level",
    "team",
  ]);
  // One more level: left out with the count and the bound, also when declared.
  const rows = 2 * (MAX_SPLIT_LEVELS + 1);
  for (const types of [undefined, { team: "categorical" as const }]) {
    const over = loadTable(table(rows, MAX_SPLIT_LEVELS + 1), {
      target: "pay",
      ...(types ? { types } : {}),
    });
    const { dataset, dropped } = makeDataset(over, { target: "pay" });
    assert.deepEqual(dataset.features.map((f) => f.name), ["level"]);
    assert.deepEqual(dropped, [{
      name: "team",
      reason: "too many levels",
      detail: { kind: "too-many-levels", levels: MAX_SPLIT_LEVELS + 1, limit: MAX_SPLIT_LEVELS },
    }]);
    // Named as a feature: refused with the count and the bound.
    assert.throws(
      () => makeDataset(over, { target: "pay", features: ["team"] }),
      (e) =>
        e instanceof OptionError &&
        e.message === `"team" has 1,001 levels; a categorical attribute is split on at most ` +
            `1,000 (the search and each split's level sets grow with the levels): leave it ` +
            `out, or group its levels into fewer`,
    );
  }
});

Deno.test("an ordinal column is not bounded: it splits by threshold, like a number", () => {
  const lines = ["grade,pay"];
  const grades = Array.from({ length: MAX_SPLIT_LEVELS + 1 }, (_, i) => `grade ${i}`);
  for (let r = 0; r < 2 * grades.length; r++) {
    lines.push(`${grades[r % grades.length]},${40000 + 11 * r}`);
  }
  const loaded = loadTable(lines.join("\n") + "\n", {
    target: "pay",
    orders: { grade: grades },
  });
  assert.equal(loaded.columns[0].type, "ordinal");
  const { dataset } = makeDataset(loaded, { target: "pay" });
  assert.deepEqual(dataset.features.map((f) => f.name), ["grade"]);
});

Deno.test("a class target has at most MAX_CLASSES classes", () => {
  assert.equal(MAX_CLASSES, 100);
  const rows = (classes: number) => {
    const lines = ["team,years"];
    for (let r = 0; r < 3 * classes; r++) lines.push(`team ${r % classes},${r % 17}`);
    return loadTable(lines.join("\n") + "\n", { target: "team", types: { team: "categorical" } });
  };
  const at = makeDataset(rows(MAX_CLASSES), { target: "team" }).dataset.target;
  assert.equal(at.kind === "classification" && at.classes.length, MAX_CLASSES);
  assert.throws(
    () => makeDataset(rows(MAX_CLASSES + 1), { target: "team" }),
    (e) =>
      e instanceof OptionError &&
      e.message === `"team" has 101 classes; a class target has at most 100 (every node of ` +
          `every tree keeps a share for each class): choose a target of fewer levels, or group them`,
  );
});
