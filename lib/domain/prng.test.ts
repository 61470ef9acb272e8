import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { createPrng } from "./prng";

describe("createPrng", () => {
  // Reference sequences from an independent Python transcription of mulberry32
  // (run with /usr/bin/python3, integer arithmetic masked to 32 bits).
  test.each<[number, number[]]>([
    [1, [0.6270739405881613, 0.002735721180215478, 0.5274470399599522, 0.9810509674716741]],
    [20_261_201, [0.28269996610470116, 0.23457883833907545, 0.10738927754573524, 0.7544106347486377]],
  ])("seed %d gives the reference sequence", (seed, expected) => {
    const rng = createPrng(seed);
    expect(expected.map(() => rng.next())).toEqual(expected);
  });

  test("the same seed gives the same sequence; another seed another", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 2 ** 32 - 1 }), (seed) => {
        const a = createPrng(seed);
        const b = createPrng(seed);
        const c = createPrng(seed + 1);
        const seqA = Array.from({ length: 8 }, () => a.next());
        expect(Array.from({ length: 8 }, () => b.next())).toEqual(seqA);
        expect(Array.from({ length: 8 }, () => c.next())).not.toEqual(seqA);
      }),
      { numRuns: 50 },
    );
  });

  test("next, float and int stay in range", () => {
    fc.assert(
      fc.property(fc.integer(), fc.integer({ min: -50, max: 50 }), fc.integer({ min: 0, max: 20 }), (seed, lo, span) => {
        const rng = createPrng(seed);
        for (let i = 0; i < 20; i += 1) {
          const u = rng.next();
          expect(u).toBeGreaterThanOrEqual(0);
          expect(u).toBeLessThan(1);
          const f = rng.float(lo, lo + span + 1);
          expect(f).toBeGreaterThanOrEqual(lo);
          expect(f).toBeLessThan(lo + span + 1);
          const k = rng.int(lo, lo + span);
          expect(Number.isInteger(k)).toBe(true);
          expect(k).toBeGreaterThanOrEqual(lo);
          expect(k).toBeLessThanOrEqual(lo + span);
        }
      }),
      { numRuns: 50 },
    );
  });

  test("int reaches both ends", () => {
    const rng = createPrng(7);
    const seen = new Set(Array.from({ length: 200 }, () => rng.int(1, 3)));
    expect([...seen].sort()).toEqual([1, 2, 3]);
  });

  test("normal has about the requested mean and spread", () => {
    const rng = createPrng(11);
    const xs = Array.from({ length: 20_000 }, () => rng.normal(5, 2));
    const mean = xs.reduce((s, x) => s + x, 0) / xs.length;
    const sd = Math.sqrt(xs.reduce((s, x) => s + (x - mean) ** 2, 0) / (xs.length - 1));
    // standard error of the mean is 2/√20000 ≈ 0.014; of the sd about 0.01
    expect(Math.abs(mean - 5)).toBeLessThan(0.06);
    expect(Math.abs(sd - 2)).toBeLessThan(0.05);
    expect(xs.every(Number.isFinite)).toBe(true);
  });

  test("weighted follows the weights", () => {
    const rng = createPrng(3);
    const counts = { a: 0, b: 0 };
    for (let i = 0; i < 10_000; i += 1) counts[rng.weighted([{ item: "a" as const, weight: 3 }, { item: "b" as const, weight: 1 }])] += 1;
    expect(counts.a / 10_000).toBeGreaterThan(0.72);
    expect(counts.a / 10_000).toBeLessThan(0.78);
  });

  test("shuffle is a permutation and leaves its input alone", () => {
    fc.assert(
      fc.property(fc.integer(), fc.array(fc.integer(), { maxLength: 40 }), (seed, items) => {
        const before = [...items];
        const out = createPrng(seed).shuffle(items);
        expect(items).toEqual(before);
        expect([...out].sort((x, y) => x - y)).toEqual([...items].sort((x, y) => x - y));
      }),
      { numRuns: 100 },
    );
  });

  test("refuses what it cannot use", () => {
    expect(() => createPrng(Number.NaN)).toThrow(RangeError);
    expect(() => createPrng(1).pick([])).toThrow(RangeError);
    expect(() => createPrng(1).weighted([{ item: 1, weight: 0 }])).toThrow(RangeError);
  });
});
