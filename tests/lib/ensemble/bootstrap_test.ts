// Resampling states and the bootstrap counts drawn from them, against a
// second plain implementation: the key and states through WebCrypto's
// SHA-256 (not node:crypto), the draws through xoroshiro128+ written out
// with BigInts from its definition (Blackman & Vigna, "Scrambled linear
// pseudorandom number generators", 2018/2021: s1 ^= s0, s0 = rotl(s0, 24) ^
// s1 ^ (s1 << 16), s1 = rotl(s1, 37), output s0 + s1) and pure-rand 8.4.2's
// documented rejection for a uniform integer below n.
import assert from "node:assert/strict";
import { xoroshiro128plus } from "pure-rand/generator/xoroshiro128plus";
import { uniformInt } from "pure-rand/distribution/uniformInt";
import {
  bootstrapCounts,
  legacyResampleStates,
  resampleStates,
  STATE_WORDS,
} from "../../../lib/ensemble/bootstrap.ts";

async function sha256(...parts: Uint8Array[]): Promise<Uint8Array> {
  const all = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  let at = 0;
  for (const p of parts) {
    all.set(p, at);
    at += p.length;
  }
  return new Uint8Array(await crypto.subtle.digest("SHA-256", all));
}

// The states as documented: key = SHA-256("paygrove resample key 2\0" seed "\0"
// target as little-endian doubles); tree b: the first 16 bytes of
// SHA-256(key, b as 4 little-endian bytes), as four little-endian int32.
async function plainStates(seed: number, target: number[], trees: number): Promise<number[]> {
  const text = new TextEncoder();
  const doubles = new Uint8Array(8 * target.length);
  const view = new DataView(doubles.buffer);
  target.forEach((v, i) => view.setFloat64(8 * i, v, true));
  const key = await sha256(
    text.encode("paygrove resample key 2\u0000"),
    text.encode(String(seed)),
    text.encode("\u0000"),
    doubles,
  );
  const out: number[] = [];
  for (let b = 0; b < trees; b++) {
    const index = new Uint8Array([b & 255, (b >> 8) & 255, (b >> 16) & 255, b >>> 24]);
    const digest = new DataView((await sha256(key, index)).buffer);
    for (let w = 0; w < 4; w++) out.push(digest.getInt32(4 * w, true));
  }
  return out;
}

// xoroshiro128+ on two 64-bit words; pure-rand's four-word state is
// [s0 high, s0 low, s1 high, s1 low] and it returns the low 32 bits of the
// sum as a signed integer.
function plainCounts(rows: number, state: ArrayLike<number>): number[] {
  const M = (1n << 64n) - 1n;
  const u = (x: number) => BigInt(x >>> 0);
  let s0 = (u(state[0]) << 32n) | u(state[1]);
  let s1 = (u(state[2]) << 32n) | u(state[3]);
  const rotl = (x: bigint, k: bigint) => ((x << k) | (x >> (64n - k))) & M;
  const next = () => {
    const low = Number((s0 + s1) & 0xffffffffn);
    s1 ^= s0;
    s0 = rotl(s0, 24n) ^ s1 ^ ((s1 << 16n) & M);
    s1 = rotl(s1, 37n);
    return low | 0;
  };
  // A uniform integer below n: 2^31 + the signed output, redrawn at or above
  // the largest multiple of n under 2^32, then modulo n.
  const limit = Math.floor(2 ** 32 / rows) * rows;
  const counts = new Array<number>(rows).fill(0);
  for (let i = 0; i < rows; i++) {
    let v = next() + 2 ** 31;
    while (v >= limit) v = next() + 2 ** 31;
    counts[v % rows]++;
  }
  return counts;
}

Deno.test("resampleStates equals the documented SHA-256 key and per-tree digests", async () => {
  const target = [Math.log(41000), Math.log(52500.5), Math.log(61000), 10.25];
  for (const [seed, trees] of [[7, 3], [123456, 2]]) {
    const states = resampleStates(seed, target, trees);
    assert.equal(states.length, trees * STATE_WORDS);
    assert.deepEqual(Array.from(states), await plainStates(seed, target, trees));
  }
  // Keyed by every pay to the last bit, and by the seed.
  const changed = [...target];
  changed[2] = Math.log(61000) + 1e-12;
  assert.notDeepEqual(resampleStates(7, changed, 1), resampleStates(7, target, 1));
  assert.notDeepEqual(resampleStates(8, target, 1), resampleStates(7, target, 1));
  assert.equal(resampleStates(7, target, 0).length, 0);
});

Deno.test("resampleStates refuses a tree count that is not whole and non-negative", () => {
  for (const trees of [-1, 1.5, NaN]) {
    assert.throws(() => resampleStates(1, [1, 2], trees), RangeError);
  }
});

Deno.test("bootstrapCounts draws each tree's counts from its own four words", () => {
  const target = Array.from({ length: 50 }, (_, i) => 10 + i / 7);
  const states = resampleStates(11, target, 3);
  for (let b = 0; b < 3; b++) {
    const counts = bootstrapCounts(50, states, b);
    const state = states.subarray(b * STATE_WORDS, (b + 1) * STATE_WORDS);
    assert.deepEqual(Array.from(counts), plainCounts(50, state));
  }
  // A number of rows that is not a power of two exercises the rejection step.
  const odd = bootstrapCounts(1000, states, 2);
  assert.deepEqual(Array.from(odd), plainCounts(1000, states.subarray(8, 12)));
  assert.equal(odd.reduce((a, b) => a + b, 0), 1000);
});

Deno.test("bootstrapCounts refuses a tree without a state", () => {
  const states = resampleStates(1, [1, 2, 3], 2);
  assert.throws(() => bootstrapCounts(3, states, 2), RangeError);
  assert.throws(() => bootstrapCounts(3, states, -1), RangeError);
  assert.throws(() => bootstrapCounts(3, states.subarray(0, 7), 1), RangeError);
});

Deno.test("draws with replacement leave about 1/e of the rows out", () => {
  // (1 - 1/n)^n -> exp(-1) = 0.3679; over 5,000 rows the share out of bag
  // has a standard deviation near 0.007, so 0.02 is about three of them.
  const rows = 5000;
  const states = resampleStates(3, [1], 4);
  for (let b = 0; b < 4; b++) {
    const counts = bootstrapCounts(rows, states, b);
    const out = counts.filter((c) => c === 0).length / rows;
    assert(Math.abs(out - Math.exp(-1)) < 0.02, `tree ${b}: ${out}`);
  }
});

Deno.test("format 1's seeds give pure-rand's own xoroshiro128plus(seed) draws", () => {
  const seeds = Int32Array.of(42, -7, 2147483647);
  const states = legacyResampleStates(seeds);
  assert.equal(states.length, 3 * STATE_WORDS);
  seeds.forEach((seed, b) => {
    assert.deepEqual(
      Array.from(states.subarray(b * STATE_WORDS, (b + 1) * STATE_WORDS)),
      xoroshiro128plus(seed).getState(),
    );
    const rng = xoroshiro128plus(seed);
    const expected = new Array<number>(37).fill(0);
    for (let i = 0; i < 37; i++) expected[uniformInt(rng, 0, 36)]++;
    assert.deepEqual(Array.from(bootstrapCounts(37, states, b)), expected);
  });
});
