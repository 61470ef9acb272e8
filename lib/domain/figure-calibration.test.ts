import fc from "fast-check";
import { describe, expect, test } from "vitest";
import {
  calibrateAxis,
  calibrateFigure,
  dataToPixel,
  pixelToData,
  pixelToValue,
  readPoint,
  valueToPixel,
  valueUncertainty,
  type AxisCalibration,
  type AxisInput,
} from "./figure-calibration";

function axis(name: "x" | "y", input: AxisInput): AxisCalibration {
  const r = calibrateAxis(name, input);
  if (!r.ok) throw new Error(r.problem.message);
  return r.axis;
}

const linear = axis("x", { scale: "linear", ticks: [{ pixel: 100, value: 0 }, { pixel: 500, value: 400 }] });
// y grows upwards while pixels grow downwards
const logY = axis("y", { scale: "log", ticks: [{ pixel: 300, value: 10 }, { pixel: 100, value: 1000 }] });

describe("calibrateAxis", () => {
  test.each([
    ["linear midpoint", linear, 300, 200],
    ["linear beyond the ticks", linear, 600, 500],
    ["linear first tick", linear, 100, 0],
    ["log midpoint is the geometric mean", logY, 200, 100],
    ["log quarter", logY, 250, 10 ** 1.5],
    ["log tick", logY, 100, 1000],
  ])("%s", (_name, a, pixel, value) => {
    expect(pixelToValue(a, pixel)).toBeCloseTo(value, 9);
    expect(valueToPixel(a, value)).toBeCloseTo(pixel, 9);
  });

  test.each([
    ["equal values", { scale: "linear", ticks: [{ pixel: 10, value: 5 }, { pixel: 90, value: 5 }] }, "equal_values"],
    ["same pixel", { scale: "linear", ticks: [{ pixel: 10, value: 5 }, { pixel: 10.4, value: 6 }] }, "same_pixel"],
    ["log with zero", { scale: "log", ticks: [{ pixel: 10, value: 0 }, { pixel: 90, value: 100 }] }, "log_non_positive"],
    ["log with a negative value", { scale: "log", ticks: [{ pixel: 10, value: 10 }, { pixel: 90, value: -1 }] }, "log_non_positive"],
    ["a blank value", { scale: "linear", ticks: [{ pixel: 10, value: Number.NaN }, { pixel: 90, value: 1 }] }, "not_finite"],
  ] as const)("%s is a problem with a message, not an exception", (_name, input, code) => {
    const r = calibrateAxis("x", input);
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.problem.code).toBe(code);
      expect(r.problem.message).toMatch(/horizontal \(x\) axis/);
    }
  });

  test("a log axis with a value ≤ 0 names the value", () => {
    const r = calibrateAxis("y", { scale: "log", ticks: [{ pixel: 10, value: 0 }, { pixel: 90, value: 100 }] });
    expect(!r.ok && r.problem.message).toMatch(/greater than 0 \(got 0\)/);
  });

  test("calibrateFigure lists the problems of both axes", () => {
    const bad: AxisInput = { scale: "log", ticks: [{ pixel: 0, value: -1 }, { pixel: 50, value: 2 }] };
    const r = calibrateFigure({ x: bad, y: bad });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.problems.map((p) => p.axis)).toEqual(["x", "y"]);
  });
});

describe("valueUncertainty", () => {
  test.each([
    ["linear: range per pixel times the pixel error", linear, 300, 0.5, 0.5],
    ["linear: two pixels", linear, 300, 2, 2],
    // log: 2 decades over 200 px; ±1 px at 100 is 10^(±0.01): upper side 100·(10^0.01 − 1)
    ["log: the wider (upper) side", logY, 200, 1, 100 * (10 ** 0.01 - 1)],
  ])("%s", (_name, a, pixel, du, expected) => {
    expect(valueUncertainty(a, pixel, du)).toBeCloseTo(expected, 9);
  });

  test("a negative pixel error cannot be computed", () => {
    expect(() => valueUncertainty(linear, 0, -1)).toThrow(RangeError);
  });
});

describe("readPoint", () => {
  const cal = { x: linear, y: logY };
  test("a point inside the ticks reads its value and uncertainty", () => {
    const r = readPoint(cal, { x: 300, y: 200 }, { pixelUncertaintyPx: 0.5 });
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.point.value.x).toBeCloseTo(200, 9);
      expect(r.point.value.y).toBeCloseTo(100, 9);
      expect(r.point.uncertainty.x).toBeCloseTo(0.5, 9);
    }
  });

  test.each([
    ["left of the x ticks", { x: 50, y: 200 }, /horizontal axis \(0 to 400\)/],
    ["below the y ticks", { x: 300, y: 340 }, /vertical axis \(10 to 1000\)/],
  ])("a point %s is a problem", (_name, pixel, message) => {
    const r = readPoint(cal, pixel);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(message);
  });
});

describe("properties", () => {
  const tickPair = fc
    .record({
      p0: fc.double({ min: -2000, max: 4000, noNaN: true }),
      gap: fc.double({ min: 2, max: 3000, noNaN: true }),
      flip: fc.boolean(),
      v0: fc.double({ min: 1e-3, max: 1e5, noNaN: true }),
      ratio: fc.double({ min: 1.01, max: 1e4, noNaN: true }),
      scale: fc.constantFrom("linear" as const, "log" as const),
    })
    .map(({ p0, gap, flip, v0, ratio, scale }) => ({
      scale,
      ticks: [
        { pixel: p0, value: v0 },
        { pixel: flip ? p0 - gap : p0 + gap, value: v0 * ratio },
      ] as const,
    }));

  test("each marked tick reads back exactly the value typed for it", () => {
    fc.assert(
      fc.property(tickPair, (input) => {
        const a = axis("x", input);
        expect(pixelToValue(a, input.ticks[0].pixel)).toBe(input.ticks[0].value);
        expect(pixelToValue(a, input.ticks[1].pixel)).toBe(input.ticks[1].value);
        expect(valueToPixel(a, input.ticks[0].value)).toBe(input.ticks[0].pixel);
        expect(valueToPixel(a, input.ticks[1].value)).toBe(input.ticks[1].pixel);
      }),
    );
  });

  test("pixel -> data -> pixel returns the pixel (to 1e-9 of the tick gap)", () => {
    fc.assert(
      fc.property(tickPair, tickPair, fc.double({ min: -0.5, max: 1.5, noNaN: true }), fc.double({ min: -0.5, max: 1.5, noNaN: true }), (ix, iy, fx, fy) => {
        const cal = { x: axis("x", ix), y: axis("y", iy) };
        const px = ix.ticks[0].pixel + fx * (ix.ticks[1].pixel - ix.ticks[0].pixel);
        const py = iy.ticks[0].pixel + fy * (iy.ticks[1].pixel - iy.ticks[0].pixel);
        const back = dataToPixel(cal, pixelToData(cal, { x: px, y: py }));
        expect(Math.abs(back.x - px)).toBeLessThanOrEqual(1e-9 * Math.abs(ix.ticks[1].pixel - ix.ticks[0].pixel) + 1e-9);
        expect(Math.abs(back.y - py)).toBeLessThanOrEqual(1e-9 * Math.abs(iy.ticks[1].pixel - iy.ticks[0].pixel) + 1e-9);
      }),
    );
  });

  test("the uncertainty covers the values one pixel error away", () => {
    fc.assert(
      fc.property(tickPair, fc.double({ min: 0, max: 1, noNaN: true }), fc.double({ min: 0.1, max: 3, noNaN: true }), (input, f, du) => {
        const a = axis("x", input);
        const p = input.ticks[0].pixel + f * (input.ticks[1].pixel - input.ticks[0].pixel);
        const u = valueUncertainty(a, p, du);
        const v = pixelToValue(a, p);
        // Beside the relative slack, allow the floating-point rounding of values as large as 1e9:
        // a few ulps of the larger value, which the difference of two readings cannot beat.
        for (const q of [p - du, p + du]) {
          const vq = pixelToValue(a, q);
          expect(Math.abs(vq - v)).toBeLessThanOrEqual(u * (1 + 1e-9) + 1e-12 + 16 * Number.EPSILON * Math.max(Math.abs(v), Math.abs(vq)));
        }
      }),
    );
  });
});
