import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { type CriteriaInputs, type CriterionName, evaluateCriteria } from "./criteria";

const POOL: CriteriaInputs = {
  widthUm: 120, depthUm: 50, lengthUm: 240, melted: true, hatchSpacingUm: 100, layerThicknessUm: 30,
  normalizedEnthalpy: 4, meltingTemperatureK: 1723, boilingTemperatureK: 3090,
};

function byName(inputs: CriteriaInputs, options = {}) {
  return Object.fromEntries(evaluateCriteria(inputs, options).map((c) => [c.name, c]));
}

describe("evaluateCriteria", () => {
  test.each([
    // name, pool change, expected value, fired
    ["lack_of_fusion_depth", {}, 50 / 30, false],
    ["lack_of_fusion_depth", { depthUm: 25 }, 25 / 30, true],
    ["lack_of_fusion_overlap", {}, (100 / 120) ** 2 + 30 / 80, true],
    ["lack_of_fusion_overlap", { hatchSpacingUm: 60 }, (60 / 120) ** 2 + 30 / 80, false],
    ["balling_aspect", {}, 2, false],
    ["balling_aspect", { lengthUm: 300 }, 2.5, true],
    ["keyhole_aspect", {}, 2.4, true],
    ["keyhole_aspect", { widthUm: 150 }, 3, false],
    ["keyhole_enthalpy", {}, 4, false],
    ["keyhole_enthalpy", { normalizedEnthalpy: 6 }, 6, true],
  ] as const)("%s with %o: value %s, fired %s", (name, change, value, fired) => {
    const c = byName({ ...POOL, ...change })[name];
    expect(c?.value).toBeCloseTo(value, 12);
    expect(c?.fired).toBe(fired);
  });

  test("margins are relative, positive when fired and negative when missed", () => {
    const c = byName(POOL);
    expect(c.balling_aspect?.margin).toBeCloseTo((2 - 2.3) / 2.3, 12);
    expect(c.keyhole_aspect?.margin).toBeCloseTo((2.5 - 2.4) / 2.5, 12);
    expect(c.keyhole_enthalpy?.threshold).toBeCloseTo((Math.PI * 3090) / 1723, 12);
  });

  test("fired agrees with the sign of the margin for every criterion", () => {
    fc.assert(
      fc.property(
        fc.record({
          widthUm: fc.double({ min: 10, max: 500, noNaN: true }),
          depthUm: fc.double({ min: 5, max: 300, noNaN: true }),
          lengthUm: fc.double({ min: 10, max: 2000, noNaN: true }),
          hatchSpacingUm: fc.double({ min: 20, max: 300, noNaN: true }),
          layerThicknessUm: fc.double({ min: 10, max: 150, noNaN: true }),
          normalizedEnthalpy: fc.double({ min: 0.1, max: 50, noNaN: true }),
        }),
        (p) => {
          for (const c of evaluateCriteria({ ...POOL, ...p }, { include: ["lack_of_fusion_depth", "lack_of_fusion_overlap", "lack_of_fusion_overlap_tang", "balling_aspect", "keyhole_aspect", "keyhole_enthalpy"] })) {
            expect(c.margin).not.toBeNull();
            if ((c.margin as number) > 1e-12) expect(c.fired).toBe(true);
            if ((c.margin as number) < -1e-12) expect(c.fired).toBe(false);
          }
        },
      ),
    );
  });

  test("thresholds are configurable", () => {
    const c = byName(POOL, { thresholds: { ballingLengthToWidth: 1.5, keyholeWidthToDepth: 1.5, keyholeNormalizedEnthalpy: 3 } });
    expect(c.balling_aspect?.fired).toBe(true);
    expect(c.keyhole_aspect?.fired).toBe(false);
    expect(c.keyhole_enthalpy?.fired).toBe(true);
    expect(c.keyhole_enthalpy?.threshold).toBe(3);
  });

  test("a non-positive threshold is a RangeError", () => {
    expect(() => evaluateCriteria(POOL, { thresholds: { ballingLengthToWidth: 0 } })).toThrow(/ballingLengthToWidth/);
  });

  test("criteria that need hatch and layer are left unevaluated without them", () => {
    const c = byName({ ...POOL, hatchSpacingUm: null, layerThicknessUm: undefined });
    for (const name of ["lack_of_fusion_depth", "lack_of_fusion_overlap"] as CriterionName[]) {
      expect(c[name]?.value).toBeNull();
      expect(c[name]?.fired).toBe(false);
      expect(c[name]?.note).toMatch(/needs/);
    }
  });

  test("with no melting lack of fusion fires and the shape criteria are undefined", () => {
    const c = byName({ ...POOL, widthUm: 0, depthUm: 0, lengthUm: 0, melted: false });
    expect(c.lack_of_fusion_depth?.fired).toBe(true);
    expect(c.lack_of_fusion_overlap?.fired).toBe(true);
    expect(c.balling_aspect?.value).toBeNull();
    expect(c.keyhole_aspect?.value).toBeNull();
    expect(JSON.stringify(evaluateCriteria({ ...POOL, widthUm: 0, depthUm: 0, lengthUm: 0, melted: false }))).not.toMatch(/NaN|Infinity/);
  });

  test("the Tang criterion is evaluated only on request", () => {
    expect(byName(POOL).lack_of_fusion_overlap_tang).toBeUndefined();
    const tang = byName(POOL, { include: ["lack_of_fusion_overlap_tang"] }).lack_of_fusion_overlap_tang;
    expect(tang?.value).toBeCloseTo((100 / 120) ** 2 + (30 / 50) ** 2, 12);
    expect(tang?.fired).toBe(true);
  });

  test("without a boiling point the enthalpy criterion has no default threshold", () => {
    const c = byName({ ...POOL, boilingTemperatureK: null }).keyhole_enthalpy;
    expect(c?.threshold).toBeNull();
    expect(c?.fired).toBe(false);
  });
});
