import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { eagarTsaiGroups, eagarTsaiMeltPool, type MeltPoolInputs } from "./meltpool";

const BASE: MeltPoolInputs = {
  laserPowerW: 200, absorptivity: 0.35, scanSpeedMmPerS: 800, spotDiameterUm: 80, thermalConductivityWPerMK: 20,
  densityKgPerM3: 7950, specificHeatJPerKgK: 500, ambientTemperatureK: 298, meltingTemperatureK: 1723,
};

describe("eagarTsaiGroups", () => {
  test("u = v·σ/(2α) and θ = 2π^1.5·k·σ·ΔT/(A·P) with σ = d/4", () => {
    const g = eagarTsaiGroups(BASE);
    const sigma = 80e-6 / 4;
    const alpha = 20 / (7950 * 500);
    expect(g.sigmaUm).toBeCloseTo(20, 12);
    expect(g.u).toBeCloseTo((0.8 * sigma) / (2 * alpha), 9);
    expect(g.theta).toBeCloseTo((2 * Math.PI ** 1.5 * 20 * sigma * (1723 - 298)) / (0.35 * 200), 9);
  });

  test.each([
    ["laserPowerW", 0],
    ["laserPowerW", -5],
    ["scanSpeedMmPerS", Number.NaN],
    ["scanSpeedMmPerS", 0],
    ["spotDiameterUm", -80],
    ["spotDiameterUm", undefined],
    ["absorptivity", 0],
    ["absorptivity", 1.2],
    ["densityKgPerM3", 0],
    ["specificHeatJPerKgK", Number.POSITIVE_INFINITY],
    ["thermalConductivityWPerMK", -1],
    ["meltingTemperatureK", Number.NaN],
    ["ambientTemperatureK", -1],
    ["ambientTemperatureK", 1800],
  ] as const)("%s = %s is a RangeError naming the input", (name, value) => {
    const inputs = { ...BASE, [name]: value } as MeltPoolInputs;
    expect(() => eagarTsaiMeltPool(inputs)).toThrow(RangeError);
    expect(() => eagarTsaiMeltPool(inputs)).toThrow(new RegExp(name));
  });
});

describe("eagarTsaiMeltPool", () => {
  test.each(["surface", "direct"] as const)("when nothing melts (%s): zero dimensions, a note, no NaN", (method) => {
    const r = eagarTsaiMeltPool({ ...BASE, laserPowerW: 2 }, { method });
    expect(r.melted).toBe(false);
    expect([r.widthUm, r.depthUm, r.lengthUm]).toEqual([0, 0, 0]);
    expect(r.notes.join(" ")).toMatch(/no melting/);
    expect(Number.isFinite(r.peakTemperatureK)).toBe(true);
    expect(r.peakTemperatureK).toBeLessThan(BASE.meltingTemperatureK);
  });

  test("surface is the default; the same inputs give the same answer twice", () => {
    const a = eagarTsaiMeltPool(BASE);
    const b = eagarTsaiMeltPool({ ...BASE });
    expect(a.method).toBe("surface");
    expect(b).toEqual(a);
  });

  test("dimensions never come back NaN or negative over LPBF inputs", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 1000, noNaN: true }),
        fc.double({ min: 10, max: 10000, noNaN: true }),
        fc.double({ min: 10, max: 500, noNaN: true }),
        (laserPowerW, scanSpeedMmPerS, spotDiameterUm) => {
          const r = eagarTsaiMeltPool({ ...BASE, laserPowerW, scanSpeedMmPerS, spotDiameterUm });
          for (const v of [r.widthUm, r.depthUm, r.lengthUm, r.peakTemperatureK]) {
            expect(Number.isFinite(v)).toBe(true);
            expect(v).toBeGreaterThanOrEqual(0);
          }
          expect(r.melted).toBe(r.peakTemperatureK > BASE.meltingTemperatureK);
        },
      ),
      { numRuns: 150 },
    );
  });

  test("an unknown method is a RangeError", () => {
    expect(() => eagarTsaiMeltPool(BASE, { method: "fast" as never })).toThrow(/unknown method/);
  });
});
