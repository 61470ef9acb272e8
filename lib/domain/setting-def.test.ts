import { describe, expect, test } from "vitest";
import { validateSettingValues, type SettingDef } from "./setting-def";

const defs: SettingDef[] = [{ key: "a.b", group: "g", label: "Thing", unit: "W", defaultValue: 1, min: 0, max: 10, source: "test" }];

describe("validateSettingValues", () => {
  test.each([
    [{ "a.b": 5 }, {}],
    [{ "a.b": 0 }, {}],
    [{ "a.b": 11 }, { "a.b": "Thing must be between 0 and 10; got 11." }],
    [{ "a.b": Number.NaN }, { "a.b": "Thing must be a number." }],
    [{ other: 1 }, { other: 'Unknown setting "other".' }],
    [{}, {}],
  ])("%j", (values, expected) => {
    expect(validateSettingValues(defs, values)).toEqual(expected);
  });
});
