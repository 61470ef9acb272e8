import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { axisEdges, binIndex } from "./coverage-grid";
import { createPrng } from "./prng";
import { DEFAULT_DUPLICATE_TOLERANCE, suggestExperiments, type PlaneAssessor, type RecordColumns, type SuggestionInput } from "./suggestions";

/** A toy window: 40 ≤ E_v ≤ 120 J/mm³ (h and t in mm). */
const evOf = (p: number, v: number, h: number, t: number) => p / (v * (h / 1000) * (t / 1000));
const toyAssessor: PlaneAssessor = (plane, p, v) => {
  const ev = evOf(p, v, plane.hatchSpacingUm, plane.layerThicknessUm);
  if (ev < 40) return { inWindow: false, regime: "lack_of_fusion", fired: ["lack_of_fusion_overlap"] };
  if (ev > 120) return { inWindow: false, regime: "keyhole", fired: ["keyhole_aspect"] };
  return { inWindow: true, regime: "dense", fired: ev > 100 ? ["balling_aspect"] : [] };
};
const everywhere: PlaneAssessor = () => ({ inWindow: true, regime: "dense", fired: [] });

const BASE: SuggestionInput = {
  n: 12,
  k: 3,
  powerRangeW: { min: 50, max: 400 },
  speedRangeMmPerS: { min: 200, max: 2000 },
  hatchSpacingsUm: [100],
  layerThicknessesUm: [30],
  powerBins: 10,
  speedBins: 10,
  powerScale: "linear",
  speedScale: "log",
};

const rngOf = (seed: number) => {
  const r = createPrng(seed);
  return () => r.next();
};

function columns(rows: { p: number; v: number; h: number; t: number }[]): RecordColumns {
  return { laserPowerW: rows.map((r) => r.p), scanSpeedMmPerS: rows.map((r) => r.v), hatchSpacingUm: rows.map((r) => r.h), layerThicknessUm: rows.map((r) => r.t) };
}

/** Records of the plane h 100 µm, t 30 µm in one cell, counted independently of the code under test. */
function recordsInCell(records: RecordColumns, input: SuggestionInput, p: number, v: number): number {
  const pe = axisEdges({ ...input.powerRangeW, bins: input.powerBins, scale: input.powerScale });
  const ve = axisEdges({ ...input.speedRangeMmPerS, bins: input.speedBins, scale: input.speedScale });
  const i = binIndex(pe, p);
  const j = binIndex(ve, v);
  let n = 0;
  for (let r = 0; r < records.laserPowerW.length; r++) {
    if (Math.abs(records.hatchSpacingUm[r]! - 100) > 10 || Math.abs(records.layerThicknessUm[r]! - 30) > 3) continue;
    if (binIndex(pe, records.laserPowerW[r]!) === i && binIndex(ve, records.scanSpeedMmPerS[r]!) === j) n++;
  }
  return n;
}

const recordArb = fc.array(
  fc.record({
    p: fc.integer({ min: 50, max: 400 }),
    v: fc.integer({ min: 200, max: 2000 }),
    h: fc.constantFrom(100, 101, 95, 120),
    t: fc.constantFrom(30, 31, 40),
  }),
  { maxLength: 250 },
);

describe("suggestExperiments: invariants", () => {
  test("inside the limits, inside the window, in sparse cells, repeating no record and no other suggestion", () => {
    fc.assert(
      fc.property(recordArb, fc.integer(), fc.integer({ min: 1, max: 30 }), fc.integer({ min: 1, max: 4 }), (rows, seed, n, k) => {
        const records = columns(rows);
        const input = { ...BASE, n, k };
        const r = suggestExperiments(input, records, toyAssessor, rngOf(seed));
        expect(r.suggestions.length).toBeLessThanOrEqual(n);
        for (const s of r.suggestions) {
          expect(s.laserPowerW).toBeGreaterThanOrEqual(50);
          expect(s.laserPowerW).toBeLessThanOrEqual(400);
          expect(s.scanSpeedMmPerS).toBeGreaterThanOrEqual(200);
          expect(s.scanSpeedMmPerS).toBeLessThanOrEqual(2000);
          expect(Number.isInteger(s.laserPowerW) && Number.isInteger(s.scanSpeedMmPerS)).toBe(true);
          expect([s.hatchSpacingUm, s.layerThicknessUm]).toEqual([100, 30]);
          expect(toyAssessor({ hatchSpacingUm: 100, layerThicknessUm: 30 }, s.laserPowerW, s.scanSpeedMmPerS).inWindow).toBe(true);
          expect(recordsInCell(records, input, s.laserPowerW, s.scanSpeedMmPerS)).toBeLessThan(k);
          for (const row of rows) {
            const dup =
              Math.abs(row.h - 100) <= 1 &&
              Math.abs(row.t - 30) <= 1 &&
              Math.abs(row.p - s.laserPowerW) <= Math.max(0.01 * row.p, 2) &&
              Math.abs(row.v - s.scanSpeedMmPerS) <= 0.01 * row.v;
            expect(dup).toBe(false);
          }
        }
        for (const a of r.suggestions) {
          for (const b of r.suggestions) {
            if (a === b) continue;
            const dup = Math.abs(a.laserPowerW - b.laserPowerW) <= Math.max(0.01 * b.laserPowerW, 2) && Math.abs(a.scanSpeedMmPerS - b.scanSpeedMmPerS) <= 0.01 * b.scanSpeedMmPerS;
            expect(dup).toBe(false);
          }
        }
        // Never more per cell than it takes to reach k.
        const perCell = new Map<string, number>();
        for (const s of r.suggestions) perCell.set(`${s.cell.powerIndex},${s.cell.speedIndex}`, (perCell.get(`${s.cell.powerIndex},${s.cell.speedIndex}`) ?? 0) + 1);
        for (const s of r.suggestions) expect(s.cell.records + perCell.get(`${s.cell.powerIndex},${s.cell.speedIndex}`)!).toBeLessThanOrEqual(k);
      }),
      { numRuns: 60 },
    );
  });

  test("the same seed and inputs give the same set; another seed another", () => {
    const records = columns([{ p: 200, v: 800, h: 100, t: 30 }]);
    const a = suggestExperiments(BASE, records, toyAssessor, rngOf(1));
    expect(suggestExperiments(BASE, records, toyAssessor, rngOf(1))).toEqual(a);
    expect(suggestExperiments(BASE, records, toyAssessor, rngOf(2)).suggestions).not.toEqual(a.suggestions);
  });
});

describe("suggestExperiments: choice of cells", () => {
  test("the thinnest cells are filled first", () => {
    // Every window cell gets 2 records except four, which stay empty; k = 3.
    const pe = axisEdges({ ...BASE.powerRangeW, bins: 10, scale: "linear" });
    const ve = axisEdges({ ...BASE.speedRangeMmPerS, bins: 10, scale: "log" });
    const rows: { p: number; v: number; h: number; t: number }[] = [];
    const empty: string[] = [];
    let windowCell = 0;
    for (let i = 0; i < 10; i++) {
      for (let j = 0; j < 10; j++) {
        const p = (pe[i]! + pe[i + 1]!) / 2;
        const v = Math.sqrt(ve[j]! * ve[j + 1]!);
        if (!toyAssessor({ hatchSpacingUm: 100, layerThicknessUm: 30 }, p, v).inWindow) continue;
        if (windowCell++ % 5 === 0 && empty.length < 4) {
          empty.push(`${i},${j}`);
          continue;
        }
        rows.push({ p: Math.round(p), v: Math.round(v), h: 100, t: 30 }, { p: Math.round(p) + 3, v: Math.round(v * 1.03), h: 100, t: 30 });
      }
    }
    const r = suggestExperiments({ ...BASE, n: 4 }, columns(rows), toyAssessor, rngOf(5));
    expect(r.suggestions.map((s) => `${s.cell.powerIndex},${s.cell.speedIndex}`).sort()).toEqual([...empty].sort());
    expect(r.suggestions.every((s) => s.cell.records === 0)).toBe(true);
    expect(r.suggestions[0]!.reason).toMatch(/holds 0 record\(s\), fewer than k = 3/);
  });

  test("suggestions spread out: with an empty plane no two of ten share a neighbourhood", () => {
    const r = suggestExperiments({ ...BASE, n: 10, k: 1 }, columns([]), everywhere, rngOf(3));
    expect(r.suggestions).toHaveLength(10);
    let closest = Infinity;
    for (const a of r.suggestions) for (const b of r.suggestions) if (a !== b) closest = Math.min(closest, Math.hypot(a.cell.powerIndex - b.cell.powerIndex, a.cell.speedIndex - b.cell.speedIndex));
    expect(closest).toBeGreaterThanOrEqual(2);
  });

  test("several shop planes: records count only in their own plane", () => {
    const input = { ...BASE, n: 6, k: 1, hatchSpacingsUm: [80, 120], layerThicknessesUm: [30] };
    const rows = [{ p: 200, v: 800, h: 80, t: 30 }];
    const r = suggestExperiments(input, columns(rows), everywhere, rngOf(9));
    expect(r.planes.map((p) => [p.hatchSpacingUm, p.records])).toEqual([
      [80, 1],
      [120, 0],
    ]);
    expect(new Set(r.suggestions.map((s) => s.hatchSpacingUm))).toEqual(new Set([80, 120]));
  });

  test("no more suggestions than the cells need, with a note", () => {
    // A window of exactly one cell: 155–190 W × 1,002–1,262 mm/s.
    const oneCell: PlaneAssessor = (_, p, v) => ({ inWindow: p >= 155 && p <= 180 && v >= 1010 && v <= 1250, regime: "dense", fired: [] });
    const r = suggestExperiments({ ...BASE, n: 10, k: 3 }, columns([{ p: 170, v: 1100, h: 100, t: 30 }]), oneCell, rngOf(1));
    expect(r.suggestions).toHaveLength(2);
    expect(r.notes.join(" ")).toMatch(/bring every window cell to k = 3/);
  });

  test.each<[string, PlaneAssessor, RegExp]>([
    ["no window at all", () => ({ inWindow: false, regime: "keyhole", fired: [] }), /No cell .* inside the predicted window/],
  ])("%s: no suggestions and a note", (_, assess, note) => {
    const r = suggestExperiments(BASE, columns([]), assess, rngOf(1));
    expect(r.suggestions).toEqual([]);
    expect(r.notes.join(" ")).toMatch(note);
  });

  test("a fully covered window: nothing to fill", () => {
    const rows = Array.from({ length: 3 }, (_, m) => ({ p: 390 - m * 3, v: 1990 - m * 30, h: 100, t: 30 }));
    const r = suggestExperiments({ ...BASE, powerRangeW: { min: 380, max: 400 }, speedRangeMmPerS: { min: 1900, max: 2000 }, powerBins: 1, speedBins: 1 }, columns(rows), everywhere, rngOf(1));
    expect(r.suggestions).toEqual([]);
    expect(r.notes.join(" ")).toMatch(/already holds at least k = 3/);
  });

  test.each<[string, Partial<SuggestionInput>]>([
    ["power min above max", { powerRangeW: { min: 400, max: 50 } }],
    ["negative power", { powerRangeW: { min: -5, max: 50 } }],
    ["no hatch values", { hatchSpacingsUm: [] }],
    ["k of zero", { k: 0 }],
    ["too many planes", { hatchSpacingsUm: Array.from({ length: 7 }, (_, i) => 60 + 10 * i), layerThicknessesUm: Array.from({ length: 6 }, (_, i) => 20 + 5 * i) }],
  ])("refuses %s", (_, change) => {
    expect(() => suggestExperiments({ ...BASE, ...change }, columns([]), everywhere, rngOf(1))).toThrow(RangeError);
  });

  test("the default duplicate tolerance is the DOMAIN near-duplicate rule", () => {
    expect(DEFAULT_DUPLICATE_TOLERANCE).toEqual({ powerRelative: 0.01, powerAbsW: 2, speedRelative: 0.01, hatchAbsUm: 1, layerAbsUm: 1 });
  });
});
