import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { createPrng } from "../prng";
import { groupFolds, parseSplitSpec, placeGroups, splitBySource } from "./splits";

const rowsArb = fc.array(fc.record({ group: fc.integer({ min: 1, max: 25 }), cls: fc.constantFrom("a", "b", "c") }), { minLength: 1, maxLength: 400 });

describe("splits by source", () => {
  test("every group lands in exactly one split, and the same seed gives the same placement", () => {
    fc.assert(
      fc.property(rowsArb, fc.integer({ min: 0, max: 2 ** 31 }), (rows, seed) => {
        const a = splitBySource(rows, { train: 0.7, validation: 0.15, test: 0.15 }, createPrng(seed));
        const b = splitBySource(rows, { train: 0.7, validation: 0.15, test: 0.15 }, createPrng(seed));
        expect([...a]).toEqual([...b]);
        expect(new Set(a.keys())).toEqual(new Set(rows.map((r) => r.group)));
      }),
      { numRuns: 100 },
    );
  });

  test("with many small sources the split sizes come close to the fractions and every class is in every split", () => {
    const rng = createPrng(3);
    const rows = Array.from({ length: 3000 }, (_, i) => ({ group: i % 60, cls: rng.chance(0.2) ? "rare" : "common" }));
    const placed = splitBySource(rows, { train: 0.7, validation: 0.15, test: 0.15 }, createPrng(9));
    const count = (s: string, c?: string) => rows.filter((r) => placed.get(r.group) === s && (c === undefined || r.cls === c)).length;
    expect(count("train") / rows.length).toBeCloseTo(0.7, 1);
    expect(count("test") / rows.length).toBeCloseTo(0.15, 1);
    for (const s of ["train", "validation", "test"]) expect(count(s, "rare") / count(s)).toBeCloseTo(0.2, 1);
  });

  test("a fraction of 0 gets nothing", () => {
    const rows = Array.from({ length: 50 }, (_, i) => ({ group: i, cls: null }));
    const placed = placeGroups(rows, [0.8, 0, 0.2], createPrng(1));
    expect([...placed.values()].includes(1)).toBe(false);
  });

  test("folds: k groups of about equal size", () => {
    const rows = Array.from({ length: 1000 }, (_, i) => ({ group: i % 40, cls: i % 3 ? "x" : "y" }));
    const folds = groupFolds(rows, 5, createPrng(2));
    const sizes = [0, 1, 2, 3, 4].map((f) => rows.filter((r) => folds.get(r.group) === f).length);
    for (const s of sizes) expect(s).toBe(200);
  });

  test("bad fractions are a RangeError naming the function", () => {
    expect(() => placeGroups([{ group: 1, cls: null }], [0.5, 0.4], createPrng(1))).toThrow(/placeGroups/);
  });
});

describe("parseSplitSpec", () => {
  test.each([
    ["source:0.7,0.15,0.15", { kind: "source", train: 0.7, validation: 0.15, test: 0.15 }],
    ["folds:5", { kind: "folds", k: 5 }],
    ["SOURCE:0.8,0.1,0.1", { kind: "source", train: 0.8, validation: 0.1, test: 0.1 }],
  ])("%s", (text, spec) => {
    expect(parseSplitSpec(text)).toEqual({ ok: true, spec });
  });
  test.each([
    ["source:0.7,0.2,0.2", /sum to 1/],
    ["source:0.7,0.3", /source:TRAIN/],
    ["folds:1", /2 to 20/],
    ["random", /folds:K/],
  ])("%s is refused", (text, message) => {
    const r = parseSplitSpec(text);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(message);
  });
});
