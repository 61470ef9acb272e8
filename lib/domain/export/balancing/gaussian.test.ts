import { expect, test } from "vitest";
import fc from "fast-check";
import { createPrng } from "../../prng";
import { clipToHardLimit } from "../process-point";
import { gaussianSample, meanAndSpread } from "./gaussian";

test("mean and sample spread", () => {
  expect(meanAndSpread([[1, 10], [3, 10]])).toEqual({ mean: [2, 10], sd: [Math.SQRT2, 0] });
});

test("samples have the class's mean and spread (large n)", () => {
  const rng = createPrng(11);
  const points = Array.from({ length: 400 }, () => [rng.normal(200, 30), rng.normal(900, 150)]);
  const g = gaussianSample(points, 20000, createPrng(5));
  const s = meanAndSpread(g.points);
  // Standard errors: sd/√n for the mean (≈0.2 and 1.1), sd/√(2n) for the spread (≈0.15 and 0.75).
  expect(Math.abs(s.mean[0]! - g.mean[0]!)).toBeLessThan(1.2);
  expect(Math.abs(s.mean[1]! - g.mean[1]!)).toBeLessThan(6);
  expect(Math.abs(s.sd[0]! - g.sd[0]!)).toBeLessThan(1);
  expect(Math.abs(s.sd[1]! - g.sd[1]!)).toBeLessThan(5);
});

test("clipped samples stay inside the hard limits however wide the spread", () => {
  fc.assert(
    fc.property(fc.array(fc.tuple(fc.double({ min: 1, max: 9000, noNaN: true }), fc.double({ min: 1, max: 19000, noNaN: true })), { minLength: 2, maxLength: 20 }), fc.integer(), (pts, seed) => {
      const fields = ["laserPowerW", "scanSpeedMmPerS"] as const;
      const g = gaussianSample(pts.map((p) => [p[0], p[1]]), 50, createPrng(seed), (j, v) => clipToHardLimit(fields[j]!, v));
      for (const [p, v] of g.points as [number, number][]) {
        expect(p).toBeGreaterThan(0);
        expect(p).toBeLessThanOrEqual(10_000);
        expect(v).toBeGreaterThan(0);
        expect(v).toBeLessThanOrEqual(20_000);
      }
    }),
    { numRuns: 60 },
  );
});

test("fewer than two points have no spread: RangeError", () => {
  expect(() => gaussianSample([[1]], 3, createPrng(1))).toThrow(/at least 2/);
});
