import assert from "node:assert/strict";
import {
  arrayFromBase64,
  arrayToBase64,
  withChecksum,
  withoutChecksum,
} from "../../../lib/io/checked_json.ts";

// Reference texts from Python 3 (base64.b64encode(struct.pack("<2d", 1.5, -2)) and so on:
// little-endian bytes, standard alphabet with padding).
Deno.test("arrays are written as base64 of their little-endian bytes, as Python's struct gives", () => {
  assert.equal(arrayToBase64(Float64Array.of(1.5, -2)), "AAAAAAAA+D8AAAAAAAAAwA==");
  assert.equal(arrayToBase64(Int32Array.of(1, -2, 2 ** 31 - 1)), "AQAAAP7///////9/");
  assert.equal(arrayToBase64(Uint32Array.of(0, 2 ** 32 - 1)), "AAAAAP////8=");
  assert.equal(arrayToBase64(Uint8Array.of(0, 255, 128)), "AP+A");
  assert.equal(arrayToBase64(new Float64Array(0)), "");
});

Deno.test("a view into a larger buffer writes only its own elements", () => {
  const whole = Int32Array.of(7, 1, -2, 9);
  const view = whole.subarray(1, 3);
  assert.equal(arrayToBase64(view), arrayToBase64(Int32Array.of(1, -2)));
});

Deno.test("arrays read back bit for bit, NaN, -0 and extremes included", () => {
  const values = Float64Array.of(NaN, -0, Number.MAX_VALUE, Number.MIN_VALUE, -Infinity, 0.1);
  const back = arrayFromBase64(arrayToBase64(values), Float64Array, values.length);
  assert.ok(back instanceof Float64Array);
  assert.deepEqual(new Uint8Array(back.buffer), new Uint8Array(values.buffer));
  assert.ok(Object.is(back[1], -0));
});

Deno.test("arrays above 32 KiB (the piece size) round-trip whole", () => {
  // 0x8000 bytes is one piece; 10,001 doubles are 80,008 bytes, three pieces.
  const values = Float64Array.from({ length: 10_001 }, (_, i) => i * 1.25 - 3);
  const text = arrayToBase64(values);
  assert.equal(text.length, 4 * Math.ceil(80_008 / 3));
  assert.deepEqual(arrayFromBase64(text, Float64Array, values.length), values);
});

Deno.test("a text of the wrong length or not base64 is said, not thrown", () => {
  assert.equal(arrayFromBase64("AQAAAP7///8=", Int32Array, 3), "has 8 bytes, expected 12");
  assert.equal(arrayFromBase64("AQAAAP7///8=", Int32Array, 1), "has 8 bytes, expected 4");
  assert.equal(arrayFromBase64("AQ!A", Int32Array, 1), "is not base64");
  assert.deepEqual(arrayFromBase64("", Uint32Array, 0), new Uint32Array(0));
  assert.deepEqual(arrayFromBase64("AAAAAP////8=", Uint32Array, 2), Uint32Array.of(0, 2 ** 32 - 1));
});

// Checksum from Python 3: hashlib.sha256(json.dumps({"kind": "x", "n": None, "a": [1, 2.5]},
// separators=(",", ":")).encode()).hexdigest().
Deno.test("the checksum is SHA-256 of the compact JSON, appended as the last field", () => {
  const text = withChecksum({ kind: "x", n: NaN, a: [1, 2.5] });
  assert.equal(
    text,
    '{"kind":"x","n":null,"a":[1,2.5],' +
      '"checksum":"10fdc2c9f01ac1fc72f8c847b29e486c668918b0beef37f955c65f743e490090"}',
  );
  assert.deepEqual(withoutChecksum(JSON.parse(text)), { kind: "x", n: null, a: [1, 2.5] });
});

Deno.test("an edited, truncated or unsigned document is refused", () => {
  const text = withChecksum({ pay: [50000, 61000], kind: "model" });
  const parsed = JSON.parse(text);
  assert.notEqual(withoutChecksum(parsed), null);
  assert.equal(withoutChecksum({ ...parsed, pay: [50000, 61001] }), null);
  assert.equal(withoutChecksum({ kind: "model", pay: [50000, 61000] }), null);
  assert.equal(withoutChecksum({ ...parsed, checksum: 12 }), null);
  assert.equal(withoutChecksum({ ...parsed, checksum: parsed.checksum.toUpperCase() }), null);
  // A field added after signing changes what is summed.
  assert.equal(withoutChecksum({ ...parsed, extra: true }), null);
  // Field order is part of what is summed: the same fields reordered do not match.
  const { checksum, ...rest } = parsed;
  assert.equal(withoutChecksum({ kind: rest.kind, pay: rest.pay, checksum }), null);
});

Deno.test("an empty document and hostile text keep their checksum", () => {
  const empty = withChecksum({});
  assert.match(empty, /^\{,"checksum":"[0-9a-f]{64}"\}$/);
  const hostile = { name: '\u001b[31m"},"checksum":"0"\u0000</script>' };
  assert.deepEqual(withoutChecksum(JSON.parse(withChecksum(hostile))), hostile);
});
