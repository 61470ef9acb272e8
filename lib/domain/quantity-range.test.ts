import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { parseQuantityList, parseQuantityRange } from "./quantity-range";
import type { Quantity } from "./units";

describe("parseQuantityRange", () => {
  test.each<[string, Quantity, number | null, number | null]>([
    ["50-400W", "laserPower", 50, 400],
    ["50 - 400 W", "laserPower", 50, 400],
    ["0.05-0.4 kW", "laserPower", 50, 400],
    ["50W-0.4kW", "laserPower", 50, 400],
    ["200-2000mm/s", "scanSpeed", 200, 2000],
    ["0.2–2 m/s", "scanSpeed", 200, 2000],
    ["0,2-2 m/s", "scanSpeed", 200, 2000],
    ["80-120um", "hatchSpacing", 80, 120],
    ["0.08-0.12 mm", "hatchSpacing", 80, 120],
    ["80um..120um", "hatchSpacing", 80, 120],
    ["80 to 120 µm", "hatchSpacing", 80, 120],
    ["30um", "layerThickness", 30, 30],
    ["30", "layerThickness", 30, 30],
    ["80-", "hatchSpacing", 80, null],
    ["-120um", "hatchSpacing", null, 120],
    ["100-100W", "laserPower", 100, 100],
  ])("%s as %s -> [%s, %s]", (text, quantity, min, max) => {
    const r = parseQuantityRange(text, quantity);
    expect(r).toMatchObject({ ok: true, range: { min, max } });
  });

  test.each<[string, Quantity, RegExp]>([
    ["400-50W", "laserPower", /minimum laser power \(400\) is above the maximum \(50\)/],
    ["-50-400W", "laserPower", /greater than 0 W; got -50 W/],
    ["50--400W", "laserPower", /cannot be negative/],
    ["0W", "laserPower", /greater than 0 W/],
    ["50-400kg", "laserPower", /not a unit of laser power/],
    ["fast-slow", "scanSpeed", /Cannot read 'fast'/],
    ["", "hatchSpacing", /No hatch spacing range entered/],
    ["-", "hatchSpacing", /Cannot read '-' as a hatch spacing range/],
    ["50-30000mm/s", "scanSpeed", /at most 20,000 mm\/s/],
  ])("%s as %s is refused", (text, quantity, message) => {
    const r = parseQuantityRange(text, quantity);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(message);
  });

  test("any two positive values in either order give the ordered range or the swap message", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 9999 }), fc.integer({ min: 1, max: 9999 }), (a, b) => {
        const r = parseQuantityRange(`${a}-${b}W`, "laserPower");
        if (a <= b) expect(r).toMatchObject({ ok: true, range: { min: a, max: b } });
        else expect(r.ok).toBe(false);
      }),
    );
  });

  test("a range written in mm reads as the same range in µm", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 1999 }), fc.integer({ min: 1, max: 1999 }), (a, b) => {
        const [lo, hi] = a <= b ? [a, b] : [b, a];
        const inUm = parseQuantityRange(`${lo}-${hi}um`, "hatchSpacing");
        const inMm = parseQuantityRange(`${lo / 1000}-${hi / 1000}mm`, "hatchSpacing");
        expect(inMm.ok && inUm.ok).toBe(true);
        if (inMm.ok && inUm.ok) {
          expect(inMm.range.min).toBeCloseTo(inUm.range.min!, 9);
          expect(inMm.range.max).toBeCloseTo(inUm.range.max!, 9);
        }
      }),
    );
  });
});

describe("parseQuantityList", () => {
  test.each<[string, Quantity, number[]]>([
    ["100um", "hatchSpacing", [100]],
    ["80, 100, 120um", "hatchSpacing", [80, 100, 120]],
    ["120; 80; 100 µm", "hatchSpacing", [80, 100, 120]],
    ["0.03mm, 40um", "layerThickness", [30, 40]],
    ["30, 30um", "layerThickness", [30]],
  ])("%s -> %j", (text, quantity, values) => {
    expect(parseQuantityList(text, quantity)).toMatchObject({ ok: true, values });
  });

  test.each<[string, Quantity, RegExp]>([
    ["", "hatchSpacing", /No hatch spacing entered/],
    ["80, -100um", "hatchSpacing", /greater than 0 µm/],
    ["80, wide", "hatchSpacing", /Cannot read 'wide'/],
  ])("%s is refused", (text, quantity, message) => {
    const r = parseQuantityList(text, quantity);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(message);
  });
});
