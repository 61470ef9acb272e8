import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { defaultCheckSettings } from "./check-settings";
import { checkRecordOf } from "./checks/check-record-fixture";
import type { CheckRecord } from "./checks/types";
import { classifyPair, exactKeyOf, findDuplicatePairs, pairsForReview, tolerancesFrom, type DuplicatePair } from "./duplicates";

const tol = tolerancesFrom(defaultCheckSettings());
const base = checkRecordOf();

describe("classifyPair", () => {
  test.each([
    ["same row again, same source", {}, "exact"],
    ["same row in another source (republished)", { sourceId: 2 }, "near"],
    ["0.1 mm hatch vs 100 µm", { entered: { ...base.entered, hatchSpacing: { text: "0.1", unit: "mm" } } }, "exact"],
    ["conversion noise below entered precision", { hatchSpacingUm: 100.0000001 }, "exact"],
    ["power +1.9 W (inside 2 W)", { laserPowerW: 201.9, entered: { ...base.entered, laserPower: { text: "201.9", unit: "W" } } }, "near"],
    ["power +2.5 W at 200 W (outside 2 W and 1 %)", { laserPowerW: 202.5 }, null],
    ["power +3.5 W at 400 W (inside 1 %)", { laserPowerW: 400, sourceId: 3 }, null],
    ["speed +1 %", { scanSpeedMmPerS: 808 }, "near"],
    ["speed +1.5 %", { scanSpeedMmPerS: 812 }, null],
    ["hatch +1 µm", { hatchSpacingUm: 101 }, "near"],
    ["hatch +2 µm", { hatchSpacingUm: 102 }, null],
    ["layer +1 µm", { layerThicknessUm: 31 }, "near"],
    ["spot +2 µm", { spotDiameterUm: 82 }, "near"],
    ["spot +3 µm", { spotDiameterUm: 83 }, null],
    ["hatch missing on one side", { hatchSpacingUm: null }, null],
    ["other alloy", { alloyKey: "IN718" }, null],
    ["Cr 0.4 wt% apart", { components: base.components.map((c) => (c.element === "Cr" ? { ...c, amount: 17.4 } : c.element === "Fe" ? { ...c, amount: 65 } : c)) }, "near"],
    ["Cr 0.6 wt% apart", { components: base.components.map((c) => (c.element === "Cr" ? { ...c, amount: 17.6 } : c.element === "Fe" ? { ...c, amount: 64.8 } : c)) }, null],
    ["different outcome", { outcome: "keyhole" }, "label_conflict"],
    ["unknown outcome against dense, same density", { outcome: "unknown" }, null],
    ["density 0.05 apart (same result)", { relativeDensityPct: 99.45, entered: { ...base.entered, relativeDensity: { text: "99.45", unit: "%" } } }, "near"],
    ["density 2 apart (replicate specimen)", { relativeDensityPct: 97.5 }, null],
    ["density 8 apart (conflict)", { relativeDensityPct: 91.5 }, "label_conflict"],
  ] as const)("%s -> %s", (_label, overrides, expected) => {
    const other = { ...base, id: 2, ...(overrides as Partial<CheckRecord>) };
    expect(classifyPair(base, other, tol)).toBe(expected);
    expect(classifyPair(other, base, tol)).toBe(expected); // symmetric
  });

  test("exact keys round to the entered precision", () => {
    const a = { ...base, hatchSpacingUm: 50.003, entered: { ...base.entered, hatchSpacing: { text: "0.050003", unit: "mm" } } };
    const b = { ...base, hatchSpacingUm: 50, entered: { ...base.entered, hatchSpacing: { text: "0.05", unit: "mm" } } };
    expect(exactKeyOf(a)).not.toBe(exactKeyOf(b));
    expect(exactKeyOf({ ...a, id: 9 })).toBe(exactKeyOf(a));
  });
});

// Random small sets on a coarse lattice so that duplicates of every kind actually occur.
const often = <T,>(common: T, ...rare: T[]) => fc.oneof({ arbitrary: fc.constant(common), weight: 4 }, { arbitrary: fc.constantFrom(common, ...rare), weight: 1 });
const recordFields = {
  sourceId: often(1, 2),
  alloyKey: often("316L", "IN718"),
  laserPowerW: fc.oneof(fc.constantFrom(1, 2, 3, 18, 19, 20, 100, 101, 102, 103, 200, 202, 203, 400, 404), fc.constant(null)),
  scanSpeedMmPerS: often(800, 806, 808, 812, 1000),
  hatchSpacingUm: often(100, 101, 102, null),
  layerThicknessUm: fc.constantFrom(27, 28, 30, 31, null),
  spotDiameterUm: often(80, 82, 83),
  outcome: often("dense", "keyhole", "unknown"),
  relativeDensityPct: often(99.5, 99.45, 97, 90, null),
};
const recordArb = fc.record(recordFields);

function bruteForce(records: readonly CheckRecord[], isDistinct: (a: number, b: number) => boolean): DuplicatePair[] {
  const out: DuplicatePair[] = [];
  for (let i = 0; i < records.length; i++) {
    for (let j = i + 1; j < records.length; j++) {
      const x = records[i]!;
      const y = records[j]!;
      const kind = classifyPair(x, y, tol);
      const a = Math.min(x.id, y.id);
      const b = Math.max(x.id, y.id);
      if (kind && !isDistinct(a, b)) out.push({ a, b, kind });
    }
  }
  return out.sort((p, q) => p.b - q.b || p.a - q.a);
}

describe("findDuplicatePairs", () => {
  test("property: blocking finds exactly the pairs brute force finds", () => {
    fc.assert(
      fc.property(fc.array(recordArb, { minLength: 0, maxLength: 40 }), fc.integer({ min: 0, max: 7 }), (rows, distinctMod) => {
        const records = rows.map((r, i) => ({ ...base, ...r, id: i + 1, entered: {} }) as CheckRecord);
        const isDistinct = (a: number, b: number) => distinctMod > 0 && (a + b) % 8 === distinctMod;
        expect(findDuplicatePairs(records, tol, { isDistinct })).toEqual(bruteForce(records, isDistinct));
      }),
      { numRuns: 300 },
    );
  });

  test("property: both block orderings (dense grid, counting sort; sparse grid, comparison sort) equal brute force", () => {
    // Narrow (P, v) spans keep the grid small next to the block (counting sort); speeds spread over
    // four decades make it far larger than the block (the comparison sort).
    const spread = fc.record({ ...recordFields, scanSpeedMmPerS: often(800, 801, 10, 12, 50_000, 99_000) });
    fc.assert(
      fc.property(fc.array(fc.oneof(recordArb, spread), { maxLength: 40 }), (rows) => {
        const records = rows.map((r, i) => ({ ...base, ...r, id: i + 1, entered: {} }) as CheckRecord);
        expect(findDuplicatePairs(records, tol)).toEqual(bruteForce(records, () => false));
      }),
      { numRuns: 300 },
    );
  });

  test("property: blocking equals brute force with loose tolerances too", () => {
    const loose = { ...tol, powerRelPct: 10, powerAbsW: 15, speedRelPct: 5, hatchAbsUm: 5 };
    fc.assert(
      fc.property(fc.array(recordArb, { maxLength: 30 }), (rows) => {
        const records = rows.map((r, i) => ({ ...base, ...r, id: 100 - i, entered: {} }) as CheckRecord);
        const brute: DuplicatePair[] = [];
        for (let i = 0; i < records.length; i++)
          for (let j = i + 1; j < records.length; j++) {
            const kind = classifyPair(records[i]!, records[j]!, loose);
            if (kind) brute.push({ a: Math.min(records[i]!.id, records[j]!.id), b: Math.max(records[i]!.id, records[j]!.id), kind });
          }
        brute.sort((p, q) => p.b - q.b || p.a - q.a);
        expect(findDuplicatePairs(records, loose)).toEqual(brute);
      }),
      { numRuns: 200 },
    );
  });

  test("a cluster of three copies gives two review pairs, each against the earliest", () => {
    const records = [1, 2, 3].map((id) => ({ ...base, id }));
    const pairs = findDuplicatePairs(records, tol);
    expect(pairs).toEqual([
      { a: 1, b: 2, kind: "exact" },
      { a: 1, b: 3, kind: "exact" },
      { a: 2, b: 3, kind: "exact" },
    ]);
    expect(pairsForReview(pairs)).toEqual([
      { recordId: 2, relatedId: 1, kind: "exact", others: [1] },
      { recordId: 3, relatedId: 1, kind: "exact", others: [1, 2] },
    ]);
  });

  test("records without power are compared by exact key only", () => {
    const records = [
      { ...base, id: 1, laserPowerW: null },
      { ...base, id: 2, laserPowerW: null },
      { ...base, id: 3, laserPowerW: null, sourceId: 5 },
    ];
    expect(findDuplicatePairs(records, tol)).toEqual([{ a: 1, b: 2, kind: "exact" }]);
  });
});
