import { describe, expect, test } from "vitest";
import fc from "fast-check";
import reference from "../../test/fixtures/eagar-tsai-reference.json";
import { eagarTsaiG, eagarTsaiPeak, solveDimensionlessPool } from "./eagar-tsai";
import { eagarTsaiMeltPool, eagarTsaiTemperatureK, type MeltPoolInputs } from "./meltpool";
import { rosenthalMeltPool } from "./rosenthal";

// Check values from DOMAIN.md, each computed twice independently with scipy's adaptive quadrature.
const CHECK: MeltPoolInputs = {
  laserPowerW: 200, absorptivity: 0.35, scanSpeedMmPerS: 500, spotDiameterUm: 100,
  thermalConductivityWPerMK: 30, densityKgPerM3: 7800, specificHeatJPerKgK: 700,
  ambientTemperatureK: 298, meltingTemperatureK: 1700,
};

function relative(a: number, b: number): number {
  return Math.abs(a / b - 1);
}

describe("dimensionless field G(X, Y, Z; u)", () => {
  test("a stationary source at its centre gives π/√2 (closed form of the integral)", () => {
    expect(eagarTsaiG(0, 0, 0, 0)).toBeCloseTo(Math.PI / Math.SQRT2, 9);
  });

  test("far from a stationary source G tends to the point source, √π/(2R) (Rosenthal at v = 0)", () => {
    // Point source: T − T0 = AP/(2πkR); in G units (AP/(2π^1.5 kσ)) that is √π/R with R in σ.
    for (const R of [20, 50]) expect(relative(eagarTsaiG(R, 0, 0, 0), Math.sqrt(Math.PI) / R)).toBeLessThan(2e-3);
  });

  test("G falls with distance across and below the beam", () => {
    fc.assert(
      fc.property(
        fc.double({ min: -5, max: 2, noNaN: true }),
        fc.double({ min: 0, max: 3, noNaN: true }),
        fc.double({ min: 0.05, max: 2, noNaN: true }),
        fc.double({ min: 0.01, max: 50, noNaN: true }),
        (X, Y, dY, u) => {
          expect(eagarTsaiG(X, Y + dY, 0, u)).toBeLessThan(eagarTsaiG(X, Y, 0, u));
          expect(eagarTsaiG(X, 0, Y + dY, u)).toBeLessThan(eagarTsaiG(X, 0, Y, u));
        },
      ),
      { numRuns: 40 },
    );
  });

  test("the hottest point trails the beam centre", () => {
    for (const u of [0.1, 1, 10, 100]) expect(eagarTsaiPeak(u).peakX).toBeLessThan(0);
  });
});

describe("Eagar–Tsai melt pool against DOMAIN.md check values", () => {
  test.each([
    // [spot 1/e² diameter µm, width, depth, length] — DOMAIN.md
    [100, 136.9, 56.8, 301.7],
    [200, 171.9, 43.8, 282.9],
  ])("d = %s µm: W %s, D %s, L %s µm", (spotDiameterUm, width, depth, length) => {
    const r = eagarTsaiMeltPool({ ...CHECK, spotDiameterUm }, { method: "direct" });
    expect(r.widthUm).toBeCloseTo(width, 1);
    expect(r.depthUm).toBeCloseTo(depth, 1);
    expect(r.lengthUm).toBeCloseTo(length, 1);
  });

  test("σ = 50 µm: T(0,0,0) = 4,284.07 K", () => {
    expect(eagarTsaiTemperatureK({ ...CHECK, spotDiameterUm: 200 }, { xUm: 0, yUm: 0, zUm: 0 })).toBeCloseTo(4284.07, 1);
  });
});

describe("Eagar–Tsai against the independent scipy reference (test/reference/eagar_tsai_reference.py)", () => {
  test.each(reference.cases.map((c) => [c.name, c] as const))("%s: direct within 1e-4, surface within 1 %%", (_name, c) => {
    const direct = eagarTsaiMeltPool(c.inputs, { method: "direct" });
    const surface = eagarTsaiMeltPool(c.inputs);
    const e = c.expected;
    for (const [r, tol] of [[direct, 1e-4], [surface, 0.01]] as const) {
      expect(relative(r.widthUm, e.width_um)).toBeLessThan(tol);
      expect(relative(r.depthUm, e.depth_um)).toBeLessThan(tol);
      expect(relative(r.lengthUm, e.length_um)).toBeLessThan(tol);
      expect(relative(r.peakTemperatureK, e.peak_temperature_k)).toBeLessThan(tol);
    }
    expect(relative(eagarTsaiTemperatureK(c.inputs, { xUm: 0, yUm: 0, zUm: 0 }), c.surface_temperature_at_origin_k)).toBeLessThan(1e-6);
  });
});

describe("limits and invariants", () => {
  test("as σ → 0 the pool tends to Rosenthal's point source", () => {
    const rosenthal = rosenthalMeltPool(CHECK);
    const errors = [8, 2, 0.5].map((spotDiameterUm) => {
      const et = eagarTsaiMeltPool({ ...CHECK, spotDiameterUm }, { method: "direct" });
      return Math.max(relative(et.widthUm, rosenthal.widthUm), relative(et.depthUm, rosenthal.depthUm), relative(et.lengthUm, rosenthal.lengthUm));
    });
    expect(errors[2]).toBeLessThan(0.005);
    expect(errors[0]).toBeGreaterThan(errors[2] as number);
  });

  test("a wide pool at a small spot has width ≈ 2 × depth, as the axisymmetric point source", () => {
    const et = eagarTsaiMeltPool({ ...CHECK, spotDiameterUm: 1 }, { method: "direct" });
    expect(et.widthUm / et.depthUm).toBeCloseTo(2, 1);
  });

  const inputsArb = fc.record({
    laserPowerW: fc.double({ min: 50, max: 500, noNaN: true }),
    absorptivity: fc.double({ min: 0.2, max: 0.6, noNaN: true }),
    scanSpeedMmPerS: fc.double({ min: 100, max: 3000, noNaN: true }),
    spotDiameterUm: fc.double({ min: 30, max: 200, noNaN: true }),
    thermalConductivityWPerMK: fc.double({ min: 7, max: 40, noNaN: true }),
    densityKgPerM3: fc.constantFrom(4420, 7950, 8190),
    specificHeatJPerKgK: fc.double({ min: 400, max: 750, noNaN: true }),
    ambientTemperatureK: fc.constant(298),
    meltingTemperatureK: fc.double({ min: 1600, max: 1950, noNaN: true }),
  });

  test("the melt pool grows with laser power", () => {
    fc.assert(
      fc.property(inputsArb, fc.double({ min: 1.02, max: 2, noNaN: true }), (p, factor) => {
        const a = eagarTsaiMeltPool(p);
        const b = eagarTsaiMeltPool({ ...p, laserPowerW: p.laserPowerW * factor });
        expect(b.widthUm).toBeGreaterThanOrEqual(a.widthUm);
        expect(b.depthUm).toBeGreaterThanOrEqual(a.depthUm);
        expect(b.lengthUm).toBeGreaterThanOrEqual(a.lengthUm);
        expect(b.peakTemperatureK).toBeGreaterThan(a.peakTemperatureK);
      }),
      { numRuns: 200 },
    );
  });

  test("the melt pool shrinks with scan speed", () => {
    fc.assert(
      fc.property(inputsArb, fc.double({ min: 1.02, max: 2, noNaN: true }), (p, factor) => {
        const a = eagarTsaiMeltPool(p);
        const b = eagarTsaiMeltPool({ ...p, scanSpeedMmPerS: p.scanSpeedMmPerS * factor });
        expect(b.widthUm).toBeLessThanOrEqual(a.widthUm);
        expect(b.depthUm).toBeLessThanOrEqual(a.depthUm);
        expect(b.lengthUm).toBeLessThanOrEqual(a.lengthUm);
      }),
      { numRuns: 200 },
    );
  });

  test("the isotherm closes where G = θ", () => {
    const u = 2.275;
    const theta = 0.33;
    const pool = solveDimensionlessPool(u, theta);
    if (!pool) throw new Error("expected melting");
    expect(eagarTsaiG(pool.front, 0, 0, u)).toBeCloseTo(theta, 9);
    expect(eagarTsaiG(pool.rear, 0, 0, u)).toBeCloseTo(theta, 9);
  });

  test("nothing melts when θ is at or above the peak", () => {
    const { peakG } = eagarTsaiPeak(1);
    expect(solveDimensionlessPool(1, peakG * 1.0001)).toBeNull();
  });
});
