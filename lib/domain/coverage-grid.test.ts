import { describe, expect, test } from "vitest";
import fc from "fast-check";
import {
  axisEdges,
  binCentre,
  binIndex,
  chooseScale,
  countGrid,
  coverageScore,
  niceAxis,
  scatterSample,
  sparseCells,
  windowMask,
  type AxisSpec,
} from "./coverage-grid";

describe("axisEdges", () => {
  test.each<[AxisSpec, number[]]>([
    [{ min: 0, max: 400, bins: 4, scale: "linear" }, [0, 100, 200, 300, 400]],
    [{ min: 50, max: 400, bins: 7, scale: "linear" }, [50, 100, 150, 200, 250, 300, 350, 400]],
    [{ min: 0, max: 0.3, bins: 3, scale: "linear" }, [0, 0.1, 0.2, 0.3]],
    [{ min: 10, max: 1000, bins: 2, scale: "log" }, [10, 100, 1000]],
    [{ min: 1, max: 10000, bins: 4, scale: "log" }, [1, 10, 100, 1000, 10000]],
  ])("%j", (spec, edges) => {
    expect(axisEdges(spec)).toEqual(edges);
  });

  test.each<[AxisSpec, RegExp]>([
    [{ min: 10, max: 10, bins: 2, scale: "linear" }, /min < max/],
    [{ min: 0, max: 10, bins: 0, scale: "linear" }, /bins must be a whole number/],
    [{ min: 0, max: 10, bins: 2.5, scale: "linear" }, /bins must be a whole number/],
    [{ min: 0, max: 10, bins: 2, scale: "log" }, /log axis needs min > 0/],
    [{ min: Number.NaN, max: 10, bins: 2, scale: "linear" }, /finite/],
  ])("refuses %j", (spec, message) => {
    expect(() => axisEdges(spec)).toThrow(RangeError);
    expect(() => axisEdges(spec)).toThrow(message);
  });

  test("edges increase strictly from min to max on either scale", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.01, max: 1e4, noNaN: true }),
        fc.double({ min: 1.001, max: 1e3, noNaN: true }),
        fc.integer({ min: 1, max: 60 }),
        fc.constantFrom("linear" as const, "log" as const),
        (min, factor, bins, scale) => {
          const e = axisEdges({ min, max: min * factor, bins, scale });
          expect(e).toHaveLength(bins + 1);
          expect(e[0]).toBe(min);
          expect(e[bins]).toBe(min * factor);
          for (let i = 1; i < e.length; i++) expect(e[i]!).toBeGreaterThan(e[i - 1]!);
        },
      ),
    );
  });
});

describe("chooseScale and niceAxis", () => {
  test.each<[number, number, "linear" | "log"]>([
    [50, 400, "linear"],
    [200, 1999, "linear"],
    [200, 2000, "log"],
    [0, 5000, "linear"],
    [20, 5000, "log"],
  ])("chooseScale(%s, %s) = %s", (min, max, scale) => {
    expect(chooseScale(min, max)).toBe(scale);
  });

  test.each<[number, number, number, "linear" | "log", AxisSpec]>([
    [52, 398, 8, "linear", { min: 50, max: 400, bins: 7, scale: "linear" }],
    [0, 1, 10, "linear", { min: 0, max: 1, bins: 10, scale: "linear" }],
    [230, 1900, 10, "log", { min: 200, max: 2000, bins: 10, scale: "log" }],
    [30, 30, 4, "linear", { min: 28, max: 32, bins: 4, scale: "linear" }],
    [100, 100, 4, "log", { min: 50, max: 200, bins: 4, scale: "log" }],
  ])("niceAxis(%s, %s, %s, %s)", (lo, hi, bins, scale, spec) => {
    expect(niceAxis(lo, hi, bins, scale)).toEqual(spec);
  });

  test("a span lost in rounding (1.4e-14 W on 156 W) is treated as one value and still contained", () => {
    const lo = 156.3633358260175;
    const a = niceAxis(lo, lo + 1.4210854715202004e-14, 1, "linear");
    expect(a.min).toBeLessThanOrEqual(lo);
    expect(a.max).toBeGreaterThanOrEqual(lo + 1.4210854715202004e-14);
  });

  test("a nice axis always contains the data", () => {
    fc.assert(
      fc.property(fc.double({ min: 0.5, max: 5000, noNaN: true }), fc.double({ min: 0, max: 5000, noNaN: true }), fc.integer({ min: 1, max: 40 }), fc.constantFrom("linear" as const, "log" as const), (lo, span, bins, scale) => {
        const a = niceAxis(lo, lo + span, bins, scale);
        expect(a.min).toBeLessThanOrEqual(lo);
        expect(a.max).toBeGreaterThanOrEqual(lo + span);
        expect(a.min).toBeLessThan(a.max);
        const edges = axisEdges(a);
        expect(binIndex(edges, lo)).toBeGreaterThanOrEqual(0);
        expect(binIndex(edges, lo + span)).toBeGreaterThanOrEqual(0);
      }),
    );
  });
});

describe("binIndex and binCentre", () => {
  const edges = [0, 100, 200, 300];
  test.each<[number, number]>([
    [0, 0],
    [99.999, 0],
    [100, 1],
    [250, 2],
    [300, 2],
    [-0.1, -1],
    [300.1, -1],
    [Number.NaN, -1],
  ])("binIndex(%s) = %s", (value, index) => {
    expect(binIndex(edges, value)).toBe(index);
  });

  test("a value lands in the bin whose edges enclose it", () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 300, noNaN: true }), (x) => {
        const i = binIndex(edges, x);
        expect(edges[i]!).toBeLessThanOrEqual(x);
        expect(x).toBeLessThanOrEqual(edges[i + 1]!);
      }),
    );
  });

  test("centres: arithmetic on linear axes, geometric on log axes", () => {
    expect(binCentre([0, 100, 200], 1, "linear")).toBe(150);
    expect(binCentre([10, 100, 1000], 0, "log")).toBeCloseTo(Math.sqrt(1000), 12);
    expect(() => binCentre([0, 1], 1, "linear")).toThrow(RangeError);
  });
});

// A hand-built selection on a 3 × 4 grid: power edges 100/200/300/400 W, speed edges
// 0/500/1000/1500/2000 mm/s. Each point's cell is worked out by hand in the comment beside it.
const HAND = {
  laserPowerW: [150, 150, 199.9, 200, 250, 399, 400, 120, 350, 350, 350, 90, 150],
  scanSpeedMmPerS: [100, 400, 499, 500, 1250, 1999, 2000, 0, 1600, 1700, 1800, 800, 2100],
  outcome: ["dense", "dense", "keyhole", "dense", "lack_of_fusion", "balling", "balling", "dense", "dense", "dense", "keyhole", "dense", "dense"],
  // cells (power, speed): (0,0) (0,0) (0,0) (1,1) (1,2) (2,3) (2,3) (0,0) (2,3) (2,3) (2,3), outside, outside
};

describe("countGrid on a hand-built selection", () => {
  const g = countGrid(HAND, [100, 200, 300, 400], [0, 500, 1000, 1500, 2000]);

  test("counts per cell", () => {
    expect(g.counts).toEqual([
      [4, 0, 0, 0],
      [0, 1, 1, 0],
      [0, 0, 0, 5],
    ]);
    expect(g.inside).toBe(11);
    expect(g.outside).toBe(2);
  });

  test("counts per outcome", () => {
    expect(g.countsByOutcome.dense).toEqual([
      [3, 0, 0, 0],
      [0, 1, 0, 0],
      [0, 0, 0, 2],
    ]);
    expect(g.countsByOutcome.keyhole).toEqual([
      [1, 0, 0, 0],
      [0, 0, 0, 0],
      [0, 0, 0, 1],
    ]);
    expect(g.countsByOutcome.balling?.[2]?.[3]).toBe(2);
    expect(g.countsByOutcome.lack_of_fusion?.[1]?.[2]).toBe(1);
    expect(Object.keys(g.countsByOutcome).sort()).toEqual(["balling", "dense", "keyhole", "lack_of_fusion"]);
  });

  test("sparse cells with k = 2, thinnest first", () => {
    const cells = sparseCells(g.counts, 2);
    expect(cells).toHaveLength(10);
    expect(cells.slice(0, 3).map((c) => [c.powerIndex, c.speedIndex, c.count])).toEqual([
      [0, 1, 0],
      [0, 2, 0],
      [0, 3, 0],
    ]);
    expect(cells.filter((c) => c.count === 1).map((c) => [c.powerIndex, c.speedIndex])).toEqual([
      [1, 1],
      [1, 2],
    ]);
    expect(cells.every((c) => c.inWindow === null)).toBe(true);
  });

  test("window mask, sparse cells in the window and the score", () => {
    // window: power centre ≥ 150 W and speed centre ≤ 1250 mm/s -> rows 0..2, columns 0..2
    const mask = windowMask(g.powerEdgesW, g.speedEdgesMmPerS, "linear", "linear", (p, v) => p >= 150 && v <= 1250);
    expect(mask).toEqual([
      [true, true, true, false],
      [true, true, true, false],
      [true, true, true, false],
    ]);
    const cells = sparseCells(g.counts, 1, mask);
    expect(cells.find((c) => c.powerIndex === 0 && c.speedIndex === 3)?.inWindow).toBe(false);
    expect(cells.find((c) => c.powerIndex === 0 && c.speedIndex === 1)?.inWindow).toBe(true);
    const s = coverageScore(g, mask, 1, ["dense", "keyhole", "cracking"]);
    expect(s).toEqual({
      k: 1,
      windowCells: 9,
      covered: 3, // (0,0), (1,1), (1,2)
      share: 3 / 9,
      byOutcome: {
        dense: { covered: 2, share: 2 / 9 }, // (0,0), (1,1)
        keyhole: { covered: 1, share: 1 / 9 },
        cracking: { covered: 0, share: 0 },
      },
    });
    const whole = coverageScore(g, null, 4, ["dense"]);
    expect(whole).toMatchObject({ windowCells: 12, covered: 2, share: 2 / 12, byOutcome: { dense: { covered: 0 } } });
  });

  test("an empty window scores null, never a division by zero", () => {
    const none = windowMask(g.powerEdgesW, g.speedEdgesMmPerS, "linear", "linear", () => false);
    expect(coverageScore(g, none, 1, ["dense"])).toMatchObject({ windowCells: 0, share: null, byOutcome: { dense: { share: null } } });
  });
});

const pointsArb = fc
  .array(fc.record({ p: fc.double({ min: 0, max: 500, noNaN: true }), v: fc.double({ min: 0, max: 3000, noNaN: true }), o: fc.constantFrom("dense", "keyhole", "balling") }), { maxLength: 200 })
  .map((rows) => ({ laserPowerW: rows.map((r) => r.p), scanSpeedMmPerS: rows.map((r) => r.v), outcome: rows.map((r) => r.o) }));

describe("countGrid properties", () => {
  const pEdges = axisEdges({ min: 50, max: 450, bins: 8, scale: "linear" });
  const vEdges = axisEdges({ min: 100, max: 2500, bins: 6, scale: "log" });

  test("nothing is lost: cells sum to the points inside, inside + outside = all, outcomes sum to the cell", () => {
    fc.assert(
      fc.property(pointsArb, (pts) => {
        const g = countGrid(pts, pEdges, vEdges);
        const sum = g.counts.flat().reduce((a, b) => a + b, 0);
        expect(sum).toBe(g.inside);
        expect(g.inside + g.outside).toBe(pts.laserPowerW.length);
        g.counts.forEach((row, i) =>
          row.forEach((c, j) => expect(Object.values(g.countsByOutcome).reduce((a, grid) => a + grid[i]![j]!, 0)).toBe(c)),
        );
      }),
    );
  });

  test("the score lies in [0, 1] and never rises as k rises", () => {
    fc.assert(
      fc.property(pointsArb, fc.integer({ min: 1, max: 5 }), (pts, k) => {
        const g = countGrid(pts, pEdges, vEdges);
        const a = coverageScore(g, null, k, ["dense"]);
        const b = coverageScore(g, null, k + 1, ["dense"]);
        expect(a.share!).toBeGreaterThanOrEqual(0);
        expect(a.share!).toBeLessThanOrEqual(1);
        expect(b.covered).toBeLessThanOrEqual(a.covered);
        expect(a.byOutcome.dense!.covered).toBeLessThanOrEqual(a.covered);
        expect(sparseCells(g.counts, k).length).toBe(g.counts.flat().filter((c) => c < k).length);
      }),
    );
  });
});

describe("scatterSample", () => {
  test("keeps every point when there are few", () => {
    const g = countGrid(HAND, [100, 200, 300, 400], [0, 500, 1000, 1500, 2000]);
    expect(scatterSample(HAND, g, 100, 2)).toEqual(HAND.laserPowerW.map((_, i) => i));
  });

  test("thins dense cells to about the limit and keeps every point of a sparse cell", () => {
    const n = 10_000;
    const pts = {
      laserPowerW: Array.from({ length: n }, (_, i) => (i === 0 ? 390 : 150)),
      scanSpeedMmPerS: Array.from({ length: n }, (_, i) => (i === 0 ? 1900 : 250 + (i % 200))),
      outcome: Array.from({ length: n }, () => "dense"),
    };
    const g = countGrid(pts, [100, 200, 300, 400], [0, 500, 1000, 1500, 2000]);
    const kept = scatterSample(pts, g, 500, 3);
    expect(kept).toContain(0); // the lone point in cell (2, 3)
    expect(kept.length).toBeLessThanOrEqual(501);
    expect(kept.length).toBeGreaterThan(450);
    expect([...kept].sort((a, b) => a - b)).toEqual(kept);
  });
});
