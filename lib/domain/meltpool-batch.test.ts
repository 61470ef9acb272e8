import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { CURATED_PROPERTY_SETS, resolveAlloyProperties } from "./alloy-properties";
import { analyzeMeltPool, materialFromProperties, type MeltPoolMaterial } from "./meltpool-analysis";
import { MELTPOOL_SLOT_COUNT, MELTPOOL_SLOTS, meltPoolInto } from "./meltpool-batch";

const materials: MeltPoolMaterial[] = Object.keys(CURATED_PROPERTY_SETS).map((alloyKey) => {
  const r = resolveAlloyProperties({ alloyKey });
  if (!r.ok) throw new Error(r.message);
  return materialFromProperties(r.properties);
});
const withoutBoiling: MeltPoolMaterial = { ...materials[0]!, boilingTemperatureK: null };

/** What analyzeMeltPool gives, in the slots of meltPoolInto (NaN where a margin is null). */
function reference(p: number, v: number, d: number, h: number | null, t: number | null, t0: number, m: MeltPoolMaterial): Float64Array {
  const a = analyzeMeltPool({ laserPowerW: p, scanSpeedMmPerS: v, spotDiameterUm: d, hatchSpacingUm: h, layerThicknessUm: t, ambientTemperatureK: t0, material: m }, { method: "surface" });
  const out = new Float64Array(MELTPOOL_SLOT_COUNT);
  const margin = (name: string) => a.criteria.find((c) => c.name === name)?.margin ?? NaN;
  out[MELTPOOL_SLOTS.widthUm] = a.pool.widthUm;
  out[MELTPOOL_SLOTS.depthUm] = a.pool.depthUm;
  out[MELTPOOL_SLOTS.lengthUm] = a.pool.lengthUm;
  out[MELTPOOL_SLOTS.peakTemperatureK] = a.pool.peakTemperatureK;
  out[MELTPOOL_SLOTS.normalizedEnthalpy] = a.normalizedEnthalpy;
  out[MELTPOOL_SLOTS.melted] = a.pool.melted ? 1 : 0;
  out[MELTPOOL_SLOTS.marginLackOfFusionDepth] = margin("lack_of_fusion_depth");
  out[MELTPOOL_SLOTS.marginLackOfFusionOverlap] = margin("lack_of_fusion_overlap");
  out[MELTPOOL_SLOTS.marginBalling] = margin("balling_aspect");
  out[MELTPOOL_SLOTS.marginKeyholeAspect] = margin("keyhole_aspect");
  out[MELTPOOL_SLOTS.marginKeyholeEnthalpy] = margin("keyhole_enthalpy");
  return out;
}

function lean(p: number, v: number, d: number, h: number | null, t: number | null, t0: number, m: MeltPoolMaterial): Float64Array {
  const out = new Float64Array(MELTPOOL_SLOT_COUNT + 3).fill(-1);
  meltPoolInto(p, v, d, h, t, t0, m, out, 3);
  return out.subarray(3);
}

describe("meltPoolInto", () => {
  test("property: the same doubles as analyzeMeltPool with the surface method, for every curated alloy", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 20, max: 1000, noNaN: true }),
        fc.double({ min: 50, max: 5000, noNaN: true }),
        fc.double({ min: 20, max: 300, noNaN: true }),
        fc.option(fc.double({ min: 20, max: 300, noNaN: true })),
        fc.option(fc.double({ min: 10, max: 150, noNaN: true })),
        fc.double({ min: 250, max: 700, noNaN: true }),
        fc.integer({ min: 0, max: materials.length }),
        (p, v, d, h, t, t0, which) => {
          const m = which === materials.length ? withoutBoiling : materials[which]!;
          let expected: number[] | string;
          try {
            expected = Array.from(reference(p, v, d, h, t, t0, m));
          } catch (error) {
            expected = (error as Error).message;
          }
          if (typeof expected === "string") expect(() => lean(p, v, d, h, t, t0, m)).toThrow(new RangeError(expected));
          else expect(Array.from(lean(p, v, d, h, t, t0, m))).toEqual(expected);
        },
      ),
      { numRuns: 1500, seed: 20261202 },
    );
  });

  test("a case where nothing melts: zero dimensions, not melted, the same margins", () => {
    const out = lean(3, 2000, 100, 100, 30, 298, materials[0]!);
    expect(out[MELTPOOL_SLOTS.melted]).toBe(0);
    expect(out[MELTPOOL_SLOTS.widthUm]).toBe(0);
    expect(Array.from(out)).toEqual(Array.from(reference(3, 2000, 100, 100, 30, 298, materials[0]!)));
  });

  test("without hatch and layer the criteria that need them have no margin", () => {
    const out = lean(200, 800, 80, null, null, 298.15, materials[0]!);
    expect(out[MELTPOOL_SLOTS.marginLackOfFusionDepth]).toBeNaN();
    expect(out[MELTPOOL_SLOTS.marginLackOfFusionOverlap]).toBeNaN();
    expect(out[MELTPOOL_SLOTS.marginBalling]).not.toBeNaN();
  });

  test.each([
    ["spot diameter 0", 200, 800, 0, 298],
    ["power NaN", Number.NaN, 800, 80, 298],
    ["ambient above melting", 200, 800, 80, 5000],
  ])("invalid input (%s) throws the RangeError analyzeMeltPool throws", (_why, p, v, d, t0) => {
    const m = materials[0]!;
    let expected = "";
    try {
      reference(p, v, d, 100, 30, t0, m);
    } catch (error) {
      expected = (error as Error).message;
    }
    expect(expected).not.toBe("");
    expect(() => lean(p, v, d, 100, 30, t0, m)).toThrow(new RangeError(expected));
  });
});
