import { expect, test } from "vitest";
import fc from "fast-check";
import { createPrng } from "../../prng";
import { balancedClassWeights, overSampleIndices, underSampleIndices } from "./random-sampling";

test("over-sampling draws n indices inside the set", () => {
  fc.assert(
    fc.property(fc.integer({ min: 1, max: 50 }), fc.integer({ min: 0, max: 200 }), fc.integer(), (size, n, seed) => {
      const idx = overSampleIndices(size, n, createPrng(seed));
      expect(idx).toHaveLength(n);
      for (const i of idx) expect(i >= 0 && i < size).toBe(true);
    }),
  );
});

test("under-sampling keeps distinct indices in order", () => {
  fc.assert(
    fc.property(fc.integer({ min: 0, max: 80 }).chain((size) => fc.tuple(fc.constant(size), fc.integer({ min: 0, max: size }))), fc.integer(), ([size, keep], seed) => {
      const idx = underSampleIndices(size, keep, createPrng(seed));
      expect(idx).toHaveLength(keep);
      expect(new Set(idx).size).toBe(keep);
      expect([...idx].sort((a, b) => a - b)).toEqual(idx);
    }),
  );
});

test.each([
  [{ a: 30, b: 10 }, { a: 40 / 60, b: 2 }],
  [{ a: 5, b: 5, c: 10 }, { a: 20 / 15, b: 20 / 15, c: 20 / 30 }],
])("balanced class weights of %j", (counts, expected) => {
  const w = balancedClassWeights(new Map(Object.entries(counts)));
  for (const [c, v] of Object.entries(expected)) expect(w.get(c)).toBeCloseTo(v, 12);
  // every class carries the same total weight
  const totals = Object.entries(counts).map(([c, n]) => n * w.get(c)!);
  for (const t of totals) expect(t).toBeCloseTo(totals[0]!, 9);
});
