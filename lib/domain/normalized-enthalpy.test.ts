import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { keyholeEnthalpyThreshold, normalizedEnthalpy } from "./normalized-enthalpy";

const BASE = {
  laserPowerW: 200, absorptivity: 0.35, scanSpeedMmPerS: 800, spotDiameterUm: 80,
  densityKgPerM3: 7950, specificHeatJPerKgK: 500, thermalConductivityWPerMK: 20, meltingTemperatureK: 1723,
};

describe("normalizedEnthalpy (King et al. 2014 form)", () => {
  test("hand calculation: A·P/(π·ρ·c·T_m·√(α·v·a³)) with a = d/2", () => {
    const alpha = 20 / (7950 * 500);
    const expected = (0.35 * 200) / (Math.PI * 7950 * 500 * 1723 * Math.sqrt(alpha * 0.8 * (40e-6) ** 3));
    expect(normalizedEnthalpy(BASE)).toBeCloseTo(expected, 10);
  });

  test("scales as P, v^(-1/2) and d^(-3/2)", () => {
    fc.assert(
      fc.property(fc.double({ min: 0.1, max: 10, noNaN: true }), (f) => {
        const h = normalizedEnthalpy(BASE);
        expect(normalizedEnthalpy({ ...BASE, laserPowerW: BASE.laserPowerW * f }) / h).toBeCloseTo(f, 9);
        expect(normalizedEnthalpy({ ...BASE, scanSpeedMmPerS: BASE.scanSpeedMmPerS * f }) / h).toBeCloseTo(f ** -0.5, 9);
        expect(normalizedEnthalpy({ ...BASE, spotDiameterUm: BASE.spotDiameterUm * f }) / h).toBeCloseTo(f ** -1.5, 9);
      }),
    );
  });

  test.each(["laserPowerW", "scanSpeedMmPerS", "spotDiameterUm", "thermalConductivityWPerMK"] as const)("%s = 0 is a RangeError naming it", (name) => {
    expect(() => normalizedEnthalpy({ ...BASE, [name]: 0 })).toThrow(new RegExp(name));
  });

  test("the default keyhole threshold is π·T_boil/T_melt", () => {
    expect(keyholeEnthalpyThreshold(3090, 1723)).toBeCloseTo((Math.PI * 3090) / 1723, 12);
  });
});
