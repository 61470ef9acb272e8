import { describe, expect, test } from "vitest";
import { resolveAlloy } from "../alloys";
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

  test.each([
    ["316L", 200, 800, 100, 30, 80],
    ["316L", 280, 1000, 100, 40, 100],
    ["Ti-6Al-4V", 280, 1200, 140, 30, 100],
    ["Ti-6Al-4V", 175, 1000, 100, 30, 70],
    ["AlSi10Mg", 370, 1300, 190, 30, 100],
    ["IN718", 285, 960, 110, 40, 100],
    ["IN718", 200, 800, 100, 30, 80],
  ] as const)("common dense parameters of %s (%s W, %s mm/s, h %s, t %s, d %s µm) raise no conflict", (alloy, p, v, h, t, d) => {
    const grade = resolveAlloy(alloy);
    if (!grade.ok) throw new Error(alloy);
    const r = checkRecordOf({ alloyKey: grade.alloyKey, components: grade.components, laserPowerW: p, scanSpeedMmPerS: v, hatchSpacingUm: h, layerThicknessUm: t, spotDiameterUm: d });
    expect(outcomeVersusPhysics(r, physics(r), settings)).toBeNull();
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
    expect(withOverride(checkRecordOf())!.inputs().absorptivity).toBe(0.9);
  });
});
