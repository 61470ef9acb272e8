/**
 * Normalized enthalpy ΔH/h_s (Hann, Iammi & Folkes, J. Phys. D 44:445401, 2011; in the form of
 * King et al., J. Mater. Process. Technol. 214(12):2915–2925, 2014):
 *
 *   ΔH/h_s = A·P / (π·h_s·√(α·v·a³)),   h_s = ρ·c·T_melt,   a = beam radius (1/e², = d/2)
 *
 * Keyhole mode is expected when ΔH/h_s > π·T_boil/T_melt (the threshold used by Sheikh et al.,
 * npj Comput. Mater. 10:252, 2024). Published codes place π and √π differently; a threshold is
 * valid only with the formula it was derived for, so this file keeps the two together.
 */

export interface NormalizedEnthalpyInputs {
  laserPowerW: number;
  absorptivity: number;
  scanSpeedMmPerS: number;
  /** 1/e² spot diameter; the beam radius a is half of it. */
  spotDiameterUm: number;
  densityKgPerM3: number;
  specificHeatJPerKgK: number;
  thermalConductivityWPerMK: number;
  meltingTemperatureK: number;
}

function requirePositive(name: string, value: number): void {
  if (typeof value !== "number" || !Number.isFinite(value) || value <= 0) {
    throw new RangeError(`normalizedEnthalpy: ${name} must be a positive finite number, got ${String(value)}`);
  }
}

/**
 * ΔH/h_s, dimensionless.
 *
 * @example
 * normalizedEnthalpy({ laserPowerW: 200, absorptivity: 0.35, scanSpeedMmPerS: 800, spotDiameterUm: 80,
 *   densityKgPerM3: 7950, specificHeatJPerKgK: 500, thermalConductivityWPerMK: 20, meltingTemperatureK: 1723 }); // ≈ 6.41
 */
export function normalizedEnthalpy(p: NormalizedEnthalpyInputs): number {
  for (const name of ["laserPowerW", "absorptivity", "scanSpeedMmPerS", "spotDiameterUm", "densityKgPerM3", "specificHeatJPerKgK", "thermalConductivityWPerMK", "meltingTemperatureK"] as const) {
    requirePositive(name, p[name]);
  }
  const alpha = p.thermalConductivityWPerMK / (p.densityKgPerM3 * p.specificHeatJPerKgK);
  const hs = p.densityKgPerM3 * p.specificHeatJPerKgK * p.meltingTemperatureK; // J/m³
  const a = (p.spotDiameterUm * 1e-6) / 2;
  const v = p.scanSpeedMmPerS * 1e-3;
  return (p.absorptivity * p.laserPowerW) / (Math.PI * hs * Math.sqrt(alpha * v * a ** 3));
}

/**
 * Default keyhole threshold on ΔH/h_s: π·T_boil/T_melt (Sheikh et al. 2024).
 *
 * @example
 * keyholeEnthalpyThreshold(3090, 1723); // ≈ 5.63
 */
export function keyholeEnthalpyThreshold(boilingTemperatureK: number, meltingTemperatureK: number): number {
  requirePositive("boilingTemperatureK", boilingTemperatureK);
  requirePositive("meltingTemperatureK", meltingTemperatureK);
  return (Math.PI * boilingTemperatureK) / meltingTemperatureK;
}
