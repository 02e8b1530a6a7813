import assert from "node:assert/strict";
import { loadTable, makeDataset } from "../../../mod.ts";

Deno.test("categoricalAsCodes turns unordered categories into their sorted positions", () => {
  const table = loadTable(
    "site,level,pay\nRidge,L1,50\nHarbor,L2,60\nNorth,L1,55\nHarbor,L3,70\n,L2,65\n",
    { target: "pay" },
  );
  const coded = makeDataset(table, { target: "pay", categoricalAsCodes: true }).dataset;
  const site = coded.features.find((f) => f.name === "site")!;
  assert.equal(site.kind, "numeric");
  // Sorted levels Harbor < North < Ridge; the blank cell stays missing.
  assert.deepEqual(Array.from(site.values), [2, 0, 1, 0, NaN]);
  // Ordinal columns keep their order and kind.
  assert.equal(coded.features.find((f) => f.name === "level")!.kind, "ordinal");
  const plain = makeDataset(table, { target: "pay" }).dataset;
  assert.equal(plain.features.find((f) => f.name === "site")!.kind, "categorical");
});
