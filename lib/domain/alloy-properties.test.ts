import { describe, expect, test } from "vitest";
import { resolveAlloy, listGrades } from "./alloys";
import { CURATED_PROPERTY_SETS, PHYSICS_PROPERTIES, PROPERTY_NAMES, resolveAlloyProperties } from "./alloy-properties";

describe("curated property sets", () => {
  test.each(Object.entries(CURATED_PROPERTY_SETS))("%s: every property has a positive value and a source", (key, set) => {
    expect(listGrades().map((g) => g.key)).toContain(key);
    for (const name of PROPERTY_NAMES) {
      expect(set[name].value).toBeGreaterThan(0);
      expect(set[name].source.length).toBeGreaterThan(5);
    }
    expect(set.absorptivity.value).toBeLessThanOrEqual(1);
    expect(set.solidusK.value).toBeLessThanOrEqual(set.liquidusK.value);
    expect(set.boilingK.value).toBeGreaterThan(set.liquidusK.value);
  });

  test("DOMAIN.md candidates: Ti-6Al-4V and IN718 from Mills 2002, IN625 from Materials 11:2356", () => {
    expect(CURATED_PROPERTY_SETS["Ti-6Al-4V"]?.densityKgPerM3.value).toBe(4420);
    expect(CURATED_PROPERTY_SETS["Ti-6Al-4V"]?.liquidusK.value).toBe(1923);
    expect(CURATED_PROPERTY_SETS.IN718?.thermalConductivityWPerMK.value).toBe(11.4);
    expect(CURATED_PROPERTY_SETS.IN625?.latentHeatJPerKg.value).toBe(227000);
  });
});

describe("resolveAlloyProperties", () => {
  test("a curated alloy resolves from its set", () => {
    const r = resolveAlloyProperties({ alloyKey: "316L" });
    if (!r.ok) throw new Error(r.message);
    expect(r.basis).toBe("curated");
    expect(r.properties.thermalConductivityWPerMK).toMatchObject({ value: 20, origin: "curated", estimated: false });
  });

  test("overrides replace single values and say so", () => {
    const r = resolveAlloyProperties({ alloyKey: "316L", overrides: { absorptivity: 0.5, thermalConductivityWPerMK: { value: 25, source: "lab measurement" } } });
    if (!r.ok) throw new Error(r.message);
    expect(r.properties.absorptivity).toMatchObject({ value: 0.5, origin: "override" });
    expect(r.properties.thermalConductivityWPerMK).toMatchObject({ value: 25, source: "lab measurement" });
    expect(r.properties.densityKgPerM3?.origin).toBe("curated");
  });

  test("an uncurated composition falls back to the mixture, with conductivity flagged estimated", () => {
    const alloy = resolveAlloy("Fe-18Cr-8Ni");
    if (!alloy.ok) throw new Error(alloy.message);
    const r = resolveAlloyProperties({ alloyKey: alloy.alloyKey, composition: { basis: "wt", components: alloy.components } });
    if (!r.ok) throw new Error(r.message);
    expect(r.basis).toBe("mixture");
    expect(r.properties.thermalConductivityWPerMK).toMatchObject({ origin: "mixture", estimated: true });
    expect(r.properties.densityKgPerM3).toMatchObject({ origin: "mixture", estimated: false });
    expect(r.properties.absorptivity?.origin).toBe("default");
    expect(r.notes.join(" ")).toMatch(/estimated/);
  });

  test("without alloy or composition every physics property must be given", () => {
    const r = resolveAlloyProperties({ overrides: { absorptivity: 0.35 } });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.missing).toEqual(PHYSICS_PROPERTIES.filter((p) => p !== "absorptivity"));
    const full = resolveAlloyProperties({
      overrides: { absorptivity: 0.35, densityKgPerM3: 7900, specificHeatJPerKgK: 500, thermalConductivityWPerMK: 20, liquidusK: 1700, boilingK: 3090 },
    });
    expect(full.ok && full.basis).toBe("overrides");
  });

  test.each([
    ["densityKgPerM3", 0],
    ["thermalConductivityWPerMK", -3],
    ["specificHeatJPerKgK", Number.NaN],
    ["absorptivity", 1.5],
  ] as const)("override %s = %s is a RangeError naming it", (name, value) => {
    expect(() => resolveAlloyProperties({ alloyKey: "316L", overrides: { [name]: value } })).toThrow(new RegExp(name));
  });
});
