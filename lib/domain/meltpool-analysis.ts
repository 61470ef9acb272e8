/**
 * One scan track analysed end to end: spot definition → Eagar–Tsai melt pool → normalized enthalpy
 * → energy densities → defect criteria → predicted regime.
 */
import type { ResolvedProperties } from "./alloy-properties";
import { type CriteriaOptions, type CriterionResult, evaluateCriteria } from "./criteria";
import { type EnergyDensities, energyDensities } from "./energy-density";
import { eagarTsaiMeltPool, type MeltPoolDimensions, type SolveMethod } from "./meltpool";
import { keyholeEnthalpyThreshold, normalizedEnthalpy } from "./normalized-enthalpy";
import { type PredictedRegime, predictRegime } from "./regime";
import { type SpotDefinition, toOneOverE2Diameter } from "./spot-definition";

/** Material properties the analysis needs, SI. */
export interface MeltPoolMaterial {
  absorptivity: number;
  densityKgPerM3: number;
  specificHeatJPerKgK: number;
  thermalConductivityWPerMK: number;
  /** Melt-pool boundary temperature (the liquidus of a curated set). */
  meltingTemperatureK: number;
  /** For the default keyhole threshold π·T_boil/T_melt; null leaves that criterion unevaluated. */
  boilingTemperatureK: number | null;
}

export interface MeltPoolAnalysisInput {
  laserPowerW: number;
  scanSpeedMmPerS: number;
  spotDiameterUm: number;
  /** How `spotDiameterUm` was measured; default the 1/e² diameter. */
  spotDefinition?: SpotDefinition;
  hatchSpacingUm?: number | null;
  layerThicknessUm?: number | null;
  ambientTemperatureK: number;
  material: MeltPoolMaterial;
}

export interface MeltPoolAnalysisOptions {
  method?: SolveMethod;
  criteria?: CriteriaOptions;
}

export interface MeltPoolAnalysis {
  spotDiameterOneOverE2Um: number;
  pool: MeltPoolDimensions;
  normalizedEnthalpy: number;
  /** π·T_boil/T_melt, or null without a boiling temperature. */
  keyholeEnthalpyThreshold: number | null;
  energy: EnergyDensities;
  criteria: CriterionResult[];
  regime: PredictedRegime;
  notes: string[];
}

/**
 * The material of a resolved property set; the liquidus is taken as the melt-pool boundary
 * (common practice). A missing property is a RangeError naming it; a missing boiling point leaves
 * the enthalpy keyhole criterion unevaluated.
 *
 * @example
 * materialFromProperties(resolveAlloyProperties({ alloyKey: "316L" }).properties).meltingTemperatureK; // 1723
 */
export function materialFromProperties(p: Partial<ResolvedProperties>): MeltPoolMaterial {
  const need = (name: keyof ResolvedProperties): number => {
    const v = p[name];
    if (!v) throw new RangeError(`materialFromProperties: ${name} is missing`);
    return v.value;
  };
  return {
    absorptivity: need("absorptivity"),
    densityKgPerM3: need("densityKgPerM3"),
    specificHeatJPerKgK: need("specificHeatJPerKgK"),
    thermalConductivityWPerMK: need("thermalConductivityWPerMK"),
    meltingTemperatureK: need("liquidusK"),
    boilingTemperatureK: p.boilingK?.value ?? null,
  };
}

/**
 * Analyses one parameter set. Throws a RangeError naming the input when a spot, speed, power or
 * property is missing, zero, negative or not a number; a case where nothing melts gives zero
 * dimensions, a "no melting" note and regime "no_melting".
 *
 * @example
 * analyzeMeltPool({ laserPowerW: 200, scanSpeedMmPerS: 800, spotDiameterUm: 80, hatchSpacingUm: 100,
 *   layerThicknessUm: 30, ambientTemperatureK: 298, material: materialFromProperties(props) }).regime.label;
 */
export function analyzeMeltPool(input: MeltPoolAnalysisInput, options: MeltPoolAnalysisOptions = {}): MeltPoolAnalysis {
  if (typeof input.spotDiameterUm !== "number" || !Number.isFinite(input.spotDiameterUm) || input.spotDiameterUm <= 0) {
    throw new RangeError(`analyzeMeltPool: spotDiameterUm must be a positive finite number, got ${String(input.spotDiameterUm)}`);
  }
  const spot = toOneOverE2Diameter(input.spotDiameterUm, input.spotDefinition ?? "one_over_e2");
  const m = input.material;
  const pool = eagarTsaiMeltPool(
    {
      laserPowerW: input.laserPowerW,
      absorptivity: m.absorptivity,
      scanSpeedMmPerS: input.scanSpeedMmPerS,
      spotDiameterUm: spot,
      densityKgPerM3: m.densityKgPerM3,
      specificHeatJPerKgK: m.specificHeatJPerKgK,
      thermalConductivityWPerMK: m.thermalConductivityWPerMK,
      meltingTemperatureK: m.meltingTemperatureK,
      ambientTemperatureK: input.ambientTemperatureK,
    },
    { method: options.method ?? "surface" },
  );
  const enthalpy = normalizedEnthalpy({
    laserPowerW: input.laserPowerW,
    absorptivity: m.absorptivity,
    scanSpeedMmPerS: input.scanSpeedMmPerS,
    spotDiameterUm: spot,
    densityKgPerM3: m.densityKgPerM3,
    specificHeatJPerKgK: m.specificHeatJPerKgK,
    thermalConductivityWPerMK: m.thermalConductivityWPerMK,
    meltingTemperatureK: m.meltingTemperatureK,
  });
  const boiling = m.boilingTemperatureK;
  if (boiling !== null && (!Number.isFinite(boiling) || boiling <= 0)) {
    throw new RangeError(`analyzeMeltPool: boilingTemperatureK must be a positive finite number or null, got ${boiling}`);
  }
  const criteria = evaluateCriteria(
    {
      widthUm: pool.widthUm,
      depthUm: pool.depthUm,
      lengthUm: pool.lengthUm,
      melted: pool.melted,
      hatchSpacingUm: input.hatchSpacingUm ?? null,
      layerThicknessUm: input.layerThicknessUm ?? null,
      normalizedEnthalpy: enthalpy,
      meltingTemperatureK: m.meltingTemperatureK,
      boilingTemperatureK: boiling,
    },
    options.criteria,
  );
  const notes = [...pool.notes];
  if (pool.melted && pool.peakTemperatureK > (boiling ?? Infinity)) {
    notes.push("the conduction-mode peak temperature exceeds the boiling point: vaporization and keyholing are likely and the model's depth is a lower bound");
  }
  return {
    spotDiameterOneOverE2Um: spot,
    pool,
    normalizedEnthalpy: enthalpy,
    keyholeEnthalpyThreshold: boiling === null ? null : keyholeEnthalpyThreshold(boiling, m.meltingTemperatureK),
    energy: energyDensities({
      laserPowerW: input.laserPowerW,
      scanSpeedMmPerS: input.scanSpeedMmPerS,
      hatchSpacingUm: input.hatchSpacingUm ?? null,
      layerThicknessUm: input.layerThicknessUm ?? null,
    }),
    criteria,
    regime: predictRegime(criteria, pool.melted),
    notes,
  };
}
