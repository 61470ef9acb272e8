import { describe, expect, test } from "vitest";
import { type CriterionResult, evaluateCriteria } from "./criteria";
import { predictRegime } from "./regime";

function criteria(change: Partial<Parameters<typeof evaluateCriteria>[0]>): CriterionResult[] {
  return evaluateCriteria({
    widthUm: 150, depthUm: 45, lengthUm: 250, melted: true, hatchSpacingUm: 90, layerThicknessUm: 30,
    normalizedEnthalpy: 3, meltingTemperatureK: 1723, boilingTemperatureK: 3090, ...change,
  });
}

describe("predictRegime", () => {
  test.each([
    ["dense", {}, [] as string[]],
    ["keyhole", { depthUm: 80, normalizedEnthalpy: 8 }, ["keyhole_aspect", "keyhole_enthalpy"]],
    ["lack_of_fusion", { depthUm: 25 }, ["lack_of_fusion_depth"]],
    ["balling", { lengthUm: 400 }, ["balling_aspect"]],
    ["mixed", { lengthUm: 400, normalizedEnthalpy: 8 }, ["balling_aspect", "keyhole_enthalpy"]],
  ] as const)("%s", (label, change, fired) => {
    const r = predictRegime(criteria(change), true);
    expect(r.label).toBe(label);
    expect(r.firedCriteria).toEqual(fired);
  });

  test("no melting wins over the criteria", () => {
    const c = criteria({ widthUm: 0, depthUm: 0, lengthUm: 0, melted: false });
    const r = predictRegime(c, false);
    expect(r.label).toBe("no_melting");
    expect(r.firedCriteria).toContain("lack_of_fusion_depth");
  });
});
