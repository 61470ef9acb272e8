import { expect, test } from "vitest";
import fc from "fast-check";
import { bruteForceNeighbours, buildKdTree } from "./kd-tree";

test("the tree finds the same neighbours as comparing with every point, ties to the lower index", () => {
  fc.assert(
    fc.property(
      fc.integer({ min: 1, max: 4 }).chain((d) => fc.array(fc.array(fc.integer({ min: -20, max: 20 }), { minLength: d, maxLength: d }), { minLength: 2, maxLength: 120 })),
      fc.integer({ min: 1, max: 8 }),
      (points, k) => {
        const tree = buildKdTree(points);
        for (let i = 0; i < points.length; i++) expect(tree.neighboursOf(i, k)).toEqual(bruteForceNeighbours(points, i, k));
      },
    ),
    { numRuns: 120 },
  );
});

test("a point is never its own neighbour and k is capped by the set", () => {
  const tree = buildKdTree([[0, 0], [0, 0], [1, 1]]);
  expect(tree.neighboursOf(0, 5)).toEqual([1, 2]);
});

test("points of mixed dimension or with NaN are refused", () => {
  expect(() => buildKdTree([[0, 1], [1]])).toThrow(/buildKdTree/);
  expect(() => buildKdTree([[0, Number.NaN]])).toThrow(/finite/);
});
