import { describe, expect, test } from "vitest";
import fc from "fast-check";
import surfaceFile from "./data/eagar-tsai-surface.json";
import { eagarTsaiPeak, solveDimensionlessPool } from "./eagar-tsai";
import { buildSurfaceTable, createSurface, DEFAULT_SURFACE_SPECS, type SurfaceFile, widthBranches } from "./eagar-tsai-surface";
import { eagarTsaiMeltPool, shippedSurface } from "./meltpool";

const file = surfaceFile as SurfaceFile;
const main = file.tables[file.tables.length - 1];
if (!main) throw new Error("surface file has no tables");

describe("the shipped surface file", () => {
  test("was built with the current specs", () => {
    expect(file.tables.map((t) => [t.lnU, t.xi, t.peakLnU, t.profileSamples ?? 0])).toEqual(
      DEFAULT_SURFACE_SPECS.map((s) => [s.lnU, s.xi, s.peakLnU, s.profileSamples ?? 0]),
    );
  });

  test.each([
    [0, 0],
    [5, 40],
    [20, 13],
    [23, 12],
    [33, 3],
    [40, 53],
  ])("main-table node (%s, %s) matches a fresh direct solve", (i, j) => {
    const u = Math.exp(main.lnU.min + i * main.lnU.step);
    const xi = main.xi.min + j * main.xi.step;
    const peak = eagarTsaiPeak(u);
    const pool = solveDimensionlessPool(u, peak.peakG / (1 + Math.exp(-xi)), peak);
    if (!pool) throw new Error("expected melting");
    const k = i * main.xi.count + j;
    expect(main.lnDepth[k]).toBeCloseTo(Math.log(pool.depth), 8);
    expect(main.lnLength[k]).toBeCloseTo(Math.log(pool.length), 8);
    expect(Math.max(main.lnHalfWidthHead[k] as number, main.lnHalfWidthTail[k] as number)).toBeCloseTo(Math.log(pool.halfWidth), 8);
  });

  test("only a small share of cells is marked for direct integration", () => {
    for (const t of file.tables) {
      const bad = t.cellOk.filter((ok) => ok !== 1).length;
      expect(bad / t.cellOk.length).toBeLessThan(0.1);
    }
  });
});

describe("surface against direct integration", () => {
  const surface = shippedSurface();
  const domain = fc.record({
    lnU: fc.double({ min: main.lnU.min, max: main.lnU.min + main.lnU.step * (main.lnU.count - 1), noNaN: true }),
    xi: fc.double({ min: main.xi.min, max: main.xi.min + main.xi.step * (main.xi.count - 1), noNaN: true }),
  });

  test("agrees within 1 % over the whole table domain (or says it cannot)", () => {
    fc.assert(
      fc.property(domain, ({ lnU, xi }) => {
        const u = Math.exp(lnU);
        const peak = eagarTsaiPeak(u);
        const theta = peak.peakG / (1 + Math.exp(-xi));
        const found = surface.lookup(u, theta);
        const direct = solveDimensionlessPool(u, theta, peak);
        if (!direct) throw new Error("expected melting");
        if (found.kind === "outside") return; // the caller integrates directly
        expect(found.kind).toBe("pool");
        if (found.kind !== "pool") return;
        expect(Math.abs(found.pool.halfWidth / direct.halfWidth - 1)).toBeLessThan(0.01);
        expect(Math.abs(found.pool.depth / direct.depth - 1)).toBeLessThan(0.01);
        expect(Math.abs(found.pool.length / direct.length - 1)).toBeLessThan(0.01);
        expect(Math.abs(found.pool.peakG / peak.peakG - 1)).toBeLessThan(1e-6);
      }),
      { numRuns: 40, seed: 20240601 },
    );
  });

  test("around the cusp where a second widest section appears (u ≈ 2–8) it still agrees", () => {
    fc.assert(
      fc.property(fc.double({ min: Math.log(2), max: Math.log(8), noNaN: true }), fc.double({ min: -5, max: -1, noNaN: true }), (lnU, xi) => {
        const u = Math.exp(lnU);
        const peak = eagarTsaiPeak(u);
        const theta = peak.peakG / (1 + Math.exp(-xi));
        const found = surface.lookup(u, theta);
        const direct = solveDimensionlessPool(u, theta, peak);
        if (!direct || found.kind !== "pool") return;
        expect(Math.abs(found.pool.halfWidth / direct.halfWidth - 1)).toBeLessThan(0.01);
      }),
      { numRuns: 25, seed: 7 },
    );
  });

  test("outside the tabulated domain the lookup says so and the melt pool is solved directly", () => {
    expect(surface.lookup(1e5, 0.001).kind).toBe("outside");
    const inputs = {
      laserPowerW: 200, absorptivity: 0.35, scanSpeedMmPerS: 500, spotDiameterUm: 0.5, thermalConductivityWPerMK: 30,
      densityKgPerM3: 7800, specificHeatJPerKgK: 700, ambientTemperatureK: 298, meltingTemperatureK: 1700,
    };
    const viaSurface = eagarTsaiMeltPool(inputs);
    expect(viaSurface.method).toBe("direct");
    expect(viaSurface.notes.join(" ")).toMatch(/solved by direct integration/);
    expect(viaSurface.widthUm).toBeCloseTo(eagarTsaiMeltPool(inputs, { method: "direct" }).widthUm, 9);
  });

  test("above the melting threshold the surface reports no melting", () => {
    const peak = surface.peakG(1) as number;
    expect(surface.lookup(1, peak * 1.01).kind).toBe("no-melting");
  });
});

describe("building a surface", () => {
  test("a small table reproduces its own nodes and marks every cell it checked", () => {
    const spec = {
      lnU: { min: 0, step: 0.5, count: 3 },
      xi: { min: -1, step: 1, count: 3 },
      peakLnU: { min: 0, step: 0.25, count: 5 },
      cellTolerance: 0.05,
    };
    const table = buildSurfaceTable(spec);
    expect(table.cellOk).toHaveLength(4);
    const reader = createSurface([table]);
    const u = Math.exp(0.5);
    const peak = eagarTsaiPeak(u);
    const theta = peak.peakG / (1 + Math.exp(-0));
    const found = reader.lookup(u, theta);
    const direct = solveDimensionlessPool(u, theta, peak);
    if (found.kind !== "pool" || !direct) throw new Error("expected a pool");
    expect(found.pool.depth).toBeCloseTo(direct.depth, 8);
    expect(found.pool.length).toBeCloseTo(direct.length, 8);
  });
});

describe("widthBranches", () => {
  test("a row with one maximum everywhere has head = tail", () => {
    const { head, tail } = widthBranches([[3], [2], [1]]);
    expect(head).toEqual([3, 2, 1]);
    expect(tail).toEqual([3, 2, 1]);
  });

  test("beyond the two-maxima band each branch continues below the other", () => {
    // ξ ascending: big pools (tail only) → band → small pools (head only)
    const { head, tail } = widthBranches([[5], [4.1, 4.2], [3.5, 3.2], [3]]);
    expect(tail[0]).toBe(5);
    expect(head[3]).toBe(3);
    expect(head[0] as number).toBeLessThan(tail[0] as number);
    expect(tail[3] as number).toBeLessThan(head[3] as number);
    expect([head[1], tail[1], head[2], tail[2]]).toEqual([4.1, 4.2, 3.5, 3.2]);
  });
});
