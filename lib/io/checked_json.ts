/**
 * The framing of the JSON files paygrove writes for itself (model files,
 * analysts' files): typed arrays as base64 of their little-endian bytes
 * (compact and exact to the last bit), and a SHA-256 checksum of the
 * document written as its last field, so that a truncated or edited file
 * is told apart from a sound one.
 *
 * @module
 */

import { createHash } from "node:crypto";

/** The typed arrays the files hold. */
export type StoredArray = Int32Array | Float64Array | Uint8Array | Uint32Array;

/**
 * A typed array's bytes as base64.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { arrayFromBase64, arrayToBase64 } from "./checked_json.ts";
 * const text = arrayToBase64(Int32Array.of(1, -2));
 * assert.deepEqual(arrayFromBase64(text, Int32Array, 2), Int32Array.of(1, -2));
 * ```
 */
export function arrayToBase64(array: StoredArray): string {
  const bytes = new Uint8Array(array.buffer, array.byteOffset, array.byteLength);
  return (bytes as Uint8Array & Base64Bytes).toBase64();
}

// The runtime's own base64 of bytes (ECMAScript's Uint8Array base64
// methods, in V8 since 2025; not yet in TypeScript's library): standard
// alphabet with padding, the same text as btoa over the bytes as
// characters, and the same bytes as atob gives back. Through a string of
// characters, a 200-tree CPS1988 model took 77 ms to encode.
interface Base64Bytes {
  toBase64(): string;
}
const Base64 = Uint8Array as unknown as { fromBase64(text: string): Uint8Array };

/**
 * A typed array of `length` elements from base64, or a sentence saying why
 * the text is not one (to be put in the caller's own error).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { arrayFromBase64 } from "./checked_json.ts";
 * assert.equal(arrayFromBase64("AAAA", Float64Array, 1), "has 3 bytes, expected 8");
 * assert.equal(arrayFromBase64("*", Int32Array, 1), "is not base64");
 * ```
 */
export function arrayFromBase64<T extends StoredArray>(
  text: string,
  Ctor: { new (buffer: ArrayBuffer): T; BYTES_PER_ELEMENT: number },
  length: number,
): T | string {
  let bytes: Uint8Array;
  try {
    bytes = Base64.fromBase64(text);
  } catch {
    return "is not base64";
  }
  const expected = length * Ctor.BYTES_PER_ELEMENT;
  if (bytes.length !== expected) return `has ${bytes.length} bytes, expected ${expected}`;
  return new Ctor(bytes.buffer as ArrayBuffer);
}

/**
 * A document as compact JSON with its checksum as the last field (NaN,
 * which JSON lacks, written as null).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { withChecksum, withoutChecksum } from "./checked_json.ts";
 * const text = withChecksum({ kind: "x", n: NaN });
 * assert.deepEqual(withoutChecksum(JSON.parse(text)), { kind: "x", n: null });
 * assert.equal(withoutChecksum(JSON.parse(text.replace("null", "1"))), null);
 * ```
 */
export function withChecksum(body: object): string {
  const text = JSON.stringify(
    body,
    (_k, v) => (typeof v === "number" && Number.isNaN(v) ? null : v),
  );
  const checksum = createHash("sha256").update(text).digest("hex");
  return `${text.slice(0, -1)},"checksum":"${checksum}"}`;
}

/**
 * The parsed document without its checksum field, or null when the
 * checksum is missing or does not match the rest.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { withoutChecksum } from "./checked_json.ts";
 * // SHA-256 of the text {"a":1,"b":[2]}, from `echo -n '{"a":1,"b":[2]}' | sha256sum`.
 * const sum = "0855bfc20eb6cfaa4be7d6b510c63dd22997718bddadcb1a4915cec3a16145b9";
 * assert.deepEqual(withoutChecksum({ a: 1, b: [2], checksum: sum }), { a: 1, b: [2] });
 * assert.equal(withoutChecksum({ a: 2, b: [2], checksum: sum }), null);
 * assert.equal(withoutChecksum({ a: 1, b: [2] }), null);
 * ```
 */
export function withoutChecksum(raw: object): Record<string, unknown> | null {
  const { checksum, ...rest } = raw as { checksum?: unknown };
  if (typeof checksum !== "string") return null;
  const sum = createHash("sha256").update(JSON.stringify(rest)).digest("hex");
  return sum === checksum ? rest : null;
}
