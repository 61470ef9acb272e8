import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { defaultCheckSettings } from "./check-settings";
import { checkRecordOf } from "./checks/check-record-fixture";
import type { CheckRecord } from "./checks/types";
import { nearestNeighbours, neighbourParamsFrom, parameterDistance, type Neighbour, type NeighbourParams } from "./neighbours";

const params = neighbourParamsFrom(defaultCheckSettings());
const base = checkRecordOf();

describe("parameterDistance", () => {
  test.each([
    ["same parameters", {}, 0],
    ["power × e^0.15 (one step)", { laserPowerW: 200 * Math.exp(0.15) }, 1],
    ["speed × e^-0.3 (two steps)", { scanSpeedMmPerS: 800 * Math.exp(-0.3) }, 2],
    ["one step in P and in v", { laserPowerW: 200 * Math.exp(0.15), scanSpeedMmPerS: 800 * Math.exp(0.15) }, Math.SQRT2],
    ["hatch missing on one side is not compared", { hatchSpacingUm: null }, 0],
    ["hatch × e^0.2 (one step)", { hatchSpacingUm: 100 * Math.exp(0.2) }, 1],
  ] as const)("%s", (_label, overrides, expected) => {
    expect(parameterDistance(base, { ...base, ...(overrides as Partial<CheckRecord>) }, params.scale)).toBeCloseTo(expected, 9);
  });

  test("no power, no distance", () => {
    expect(parameterDistance(base, { ...base, laserPowerW: null }, params.scale)).toBeNull();
  });
});

function bruteForce(records: readonly CheckRecord[], p: NeighbourParams): Map<number, Neighbour[]> {
  const out = new Map<number, Neighbour[]>();
  for (const r of records) {
    if (r.outcome === "unknown" || r.laserPowerW === null) continue;
    const found: Neighbour[] = [];
    for (const q of records) {
      if (q === r || q.alloyKey !== r.alloyKey || q.outcome === "unknown") continue;
      const d = parameterDistance(r, q, p.scale);
      if (d !== null && d <= p.radius) found.push({ id: q.id, outcome: q.outcome, distance: d });
    }
    found.sort((a, b) => a.distance - b.distance || a.id - b.id);
    out.set(r.id, found.slice(0, p.count));
  }
  return out;
}

describe("nearestNeighbours", () => {
  test("a small worked case", () => {
    const records = [
      { ...base, id: 1 },
      { ...base, id: 2, laserPowerW: 210, outcome: "keyhole" },
      { ...base, id: 3, laserPowerW: 400 }, // ln 2 / 0.15 = 4.6 steps away
      { ...base, id: 4, alloyKey: "IN718" }, // other alloy
      { ...base, id: 5, outcome: "unknown" }, // says nothing
    ];
    const n = nearestNeighbours(records, params);
    expect(n.get(1)!.map((x) => x.id)).toEqual([2]);
    expect(n.get(2)!.map((x) => [x.id, x.outcome])).toEqual([[1, "dense"]]);
    expect(n.has(5)).toBe(false);
  });

  // Small sets are one leaf; sets of a few hundred records make trees several levels deep, with
  // splits on every coordinate and ties on the discrete layer values.
  test.each([
    { size: 60, runs: 200 },
    { size: 600, runs: 40 },
  ])("property: the tree search equals brute force (up to $size records)", ({ size, runs }) => {
    const arb = fc.record({
      alloyKey: fc.constantFrom("316L", "IN718"),
      laserPowerW: fc.oneof(fc.double({ min: 50, max: 400, noNaN: true }), fc.constant(null)),
      scanSpeedMmPerS: fc.double({ min: 300, max: 1500, noNaN: true }),
      hatchSpacingUm: fc.oneof(fc.double({ min: 60, max: 140, noNaN: true }), fc.constant(null)),
      layerThicknessUm: fc.constantFrom(30, 40, null),
      outcome: fc.constantFrom("dense", "keyhole", "lack_of_fusion", "unknown"),
    });
    fc.assert(
      fc.property(fc.array(arb, { maxLength: size, minLength: size / 2 }), fc.integer({ min: 1, max: 9 }), fc.double({ min: 0.3, max: 3, noNaN: true }), (rows, count, radius) => {
        const records = rows.map((r, i) => ({ ...base, ...r, id: i + 1 }) as CheckRecord);
        const p = { ...params, count, radius };
        const grid = nearestNeighbours(records, p);
        const brute = bruteForce(records, p);
        expect([...grid.keys()].sort((a, b) => a - b)).toEqual([...brute.keys()].sort((a, b) => a - b));
        for (const [id, list] of brute) expect(grid.get(id)!.map((x) => x.id)).toEqual(list.map((x) => x.id));
      }),
      { numRuns: runs },
    );
  });

  test("targets restrict the records judged", () => {
    const records = [1, 2, 3].map((id) => ({ ...base, id }));
    expect([...nearestNeighbours(records, params, new Set([2])).keys()]).toEqual([2]);
  });

  test("a non-positive radius is refused", () => {
    expect(() => nearestNeighbours([], { ...params, radius: 0 })).toThrow(RangeError);
  });
});
