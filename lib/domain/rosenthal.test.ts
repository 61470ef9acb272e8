import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { rosenthalMeltPool, rosenthalTemperatureK } from "./rosenthal";

const BASE = {
  laserPowerW: 200, absorptivity: 0.35, scanSpeedMmPerS: 500, densityKgPerM3: 7800,
  specificHeatJPerKgK: 700, thermalConductivityWPerMK: 30, meltingTemperatureK: 1700, ambientTemperatureK: 298,
};

describe("rosenthalMeltPool", () => {
  test("the closed-form ends and widest section lie on the melting isotherm", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 20, max: 800, noNaN: true }),
        fc.double({ min: 50, max: 5000, noNaN: true }),
        fc.double({ min: 5, max: 200, noNaN: true }),
        (laserPowerW, scanSpeedMmPerS, thermalConductivityWPerMK) => {
          const p = { ...BASE, laserPowerW, scanSpeedMmPerS, thermalConductivityWPerMK };
          const pool = rosenthalMeltPool(p);
          const alpha = thermalConductivityWPerMK / (BASE.densityKgPerM3 * BASE.specificHeatJPerKgK);
          const n = pool.operatingParameter;
          const rearUm = (-n * 2 * alpha) / (scanSpeedMmPerS * 1e-3) * 1e6;
          const frontUm = pool.lengthUm + rearUm;
          expect(rosenthalTemperatureK(p, { xUm: frontUm, yUm: 0, zUm: 0 })).toBeCloseTo(1700, 6);
          expect(rosenthalTemperatureK(p, { xUm: rearUm, yUm: 0, zUm: 0 })).toBeCloseTo(1700, 6);
          // On the widest section the isotherm is tangent to y = W/2: just outside it is colder everywhere.
          const ys = [-0.3, -0.1, 0, 0.1, 0.3].map((f) => rearUm * 0.5 + f * pool.lengthUm);
          for (const x of ys) expect(rosenthalTemperatureK(p, { xUm: x, yUm: pool.widthUm / 2 * 1.001, zUm: 0 })).toBeLessThan(1700);
          expect(pool.widthUm).toBeCloseTo(2 * pool.depthUm, 9);
        },
      ),
      { numRuns: 60 },
    );
  });

  test.each([
    ["laserPowerW", 0],
    ["scanSpeedMmPerS", -1],
    ["thermalConductivityWPerMK", Number.NaN],
  ] as const)("%s = %s is a RangeError naming the input", (name, value) => {
    expect(() => rosenthalMeltPool({ ...BASE, [name]: value })).toThrow(new RegExp(name));
  });
});
