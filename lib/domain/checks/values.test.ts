import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { defaultCheckSettings } from "../check-settings";
import { PLAUSIBLE_RANGES, toCanonical } from "../units";
import { checkRecordOf } from "./check-record-fixture";
import { checkRecord } from "./index";
import { unitSlipCandidates, VALUE_RULES } from "./values";
import type { CheckRecord } from "./types";

const settings = defaultCheckSettings();
const codes = (r: CheckRecord) => checkRecord(r, settings).map((f) => f.code).filter((c) => /^(limit|range|unit_slip)\./.test(c));

describe("unitSlipCandidates", () => {
  test.each([
    // value (canonical), entered unit, quantity, expected best unit, expected canonical value
    [0.8, "mm/s", "scanSpeed", "m/s", 800],
    [0.1, "µm", "hatchSpacing", "mm", 100],
    [0.03, "µm", "layerThickness", "mm", 30],
    [0.2, "W", "laserPower", "kW", 200],
    [48_000, "mm/s", "scanSpeed", "mm/min", 800],
    [4, "µm", "hatchSpacing", "mil", 101.6],
    [0.995, "%", "relativeDensity", "fraction", 99.5],
    [0.08, "µm", "spotDiameter", "mm", 80],
  ] as const)("%s in %s (%s) suggests %s", (value, unit, quantity, bestUnit, bestValue) => {
    const c = unitSlipCandidates(value, unit, quantity, PLAUSIBLE_RANGES[quantity]);
    expect(c[0]?.unit).toBe(bestUnit);
    expect(c[0]?.canonicalValue).toBeCloseTo(bestValue, 9);
  });

  test("a plausible value has no candidates", () => {
    expect(unitSlipCandidates(800, "mm/s", "scanSpeed", PLAUSIBLE_RANGES.scanSpeed)).toEqual([]);
  });

  test("m/min (× 16.7) is not a standard factor, so 20 mm/s only suggests in/s", () => {
    expect(unitSlipCandidates(20, "mm/s", "scanSpeed", PLAUSIBLE_RANGES.scanSpeed).map((c) => c.unit)).toEqual(["in/s"]);
  });

  test("preheat is never a unit slip (its conversions are offsets)", () => {
    expect(unitSlipCandidates(900, "°C", "preheat", PLAUSIBLE_RANGES.preheat)).toEqual([]);
  });

  test("property: every candidate is inside the range and one standard factor away", () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-4, max: 1e6, noNaN: true }), fc.constantFrom("mm/s", "m/s", "mm/min"), (value, unit) => {
        const range = PLAUSIBLE_RANGES.scanSpeed;
        for (const c of unitSlipCandidates(value, unit, "scanSpeed", range)) {
          expect(c.canonicalValue).toBeGreaterThanOrEqual(range.min);
          expect(c.canonicalValue).toBeLessThanOrEqual(range.max);
          expect([1000, 0.001, 25.4, 1 / 60].some((f) => Math.abs(c.factor / f - 1) < 1e-9)).toBe(true);
          expect(c.factor).toBeCloseTo(toCanonical(1, c.unit, "scanSpeed") / toCanonical(1, unit, "scanSpeed"), 9);
        }
      }),
    );
  });
});

describe("value rules on a record", () => {
  test("a plausible record raises none", () => {
    expect(codes(checkRecordOf())).toEqual([]);
  });

  test.each([
    ["speed 0.8 typed in mm/s", { scanSpeedMmPerS: 0.8, entered: { scanSpeed: { text: "0.8", unit: "mm/s" } } }, ["unit_slip.scan_speed"]],
    ["hatch 0.1 typed in µm", { hatchSpacingUm: 0.1, entered: { hatchSpacing: { text: "0.1", unit: "µm" } } }, ["unit_slip.hatch_spacing"]],
    ["speed 10,000 mm/s (÷ 60 lands it)", { scanSpeedMmPerS: 10_000, entered: { scanSpeed: { text: "10000", unit: "mm/s" } } }, ["unit_slip.scan_speed"]],
    ["layer 400 µm, no factor helps", { layerThicknessUm: 400, entered: { layerThickness: { text: "0.4", unit: "mm" } } }, ["range.layer_thickness"]],
    ["hatch 800 µm entered in mm", { hatchSpacingUm: 800, entered: { hatchSpacing: { text: "0.8", unit: "mm" } } }, ["range.hatch_spacing"]],
    ["power 12 kW", { laserPowerW: 12_000 }, ["limit.laser_power"]],
    ["negative spot", { spotDiameterUm: -5 }, ["limit.spot_diameter"]],
    ["relative density 100.4 %", { relativeDensityPct: 100.4 }, ["range.relative_density"]],
    ["relative density 60 %", { relativeDensityPct: 60 }, ["range.relative_density"]],
  ] as const)("%s", (_label, overrides, expected) => {
    const base = checkRecordOf();
    const record = { ...base, ...overrides, entered: { ...base.entered, ...("entered" in overrides ? overrides.entered : {}) } } as CheckRecord;
    expect(codes(record)).toEqual(expected);
  });

  test("the unit slip carries a one-step fix: the same text in the suggested unit", () => {
    const base = checkRecordOf();
    const f = checkRecord({ ...base, scanSpeedMmPerS: 0.8, entered: { ...base.entered, scanSpeed: { text: "0,8", unit: "mm/s" } } }, settings).find((x) => x.code === "unit_slip.scan_speed");
    expect(f?.details.suggestedFix).toEqual({ field: "scanSpeed", value: "0,8", unit: "m/s", canonicalValue: 800 });
    expect(f?.message).toMatch(/m\/s/);
  });

  test("thresholds are settings: a narrower range flags a value the default accepts", () => {
    const narrow = { ...settings, "range.laserPower.max": 150 };
    expect(checkRecord(checkRecordOf(), narrow).map((f) => f.code)).toContain("range.laser_power");
  });

  test("every field has a limit, slip and range rule with distinct codes", () => {
    const all = VALUE_RULES.flatMap((r) => r.infos.map((i) => i.code));
    expect(new Set(all).size).toBe(all.length);
    expect(all.length).toBe(30);
  });
});
