import { describe, expect, test } from "vitest";
import { defaultCheckSettings } from "../check-settings";
import { checkRecordOf } from "./check-record-fixture";
import { COMPOSITION_RULES } from "./composition";
import type { CheckRecord } from "./types";

const settings = defaultCheckSettings();
const run = (overrides: Partial<CheckRecord>, s = settings) =>
  COMPOSITION_RULES.map((r) => r.check(checkRecordOf(overrides), s))
    .filter((f) => f !== null)
    .map((f) => f.code);

const c = (element: string, amount: number, isBalance = false) => ({ element, amount, isBalance });

describe("composition rules", () => {
  test.each([
    ["nominal 316L", {}, []],
    ["unknown alloy, no composition", { alloyKey: "Mystery-9", components: [] }, ["alloy.unknown"]],
    ["unknown element", { components: [c("Fe", 80, true), c("Xx", 20)] }, ["composition.unknown_element"]],
    ["sum 98 wt%", { components: [c("Fe", 70), c("Cr", 18), c("Ni", 10)] }, ["composition.sum"]],
    ["sum 100.4 wt% (inside ± 0.5)", { components: [c("Fe", 72.4), c("Cr", 18), c("Ni", 10)] }, []],
    ["sum 100.6 wt%", { components: [c("Fe", 72.6), c("Cr", 18), c("Ni", 10)] }, ["composition.sum"]],
  ] as const)("%s", (_label, overrides, expected) => {
    expect(run(overrides as Partial<CheckRecord>)).toEqual(expected);
  });

  test("the sum tolerance is a setting", () => {
    expect(run({ components: [c("Fe", 72.4), c("Cr", 18), c("Ni", 10)] }, { ...settings, "composition.sumTolerancePct": 0.1 })).toEqual(["composition.sum"]);
  });
});
