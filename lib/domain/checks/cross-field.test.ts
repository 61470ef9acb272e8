import { describe, expect, test } from "vitest";
import { defaultCheckSettings } from "../check-settings";
import { checkRecordOf } from "./check-record-fixture";
import { CROSS_FIELD_RULES } from "./cross-field";
import type { CheckRecord } from "./types";

const settings = defaultCheckSettings();
const run = (overrides: Partial<CheckRecord>) =>
  CROSS_FIELD_RULES.map((r) => r.check(checkRecordOf(overrides), settings))
    .filter((f) => f !== null)
    .map((f) => f.code);

describe("cross-field rules", () => {
  test.each([
    ["plausible record", {}, []],
    ["D10 > D50", { powderD10Um: 40, powderD50Um: 35, powderD90Um: 60 }, ["powder.order"]],
    ["D50 > D90", { powderD10Um: 15, powderD50Um: 35, powderD90Um: 30 }, ["powder.order"]],
    ["D10 > D90 with D50 missing", { powderD10Um: 50, powderD50Um: null, powderD90Um: 30 }, ["powder.order"]],
    ["ordered sizes", { powderD10Um: 15, powderD50Um: 35, powderD90Um: 60 }, []],
    ["equal sizes are allowed", { powderD10Um: 35, powderD50Um: 35, powderD90Um: 35 }, []],
    ["spot 600 µm on a 100 µm hatch (6×)", { spotDiameterUm: 600 }, ["geometry.spot_hatch"]],
    ["hatch 400 µm with an 80 µm spot (5×)", { hatchSpacingUm: 400, volumetricEnergyJMm3: 200 / (800 * 0.4 * 0.03) }, ["geometry.spot_hatch"]],
    ["hatch 240 µm with an 80 µm spot (3×, at the bound)", { hatchSpacingUm: 240, volumetricEnergyJMm3: 200 / (800 * 0.24 * 0.03) }, []],
    ["E_v 3 J/mm³", { volumetricEnergyJMm3: 3 }, ["energy.volumetric"]],
    ["E_v 900 J/mm³", { volumetricEnergyJMm3: 900 }, ["energy.volumetric"]],
    ["E_v derived when not stored", { volumetricEnergyJMm3: null, scanSpeedMmPerS: 20 }, ["energy.volumetric"]],
    ["no E_v without hatch", { volumetricEnergyJMm3: null, hatchSpacingUm: null }, []],
  ] as const)("%s", (_label, overrides, expected) => {
    expect(run(overrides as Partial<CheckRecord>)).toEqual(expected);
  });

  test("the spot/hatch bound is a setting", () => {
    const strict = { ...settings, "geometry.hatchToSpot.max": 1 };
    expect(CROSS_FIELD_RULES[1]!.check(checkRecordOf({ hatchSpacingUm: 100 }), strict)?.code).toBe("geometry.spot_hatch");
  });

  test("the energy finding names the four inputs", () => {
    const f = CROSS_FIELD_RULES[2]!.check(checkRecordOf({ volumetricEnergyJMm3: 900 }), settings);
    expect(f?.details.inputs).toMatchObject({ laserPowerW: 200, scanSpeedMmPerS: 800, hatchSpacingUm: 100, layerThicknessUm: 30 });
    expect(f?.details.thresholds).toEqual({ min: 10, max: 300 });
  });
});
