import { describe, expect, test } from "vitest";
import { defaultCheckSettings } from "../check-settings";
import { ASSUMED_RULES } from "./assumed";
import { checkRecordOf } from "./check-record-fixture";

describe("assumed values", () => {
  test("a reported value raises nothing", () => {
    expect(ASSUMED_RULES.map((r) => r.check(checkRecordOf(), defaultCheckSettings())).filter(Boolean)).toEqual([]);
  });

  test.each([
    ["spotDiameter", "assumed.spot_diameter"],
    ["layerThickness", "assumed.layer_thickness"],
    ["powderD50", "assumed.powder_d50"],
  ] as const)("an assumed %s is shown as info", (field, code) => {
    const base = checkRecordOf();
    const entered = { ...base.entered, [field]: { text: "80", unit: "µm", provenance: "assumed" } };
    const found = ASSUMED_RULES.map((r) => r.check({ ...base, entered }, defaultCheckSettings())).filter((f) => f !== null);
    expect(found.map((f) => [f.code, f.severity])).toEqual([[code, "info"]]);
    expect(found[0]!.message).toMatch(/assumed default/);
  });
});
