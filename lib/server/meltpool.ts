/**
 * Use case: the melt-pool calculator. Parses the options as typed (values with units, property
 * overrides in SI), resolves the alloy and its property set, runs the physics core and returns a
 * report or a typed error.
 */
import { resolveAlloy } from "../domain/alloys";
import { type PropertyName, type PropertyOverrides, resolveAlloyProperties } from "../domain/alloy-properties";
import { analyzeMeltPool, materialFromProperties } from "../domain/meltpool-analysis";
import type { SolveMethod } from "../domain/meltpool";
import type { SpotDefinition } from "../domain/spot-definition";
import { checkHardLimit, parseQuantity, type Quantity } from "../domain/units";
import { fail, ok, type Result } from "./result";

/** The options as text (or numbers), as a form, a route or the CLI receives them. */
export interface MeltpoolRequest {
  alloy?: string | null;
  power?: string | null;
  speed?: string | null;
  spot?: string | null;
  spotDefinition?: string | null;
  hatch?: string | null;
  layer?: string | null;
  absorptivity?: string | number | null;
  density?: string | number | null;
  cp?: string | number | null;
  k?: string | number | null;
  tMelt?: string | number | null;
  tBoil?: string | number | null;
  t0?: string | number | null;
  method?: string | null;
}

export interface MeltpoolCriterionReport {
  name: string;
  mechanism: string;
  rule: string;
  value: number | null;
  threshold: number | null;
  comparison: string;
  margin: number | null;
  fired: boolean;
  source: string;
  note?: string;
}

export interface MeltpoolPropertyReport {
  value: number;
  origin: string;
  estimated: boolean;
  source: string;
}

export interface MeltpoolReport {
  width_um: number;
  depth_um: number;
  length_um: number;
  peak_temperature_k: number;
  melted: boolean;
  normalized_enthalpy: number;
  keyhole_enthalpy_threshold: number | null;
  energy_density_j_mm3: number | null;
  linear_energy_density_j_mm: number | null;
  areal_energy_density_j_mm2: number | null;
  criteria: MeltpoolCriterionReport[];
  regime: { label: string; mechanisms: string[]; fired: string[]; summary: string };
  properties_source: {
    basis: "curated" | "mixture" | "overrides";
    alloy_key: string | null;
    properties: Record<string, MeltpoolPropertyReport>;
  };
  alloy: { key: string; display_name: string; standard: string | null } | null;
  inputs: {
    laser_power_w: number;
    scan_speed_mm_s: number;
    spot_diameter_um: number;
    spot_definition: SpotDefinition;
    spot_diameter_1_e2_um: number;
    hatch_spacing_um: number | null;
    layer_thickness_um: number | null;
    ambient_temperature_k: number;
    melting_temperature_k: number;
    boiling_temperature_k: number | null;
  };
  method: SolveMethod;
  notes: string[];
}

/** Room temperature when no preheat is given (common practice: 298.15 K). */
export const DEFAULT_AMBIENT_TEMPERATURE_K = 298.15;

const SPOT_DEFINITIONS: Record<string, SpotDefinition> = {
  "1/e2": "one_over_e2",
  "1/e^2": "one_over_e2",
  e2: "one_over_e2",
  one_over_e2: "one_over_e2",
  d4sigma: "d4sigma",
  d4s: "d4sigma",
  fwhm: "fwhm",
};

const PROPERTY_FIELDS: readonly [keyof MeltpoolRequest, PropertyName, string][] = [
  ["absorptivity", "absorptivity", "absorptivity"],
  ["density", "densityKgPerM3", "density_kg_m3"],
  ["cp", "specificHeatJPerKgK", "specific_heat_j_kg_k"],
  ["k", "thermalConductivityWPerMK", "thermal_conductivity_w_m_k"],
  ["tMelt", "liquidusK", "liquidus_k"],
  ["tBoil", "boilingK", "boiling_k"],
];

const REPORT_NAMES: Record<PropertyName, string> = {
  densityKgPerM3: "density_kg_m3",
  specificHeatJPerKgK: "specific_heat_j_kg_k",
  thermalConductivityWPerMK: "thermal_conductivity_w_m_k",
  solidusK: "solidus_k",
  liquidusK: "liquidus_k",
  boilingK: "boiling_k",
  latentHeatJPerKg: "latent_heat_j_kg",
  absorptivity: "absorptivity",
};

function text(value: string | number | null | undefined): string | null {
  if (value === null || value === undefined) return null;
  const s = String(value).trim();
  return s === "" ? null : s;
}

function readSi(value: string | number | null | undefined): number | null | string {
  const s = text(value);
  if (s === null) return null;
  const n = Number(s);
  return Number.isFinite(n) && n > 0 ? n : `must be a positive number in SI units, got '${s}'`;
}

/**
 * Computes the melt pool, criteria and regime for one parameter set.
 *
 * @example
 * computeMeltpool({ alloy: "316L", power: "200W", speed: "800mm/s", spot: "80um", hatch: "100um", layer: "30um" });
 * // { ok: true, data: { width_um: …, regime: { label: … }, … } }
 */
export function computeMeltpool(request: MeltpoolRequest): Result<MeltpoolReport> {
  const fieldErrors: Record<string, string[]> = {};
  const addError = (field: string, message: string): void => {
    (fieldErrors[field] ??= []).push(message);
  };

  const quantity = (field: keyof MeltpoolRequest, q: Quantity, required: boolean, label: string): number | null => {
    const raw = text(request[field] as string | number | null | undefined);
    if (raw === null) {
      if (required) addError(field, `${label} is required`);
      return null;
    }
    const parsed = parseQuantity(raw, q);
    if (!parsed.ok) {
      addError(field, parsed.message);
      return null;
    }
    const limit = checkHardLimit(parsed.value, q);
    if (limit) {
      addError(field, limit);
      return null;
    }
    return parsed.value;
  };

  const laserPowerW = quantity("power", "laserPower", true, "laser power (--power)");
  const scanSpeedMmPerS = quantity("speed", "scanSpeed", true, "scan speed (--speed)");
  const spotDiameterUm = quantity("spot", "spotDiameter", true, "spot diameter (--spot)");
  const hatchSpacingUm = quantity("hatch", "hatchSpacing", false, "hatch spacing");
  const layerThicknessUm = quantity("layer", "layerThickness", false, "layer thickness");

  const definitionText = text(request.spotDefinition)?.toLowerCase() ?? "1/e2";
  const spotDefinition = SPOT_DEFINITIONS[definitionText];
  if (!spotDefinition) addError("spotDefinition", `unknown spot definition '${definitionText}': use 1/e2, d4sigma or fwhm`);

  const methodText = text(request.method)?.toLowerCase() ?? "surface";
  if (methodText !== "surface" && methodText !== "direct") addError("method", `unknown method '${methodText}': use surface or direct`);
  const method = methodText as SolveMethod;

  const overrides: PropertyOverrides = {};
  for (const [field, name] of PROPERTY_FIELDS) {
    const v = readSi(request[field] as string | number | null | undefined);
    if (typeof v === "string") addError(field, v);
    else if (v !== null) {
      if (name === "absorptivity" && v > 1) addError(field, `must be at most 1, got ${v}`);
      else overrides[name] = v;
    }
  }
  const t0 = readSi(request.t0);
  if (typeof t0 === "string") addError("t0", t0);
  const ambientTemperatureK = typeof t0 === "number" ? t0 : DEFAULT_AMBIENT_TEMPERATURE_K;

  let alloy: MeltpoolReport["alloy"] = null;
  let alloyKey: string | null = null;
  let composition = null;
  const alloyText = text(request.alloy);
  if (alloyText !== null) {
    const resolved = resolveAlloy(alloyText);
    if (!resolved.ok) addError("alloy", resolved.message);
    else {
      alloy = { key: resolved.alloyKey, display_name: resolved.displayName, standard: resolved.standard };
      alloyKey = resolved.alloyKey;
      composition = { basis: "wt" as const, components: resolved.components };
    }
  }

  if (Object.keys(fieldErrors).length > 0) {
    return fail("invalid_input", "Some options need attention.", { fieldErrors });
  }

  const props = resolveAlloyProperties({ alloyKey, composition, overrides });
  if (!props.ok) {
    const message = alloyText === null
      ? `without --alloy every property is needed: give ${props.missing.map(flagOf).join(", ")}`
      : props.message;
    return fail("invalid_input", message, { missing: props.missing.map(flagOf) });
  }

  try {
    const material = materialFromProperties(props.properties);
    const analysis = analyzeMeltPool(
      {
        laserPowerW: laserPowerW as number,
        scanSpeedMmPerS: scanSpeedMmPerS as number,
        spotDiameterUm: spotDiameterUm as number,
        spotDefinition: spotDefinition as SpotDefinition,
        hatchSpacingUm,
        layerThicknessUm,
        ambientTemperatureK,
        material,
      },
      { method },
    );
    const { pool } = analysis;
    return ok({
      width_um: pool.widthUm,
      depth_um: pool.depthUm,
      length_um: pool.lengthUm,
      peak_temperature_k: pool.peakTemperatureK,
      melted: pool.melted,
      normalized_enthalpy: analysis.normalizedEnthalpy,
      keyhole_enthalpy_threshold: analysis.keyholeEnthalpyThreshold,
      energy_density_j_mm3: analysis.energy.volumetricJPerMm3,
      linear_energy_density_j_mm: analysis.energy.linearJPerMm,
      areal_energy_density_j_mm2: analysis.energy.arealJPerMm2,
      criteria: analysis.criteria.map((c) => ({
        name: c.name,
        mechanism: c.mechanism,
        rule: c.rule,
        value: c.value,
        threshold: c.threshold,
        comparison: c.comparison,
        margin: c.margin,
        fired: c.fired,
        source: c.source,
        ...(c.note ? { note: c.note } : {}),
      })),
      regime: {
        label: analysis.regime.label,
        mechanisms: analysis.regime.mechanisms,
        fired: analysis.regime.firedCriteria,
        summary: analysis.regime.summary,
      },
      properties_source: {
        basis: props.basis,
        alloy_key: alloyKey,
        properties: Object.fromEntries(
          Object.entries(props.properties).filter((entry): entry is [string, NonNullable<(typeof entry)[1]>] => entry[1] !== undefined).map(([name, p]) => [
            REPORT_NAMES[name as PropertyName],
            { value: p.value, origin: p.origin, estimated: p.estimated, source: p.source },
          ]),
        ),
      },
      alloy,
      inputs: {
        laser_power_w: laserPowerW as number,
        scan_speed_mm_s: scanSpeedMmPerS as number,
        spot_diameter_um: spotDiameterUm as number,
        spot_definition: spotDefinition as SpotDefinition,
        spot_diameter_1_e2_um: analysis.spotDiameterOneOverE2Um,
        hatch_spacing_um: hatchSpacingUm,
        layer_thickness_um: layerThicknessUm,
        ambient_temperature_k: ambientTemperatureK,
        melting_temperature_k: material.meltingTemperatureK,
        boiling_temperature_k: material.boilingTemperatureK,
      },
      method: pool.method,
      notes: [...props.notes, ...analysis.notes],
    });
  } catch (error) {
    if (error instanceof RangeError) return fail("invalid_input", error.message);
    throw error;
  }
}

const FLAGS: Record<PropertyName, string> = {
  absorptivity: "--absorptivity",
  densityKgPerM3: "--density",
  specificHeatJPerKgK: "--cp",
  thermalConductivityWPerMK: "--k",
  liquidusK: "--t-melt",
  boilingK: "--t-boil",
  solidusK: "solidus",
  latentHeatJPerKg: "latent heat",
};

function flagOf(name: PropertyName): string {
  return FLAGS[name];
}
