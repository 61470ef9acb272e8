import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { findRoot, integrateAdaptive, minimize } from "./meltpool-numerics";

describe("integrateAdaptive", () => {
  test.each([
    ["exp(-x²) on [0, 10] = √π/2 · erf(10)", (x: number) => Math.exp(-x * x), 0, 10, Math.sqrt(Math.PI) / 2],
    ["1/(1+x²) on [0, 1] = π/4", (x: number) => 1 / (1 + x * x), 0, 1, Math.PI / 4],
    ["√x on [0, 1] = 2/3 (endpoint singularity in the derivative)", (x: number) => Math.sqrt(x), 0, 1, 2 / 3],
    ["narrow spike exp(-((x-0.7)/1e-3)²) with a breakpoint", (x: number) => Math.exp(-(((x - 0.7) / 1e-3) ** 2)), 0, 1, 1e-3 * Math.sqrt(Math.PI)],
  ])("%s", (_label, f, a, b, exact) => {
    const r = integrateAdaptive(f, a, b, [0.7]);
    expect(Math.abs(r.value / exact - 1)).toBeLessThan(1e-9);
  });

  test("polynomials up to degree 20 are exact on one panel pair", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 20 }), (n) => {
        const r = integrateAdaptive((x) => x ** n, 0, 1);
        expect(r.value).toBeCloseTo(1 / (n + 1), 12);
      }),
    );
  });
});

describe("findRoot", () => {
  test.each([
    ["x² − 2", (x: number) => x * x - 2, 0, 2, Math.SQRT2],
    ["cos x − x", (x: number) => Math.cos(x) - x, 0, 1, 0.7390851332151607],
    ["x³ (flat root)", (x: number) => x ** 3, -1, 2, 0],
  ])("%s", (_label, f, a, b, root) => {
    expect(findRoot(f, a, b, 1e-14)).toBeCloseTo(root, 6);
  });

  test("a bracket without a sign change is an error", () => {
    expect(() => findRoot((x) => x * x + 1, -1, 1)).toThrow(RangeError);
  });
});

describe("minimize", () => {
  test("finds the minimum of shifted parabolas", () => {
    fc.assert(
      fc.property(fc.double({ min: -5, max: 5, noNaN: true }), (c) => {
        expect(minimize((x) => (x - c) ** 2 + 1, -10, 10, 1e-10).x).toBeCloseTo(c, 6);
      }),
    );
  });
});
