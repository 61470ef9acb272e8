import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { latinHypercube, maximinLatinHypercube, minPairDistance } from "./latin-hypercube";
import { createPrng } from "./prng";

const rngOf = (seed: number) => {
  const r = createPrng(seed);
  return () => r.next();
};

/** The stratum of each point on each axis. */
const strataOf = (points: number[][], n: number) => points[0]!.map((_, d) => points.map((pt) => Math.floor(pt[d]! * n)));

describe("latinHypercube and maximinLatinHypercube", () => {
  test.each([
    [0, 2],
    [1, 3],
    [2, 2],
    [5, 1],
    [12, 2],
    [50, 3],
  ])("n = %s, dims = %s: one point per stratum of every axis, inside [0, 1)", (n, dims) => {
    for (const design of [latinHypercube(n, dims, rngOf(3)), maximinLatinHypercube(n, dims, rngOf(3)), maximinLatinHypercube(n, dims, rngOf(3), { jitter: true })]) {
      expect(design).toHaveLength(n);
      for (const pt of design) {
        expect(pt).toHaveLength(dims);
        for (const x of pt) {
          expect(x).toBeGreaterThanOrEqual(0);
          expect(x).toBeLessThan(1);
        }
      }
      if (n > 0) for (const axis of strataOf(design, n)) expect([...axis].sort((a, b) => a - b)).toEqual(Array.from({ length: n }, (_, i) => i));
    }
  });

  test("the stratification holds for any size and seed", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 40 }), fc.integer({ min: 1, max: 4 }), fc.integer(), (n, dims, seed) => {
        const design = maximinLatinHypercube(n, dims, rngOf(seed), { iterations: 200 });
        for (const axis of strataOf(design, n)) expect(new Set(axis).size).toBe(n);
      }),
      { numRuns: 60 },
    );
  });

  test("the same seed gives the same design; another seed another", () => {
    expect(maximinLatinHypercube(12, 2, rngOf(1))).toEqual(maximinLatinHypercube(12, 2, rngOf(1)));
    expect(maximinLatinHypercube(12, 2, rngOf(1))).not.toEqual(maximinLatinHypercube(12, 2, rngOf(2)));
  });

  test("maximin designs are spread wider than random Latin hypercubes (20 seeds)", () => {
    let maximin = 0;
    let plain = 0;
    let wins = 0;
    for (let seed = 1; seed <= 20; seed++) {
      const a = minPairDistance(maximinLatinHypercube(20, 2, rngOf(seed)));
      const b = minPairDistance(latinHypercube(20, 2, rngOf(seed)));
      maximin += a;
      plain += b;
      if (a >= b) wins++;
    }
    expect(maximin / plain).toBeGreaterThan(1.5);
    expect(wins).toBeGreaterThanOrEqual(18);
  });

  test("12 points in 2 dimensions keep at least 2.5 strata apart", () => {
    for (let seed = 1; seed <= 5; seed++) expect(minPairDistance(maximinLatinHypercube(12, 2, rngOf(seed))) * 12).toBeGreaterThanOrEqual(2.5);
  });

  test.each([
    [-1, 2],
    [1.5, 2],
    [3, 0],
  ])("refuses n = %s, dims = %s", (n, dims) => {
    expect(() => maximinLatinHypercube(n, dims, rngOf(1))).toThrow(RangeError);
    expect(() => latinHypercube(n, dims, rngOf(1))).toThrow(RangeError);
  });

  test("minPairDistance", () => {
    expect(minPairDistance([[0, 0], [3, 4], [0, 1]])).toBe(1);
    expect(minPairDistance([[0.5]])).toBe(Infinity);
  });
});
