/**
 * Rosenthal moving point source (D. Rosenthal, Trans. ASME 68:849–866, 1946), quasi-steady, on a
 * semi-infinite body:
 *
 *   T − T0 = A·P/(2π·k·R) · exp(−v·(R + x)/(2α)),   R = √(x² + y² + z²)
 *
 * x along the scan (ahead of the source positive). The melting isotherm is a surface of revolution
 * about the scan axis, so width = 2 × depth. With lengths in units of 2α/v and
 * n = A·P·v/(4π·k·α·(T_melt − T0)) the isotherm is e^(−(ρ + ξ))/ρ = 1/n, which gives closed-form
 * conditions (derived here): rear end at ξ = −n; front end ξ_f with ξ_f·e^(2ξ_f) = n; widest section
 * where ρ solves ln(n/ρ) = ρ/(1 + ρ), at ξ = −ρ²/(1 + ρ), radius √(ρ² − ξ²).
 */
import { findRoot } from "./meltpool-numerics";

export interface RosenthalInputs {
  laserPowerW: number;
  absorptivity: number;
  scanSpeedMmPerS: number;
  densityKgPerM3: number;
  specificHeatJPerKgK: number;
  thermalConductivityWPerMK: number;
  meltingTemperatureK: number;
  ambientTemperatureK: number;
}

export interface RosenthalPool {
  widthUm: number;
  depthUm: number;
  lengthUm: number;
  /** The dimensionless operating parameter n = A·P·v/(4π·k·α·ΔT). */
  operatingParameter: number;
}

function check(inputs: RosenthalInputs): void {
  for (const name of ["laserPowerW", "absorptivity", "scanSpeedMmPerS", "densityKgPerM3", "specificHeatJPerKgK", "thermalConductivityWPerMK", "meltingTemperatureK"] as const) {
    const v = inputs[name];
    if (typeof v !== "number" || !Number.isFinite(v) || v <= 0) throw new RangeError(`rosenthal: ${name} must be a positive finite number, got ${String(v)}`);
  }
  const t0 = inputs.ambientTemperatureK;
  if (!Number.isFinite(t0) || t0 < 0 || t0 >= inputs.meltingTemperatureK) {
    throw new RangeError(`rosenthal: ambientTemperatureK must be >= 0 and below meltingTemperatureK, got ${t0}`);
  }
}

/**
 * Temperature at a point (µm; x ahead of the source positive, z depth). Infinite at the source.
 *
 * @example
 * rosenthalTemperatureK(inputs, { xUm: -100, yUm: 0, zUm: 0 });
 */
export function rosenthalTemperatureK(inputs: RosenthalInputs, point: { xUm: number; yUm: number; zUm: number }): number {
  check(inputs);
  const alpha = inputs.thermalConductivityWPerMK / (inputs.densityKgPerM3 * inputs.specificHeatJPerKgK);
  const v = inputs.scanSpeedMmPerS * 1e-3;
  const x = point.xUm * 1e-6;
  const r = Math.hypot(x, point.yUm * 1e-6, point.zUm * 1e-6);
  if (r === 0) return Infinity;
  return inputs.ambientTemperatureK + ((inputs.absorptivity * inputs.laserPowerW) / (2 * Math.PI * inputs.thermalConductivityWPerMK * r)) * Math.exp((-v * (r + x)) / (2 * alpha));
}

/**
 * Melt-pool width, depth and length of the Rosenthal solution, from the closed-form conditions in
 * the file comment (each a one-dimensional root).
 *
 * @example
 * rosenthalMeltPool({ laserPowerW: 200, absorptivity: 0.35, scanSpeedMmPerS: 500, densityKgPerM3: 7800,
 *   specificHeatJPerKgK: 700, thermalConductivityWPerMK: 30, meltingTemperatureK: 1700, ambientTemperatureK: 298 });
 */
export function rosenthalMeltPool(inputs: RosenthalInputs): RosenthalPool {
  check(inputs);
  const alpha = inputs.thermalConductivityWPerMK / (inputs.densityKgPerM3 * inputs.specificHeatJPerKgK);
  const v = inputs.scanSpeedMmPerS * 1e-3;
  const n = (inputs.absorptivity * inputs.laserPowerW * v) / (4 * Math.PI * inputs.thermalConductivityWPerMK * alpha * (inputs.meltingTemperatureK - inputs.ambientTemperatureK));
  const lengthScaleUm = ((2 * alpha) / v) * 1e6;
  // Front: ξ·e^(2ξ) = n, increasing in ξ ≥ 0.
  const front = findRoot((xi) => xi * Math.exp(2 * xi) - n, 0, Math.max(1, Math.log1p(n)), 1e-14 * Math.max(1, n));
  // Widest section: ln n − ln ρ − ρ/(1 + ρ) = 0, decreasing in ρ.
  const rhoHi = Math.max(1, n);
  const rho = findRoot((r) => Math.log(n) - Math.log(r) - r / (1 + r), 1e-300 + n * 1e-12, rhoHi * 2, 1e-14 * rhoHi);
  const xi = -(rho * rho) / (1 + rho);
  const radius = Math.sqrt(Math.max(0, rho * rho - xi * xi));
  return {
    widthUm: 2 * radius * lengthScaleUm,
    depthUm: radius * lengthScaleUm,
    lengthUm: (front + n) * lengthScaleUm,
    operatingParameter: n,
  };
}
