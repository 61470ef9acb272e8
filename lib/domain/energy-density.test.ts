import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { energyDensities } from "./energy-density";

describe("energyDensities", () => {
  test.each([
    // P (W), v (mm/s), h (µm), t (µm), E_l, E_a, E_v — E = P/v, P/(v·h), P/(v·h·t) with h, t in mm
    [200, 800, 100, 30, 0.25, 2.5, 83.333333],
    [370, 1300, 190, 30, 0.284615, 1.497976, 49.932523],
    [100, 1000, 50, 20, 0.1, 2, 100],
  ])("P=%s W, v=%s mm/s, h=%s µm, t=%s µm", (laserPowerW, scanSpeedMmPerS, hatchSpacingUm, layerThicknessUm, el, ea, ev) => {
    const e = energyDensities({ laserPowerW, scanSpeedMmPerS, hatchSpacingUm, layerThicknessUm });
    expect(e.linearJPerMm).toBeCloseTo(el, 5);
    expect(e.arealJPerMm2).toBeCloseTo(ea, 5);
    expect(e.volumetricJPerMm3).toBeCloseTo(ev, 4);
  });

  test.each([
    ["missing hatch", { laserPowerW: 200, scanSpeedMmPerS: 800, layerThicknessUm: 30 }, [0.25, null, null]],
    ["zero speed", { laserPowerW: 200, scanSpeedMmPerS: 0, hatchSpacingUm: 100, layerThicknessUm: 30 }, [null, null, null]],
    ["negative layer", { laserPowerW: 200, scanSpeedMmPerS: 800, hatchSpacingUm: 100, layerThicknessUm: -30 }, [0.25, 2.5, null]],
    ["NaN power", { laserPowerW: Number.NaN, scanSpeedMmPerS: 800, hatchSpacingUm: 100, layerThicknessUm: 30 }, [null, null, null]],
    ["null power", { laserPowerW: null, scanSpeedMmPerS: 800 }, [null, null, null]],
  ] as const)("%s gives null where an input is unusable", (_label, inputs, expected) => {
    const e = energyDensities(inputs);
    expect([e.linearJPerMm, e.arealJPerMm2, e.volumetricJPerMm3].map((v) => (v === null ? null : Number(v.toFixed(6))))).toEqual(expected);
  });

  test("volumetric energy scales inversely with each of v, h and t", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 1000, noNaN: true }),
        fc.double({ min: 10, max: 5000, noNaN: true }),
        fc.double({ min: 10, max: 500, noNaN: true }),
        fc.double({ min: 10, max: 200, noNaN: true }),
        (p, v, h, t) => {
          const a = energyDensities({ laserPowerW: p, scanSpeedMmPerS: v, hatchSpacingUm: h, layerThicknessUm: t });
          const b = energyDensities({ laserPowerW: p, scanSpeedMmPerS: 2 * v, hatchSpacingUm: h, layerThicknessUm: t });
          expect((a.volumetricJPerMm3 as number) / (b.volumetricJPerMm3 as number)).toBeCloseTo(2, 9);
          expect((a.linearJPerMm as number) * 1e6 / (h * t)).toBeCloseTo(a.volumetricJPerMm3 as number, 6);
        },
      ),
    );
  });
});
