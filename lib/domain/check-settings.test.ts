import { describe, expect, test } from "vitest";
import { CHECK_SETTING_DEFS, checkSettingsProblems, completeCheckSettings, defaultCheckSettings, settingOf } from "./check-settings";
import { PLAUSIBLE_RANGES } from "./units";

describe("check settings", () => {
  test("keys are unique and every default lies inside its own bounds", () => {
    const keys = CHECK_SETTING_DEFS.map((d) => d.key);
    expect(new Set(keys).size).toBe(keys.length);
    for (const d of CHECK_SETTING_DEFS) {
      expect(d.defaultValue, d.key).toBeGreaterThanOrEqual(d.min);
      expect(d.defaultValue, d.key).toBeLessThanOrEqual(d.max);
      expect(d.source.length, d.key).toBeGreaterThan(5);
    }
    expect(checkSettingsProblems(defaultCheckSettings())).toEqual({});
  });

  test.each([
    ["range.scanSpeed.min", PLAUSIBLE_RANGES.scanSpeed.min],
    ["range.hatchSpacing.max", PLAUSIBLE_RANGES.hatchSpacing.max],
    ["energy.volumetric.max", 300],
    ["duplicates.spot.absUm", 2],
    ["physics.balling.lengthToWidth", 2.3],
  ])("default of %s is %s (DOMAIN.md)", (key, value) => {
    expect(settingOf(defaultCheckSettings(), key)).toBe(value);
  });

  test("a stored older version is completed with defaults and loses unknown keys", () => {
    const s = completeCheckSettings({ "range.scanSpeed.max": 4000, "retired.setting": 3, "physics.margin.keyhole": "high" });
    expect(s["range.scanSpeed.max"]).toBe(4000);
    expect(s["physics.margin.keyhole"]).toBe(0.75);
    expect("retired.setting" in s).toBe(false);
  });

  test.each([
    [{ "range.laserPower.min": 2000 }, "range.laserPower.min", /above the highest/],
    [{ "physics.margin.keyhole": -1 }, "physics.margin.keyhole", /between 0 and 1000/],
    [{ "neighbours.minCount": 9, "neighbours.count": 5 }, "neighbours.minCount", /cannot exceed/],
    [{ "no.such.key": 1 }, "no.such.key", /Unknown setting/],
  ])("problems: %j", (overrides, key, message) => {
    const problems = checkSettingsProblems({ ...defaultCheckSettings(), ...overrides });
    expect(problems[key]).toMatch(message);
  });

  test("settingOf refuses an undefined key", () => {
    expect(() => settingOf({}, "no.such.key")).toThrow(RangeError);
  });
});
