import { describe, expect, test } from "vitest";
import fc from "fast-check";
import {
  type Composition,
  formatDesignation,
  parseComposition,
  toAtomicPercent,
  toWeightPercent,
} from "./composition";
import { ELEMENTS } from "./elements";

function amounts(c: Composition): Record<string, number> {
  return Object.fromEntries(c.components.map((x) => [x.element, Number(x.amount.toFixed(6))]));
}

describe("parseComposition", () => {
  test.each([
    ["Ti-6Al-4V", "Ti", { Ti: 90, Al: 6, V: 4 }],
    ["Fe-18Cr-8Ni", "Fe", { Fe: 74, Cr: 18, Ni: 8 }],
    ["Ni-5Nb", "Ni", { Ni: 95, Nb: 5 }],
    ["Al-10Si-0.35Mg", "Al", { Al: 89.65, Si: 10, Mg: 0.35 }],
    ["Ti–6Al–4V", "Ti", { Ti: 90, Al: 6, V: 4 }],
    ["AlSi12", "Al", { Al: 88, Si: 12 }],
    ["TiAl6V4", "Ti", { Ti: 90, Al: 6, V: 4 }],
    ["AlSi10Mg0.4", "Al", { Al: 89.6, Si: 10, Mg: 0.4 }],
    ["Fe bal, Cr 17, Ni 12, Mo 2.5", "Fe", { Fe: 68.5, Cr: 17, Ni: 12, Mo: 2.5 }],
    ["Cr 17; Ni 12; Fe balance", "Fe", { Fe: 71, Cr: 17, Ni: 12 }],
    ["Fe: bal, Cr: 18 wt%, Ni: 8 wt%", "Fe", { Fe: 74, Cr: 18, Ni: 8 }],
    ["fe bal cr 18 ni 8", "Fe", { Fe: 74, Cr: 18, Ni: 8 }],
  ])("%s", (text, balance, expected) => {
    const r = parseComposition(text);
    if (!r.ok) throw new Error(r.message);
    expect(r.composition.basis).toBe("wt");
    expect(amounts(r.composition)).toEqual(expected);
    expect(r.composition.components.filter((c) => c.isBalance).map((c) => c.element)).toEqual([balance]);
  });

  test("a list with every amount given and a sum within 0.5 wt% is accepted without a balance", () => {
    const r = parseComposition("Fe 70, Cr 18.2, Ni 12");
    expect(r.ok && r.composition.components.every((c) => !c.isBalance)).toBe(true);
  });

  test("an at% list keeps its basis", () => {
    const r = parseComposition("Ni 50 at%, Ti 50 at%");
    expect(r.ok && r.composition.basis).toBe("at");
  });

  test.each([
    ["Fe-18Xx", /unknown element symbol 'Xx'/],
    ["Fe bal, Qq 5", /unknown element symbol 'Qq'/],
    ["Fe 70, Cr 18, Ni 8", /sum to 96 wt%/],
    ["Fe 70, Cr 25, Ni 8", /sum to 103 wt%/],
    ["Fe bal, Cr 60, Ni 45", /leaving nothing for the balance/],
    ["AlSi7Mg", /no amount given for Mg/],
    ["Fe-18Cr-Ni", /no amount given for Ni/],
    ["Fe-18Cr-8Cr", /Cr appears twice/],
    ["Fe bal, Cr bal", /more than one balance/],
    ["Ni 50 at%, Ti 50 wt%", /mixes wt% and at%/],
    ["hello", /cannot read/],
    ["", /empty/],
    ["Fe", /one element only/],
  ])("%s is rejected as a value", (text, message) => {
    const r = parseComposition(text);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(message);
  });

  test("the sum tolerance is configurable", () => {
    expect(parseComposition("Fe 70, Cr 18, Ni 11").ok).toBe(false);
    expect(parseComposition("Fe 70, Cr 18, Ni 11", { sumTolerancePct: 1.5 }).ok).toBe(true);
  });
});

describe("wt% <-> at%", () => {
  test("Ti-6Al-4V in at% (w_i = x_i·M_i / Σ x_j·M_j)", () => {
    const r = parseComposition("Ti-6Al-4V");
    if (!r.ok) throw new Error(r.message);
    const at = amounts(toAtomicPercent(r.composition));
    // Hand calculation with CIAAW weights: Al 6/26.982, V 4/50.942, Ti 90/47.867 (mol per 100 g).
    const nAl = 6 / 26.982, nV = 4 / 50.942, nTi = 90 / 47.867;
    const total = nAl + nV + nTi;
    expect(at.Al).toBeCloseTo((100 * nAl) / total, 5);
    expect(at.V).toBeCloseTo((100 * nV) / total, 5);
    expect(at.Al).toBeCloseTo(10.2, 1);
  });

  test("equiatomic NiTi is 55.08 wt% Ni", () => {
    const r = parseComposition("Ni 50 at%, Ti 50 at%");
    if (!r.ok) throw new Error(r.message);
    expect(amounts(toWeightPercent(r.composition)).Ni).toBeCloseTo((100 * 58.693) / (58.693 + 47.867), 6);
  });

  const symbols = ELEMENTS.map((e) => e.symbol);
  const compositionArb = fc
    .uniqueArray(fc.constantFrom(...symbols), { minLength: 2, maxLength: 6 })
    .chain((elements) =>
      fc.array(fc.double({ min: 0.01, max: 100, noNaN: true }), { minLength: elements.length, maxLength: elements.length }).map(
        (weights): Composition => {
          const sum = weights.reduce((s, w) => s + w, 0);
          return {
            basis: "wt",
            components: elements.map((element, i) => ({ element, amount: ((weights[i] as number) / sum) * 100, isBalance: i === 0 })),
          };
        },
      ),
    );

  test("round trip wt -> at -> wt returns the composition and both sum to 100", () => {
    fc.assert(
      fc.property(compositionArb, (wt) => {
        const at = toAtomicPercent(wt);
        expect(at.components.reduce((s, c) => s + c.amount, 0)).toBeCloseTo(100, 9);
        const back = toWeightPercent(at);
        back.components.forEach((c, i) => expect(c.amount).toBeCloseTo(wt.components[i]?.amount ?? Number.NaN, 9));
      }),
    );
  });

  test("formatting a parsed composition and parsing it again is stable", () => {
    fc.assert(
      fc.property(compositionArb, (wt) => {
        const text = formatDesignation(wt);
        const again = parseComposition(text);
        if (!again.ok) throw new Error(`${text}: ${again.message}`);
        expect(formatDesignation(again.composition)).toBe(text);
      }),
    );
  });
});

describe("formatDesignation", () => {
  test.each([
    ["Fe bal, Cr 17, Ni 12, Mo 2.5", "Fe-17Cr-12Ni-2.5Mo"],
    ["Fe bal, Ni 8, Cr 18", "Fe-18Cr-8Ni"],
    ["Fe 70, Cr 18, Ni 12", "Fe-18Cr-12Ni"],
  ])("%s -> %s", (text, expected) => {
    const r = parseComposition(text);
    if (!r.ok) throw new Error(r.message);
    expect(formatDesignation(r.composition)).toBe(expected);
  });
});
