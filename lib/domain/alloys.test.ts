import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { listGrades, resolveAlloy } from "./alloys";
import { getElement } from "./elements";

describe("resolveAlloy: named grades and aliases", () => {
  test.each([
    ["316L", "316L"],
    ["SS316L", "316L"],
    ["316 L", "316L"],
    ["ss 316l", "316L"],
    ["1.4404", "316L"],
    ["Ti-6Al-4V", "Ti-6Al-4V"],
    ["Ti6Al4V", "Ti-6Al-4V"],
    ["Ti64", "Ti-6Al-4V"],
    ["ti-64", "Ti-6Al-4V"],
    ["alloy 718", "IN718"],
    ["Inconel 718", "IN718"],
    ["IN 718", "IN718"],
    ["in718", "IN718"],
    ["Inconel 625", "IN625"],
    ["18Ni(300)", "18Ni300"],
    ["maraging 300", "18Ni300"],
    ["MS1", "18Ni300"],
    ["17-4 PH", "17-4PH"],
    ["CuCr1Zr", "CuCrZr"],
    ["CoCrMo", "CoCrMo"],
    ["Co-28Cr-6Mo", "CoCrMo"],
    ["AlSi10Mg", "AlSi10Mg"],
    ["alsi10mg", "AlSi10Mg"],
    ["Hastelloy X", "HastelloyX"],
    ["H13", "H13"],
    ["304L", "304L"],
  ])("%s -> %s", (text, key) => {
    const r = resolveAlloy(text);
    if (!r.ok) throw new Error(r.message);
    expect(r.alloyKey).toBe(key);
    expect(r.basis).toBe("wt");
    expect(r.kind).toBe("nominal");
    expect(r.standard).not.toBeNull();
  });

  test.each([
    ["316L", "ASTM F3184"],
    ["Ti-6Al-4V", "ASTM F2924"],
    ["IN718", "ASTM F3055"],
    ["IN625", "ASTM F3056"],
    ["AlSi10Mg", "ASTM F3318"],
  ])("%s names its PBF standard %s", (text, standard) => {
    const r = resolveAlloy(text);
    expect(r.ok && r.standard).toContain(standard);
  });

  test("316L nominal composition is the midpoint of its ranges with Fe balance", () => {
    const r = resolveAlloy("316L");
    if (!r.ok) throw new Error(r.message);
    const byElement = Object.fromEntries(r.components.map((c) => [c.element, c]));
    expect(byElement.Cr?.amount).toBe(17); // 16.0–18.0
    expect(byElement.Ni?.amount).toBe(12); // 10.0–14.0
    expect(byElement.Mo?.amount).toBe(2.5); // 2.00–3.00
    expect(byElement.Fe?.isBalance).toBe(true);
    expect(byElement.Fe?.amount).toBeCloseTo(100 - 17 - 12 - 2.5 - 1 - 0.375 - 0.05 - 0.015, 9);
  });
});

describe("resolveAlloy: parsed designations", () => {
  test.each([
    ["Fe-18Cr-8Ni", "Fe-18Cr-8Ni"],
    ["Fe bal, Cr 18, Ni 8", "Fe-18Cr-8Ni"],
    ["  Fe-18Cr-8Ni  ", "Fe-18Cr-8Ni"],
    ["Ni-5Nb", "Ni-5Nb"],
    ["Fe bal, Ni 12, Cr 17, Mo 2.5", "Fe-17Cr-12Ni-2.5Mo"],
  ])("%s -> key %s, no standard", (text, key) => {
    const r = resolveAlloy(text);
    if (!r.ok) throw new Error(r.message);
    expect(r.alloyKey).toBe(key);
    expect(r.standard).toBeNull();
  });

  test("an at% list is returned in wt%", () => {
    const r = resolveAlloy("Ni 50 at%, Ti 50 at%");
    if (!r.ok) throw new Error(r.message);
    expect(r.basis).toBe("wt");
    expect(r.components.find((c) => c.element === "Ni")?.amount).toBeCloseTo(55.08, 2);
  });

  test.each([
    ["Fe-18Xx", /unknown element symbol 'Xx'/],
    ["Inconel 939", /not a known grade/],
    ["Fe 60, Cr 18, Ni 8", /sum to 86/],
    ["", /no alloy/],
  ])("%s is an error value", (text, message) => {
    const r = resolveAlloy(text);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(message);
  });
});

describe("listGrades", () => {
  const grades = listGrades();
  test("contains the grades LPBF work needs", () => {
    const keys = grades.map((g) => g.key);
    for (const key of ["316L", "304L", "17-4PH", "18Ni300", "H13", "Ti-6Al-4V", "IN718", "IN625", "HastelloyX", "AlSi10Mg", "CuCrZr", "CoCrMo"]) {
      expect(keys).toContain(key);
    }
  });

  test.each(listGrades().map((g) => [g.key, g] as const))("%s: known elements, one balance, sums to 100, standard named", (_key, grade) => {
    expect(grade.components.filter((c) => c.isBalance)).toHaveLength(1);
    for (const c of grade.components) expect(getElement(c.element)).toBeDefined();
    expect(grade.components.reduce((s, c) => s + c.amount, 0)).toBeCloseTo(100, 9);
    expect(grade.components.every((c) => c.amount > 0)).toBe(true);
    expect(grade.standard.length).toBeGreaterThan(0);
    expect(resolveAlloy(grade.key).ok && resolveAlloy(grade.displayName).ok).toBe(true);
  });

  test("every alias resolves to its own grade, whatever its case and spacing", () => {
    const pairs = grades.flatMap((g) => g.aliases.map((a) => [a, g.key] as const));
    fc.assert(
      fc.property(fc.constantFrom(...pairs), fc.boolean(), fc.constantFrom("", " ", "-"), ([alias, key], upper, sep) => {
        const variant = (upper ? alias.toUpperCase() : alias.toLowerCase()).replace(/ /g, sep);
        const r = resolveAlloy(variant);
        expect(r.ok && r.alloyKey).toBe(key);
      }),
    );
  });

  test("listGrades returns copies that callers cannot use to alter the library", () => {
    const first = listGrades();
    first[0]?.components.splice(0);
    expect(listGrades()[0]?.components.length).toBeGreaterThan(0);
  });
});
