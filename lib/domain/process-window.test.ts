import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { resolveAlloyProperties } from "./alloy-properties";
import { defaultCheckSettings } from "./check-settings";
import type { CriterionResult } from "./criteria";
import { materialFromProperties } from "./meltpool-analysis";
import { assessPoint, mechanismField, windowBoundaries, windowSettingsFromChecks, type WindowCase } from "./process-window";

function materialOf(alloyKey: string) {
  const p = resolveAlloyProperties({ alloyKey });
  if (!p.ok) throw new Error(p.message);
  return materialFromProperties(p.properties);
}

const case316L: WindowCase = {
  material: materialOf("316L"),
  hatchSpacingUm: 100,
  layerThicknessUm: 30,
  spotDiameterUm: 80,
  ambientTemperatureK: 298.15,
  settings: windowSettingsFromChecks(defaultCheckSettings()),
};

function criterion(mechanism: CriterionResult["mechanism"], fired: boolean, margin: number | null): CriterionResult {
  return { name: "balling_aspect", mechanism, rule: "x", value: margin, threshold: 1, comparison: ">=", fired, margin, inputs: {}, source: "test" };
}

describe("windowSettingsFromChecks", () => {
  test("reads the physics thresholds and margins of a settings version", () => {
    const s = windowSettingsFromChecks({ ...defaultCheckSettings(), "physics.margin.balling": 5, "physics.keyhole.widthToDepth": 1.5 });
    expect(s.margins.balling).toBe(5);
    expect(s.thresholds.keyholeWidthToDepth).toBe(1.5);
    expect(s.margins.lack_of_fusion).toBe(defaultCheckSettings()["physics.margin.lackOfFusion"]);
  });
});

describe("mechanismField", () => {
  test.each<[string, CriterionResult[], "keyhole" | "lack_of_fusion" | "balling", number, boolean, number]>([
    ["all fire, strongest beyond the margin", [criterion("keyhole", true, 0.2), criterion("keyhole", true, 1.0)], "keyhole", 0.75, true, 0.2],
    ["all fire, none beyond the margin", [criterion("keyhole", true, 0.2), criterion("keyhole", true, 0.5)], "keyhole", 0.75, false, -0.25],
    ["one beyond, another does not fire", [criterion("keyhole", false, -0.1), criterion("keyhole", true, 2)], "keyhole", 0.75, false, -0.1],
    ["fired without a value counts as far beyond", [criterion("lack_of_fusion", true, null), criterion("lack_of_fusion", true, 1)], "lack_of_fusion", 0.75, true, 1],
    ["not evaluable", [criterion("balling", false, null)], "balling", 3, false, -1],
    ["other mechanisms are ignored", [criterion("balling", true, 9)], "keyhole", 0.75, false, -1],
  ])("%s", (_, criteria, mechanism, margin, indicated, field) => {
    const r = mechanismField(criteria, mechanism, margin);
    expect(r.indicated).toBe(indicated);
    expect(r.field).toBeCloseTo(field, 12);
  });

  test("the field is ≥ 0 exactly when the mechanism is strongly predicted", () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -2, max: 5, noNaN: true }), { minLength: 1, maxLength: 3 }), fc.double({ min: 0.01, max: 4, noNaN: true }), (margins, m) => {
        const criteria = margins.map((x) => criterion("keyhole", x >= 0, x));
        const r = mechanismField(criteria, "keyhole", m);
        expect(r.field >= 0).toBe(r.indicated);
      }),
    );
  });
});

describe("assessPoint (316L, h 100 µm, t 30 µm, d 80 µm)", () => {
  test.each<[number, number, boolean, string]>([
    [200, 800, true, "dense"], // a common dense 316L setting
    [50, 1500, false, "lack_of_fusion"], // low power, fast
    [400, 300, false, "keyhole"], // high power, slow
  ])("P %s W, v %s mm/s: in window %s, regime %s", (p, v, inWindow, regime) => {
    const a = assessPoint(case316L, p, v);
    expect(a.inWindow).toBe(inWindow);
    expect(a.regime).toBe(regime);
  });

  test("inside the window the criteria that fired are reported though within their margin", () => {
    const a = assessPoint(case316L, 200, 800);
    expect(a.fired).toContain("balling_aspect");
    expect(a.indicated).toEqual([]);
  });

  test("a model input it cannot use is the model's RangeError", () => {
    expect(() => assessPoint(case316L, 0, 800)).toThrow(RangeError);
  });
});

describe("windowBoundaries", () => {
  const power = { min: 50, max: 400, scale: "linear" as const };
  const speed = { min: 200, max: 2000, scale: "log" as const };
  const boundaries = windowBoundaries(case316L, power, speed, 16, 8);

  test("one entry per mechanism; lack of fusion and keyhole bound the 316L window", () => {
    expect(boundaries.map((b) => b.mechanism)).toEqual(["lack_of_fusion", "keyhole", "balling"]);
    expect(boundaries.find((b) => b.mechanism === "lack_of_fusion")!.lines.length).toBeGreaterThan(0);
    expect(boundaries.find((b) => b.mechanism === "keyhole")!.lines.length).toBeGreaterThan(0);
  });

  test("every boundary point lies inside the ranges, and the verdict changes within 2 % of it", () => {
    for (const b of boundaries) {
      for (const line of b.lines) {
        for (const p of line) {
          expect(p.laserPowerW).toBeGreaterThanOrEqual(power.min - 1e-9);
          expect(p.laserPowerW).toBeLessThanOrEqual(power.max + 1e-9);
          expect(p.scanSpeedMmPerS).toBeGreaterThanOrEqual(speed.min - 1e-9);
          expect(p.scanSpeedMmPerS).toBeLessThanOrEqual(speed.max + 1e-9);
          const verdicts = new Set<boolean>();
          for (const [fp, fv] of [[1.02, 1], [0.98, 1], [1, 1.02], [1, 0.98]] as const) {
            verdicts.add(assessPoint(case316L, p.laserPowerW * fp, p.scanSpeedMmPerS * fv).indicated.includes(b.mechanism));
          }
          expect(verdicts.size).toBe(2);
        }
      }
    }
  });

  test("refuses an unusable range", () => {
    expect(() => windowBoundaries(case316L, { min: 0, max: 400, scale: "linear" }, speed)).toThrow(RangeError);
    expect(() => windowBoundaries(case316L, power, { min: 900, max: 200, scale: "log" })).toThrow(RangeError);
  });
});
