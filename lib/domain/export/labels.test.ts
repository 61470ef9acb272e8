import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { describeLabelRule, labelClasses, labelOf } from "./labels";

const binary = { scheme: "binary" as const, densityThresholdPct: 99 };

describe("labelOf", () => {
  test.each([
    ["dense", 99.4, 1, "success"],
    ["dense", 99.0, 1, "success"],
    ["dense", 98.9, 0, "failure"],
    ["keyhole", 99.8, 0, "failure"],
    ["lack_of_fusion", null, 0, "failure"],
    ["unknown", 95, 0, "failure"],
  ] as const)("binary: %s at %s %% → %s", (outcome, density, label, cls) => {
    expect(labelOf({ outcome, relativeDensityPct: density }, binary)).toEqual({ ok: true, label, className: cls });
  });

  test.each([
    ["dense", null],
    ["unknown", null],
    ["unknown", 99.5],
  ] as const)("binary: %s at %s %% has no label", (outcome, density) => {
    expect(labelOf({ outcome, relativeDensityPct: density }, binary).ok).toBe(false);
  });

  test("the threshold is the user's", () => {
    expect(labelOf({ outcome: "dense", relativeDensityPct: 99.2 }, { scheme: "binary", densityThresholdPct: 99.5 })).toMatchObject({ label: 0 });
  });

  test("multiclass keeps the outcome and drops unknown", () => {
    expect(labelOf({ outcome: "balling", relativeDensityPct: null }, { scheme: "multiclass", densityThresholdPct: 99 })).toEqual({ ok: true, label: "balling", className: "balling" });
    expect(labelOf({ outcome: "unknown", relativeDensityPct: 99 }, { scheme: "multiclass", densityThresholdPct: 99 }).ok).toBe(false);
  });

  test("density is the relative density, or no label", () => {
    expect(labelOf({ outcome: "unknown", relativeDensityPct: 97.25 }, { scheme: "density", densityThresholdPct: 99 })).toEqual({ ok: true, label: 97.25, className: null });
    expect(labelOf({ outcome: "dense", relativeDensityPct: null }, { scheme: "density", densityThresholdPct: 99 }).ok).toBe(false);
  });

  test("a binary label is 1 exactly when dense at or above the threshold", () => {
    fc.assert(
      fc.property(fc.constantFrom("dense", "keyhole", "lack_of_fusion", "balling", "cracking", "other", "unknown"), fc.option(fc.double({ min: 0, max: 101, noNaN: true })), fc.double({ min: 90, max: 100, noNaN: true }), (outcome, density, thr) => {
        const r = labelOf({ outcome, relativeDensityPct: density }, { scheme: "binary", densityThresholdPct: thr });
        if (r.ok && r.label === 1) expect(outcome === "dense" && density !== null && density >= thr).toBe(true);
        if (outcome === "dense" && density !== null && density >= thr) expect(r).toMatchObject({ ok: true, label: 1 });
      }),
    );
  });
});

test("classes and wording", () => {
  expect(labelClasses(binary)).toEqual(["success", "failure"]);
  expect(labelClasses({ scheme: "density", densityThresholdPct: 99 })).toBeNull();
  expect(describeLabelRule({ scheme: "binary", densityThresholdPct: 99.5 })).toContain("99.5 %");
});
