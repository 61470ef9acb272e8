/**
 * Melt-pool size of one scan track from the Eagar–Tsai model, in physical units, by the
 * precomputed surface (default, fast) or by direct integration.
 */
import { eagarTsaiG, eagarTsaiPeak, solveDimensionlessPool } from "./eagar-tsai";
import { createSurface, type EagarTsaiSurface, type SurfaceFile } from "./eagar-tsai-surface";
import surfaceFile from "./data/eagar-tsai-surface.json";

/** Inputs of the conduction-mode melt-pool model, SI except where the name says otherwise. */
export interface MeltPoolInputs {
  laserPowerW: number;
  /** Fraction of the laser power absorbed, 0 < A ≤ 1. */
  absorptivity: number;
  scanSpeedMmPerS: number;
  /** 1/e² diameter (convert other definitions with spot-definition.ts). */
  spotDiameterUm: number;
  densityKgPerM3: number;
  specificHeatJPerKgK: number;
  thermalConductivityWPerMK: number;
  /** Temperature of the melt-pool boundary (usually the liquidus). */
  meltingTemperatureK: number;
  /** Temperature of the part far from the beam (preheat or room temperature). */
  ambientTemperatureK: number;
}

export type SolveMethod = "surface" | "direct";

export interface MeltPoolOptions {
  /** "surface" (default) interpolates the precomputed solution, "direct" integrates numerically. */
  method?: SolveMethod;
  /** Another surface to read, e.g. in tests. */
  surface?: EagarTsaiSurface;
}

/** The two groups the dimensionless solution depends on, and the scales back to physical units. */
export interface EagarTsaiGroups {
  /** σ = d/4 for a 1/e² diameter d, in µm. */
  sigmaUm: number;
  thermalDiffusivityM2PerS: number;
  /** u = v·σ/(2α), dimensionless beam radius. */
  u: number;
  /** θ = (T_melt − T0) / (A·P/(2·π^(3/2)·k·σ)), dimensionless melting temperature. */
  theta: number;
  /** A·P/(2·π^(3/2)·k·σ), in K. */
  temperatureScaleK: number;
}

export interface MeltPoolDimensions {
  widthUm: number;
  depthUm: number;
  lengthUm: number;
  peakTemperatureK: number;
  melted: boolean;
  /** The method that produced the numbers ("direct" also when the surface had to fall back). */
  method: SolveMethod;
  notes: string[];
  groups: EagarTsaiGroups;
}

function requirePositive(name: string, value: number): void {
  if (typeof value !== "number" || !Number.isFinite(value) || value <= 0) {
    throw new RangeError(`eagarTsai: ${name} must be a positive finite number, got ${String(value)}`);
  }
}

/**
 * Validates the inputs and computes the dimensionless groups. Throws a RangeError naming the input
 * when a value is missing, zero, negative or not a number.
 *
 * @example
 * eagarTsaiGroups({ laserPowerW: 200, absorptivity: 0.35, scanSpeedMmPerS: 500, spotDiameterUm: 200,
 *   densityKgPerM3: 7800, specificHeatJPerKgK: 700, thermalConductivityWPerMK: 30,
 *   meltingTemperatureK: 1700, ambientTemperatureK: 298 }).u; // ≈ 2.275
 */
export function eagarTsaiGroups(inputs: MeltPoolInputs): EagarTsaiGroups {
  requirePositive("laserPowerW", inputs.laserPowerW);
  requirePositive("scanSpeedMmPerS", inputs.scanSpeedMmPerS);
  requirePositive("spotDiameterUm", inputs.spotDiameterUm);
  requirePositive("densityKgPerM3", inputs.densityKgPerM3);
  requirePositive("specificHeatJPerKgK", inputs.specificHeatJPerKgK);
  requirePositive("thermalConductivityWPerMK", inputs.thermalConductivityWPerMK);
  requirePositive("meltingTemperatureK", inputs.meltingTemperatureK);
  requirePositive("absorptivity", inputs.absorptivity);
  if (inputs.absorptivity > 1) throw new RangeError(`eagarTsai: absorptivity must be at most 1, got ${inputs.absorptivity}`);
  const t0 = inputs.ambientTemperatureK;
  if (typeof t0 !== "number" || !Number.isFinite(t0) || t0 < 0) {
    throw new RangeError(`eagarTsai: ambientTemperatureK must be a finite number >= 0 K, got ${String(t0)}`);
  }
  if (t0 >= inputs.meltingTemperatureK) {
    throw new RangeError(`eagarTsai: ambientTemperatureK (${t0}) must be below meltingTemperatureK (${inputs.meltingTemperatureK})`);
  }
  const sigmaM = inputs.spotDiameterUm * 1e-6 / 4; // σ = d/4 for a 1/e² diameter (Gaussian)
  const alpha = inputs.thermalConductivityWPerMK / (inputs.densityKgPerM3 * inputs.specificHeatJPerKgK);
  const speedMPerS = inputs.scanSpeedMmPerS * 1e-3;
  const temperatureScaleK = (inputs.absorptivity * inputs.laserPowerW) / (2 * Math.PI ** 1.5 * inputs.thermalConductivityWPerMK * sigmaM);
  return {
    sigmaUm: sigmaM * 1e6,
    thermalDiffusivityM2PerS: alpha,
    u: (speedMPerS * sigmaM) / (2 * alpha),
    theta: (inputs.meltingTemperatureK - t0) / temperatureScaleK,
    temperatureScaleK,
  };
}

let defaultSurface: EagarTsaiSurface | null = null;

/** The shipped surface (data/eagar-tsai-surface.json), read on first use. */
export function shippedSurface(): EagarTsaiSurface {
  defaultSurface ??= createSurface((surfaceFile as SurfaceFile).tables);
  return defaultSurface;
}

interface Dimensionless {
  halfWidth: number;
  depth: number;
  length: number;
  peakG: number;
  melted: boolean;
  method: SolveMethod;
  note: string | null;
}

// Memo of recent direct integrations (each costs milliseconds): repeated parameter sets (a table
// re-rendered, a record re-checked) cost one map lookup. Surface readings are cheaper than the
// memo's key would be, so they are not kept. Bounded; cleared when full.
const MEMO_LIMIT = 4096;
const memo = new Map<string, Dimensionless>();

function solveDirect(u: number, theta: number, note: string | null): Dimensionless {
  const peak = eagarTsaiPeak(u);
  const pool = solveDimensionlessPool(u, theta, peak);
  if (!pool) return { halfWidth: 0, depth: 0, length: 0, peakG: peak.peakG, melted: false, method: "direct", note };
  return { halfWidth: pool.halfWidth, depth: pool.depth, length: pool.length, peakG: peak.peakG, melted: true, method: "direct", note };
}

function solveDirectMemo(u: number, theta: number, note: string | null, memoize: boolean): Dimensionless {
  if (!memoize) return solveDirect(u, theta, note);
  const key = `${note === null ? "direct" : "fallback"}|${u}|${theta}`;
  const cached = memo.get(key);
  if (cached) return cached;
  const result = solveDirect(u, theta, note);
  if (memo.size >= MEMO_LIMIT) memo.clear();
  memo.set(key, result);
  return result;
}

function solveDimensionless(u: number, theta: number, method: SolveMethod, surface: EagarTsaiSurface | undefined): Dimensionless {
  // A caller's own surface (tests, calibration) is never memoized: its answers may differ.
  const memoize = surface === undefined;
  if (method === "direct") return solveDirectMemo(u, theta, null, memoize);
  const found = (surface ?? shippedSurface()).lookup(u, theta);
  if (found.kind === "pool") {
    const p = found.pool;
    return { halfWidth: p.halfWidth, depth: p.depth, length: p.length, peakG: p.peakG, melted: true, method: "surface", note: null };
  }
  if (found.kind === "no-melting") return { halfWidth: 0, depth: 0, length: 0, peakG: found.peakG, melted: false, method: "surface", note: null };
  return solveDirectMemo(u, theta, `solved by direct integration: ${found.reason}`, memoize);
}

/**
 * Width, depth and length of the melt pool (Eagar–Tsai, quasi-steady conduction mode) and the peak
 * surface temperature. When nothing melts, the dimensions are zero and a note says so.
 *
 * @example
 * eagarTsaiMeltPool({ laserPowerW: 200, absorptivity: 0.35, scanSpeedMmPerS: 500, spotDiameterUm: 100,
 *   densityKgPerM3: 7800, specificHeatJPerKgK: 700, thermalConductivityWPerMK: 30,
 *   meltingTemperatureK: 1700, ambientTemperatureK: 298 });
 * // { widthUm: ≈136.9, depthUm: ≈56.8, lengthUm: ≈301.7, ... }
 */
export function eagarTsaiMeltPool(inputs: MeltPoolInputs, options: MeltPoolOptions = {}): MeltPoolDimensions {
  const groups = eagarTsaiGroups(inputs);
  const method = options.method ?? "surface";
  if (method !== "surface" && method !== "direct") throw new RangeError(`eagarTsaiMeltPool: unknown method ${String(method)}`);
  const solved = solveDimensionless(groups.u, groups.theta, method, options.surface);
  const peakTemperatureK = inputs.ambientTemperatureK + groups.temperatureScaleK * solved.peakG;
  const notes: string[] = [];
  if (solved.note) notes.push(solved.note);
  if (!solved.melted) {
    notes.push(`no melting: the peak temperature ${peakTemperatureK.toFixed(0)} K stays below the melting temperature ${inputs.meltingTemperatureK} K`);
  }
  return {
    widthUm: 2 * solved.halfWidth * groups.sigmaUm,
    depthUm: solved.depth * groups.sigmaUm,
    lengthUm: solved.length * groups.sigmaUm,
    peakTemperatureK,
    melted: solved.melted,
    method: solved.method,
    notes,
    groups,
  };
}

/**
 * Temperature at a point of the quasi-steady field (x along the scan, ahead of the beam positive;
 * z depth), by direct integration.
 *
 * @example
 * eagarTsaiTemperatureK(checkCaseInputs, { xUm: 0, yUm: 0, zUm: 0 }); // ≈ 4284.07 for σ = 50 µm
 */
export function eagarTsaiTemperatureK(inputs: MeltPoolInputs, point: { xUm: number; yUm: number; zUm: number }): number {
  const g = eagarTsaiGroups(inputs);
  for (const [name, value] of Object.entries(point)) {
    if (!Number.isFinite(value)) throw new RangeError(`eagarTsaiTemperatureK: ${name} must be finite, got ${value}`);
  }
  if (point.zUm < 0) throw new RangeError(`eagarTsaiTemperatureK: zUm must be >= 0 (into the part), got ${point.zUm}`);
  const G = eagarTsaiG(point.xUm / g.sigmaUm, Math.abs(point.yUm) / g.sigmaUm, point.zUm / g.sigmaUm, g.u);
  return inputs.ambientTemperatureK + g.temperatureScaleK * G;
}
