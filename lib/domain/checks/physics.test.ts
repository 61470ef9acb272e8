import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { defaultCheckSettings } from "../check-settings";
import { checkRecordOf } from "./check-record-fixture";
import { criterionMargin, outcomeVersusPhysics, type CriterionValue, type PhysicsAssessment } from "./physics";

const settings = defaultCheckSettings(); // margin 0.25

function assessment(lof: number, keyholeWD: number, ballingLW: number): PhysicsAssessment {
  const criteria: CriterionValue[] = [
    { mode: "lack_of_fusion", name: "(h/W)² + t/(t + D) ≥ 1", value: lof, threshold: 1, direction: "atLeast" },
    { mode: "keyhole", name: "W/D ≤ 2.5", value: keyholeWD, threshold: 2.5, direction: "atMost" },
    { mode: "balling", name: "L/W ≥ 2.3", value: ballingLW, threshold: 2.3, direction: "atLeast" },
  ];
  return { model: "test", meltPool: { widthUm: 100, depthUm: 40, lengthUm: 200, melted: true }, criteria, inputs: { absorptivity: 0.35 }, notes: [] };
}

describe("criterionMargin", () => {
  test.each([
    [{ value: 1.5, threshold: 1, direction: "atLeast" }, 0.5],
    [{ value: 0.5, threshold: 1, direction: "atLeast" }, -0.5],
    [{ value: 2, threshold: 2.5, direction: "atMost" }, 0.25],
    [{ value: 5, threshold: 2.5, direction: "atMost" }, -0.5],
    [{ value: 0, threshold: 2.5, direction: "atMost" }, 1000],
  ] as const)("%j -> %s", (c, expected) => {
    expect(criterionMargin({ mode: "keyhole", name: "x", ...c })).toBeCloseTo(expected, 9);
  });

  test("property: the margin is positive exactly when the criterion fires", () => {
    fc.assert(
      fc.property(fc.double({ min: 0.01, max: 100, noNaN: true }), fc.double({ min: 0.01, max: 100, noNaN: true }), fc.constantFrom("atLeast" as const, "atMost" as const), (value, threshold, direction) => {
        const fires = direction === "atLeast" ? value >= threshold : value <= threshold;
        const m = criterionMargin({ mode: "balling", name: "x", value, threshold, direction });
        expect(m >= -1e-12).toBe(fires || Math.abs(value - threshold) < 1e-9 * threshold);
      }),
    );
  });
});

describe("outcomeVersusPhysics", () => {
  test.each([
    // outcome, LoF value, keyhole W/D, balling L/W, conflict?
    ["dense", 0.6, 4, 1.5, false], // nothing predicted
    ["dense", 1.2, 4, 1.5, false], // LoF 20 % beyond: inside the margin
    ["dense", 1.5, 4, 1.5, true], // LoF 50 % beyond
    ["dense", 0.6, 1.5, 1.5, true], // keyhole W/D 1.5: 67 % beyond
    ["lack_of_fusion", 0.6, 4, 1.5, true], // full fusion predicted by 40 %
    ["lack_of_fusion", 0.9, 4, 1.5, false], // only 10 % clear
    ["keyhole", 1.6, 5, 1.5, true], // keyhole clear by 50 %, LoF strongly predicted
    ["keyhole", 0.6, 5, 1.5, false], // keyhole clear but nothing else predicted: conduction model may miss it
    ["balling", 0.6, 1.5, 1.2, true], // balling clear, keyhole strongly predicted
    ["cracking", 1.6, 1.5, 3, false], // not judged
    ["unknown", 1.6, 1.5, 3, false],
  ] as const)("%s with LoF %s, W/D %s, L/W %s -> conflict %s", (outcome, lof, wd, lw, conflict) => {
    const f = outcomeVersusPhysics(checkRecordOf({ outcome }), assessment(lof, wd, lw), settings);
    expect(f !== null).toBe(conflict);
    if (f) {
      expect(f.code).toBe("physics.outcome_conflict");
      expect(f.details.criteria).toHaveLength(3);
      expect(f.details.thresholds).toEqual({ margin: 0.25 });
    }
  });

  test("the message names the criterion, its value and threshold", () => {
    const f = outcomeVersusPhysics(checkRecordOf({ outcome: "dense" }), assessment(1.5, 4, 1.5), settings);
    expect(f?.message).toMatch(/lack of fusion/);
    expect(f?.message).toMatch(/= 1\.5 \(lack of fusion at ≥ 1, 50 % beyond\)/);
  });

  test("the margin is a setting", () => {
    expect(outcomeVersusPhysics(checkRecordOf(), assessment(1.2, 4, 1.5), { ...settings, "physics.margin": 0.1 })).not.toBeNull();
  });

  test("no assessment, no finding", () => {
    expect(outcomeVersusPhysics(checkRecordOf(), null, settings)).toBeNull();
  });
});
