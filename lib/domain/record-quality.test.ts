import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { completenessInputOf, completenessValueOf, recordCompleteness, recordQuality, type CompletenessInput } from "./record-quality";

const full: CompletenessInput["fields"] = {
  laserPower: { present: true },
  scanSpeed: { present: true },
  hatchSpacing: { present: true },
  layerThickness: { present: true },
  spotDiameter: { present: true },
  powderD50: { present: true },
  result: { present: true },
};

describe("recordCompleteness", () => {
  test.each([
    // total weight 5.75 with the defaults
    ["every field reported", {}, 1],
    ["spot assumed", { spotDiameter: { present: true, provenance: "assumed" as const } }, (5.75 - 0.25) / 5.75],
    ["spot missing", { spotDiameter: { present: false } }, 5.25 / 5.75],
    ["hatch derived", { hatchSpacing: { present: true, provenance: "derived" as const } }, (5.75 - 0.2) / 5.75],
    ["no result", { result: { present: false } }, 4.75 / 5.75],
  ])("%s", (_label, overrides, expected) => {
    expect(recordCompleteness({ fields: { ...full, ...overrides } }, {}).value).toBeCloseTo(expected, 9);
  });

  test("shortfalls say which fields count less", () => {
    const c = recordCompleteness({ fields: { ...full, spotDiameter: { present: true, provenance: "assumed" }, powderD50: { present: false } } }, {});
    expect(c.shortfalls.map((s) => [s.field, s.state])).toEqual([
      ["spotDiameter", "assumed"],
      ["powderD50", "missing"],
    ]);
  });

  test("assuming a value never raises completeness above reporting it", () => {
    fc.assert(
      fc.property(fc.constantFrom("laserPower", "scanSpeed", "hatchSpacing", "layerThickness", "spotDiameter", "powderD50") as fc.Arbitrary<keyof typeof full>, fc.double({ min: 0, max: 1, noNaN: true }), (field, factor) => {
        const s = { "completeness.factor.assumed": factor };
        const reported = recordCompleteness({ fields: full }, s).value;
        const assumed = recordCompleteness({ fields: { ...full, [field]: { present: true, provenance: "assumed" } } }, s).value;
        const missing = recordCompleteness({ fields: { ...full, [field]: { present: false } } }, s).value;
        expect(assumed).toBeLessThanOrEqual(reported + 1e-12);
        expect(assumed).toBeGreaterThanOrEqual(missing - 1e-12);
      }),
    );
  });
});

describe("recordQuality", () => {
  test.each([
    [0.9, 0.8, 0.72],
    [1, 1, 1],
    [1.2, 0.5, 0.5], // clamped
    [0, 1, 0],
  ])("%s × %s = %s", (s, c, q) => {
    expect(recordQuality(s, c)).toBe(q);
  });

  test("non-finite input is refused", () => {
    expect(() => recordQuality(Number.NaN, 1)).toThrow(RangeError);
  });
});

describe("completenessInputOf", () => {
  test("reads presence from the values and provenance from what was entered", () => {
    const input = completenessInputOf({
      laserPowerW: 200, scanSpeedMmPerS: 800, hatchSpacingUm: null, layerThicknessUm: 30, spotDiameterUm: 80, powderD50Um: null,
      relativeDensityPct: null, outcome: "unknown", entered: { spotDiameter: { provenance: "assumed" }, laserPower: { provenance: "reported" } },
    });
    expect(input.fields.spotDiameter).toEqual({ present: true, provenance: "assumed" });
    expect(input.fields.hatchSpacing?.present).toBe(false);
    expect(input.fields.result?.present).toBe(false);
  });
});

describe("completenessValueOf", () => {
  test("property: equals recordCompleteness of completenessInputOf", () => {
    const value = fc.option(fc.double({ min: 1, max: 500, noNaN: true }), { nil: null });
    const provenance = fc.constantFrom(undefined, "reported", "derived", "assumed");
    fc.assert(
      fc.property(value, value, value, value, value, value, value, fc.constantFrom("dense", "unknown", "keyhole"), provenance, provenance, fc.boolean(), fc.double({ min: 0, max: 1, noNaN: true }), (p, v, h, t, d, d50, rd, outcome, spotProv, hatchProv, allReported, factor) => {
        const r = {
          laserPowerW: p, scanSpeedMmPerS: v, hatchSpacingUm: h, layerThicknessUm: t, spotDiameterUm: d, powderD50Um: d50, relativeDensityPct: rd, outcome,
          entered: { spotDiameter: { provenance: spotProv }, hatchSpacing: { provenance: hatchProv } }, enteredAllReported: allReported && spotProv !== "assumed" && spotProv !== "derived" && hatchProv !== "assumed" && hatchProv !== "derived",
        };
        const s = { "completeness.factor.assumed": factor };
        expect(completenessValueOf(r, s)).toBeCloseTo(recordCompleteness(completenessInputOf(r), s).value, 12);
      }),
    );
  });
});
