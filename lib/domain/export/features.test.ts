import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { resolveAlloy } from "../alloys";
import { analyzeMeltPool, materialFromProperties } from "../meltpool-analysis";
import { resolveAlloyProperties } from "../alloy-properties";
import { compositionFeature, createFeatureComputer, FEATURE_CATALOGUE, materialContext, roundSig, roundSigOrNaN } from "./features";
import type { ProcessPoint } from "./process-point";

const alloy = resolveAlloy("316L");
if (!alloy.ok) throw new Error("316L");
const composition = { basis: "wt" as const, components: alloy.components };
const point: ProcessPoint = { laserPowerW: 200, scanSpeedMmPerS: 800, hatchSpacingUm: 100, layerThicknessUm: 30, spotDiameterUm: 80, preheatC: null, powderD50Um: 35 };

function features(groups: Parameters<typeof createFeatureComputer>[0], p = point, elements: string[] = []) {
  const fc = createFeatureComputer(groups, elements);
  const out = new Float64Array(fc.columns.length);
  fc.compute(p, materialContext("316L", composition), { recordQuality: 0.8, sourceYear: 2021 }, out);
  return Object.fromEntries(fc.columns.map((c, i) => [c.name, out[i]]));
}

describe("feature catalogue", () => {
  test("names are snake_case, unique, and carry a unit and a definition", () => {
    const names = FEATURE_CATALOGUE.map((f) => f.name);
    expect(new Set(names).size).toBe(names.length);
    for (const f of FEATURE_CATALOGUE) {
      expect(f.name).toMatch(/^[a-z0-9_]+$/);
      expect(f.unit.length).toBeGreaterThan(0);
      expect(f.definition.length).toBeGreaterThan(5);
    }
    expect(compositionFeature("Cr")).toMatchObject({ name: "cr_wt_pct", unit: "wt%", group: "composition" });
  });

  test("energy densities from the process values (P/v, P/(v·h), P/(v·h·t))", () => {
    const f = features(["process", "energy"]);
    expect(f.linear_energy_density_j_mm).toBeCloseTo(0.25, 12);
    expect(f.areal_energy_density_j_mm2).toBeCloseTo(2.5, 12);
    expect(f.volumetric_energy_density_j_mm3).toBeCloseTo(83.33333333, 6);
    expect(f.preheat_c).toBeNaN();
  });

  test("melt-pool features agree with the melt-pool core", () => {
    const f = features(["meltpool"]);
    const props = resolveAlloyProperties({ alloyKey: "316L", composition });
    if (!props.ok) throw new Error(props.message);
    const a = analyzeMeltPool({ laserPowerW: 200, scanSpeedMmPerS: 800, spotDiameterUm: 80, hatchSpacingUm: 100, layerThicknessUm: 30, ambientTemperatureK: 298.15, material: materialFromProperties(props.properties) });
    expect(f.meltpool_width_um).toBeCloseTo(a.pool.widthUm, 6);
    expect(f.meltpool_depth_um).toBeCloseTo(a.pool.depthUm, 6);
    expect(f.meltpool_length_to_width).toBeCloseTo(a.pool.lengthUm / a.pool.widthUm, 6);
    expect(f.margin_balling).toBeCloseTo(a.criteria.find((c) => c.name === "balling_aspect")!.margin!, 6);
    expect(f.depth_to_layer).toBeCloseTo(a.pool.depthUm / 30, 6);
  });

  test("preheat raises the ambient temperature and so the pool", () => {
    expect(features(["meltpool"], { ...point, preheatC: 200 }).meltpool_width_um).toBeGreaterThan(features(["meltpool"]).meltpool_width_um!);
  });

  test("no spot diameter: melt-pool features are empty, energy densities are not", () => {
    const f = features(["energy", "meltpool"], { ...point, spotDiameterUm: null });
    expect(f.meltpool_width_um).toBeNaN();
    expect(f.volumetric_energy_density_j_mm3).toBeGreaterThan(0);
  });

  test("mixture and composition columns; an absent element is 0 wt%", () => {
    const f = features(["mixture", "composition", "provenance"], point, ["Cr", "Ti", "Fe"]);
    expect(f.cr_wt_pct).toBeCloseTo(17, 0);
    expect(f.ti_wt_pct).toBe(0);
    expect(f.mix_density_kg_m3).toBeGreaterThan(7500);
    expect(f.record_quality).toBe(0.8);
    expect(f.source_year).toBe(2021);
  });

  test.each([[1 / 3, 0.3333333333], [123456.789012345, 123456.789], [-2.5e-7, -2.5e-7], [0, 0]])("roundSig(%s) = %s", (x, r) => {
    expect(roundSig(x)).toBe(r);
  });
});

describe("roundSig", () => {
  /** The rounding written out with the power of ten computed in place, as the table must reproduce. */
  const inPlace = (x: number) => {
    if (x === 0) return 0;
    const e = Math.floor(Math.log10(Math.abs(x)));
    const scale = 10 ** (9 - e);
    const r = Math.round(x * scale) / scale;
    return Number.isFinite(r) ? r : x;
  };

  test("property: the same doubles as rounding with 10 ** n computed in place, over the whole double range", () => {
    fc.assert(fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (x) => {
      expect(Object.is(roundSig(x), inPlace(x))).toBe(true);
      expect(Object.is(roundSigOrNaN(x), inPlace(x))).toBe(true);
    }), { numRuns: 20000 });
  });

  test("not finite: null, or NaN for typed columns", () => {
    expect(roundSig(Infinity)).toBeNull();
    expect(roundSigOrNaN(Number.NaN)).toBeNaN();
  });
});
