import { describe, expect, test } from "vitest";
import { resolveAlloyProperties } from "./alloy-properties";
import { analyzeMeltPool, materialFromProperties } from "./meltpool-analysis";
import { eagarTsaiMeltPool } from "./meltpool";

function material316L() {
  const r = resolveAlloyProperties({ alloyKey: "316L" });
  if (!r.ok) throw new Error(r.message);
  return materialFromProperties(r.properties);
}

describe("analyzeMeltPool", () => {
  test("combines pool, enthalpy, energy density, criteria and regime", () => {
    const a = analyzeMeltPool({ laserPowerW: 200, scanSpeedMmPerS: 800, spotDiameterUm: 80, hatchSpacingUm: 100, layerThicknessUm: 30, ambientTemperatureK: 298, material: material316L() });
    expect(a.energy.volumetricJPerMm3).toBeCloseTo(200 / (800 * 0.1 * 0.03), 9);
    expect(a.criteria.map((c) => c.name)).toEqual(["lack_of_fusion_depth", "lack_of_fusion_overlap", "balling_aspect", "keyhole_aspect", "keyhole_enthalpy"]);
    expect(a.regime.firedCriteria).toEqual(a.criteria.filter((c) => c.fired).map((c) => c.name));
    expect(a.keyholeEnthalpyThreshold).toBeCloseTo((Math.PI * 3090) / 1723, 9);
  });

  test("an FWHM spot is converted to 1/e² before the physics (× 1.699)", () => {
    const m = material316L();
    const fwhm = analyzeMeltPool({ laserPowerW: 200, scanSpeedMmPerS: 800, spotDiameterUm: 50, spotDefinition: "fwhm", ambientTemperatureK: 298, material: m });
    expect(fwhm.spotDiameterOneOverE2Um).toBeCloseTo(50 * 1.6986, 2);
    const direct = eagarTsaiMeltPool({ laserPowerW: 200, scanSpeedMmPerS: 800, spotDiameterUm: fwhm.spotDiameterOneOverE2Um, absorptivity: m.absorptivity,
      densityKgPerM3: m.densityKgPerM3, specificHeatJPerKgK: m.specificHeatJPerKgK, thermalConductivityWPerMK: m.thermalConductivityWPerMK,
      meltingTemperatureK: m.meltingTemperatureK, ambientTemperatureK: 298 });
    expect(fwhm.pool.widthUm).toBeCloseTo(direct.widthUm, 9);
  });

  test("nothing melting gives the no-melting regime and finite numbers only", () => {
    const a = analyzeMeltPool({ laserPowerW: 3, scanSpeedMmPerS: 2000, spotDiameterUm: 100, hatchSpacingUm: 100, layerThicknessUm: 30, ambientTemperatureK: 298, material: material316L() });
    expect(a.regime.label).toBe("no_melting");
    expect(a.pool.notes.join(" ")).toMatch(/no melting/);
    expect(JSON.stringify(a)).not.toMatch(/NaN|Infinity/);
  });

  test.each([
    ["spotDiameterUm", { spotDiameterUm: 0 }],
    ["laserPowerW", { laserPowerW: Number.NaN }],
    ["scanSpeedMmPerS", { scanSpeedMmPerS: -1 }],
  ] as const)("bad %s is a RangeError naming it", (name, change) => {
    expect(() => analyzeMeltPool({ laserPowerW: 200, scanSpeedMmPerS: 800, spotDiameterUm: 80, ambientTemperatureK: 298, material: material316L(), ...change })).toThrow(new RegExp(name));
  });

  test("a missing property is a RangeError naming it", () => {
    expect(() => materialFromProperties({})).toThrow(/absorptivity/);
  });
});
