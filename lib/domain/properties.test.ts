import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { type Composition, parseComposition } from "./composition";
import { ELEMENTS, getElement } from "./elements";
import { mixtureProperties } from "./properties";

function comp(text: string): Composition {
  const r = parseComposition(text);
  if (!r.ok) throw new Error(r.message);
  return r.composition;
}

describe("mixtureProperties", () => {
  test("a pure element gives the element's own values", () => {
    const ni = getElement("Ni");
    if (!ni) throw new Error("no Ni");
    const m = mixtureProperties({ basis: "wt", components: [{ element: "Ni", amount: 100, isBalance: true }] });
    expect(m.densityKgPerM3).toBeCloseTo(ni.densityGPerCm3 * 1000, 9);
    expect(m.specificHeatJPerKgK).toBeCloseTo(ni.specificHeatJPerGK * 1000, 9);
    expect(m.meltingTemperatureK).toBeCloseTo(ni.meltingPointK, 9);
    expect(m.atomicSizeMismatchPct).toBeCloseTo(0, 12);
    expect(m.electronegativitySpread).toBeCloseTo(0, 12);
  });

  test("Ti-6Al-4V by hand: 1/ρ = Σ w/ρ, c_p = Σ w·c_p, M = Σ x·M", () => {
    const m = mixtureProperties(comp("Ti-6Al-4V"));
    const w = { Ti: 0.9, Al: 0.06, V: 0.04 };
    const rho = 1 / (w.Ti / 4506 + w.Al / 2700 + w.V / 6000);
    expect(m.densityKgPerM3).toBeCloseTo(rho, 6);
    expect(m.specificHeatJPerKgK).toBeCloseTo(1000 * (0.9 * 0.523 + 0.06 * 0.897 + 0.04 * 0.489), 6);
    const n = { Ti: 0.9 / 47.867, Al: 0.06 / 26.982, V: 0.04 / 50.942 };
    const total = n.Ti + n.Al + n.V;
    expect(m.molarMassGPerMol).toBeCloseTo((n.Ti * 47.867 + n.Al * 26.982 + n.V * 50.942) / total, 9);
    // The mixture density is within 2 % of the handbook 4,420 kg/m³ (Mills 2002, from memory).
    expect(Math.abs(m.densityKgPerM3 / 4420 - 1)).toBeLessThan(0.02);
  });

  test("the mixture conductivity of 316L is far above the real alloy (why it is flagged estimated)", () => {
    const m = mixtureProperties(comp("Fe bal, Cr 17, Ni 12, Mo 2.5"));
    expect(m.thermalConductivityWPerMK).toBeGreaterThan(3 * 15);
  });

  test("every mixture value lies between the smallest and largest element value", () => {
    const symbols = ELEMENTS.filter((e) => e.phaseAt298K === "solid").map((e) => e.symbol);
    fc.assert(
      fc.property(fc.uniqueArray(fc.constantFrom(...symbols), { minLength: 2, maxLength: 5 }), fc.array(fc.double({ min: 1, max: 50, noNaN: true }), { minLength: 5, maxLength: 5 }), (elements, weights) => {
        const total = elements.reduce((s, _e, i) => s + (weights[i] as number), 0);
        const c: Composition = { basis: "wt", components: elements.map((element, i) => ({ element, amount: (100 * (weights[i] as number)) / total, isBalance: false })) };
        const m = mixtureProperties(c);
        const data = elements.map((e) => getElement(e)!);
        const within = (value: number, pick: (e: (typeof data)[number]) => number, scale = 1): void => {
          const values = data.map(pick).map((v) => v * scale);
          expect(value).toBeGreaterThanOrEqual(Math.min(...values) * (1 - 1e-12));
          expect(value).toBeLessThanOrEqual(Math.max(...values) * (1 + 1e-12));
        };
        within(m.densityKgPerM3, (e) => e.densityGPerCm3, 1000);
        within(m.specificHeatJPerKgK, (e) => e.specificHeatJPerGK, 1000);
        within(m.meltingTemperatureK, (e) => e.meltingPointK);
        within(m.valenceElectronConcentration, (e) => e.valenceElectrons);
        within(m.electronegativityMean, (e) => e.electronegativityPauling);
      }),
    );
  });

  test("atomic-size mismatch of equiatomic CoCrFeMnNi is small (a few %)", () => {
    const m = mixtureProperties({ basis: "at", components: ["Co", "Cr", "Fe", "Mn", "Ni"].map((element) => ({ element, amount: 20, isBalance: false })) });
    expect(m.atomicSizeMismatchPct).toBeGreaterThan(0);
    expect(m.atomicSizeMismatchPct).toBeLessThan(3);
    expect(m.valenceElectronConcentration).toBeCloseTo((9 + 6 + 8 + 7 + 10) / 5, 12);
  });
});
