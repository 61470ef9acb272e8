import { describe, expect, test } from "vitest";
import { checkSettingsInputSchema } from "./check-settings";
import { fieldErrorsOf } from "./issues";

describe("checkSettingsInputSchema", () => {
  test("form strings are read as numbers, decimal comma included", () => {
    const r = checkSettingsInputSchema.safeParse({ values: { "physics.margin.keyhole": "0,3", "range.scanSpeed.max": "4000" }, basedOnVersion: "2", reason: "Narrower speed range for this project" });
    expect(r.success && r.data.values).toEqual({ "physics.margin.keyhole": 0.3, "range.scanSpeed.max": 4000 });
    expect(r.success && r.data.basedOnVersion).toBe(2);
  });

  test.each([
    [{ values: { "physics.margin.keyhole": "abc" }, basedOnVersion: null, reason: "because" }, "values.physics.margin.keyhole", /number/],
    [{ values: { "range.laserPower.min": "5000" }, basedOnVersion: null, reason: "because" }, "values.range.laserPower.min", /between|above the highest/],
    [{ values: { "no.such": "1" }, basedOnVersion: null, reason: "because" }, "values.no.such", /Unknown setting/],
    [{ values: {}, basedOnVersion: null, reason: "" }, "reason", /Say why/],
  ])("bad input %#", (input, key, message) => {
    const r = checkSettingsInputSchema.safeParse(input);
    expect(r.success).toBe(false);
    if (!r.success) expect(fieldErrorsOf(r.error)[key]?.join(" ")).toMatch(message);
  });
});
