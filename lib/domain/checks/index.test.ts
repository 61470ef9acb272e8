import { describe, expect, test } from "vitest";
import { CHECK_SETTING_DEFS, defaultCheckSettings } from "../check-settings";
import { checkRecordOf } from "./check-record-fixture";
import { checkRecords, RULE_CATALOGUE, ruleInfo } from "./index";

describe("rule catalogue", () => {
  test("codes are unique and well-formed", () => {
    const codes = RULE_CATALOGUE.map((r) => r.code);
    expect(new Set(codes).size).toBe(codes.length);
    for (const code of codes) expect(code).toMatch(/^[a-z]+(_[a-z]+)*\.[a-z0-9]+(_[a-z0-9]+)*$/);
  });

  test("every rule names a source, a fix and only defined settings", () => {
    const keys = new Set(CHECK_SETTING_DEFS.map((d) => d.key));
    for (const rule of RULE_CATALOGUE) {
      expect(rule.source.length, rule.code).toBeGreaterThan(10);
      expect(rule.description.length, rule.code).toBeGreaterThan(40);
      for (const k of rule.thresholdKeys) expect(keys.has(k), `${rule.code}: ${k}`).toBe(true);
    }
  });

  test.each([
    ["duplicate.exact", "error"],
    ["duplicate.near", "warning"],
    ["limit.scan_speed", "error"],
    ["range.hatch_spacing", "warning"],
    ["assumed.spot_diameter", "info"],
    ["physics.outcome_conflict", "warning"],
    ["neighbours.disagree", "warning"],
  ] as const)("%s is a %s", (code, severity) => {
    expect(ruleInfo(code)?.severity).toBe(severity);
  });
});

describe("checkRecords", () => {
  const base = checkRecordOf();
  const records = [
    base,
    { ...base, id: 2 }, // exact copy of 1
    { ...base, id: 3, sourceId: 2 }, // republished: near duplicate of 1
    { ...base, id: 4, scanSpeedMmPerS: 0.8, volumetricEnergyJMm3: null, entered: { ...base.entered, scanSpeed: { text: "0.8", unit: "mm/s" } } },
  ];

  test("findings per record, duplicates for everyone", () => {
    const r = checkRecords(records, defaultCheckSettings());
    expect(r.findings.get(1)).toEqual([]);
    expect(r.findings.get(4)!.map((f) => f.code)).toEqual(["unit_slip.scan_speed", "energy.volumetric"]);
    expect(r.duplicateFindings.get(2)!.map((f) => [f.code, f.relatedRecordId])).toEqual([["duplicate.exact", 1]]);
    expect(r.duplicateFindings.get(3)!.map((f) => [f.code, f.relatedRecordId])).toEqual([["duplicate.near", 1]]);
    expect(r.duplicateFindings.has(1)).toBe(false);
  });

  test("targets limit the single-record findings", () => {
    const r = checkRecords(records, defaultCheckSettings(), { targets: new Set([4]) });
    expect([...r.findings.keys()]).toEqual([4]);
  });

  test("a pair marked distinct is not raised again", () => {
    const r = checkRecords(records, defaultCheckSettings(), { isDistinct: (a, b) => a === 1 && b === 2 });
    expect(r.duplicateFindings.get(2)).toBeUndefined();
  });

  test("the physics provider is consulted per target", () => {
    const seen: number[] = [];
    checkRecords(records, defaultCheckSettings(), { targets: new Set([1, 3]), physics: (rec) => (seen.push(rec.id), null) });
    expect(seen.sort()).toEqual([1, 3]);
  });
});
