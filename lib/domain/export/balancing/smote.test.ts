import { expect, test } from "vitest";
import fc from "fast-check";
import { createPrng } from "../../prng";
import { bruteForceNeighbours } from "./kd-tree";
import { smote } from "./smote";

const pointsArb = fc.array(fc.array(fc.double({ min: -100, max: 100, noNaN: true }), { minLength: 3, maxLength: 3 }), { minLength: 6, maxLength: 60 });

// Chawla et al., JAIR 16:321–357, 2002, section 4.2: x_new = x + gap·(x_nn − x), gap ∈ [0, 1),
// x_nn one of the k nearest neighbours of x in its own class.
test("every synthetic point lies on a segment from a point to one of its k nearest neighbours", () => {
  fc.assert(
    fc.property(pointsArb, fc.integer({ min: 1, max: 5 }), fc.integer({ min: 0, max: 1e6 }), (points, k, seed) => {
      const r = smote(points, 25, k, createPrng(seed));
      expect(r.points).toHaveLength(25);
      r.points.forEach((p, s) => {
        const [i, j] = r.parents[s]!;
        expect(bruteForceNeighbours(points, i, k)).toContain(j);
        const gap = r.gaps[s]!;
        expect(gap).toBeGreaterThanOrEqual(0);
        expect(gap).toBeLessThan(1);
        p.forEach((x, d) => expect(x).toBeCloseTo(points[i]![d]! + gap * (points[j]![d]! - points[i]![d]!), 9));
      });
    }),
    { numRuns: 80 },
  );
});

test("the same seed gives the same points; scaling changes which neighbours are near", () => {
  const pts = [[0, 0], [1, 100], [2, 0], [3, 100], [4, 0], [5, 100]];
  expect(smote(pts, 10, 2, createPrng(4))).toEqual(smote(pts, 10, 2, createPrng(4)));
  const raw = smote(pts, 50, 1, createPrng(4));
  const scaled = smote(pts, 50, 1, createPrng(4), [1, 1000]);
  // Raw distances: the nearest of a point is the one 2 along x (same y); scaled, the one 1 along x.
  expect(raw.parents.every(([i, j]) => Math.abs(i - j) === 2)).toBe(true);
  expect(scaled.parents.every(([i, j]) => Math.abs(i - j) === 1)).toBe(true);
});

test("a class with no more than k points is a RangeError naming the count", () => {
  expect(() => smote([[0], [1], [2]], 2, 3, createPrng(1))).toThrow(/3 points are too few for k = 3/);
  expect(smote([[0], [1]], 0, 5, createPrng(1)).points).toEqual([]);
});
