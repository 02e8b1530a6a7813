// The data a fitting worker receives: the same values in shared memory,
// read back as the dataset it came from.
import assert from "node:assert/strict";
import { binFeatures, canonicalRowOrder } from "../../../mod.ts";
import { datasetOf, shareData } from "../../../lib/ensemble/_shared_data.ts";
import { smallPay } from "./_small_pay.ts";

Deno.test("shared data holds the dataset's values in shared memory and reads back equal", () => {
  const dataset = smallPay();
  const bins = binFeatures(dataset);
  const order = canonicalRowOrder(dataset);
  const data = shareData(dataset, bins, order);
  assert(data.features.every((f) => f.values.buffer instanceof SharedArrayBuffer));
  assert(data.target.values.buffer instanceof SharedArrayBuffer);
  const back = datasetOf(data);
  assert.equal(back.rows, dataset.rows);
  assert.deepEqual(back.target, dataset.target);
  back.features.forEach((f, i) => {
    assert.equal(f.name, dataset.features[i].name);
    assert.deepEqual(Array.from(f.values), Array.from(dataset.features[i].values));
  });
  assert.deepEqual(Array.from(data.order), Array.from(order));
});
