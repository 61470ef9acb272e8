/**
 * Energy densities of a scan: E_l = P/v (J/mm), E_a = P/(v·h) (J/mm²), E_v = P/(v·h·t) (J/mm³),
 * with P in W, v in mm/s, h and t in mm (common practice in LPBF literature).
 */

export interface EnergyDensityInputs {
  laserPowerW?: number | null;
  scanSpeedMmPerS?: number | null;
  hatchSpacingUm?: number | null;
  layerThicknessUm?: number | null;
}

export interface EnergyDensities {
  linearJPerMm: number | null;
  arealJPerMm2: number | null;
  volumetricJPerMm3: number | null;
}

const UM_PER_MM = 1000;

function positive(value: number | null | undefined): number | null {
  return typeof value === "number" && Number.isFinite(value) && value > 0 ? value : null;
}

/**
 * Linear, areal and volumetric energy density; each is null when one of its inputs is missing,
 * not finite or not positive.
 *
 * @example
 * energyDensities({ laserPowerW: 200, scanSpeedMmPerS: 800, hatchSpacingUm: 100, layerThicknessUm: 30 });
 * // { linearJPerMm: 0.25, arealJPerMm2: 2.5, volumetricJPerMm3: 83.33 }
 */
export function energyDensities(p: EnergyDensityInputs): EnergyDensities {
  const power = positive(p.laserPowerW);
  const speed = positive(p.scanSpeedMmPerS);
  const hatchUm = positive(p.hatchSpacingUm);
  const layerUm = positive(p.layerThicknessUm);
  const linear = power !== null && speed !== null ? power / speed : null;
  const areal = linear !== null && hatchUm !== null ? linear / (hatchUm / UM_PER_MM) : null;
  const volumetric = areal !== null && layerUm !== null ? areal / (layerUm / UM_PER_MM) : null;
  return { linearJPerMm: linear, arealJPerMm2: areal, volumetricJPerMm3: volumetric };
}
