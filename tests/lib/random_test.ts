import assert from "node:assert/strict";
import fc from "fast-check";
import { makeRng, randomBelow, randomInt, shuffle, shuffleDoubles } from "../../lib/random.ts";

// xoroshiro128+ as Blackman and Vigna publish it (xoroshiro128plus.c, constants a = 24,
// b = 16, c = 37; from memory), on 64-bit BigInt state. pure-rand keeps the state as four
// 32-bit halves and seeds it as s0 = 0xffffffff:~seed, s1 = seed:0 (read in pure-rand 8.4.2's
// source); its output is the low 32 bits of s0 + s1, signed.
function* vigna(seed: number): Generator<number> {
  const mask = (1n << 64n) - 1n;
  const u32 = (x: number) => BigInt(x >>> 0);
  let s0 = (0xffffffffn << 32n) | u32(~seed);
  let s1 = u32(seed) << 32n;
  const rotl = (x: bigint, k: bigint) => ((x << k) | (x >> (64n - k))) & mask;
  while (true) {
    const result = (s0 + s1) & mask;
    s1 ^= s0;
    s0 = rotl(s0, 24n) ^ s1 ^ ((s1 << 16n) & mask);
    s1 = rotl(s1, 37n);
    yield Number(BigInt.asIntN(32, result & 0xffffffffn));
  }
}

Deno.test("makeRng is xoroshiro128+ as published", () => {
  for (const seed of [0, 1, 42, -7, 2 ** 31 - 1, -(2 ** 31)]) {
    const rng = makeRng(seed);
    const reference = vigna(seed);
    for (let i = 0; i < 50; i++) assert.equal(rng.next(), reference.next().value, `seed ${seed}`);
  }
});

Deno.test("seeds outside 32-bit whole numbers are refused", () => {
  for (const seed of [2 ** 31, -(2 ** 31) - 1, 1.5, NaN, Infinity]) {
    assert.throws(() => makeRng(seed), RangeError, String(seed));
  }
  assert.throws(() => makeRng(2 ** 31), /from -2\^31 to 2\^31 - 1, got 2147483648/);
  makeRng(2 ** 31 - 1);
  makeRng(-(2 ** 31));
});

Deno.test("the same seed gives the same draws; another seed other draws", () => {
  const draw = (seed: number) => {
    const rng = makeRng(seed);
    return Array.from({ length: 20 }, () => randomInt(rng, 0, 1_000_000));
  };
  assert.deepEqual(draw(5), draw(5));
  assert.notDeepEqual(draw(5), draw(6));
});

// Chi-square critical value for 9 degrees of freedom at p = 0.001 is 27.88 (R 4.x:
// qchisq(0.999, 9) = 27.877). The seed is fixed, so the check is deterministic.
Deno.test("randomInt covers [low, high] with both ends, evenly", () => {
  const rng = makeRng(2024);
  const counts = new Array(10).fill(0);
  const n = 20_000;
  for (let i = 0; i < n; i++) {
    const x = randomInt(rng, 3, 12);
    assert.ok(Number.isInteger(x) && x >= 3 && x <= 12, `drew ${x}`);
    counts[x - 3]++;
  }
  assert.ok(counts[0] > 0 && counts[9] > 0);
  const expected = n / 10;
  const chi2 = counts.reduce((s, c) => s + (c - expected) ** 2 / expected, 0);
  assert.ok(chi2 < 27.88, `chi-square ${chi2}`);
  // A range of one value.
  assert.equal(randomInt(rng, 7, 7), 7);
  // Negative bounds.
  const low = Array.from({ length: 200 }, () => randomInt(rng, -2, -1));
  assert.deepEqual([...new Set(low)].sort(), [-1, -2]);
});

Deno.test("shuffle is Fisher-Yates from the last place, drawing j in [0, i]", () => {
  const mine = <T>(array: T[], seed: number) => {
    const rng = makeRng(seed);
    const out = array.slice();
    for (let i = out.length - 1; i >= 1; i--) {
      const j = randomInt(rng, 0, i);
      [out[i], out[j]] = [out[j], out[i]];
    }
    return out;
  };
  const items = Array.from({ length: 30 }, (_, i) => `p${i}`);
  const input = items.slice();
  const result = shuffle(input, makeRng(9));
  assert.equal(result, input, "shuffles in place");
  assert.deepEqual(result, mine(items, 9));
  assert.deepEqual(result.slice().sort(), items.slice().sort());
  assert.notDeepEqual(result, items);
});

Deno.test("shuffle works on typed arrays and leaves 0 or 1 items as they are", () => {
  const typed = shuffle(Int32Array.from({ length: 10 }, (_, i) => i), makeRng(3));
  assert.deepEqual([...typed].sort((a, b) => a - b), [0, 1, 2, 3, 4, 5, 6, 7, 8, 9]);
  assert.deepEqual(shuffle([], makeRng(1)), []);
  const rng = makeRng(1);
  assert.deepEqual(shuffle(["only"], rng), ["only"]);
  // No draw was spent on a single item.
  assert.equal(rng.next(), makeRng(1).next());
});

// Each of the 6 orders of 3 items should come up about 1/6 of the time (chi-square, 5
// degrees of freedom, p = 0.001: 20.52, R 4.x qchisq(0.999, 5)).
Deno.test("every order of three items is equally likely", () => {
  const rng = makeRng(77);
  const counts = new Map<string, number>();
  const n = 12_000;
  for (let i = 0; i < n; i++) {
    const key = shuffle(["a", "b", "c"], rng).join("");
    counts.set(key, (counts.get(key) ?? 0) + 1);
  }
  assert.equal(counts.size, 6);
  const chi2 = [...counts.values()].reduce((s, c) => s + (c - n / 6) ** 2 / (n / 6), 0);
  assert.ok(chi2 < 20.52, `chi-square ${chi2}`);
});

Deno.test("randomBelow draws as pure-rand's uniformInt does, rejections included", () => {
  // 3 x 2^30: a quarter of the 32-bit draws are rejected, so the rejection
  // path runs; the generators must also end in the same state.
  for (const seed of [1, 2, 3, -7, 2 ** 31 - 1]) {
    const a = makeRng(seed);
    const b = makeRng(seed);
    for (const size of [1, 2, 3, 5, 1000, 2 ** 31 + 11, 3 * 2 ** 30, 2 ** 32]) {
      for (let k = 0; k < 200; k++) assert.equal(randomBelow(a, size), randomInt(b, 0, size - 1));
    }
    assert.equal(a.next(), b.next());
  }
});

Deno.test("a long shuffle equals one drawn through the library, and uses as many draws", () => {
  const items = Int32Array.from({ length: 5000 }, (_, i) => i);
  const rng = makeRng(11);
  const mine = shuffle(items.slice(), rng);
  const lib = makeRng(11);
  const theirs = items.slice();
  for (let i = theirs.length - 1; i > 0; i--) {
    const j = randomInt(lib, 0, i);
    [theirs[i], theirs[j]] = [theirs[j], theirs[i]];
  }
  assert.deepEqual(mine, theirs);
  assert.equal(rng.next(), lib.next());
});

Deno.test("randomBelow's remainder by floor equals the library's at the edges of 32 bits", () => {
  // The quotient's rounding cannot reach the next whole number: checked where
  // it is closest, v just below a multiple of a large size, and at random.
  const remainder = (v: number, size: number) => v - Math.floor(v / size) * size;
  const edges = [1, 2, 3, 7, 2 ** 16 + 1, 2 ** 31 - 1, 2 ** 31, 2 ** 31 + 1, 2 ** 32 - 1, 2 ** 32];
  for (const size of edges) {
    for (const v of [0, 1, size - 1, size, 2 ** 32 - 1, 2 ** 32 - 2, 2 * size - 1]) {
      if (v >= 0 && v < 2 ** 32) assert.equal(remainder(v, size), v % size, `${v} % ${size}`);
    }
  }
  fc.assert(
    fc.property(
      fc.integer({ min: 0, max: 2 ** 32 - 1 }),
      fc.integer({ min: 1, max: 2 ** 32 }),
      (v, size) => remainder(v, size) === v % size,
    ),
    { numRuns: 20000 },
  );
});

Deno.test("shuffleDoubles draws as shuffle does: the same order, the same draws used", () => {
  fc.assert(
    fc.property(
      fc.array(fc.double(), { maxLength: 300 }),
      fc.integer({ min: -(2 ** 31), max: 2 ** 31 - 1 }),
      (values, seed) => {
        const a = makeRng(seed);
        const b = makeRng(seed);
        const doubles = Float64Array.from(values);
        const plain = Array.from(doubles);
        assert.equal(shuffleDoubles(doubles, a), doubles, "in place");
        shuffle(plain, b);
        assert.deepEqual(Array.from(doubles), plain);
        assert.equal(a.next(), b.next());
      },
    ),
    { numRuns: 300 },
  );
});
