import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { scoreSource, SOURCE_QUALITY_SETTING_DEFS, type SourceAttributes } from "./source-quality";

const best: SourceAttributes = {
  kind: "journal_article",
  densityMethod: "archimedes",
  outcomeEvidence: "micrographs",
  machineStated: true,
  spotSizeDefinition: "one_over_e2",
  powderReported: true,
  atmosphereReported: true,
  qualityOverride: null,
  qualityOverrideReason: null,
};

describe("scoreSource", () => {
  test.each([
    // overrides, expected score with default weights 0.3 / 0.3 / 0.2 / 0.2
    ["everything verifiable", {}, 1],
    ["preprint", { kind: "preprint" }, 0.3 * 0.7 + 0.7],
    ["density method unknown", { densityMethod: "unknown" }, 0.3 * 0.4 + 0.7],
    ["statement only", { outcomeEvidence: "statement_only" }, 0.2 * 0.5 + 0.8],
    ["spot definition unstated, no powder", { spotSizeDefinition: "unstated", powderReported: false }, 0.8 + 0.2 * 0.5],
    ["unrecognised kind scores 0", { kind: "blog" }, 0.7],
  ] as const)("%s", (_label, overrides, expected) => {
    expect(scoreSource({ ...best, ...overrides }, {}).score).toBeCloseTo(expected, 9);
  });

  test("the explanation names each part and the missing details", () => {
    const q = scoreSource({ ...best, powderReported: false, atmosphereReported: false }, {});
    expect(q.explanation).toMatch(/peer-reviewed journal article/);
    expect(q.explanation).toMatch(/Archimedes/);
    expect(q.explanation).toMatch(/missing: powder size, atmosphere/);
  });

  test("an override wins and the explanation gives the reason and the computed score", () => {
    const q = scoreSource({ ...best, kind: "shop_trial", qualityOverride: 0.95, qualityOverrideReason: "Raw data and micrographs checked on site" }, {});
    expect(q.score).toBe(0.95);
    expect(q.overridden).toBe(true);
    expect(q.computedScore).toBeLessThan(0.95);
    expect(q.explanation).toMatch(/A reviewer set the score to 95%: "Raw data and micrographs checked on site"/);
  });

  test("weights are settings", () => {
    const onlyKind = { "quality.weight.densityMethod": 0, "quality.weight.outcomeEvidence": 0, "quality.weight.reported": 0 };
    expect(scoreSource({ ...best, kind: "thesis", densityMethod: "unknown" }, onlyKind).score).toBeCloseTo(0.85, 9);
  });

  test("property: the score stays in [0, 1] whatever the weights", () => {
    const keys = SOURCE_QUALITY_SETTING_DEFS.map((d) => d.key);
    fc.assert(
      fc.property(fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: keys.length, maxLength: keys.length }), fc.boolean(), (values, powder) => {
        const s = Object.fromEntries(keys.map((k, i) => [k, values[i]!]));
        const q = scoreSource({ ...best, powderReported: powder, densityMethod: "ct" }, s);
        expect(q.score).toBeGreaterThanOrEqual(0);
        expect(q.score).toBeLessThanOrEqual(1);
      }),
    );
  });
});
