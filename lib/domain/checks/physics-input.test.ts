import { describe, expect, test } from "vitest";
import { defaultCheckSettings } from "../check-settings";
import { checkRecordOf } from "./check-record-fixture";
import { outcomeVersusPhysics } from "./physics";
import { physicsProvider } from "./physics-input";

const settings = defaultCheckSettings();
const physics = physicsProvider(settings, new Map());

describe("physicsProvider", () => {
  test("a 316L record gets a melt pool and the five default criteria", () => {
    const a = physics(checkRecordOf());
    expect(a).not.toBeNull();
    expect(a!.meltPool.melted).toBe(true);
    expect(a!.meltPool.widthUm).toBeGreaterThan(40);
    expect(a!.criteria.map((c) => c.mode).sort()).toEqual(["balling", "keyhole", "keyhole", "lack_of_fusion", "lack_of_fusion"]);
    expect(a!.model).toMatch(/Eagar–Tsai/);
  });

  test.each([
    ["no spot size", { spotDiameterUm: null }],
    ["unknown outcome", { outcome: "unknown" }],
    ["cracking is not judged by the criteria", { outcome: "cracking" }],
    ["unknown alloy without composition", { alloyKey: "Mystery-9", components: [] }],
  ] as const)("%s: no assessment", (_label, overrides) => {
    expect(physics(checkRecordOf(overrides))).toBeNull();
  });

  test("a fast, weak track labelled dense contradicts the lack-of-fusion criteria", () => {
    // 60 W at 3 m/s over a 150 µm hatch and 60 µm layers: shallow, narrow tracks far apart
    const r = checkRecordOf({ laserPowerW: 60, scanSpeedMmPerS: 3000, hatchSpacingUm: 150, layerThicknessUm: 60, outcome: "dense" });
    const f = outcomeVersusPhysics(r, physics(r), settings);
    expect(f?.code).toBe("physics.outcome_conflict");
    expect(f?.message).toMatch(/lack of fusion/);
  });

  test("the same track labelled lack of fusion agrees with the physics", () => {
    const r = checkRecordOf({ laserPowerW: 60, scanSpeedMmPerS: 3000, hatchSpacingUm: 150, layerThicknessUm: 60, outcome: "lack_of_fusion" });
    expect(outcomeVersusPhysics(r, physics(r), settings)).toBeNull();
  });

  test("a property override for the alloy is used", () => {
    const withOverride = physicsProvider(settings, new Map([["316L", { absorptivity: 0.9 }]]));
    expect(withOverride(checkRecordOf())!.inputs.absorptivity).toBe(0.9);
  });
});
