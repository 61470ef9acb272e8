import { describe, expect, test } from "vitest";
import { defaultCheckSettings } from "../check-settings";
import { checkRecordOf } from "./check-record-fixture";
import { criterionMargin, outcomeVersusPhysics, type CriterionValue, type PhysicsAssessment } from "./physics";

const settings = defaultCheckSettings(); // margin 0.25

const judged = (mode: CriterionValue["mode"], name: string, value: number, threshold: number, comparison: "<=" | ">="): CriterionValue => {
  const margin = comparison === "<=" ? (threshold - value) / threshold : (value - threshold) / threshold;
  return { mode, name, value, threshold, comparison, fired: margin >= 0, margin };
};

function assessment(lof: number, keyholeWD: number, ballingLW: number): PhysicsAssessment {
  const criteria: CriterionValue[] = [
    judged("lack_of_fusion", "(h/W)^2 + t/(t + D) >= threshold", lof, 1, ">="),
    judged("keyhole", "W/D <= threshold", keyholeWD, 2.5, "<="),
    judged("balling", "L/W >= threshold", ballingLW, 2.3, ">="),
  ];
  return { model: "test", meltPool: { widthUm: 100, depthUm: 40, lengthUm: 200, melted: true }, criteria, inputs: () => ({ absorptivity: 0.35 }), notes: [] };
}

describe("criterionMargin", () => {
  test.each([
    [{ value: 1.5, threshold: 1, comparison: ">=", fired: true, margin: 0.5 }, 0.5],
    [{ value: 0.5, threshold: 1, comparison: ">=", fired: false, margin: -0.5 }, -0.5],
    [{ value: null, threshold: 1, comparison: ">=", fired: true, margin: null }, 1000], // no melt pool: overlap fires without a value
    [{ value: null, threshold: null, comparison: ">", fired: false, margin: null }, null], // not evaluable
  ] as const)("%j -> %s", (c, expected) => {
    expect(criterionMargin({ mode: "keyhole", name: "x", ...c })).toBe(expected);
  });
});

describe("outcomeVersusPhysics", () => {
  test.each([
    // outcome, LoF value, keyhole W/D, balling L/W, conflict?  Margins (v−T)/T or (T−v)/T; defaults LoF 0.75,
    // keyhole 0.75, balling 3; "clear" means at least min(margin, 0.5) on the other side.
    ["dense", 0.6, 4, 1.5, false], // nothing predicted
    ["dense", 1.5, 4, 1.5, false], // LoF 50 % beyond: inside the margin
    ["dense", 1.8, 4, 1.5, true], // LoF 80 % beyond
    ["dense", 0.6, 1.5, 1.5, false], // keyhole W/D 1.5: 40 % beyond, inside the margin
    ["dense", 0.6, 0.5, 1.5, true], // keyhole W/D 0.5: 80 % beyond
    ["dense", 0.6, 4, 7, false], // L/W 7: 204 % beyond, inside the balling margin
    ["dense", 0.6, 4, 10, true], // L/W 10: 335 % beyond
    ["lack_of_fusion", 0.4, 4, 1.5, true], // full fusion predicted, 60 % clear
    ["lack_of_fusion", 0.6, 4, 1.5, false], // only 40 % clear
    ["keyhole", 1.8, 5, 1.5, true], // keyhole clear by 100 %, LoF strongly predicted
    ["keyhole", 0.6, 5, 1.5, false], // keyhole clear but nothing else predicted: conduction model may miss it
    ["balling", 0.6, 0.5, 1.0, true], // balling clear by 57 %, keyhole strongly predicted
    ["cracking", 1.8, 0.5, 10, false], // not judged
    ["unknown", 1.8, 0.5, 10, false],
  ] as const)("%s with LoF %s, W/D %s, L/W %s -> conflict %s", (outcome, lof, wd, lw, conflict) => {
    const f = outcomeVersusPhysics(checkRecordOf({ outcome }), assessment(lof, wd, lw), settings);
    expect(f !== null).toBe(conflict);
    if (f) {
      expect(f.code).toBe("physics.outcome_conflict");
      expect(f.details.criteria).toHaveLength(3);
      expect(f.details.thresholds).toEqual({ marginLackOfFusion: 0.75, marginKeyhole: 0.75, marginBalling: 3 });
    }
  });

  test("the message names the criterion, its value and threshold", () => {
    const f = outcomeVersusPhysics(checkRecordOf({ outcome: "dense" }), assessment(1.8, 4, 1.5), settings);
    expect(f?.message).toMatch(/lack of fusion/);
    expect(f?.message).toMatch(/\(h\/W\)\^2 \+ t\/\(t \+ D\) = 1\.8 \(lack of fusion at ≥ 1, 80 % beyond\)/);
  });

  test("the margin is a setting", () => {
    expect(outcomeVersusPhysics(checkRecordOf(), assessment(1.2, 4, 1.5), settings)).toBeNull();
    expect(outcomeVersusPhysics(checkRecordOf(), assessment(1.2, 4, 1.5), { ...settings, "physics.margin.lackOfFusion": 0.1 })).not.toBeNull();
  });

  test("a mechanism counts only when all its criteria agree", () => {
    const a = assessment(0.6, 4, 1.5);
    const oneIndicator = { ...a, criteria: [...a.criteria, judged("keyhole", "ΔH/h_s > threshold", 11, 5.6, ">=")] }; // 96 % beyond, but W/D says no
    expect(outcomeVersusPhysics(checkRecordOf(), oneIndicator, settings)).toBeNull();
    const both = { ...a, criteria: [...assessment(0.6, 2, 1.5).criteria, judged("keyhole", "ΔH/h_s > threshold", 11, 5.6, ">=")] };
    expect(outcomeVersusPhysics(checkRecordOf(), both, settings)?.message).toMatch(/ΔH\/h_s = 11/);
  });

  test("no assessment, no finding", () => {
    expect(outcomeVersusPhysics(checkRecordOf(), null, settings)).toBeNull();
  });
});
