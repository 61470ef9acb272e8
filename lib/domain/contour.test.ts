import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { zeroContour } from "./contour";

const lattice = (n: number, lo: number, hi: number) => Array.from({ length: n }, (_, i) => lo + ((hi - lo) * i) / (n - 1));
const sample = (xs: number[], ys: number[], f: (x: number, y: number) => number) => ys.map((y) => xs.map((x) => f(x, y)));

describe("zeroContour", () => {
  test.each<[string, (x: number, y: number) => number, number]>([
    ["no sign change", () => 1, 0],
    ["all negative", () => -1, 0],
    ["a vertical line", (x) => x - 0.5, 1],
    ["two separate lines", (x) => Math.abs(x - 0.5) - 0.25, 2],
  ])("%s gives %s polyline(s)", (_, f, count) => {
    const xs = lattice(11, 0, 1);
    expect(zeroContour(xs, xs, sample(xs, xs, f))).toHaveLength(count);
  });

  test("the example: f = x − 0.5 on the unit square", () => {
    expect(zeroContour([0, 1], [0, 1], [[-0.5, 0.5], [-0.5, 0.5]])).toEqual([
      [
        { x: 0.5, y: 0 },
        { x: 0.5, y: 1 },
      ],
    ]);
  });

  test("a circle is one closed loop of points near the radius", () => {
    const xs = lattice(41, -1, 1);
    const lines = zeroContour(xs, xs, sample(xs, xs, (x, y) => 0.6 - Math.hypot(x, y)));
    expect(lines).toHaveLength(1);
    const loop = lines[0]!;
    expect(loop[0]).toEqual(loop[loop.length - 1]);
    for (const p of loop) expect(Math.abs(Math.hypot(p.x, p.y) - 0.6)).toBeLessThan(0.01);
  });

  test("a saddle cell gives two segments, split by the centre value", () => {
    // corners: (0,0) +, (1,0) −, (1,1) +, (0,1) −; centre mean > 0 joins the + corners
    const lines = zeroContour([0, 1], [0, 1], [[1, -1], [-1, 2]]);
    expect(lines).toHaveLength(2);
    expect(lines.flat().every((p) => (p.x === 0 || p.x === 1 || p.y === 0 || p.y === 1))).toBe(true);
  });

  test("the crossing solver is asked for each crossing edge", () => {
    const xs = lattice(5, 0, 1);
    const calls: number[] = [];
    const lines = zeroContour(xs, xs, sample(xs, xs, (x) => x - 0.3), (a, _fa, b) => {
      calls.push(a.y);
      return { x: 0.3, y: (a.y + b.y) / 2 };
    });
    expect(calls).toHaveLength(5);
    expect(lines[0]!.every((p) => p.x === 0.3)).toBe(true);
  });

  test("refuses values of the wrong shape", () => {
    expect(() => zeroContour([0, 1], [0, 1], [[1, 2]])).toThrow(RangeError);
  });

  test("for a linear field every contour point is exactly on the zero line, and lies inside the lattice", () => {
    fc.assert(
      fc.property(
        fc.double({ min: -2, max: 2, noNaN: true }).filter((a) => Math.abs(a) > 0.05),
        fc.double({ min: -2, max: 2, noNaN: true }),
        fc.double({ min: -1, max: 1, noNaN: true }),
        (a, b, c) => {
          const xs = lattice(9, 0, 1);
          const f = (x: number, y: number) => a * x + b * y + c;
          for (const line of zeroContour(xs, xs, sample(xs, xs, f))) {
            for (const p of line) {
              expect(Math.abs(f(p.x, p.y))).toBeLessThan(1e-9);
              expect(p.x).toBeGreaterThanOrEqual(0);
              expect(p.x).toBeLessThanOrEqual(1);
            }
          }
        },
      ),
    );
  });
});
