import { describe, expect, test } from "vitest";
import { defaultCheckSettings } from "../check-settings";
import { checkRecordOf } from "./check-record-fixture";
import { duplicateFinding, neighbourFinding } from "./collection";

const settings = defaultCheckSettings(); // at least 4 neighbours, 80 % disagreeing
const n = (outcomes: string[]) => outcomes.map((outcome, i) => ({ id: 10 + i, outcome, distance: 0.1 * (i + 1) }));

describe("neighbourFinding", () => {
  test.each([
    ["5 of 5 disagree", ["keyhole", "keyhole", "keyhole", "lack_of_fusion", "keyhole"], true],
    ["4 of 5 disagree (80 %)", ["keyhole", "keyhole", "keyhole", "dense", "keyhole"], true],
    ["3 of 5 disagree", ["keyhole", "keyhole", "dense", "dense", "keyhole"], false],
    ["too few neighbours", ["keyhole", "keyhole", "keyhole"], false],
    ["none", [], false],
  ])("%s", (_label, outcomes, flagged) => {
    const f = neighbourFinding(checkRecordOf({ outcome: "dense" }), n(outcomes), settings);
    expect(f !== null).toBe(flagged);
    if (f) {
      expect(f.details.inputs?.majorityOutcome).toBe("keyhole");
      expect((f.details.neighbours as unknown[]).length).toBe(outcomes.length);
    }
  });
});

describe("duplicateFinding", () => {
  test.each([
    ["exact", "duplicate.exact", "error", /Merge it into #1/],
    ["near", "duplicate.near", "warning", /within the duplicate tolerances/],
    ["label_conflict", "duplicate.label_conflict", "warning", /outcome keyhole here, dense there/],
  ] as const)("%s", (kind, code, severity, message) => {
    const f = duplicateFinding(checkRecordOf({ id: 2, outcome: "keyhole" }), checkRecordOf({ id: 1 }), kind, [1]);
    expect([f.code, f.severity, f.relatedRecordId]).toEqual([code, severity, 1]);
    expect(f.message).toMatch(message);
  });
});
