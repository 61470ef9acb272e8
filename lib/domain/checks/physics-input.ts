/**
 * Builds the melt-pool assessment the outcome-versus-physics rule judges, from a record: the
 * alloy's property set (curated, overridden, or estimated from the composition), the Eagar–Tsai
 * melt pool and the defect criteria of meltpool-analysis.ts, with the thresholds of the current
 * settings version.
 */
import { type PropertyOverrides, resolveAlloyProperties } from "../alloy-properties";
import { settingOf, type CheckSettings } from "../check-settings";
import type { Composition } from "../composition";
import { evaluateCriteria } from "../criteria";
import { eagarTsaiMeltPool } from "../meltpool";
import { materialFromProperties, type MeltPoolMaterial } from "../meltpool-analysis";
import { normalizedEnthalpy } from "../normalized-enthalpy";
import { isJudgedOutcome } from "../neighbours";
import type { CheckRecord } from "./types";
import type { PhysicsAssessment } from "./physics";

/** Room temperature when no preheat is given: 298.15 K (common practice). */
const ROOM_TEMPERATURE_K = 298.15;
/** 0 °C = 273.15 K exactly (SI Brochure, 9th edition, section 2.3.1). */
const KELVIN_AT_ZERO_CELSIUS = 273.15;

const NO_NOTES: readonly string[] = Object.freeze([]);

const JUDGED = new Set(["dense", "keyhole", "lack_of_fusion", "balling"]);

interface MaterialEntry {
  material: MeltPoolMaterial | null;
  basis: string;
  notes: string[];
}

/**
 * A function giving the assessment of a record, or null when the physics cannot run (no spot
 * size, an alloy without properties or composition) or the outcome is not one the rule judges.
 * Property sets are resolved once per alloy and composition.
 *
 * @example
 * const physics = physicsProvider(defaultCheckSettings(), new Map());
 * physics(record)?.criteria.map((c) => c.name); // ["D/t <= threshold", ...]
 */
export function physicsProvider(settings: CheckSettings, overrides: ReadonlyMap<string, PropertyOverrides>): (record: CheckRecord) => PhysicsAssessment | null {
  const materials = new Map<CheckRecord["components"], MaterialEntry>();
  const thresholds = {
    lackOfFusionOverlap: settingOf(settings, "physics.lackOfFusion.overlap"),
    ballingLengthToWidth: settingOf(settings, "physics.balling.lengthToWidth"),
    keyholeWidthToDepth: settingOf(settings, "physics.keyhole.widthToDepth"),
  };
  const criteriaOptions = { thresholds };
  const materialOf = (r: CheckRecord): MaterialEntry => {
    let entry = materials.get(r.components);
    if (entry) return entry;
    const composition: Composition | null = r.components.length ? { basis: r.compositionBasis === "at" ? "at" : "wt", components: r.components.map((c) => ({ ...c })) } : null;
    const resolved = resolveAlloyProperties({ alloyKey: r.alloyKey, composition, overrides: overrides.get(r.alloyKey) ?? {} });
    if (!resolved.ok) entry = { material: null, basis: "none", notes: [resolved.message] };
    else {
      try {
        entry = { material: materialFromProperties(resolved.properties), basis: resolved.basis, notes: resolved.notes };
      } catch (error) {
        if (!(error instanceof RangeError)) throw error;
        entry = { material: null, basis: "none", notes: [error.message] };
      }
    }
    materials.set(r.components, entry);
    return entry;
  };
  return (r) => {
    if (!JUDGED.has(r.outcome) || !isJudgedOutcome(r.outcome)) return null;
    const p = r.laserPowerW;
    const v = r.scanSpeedMmPerS;
    const d = r.spotDiameterUm;
    if (!(p! > 0) || !(v! > 0) || !(d! > 0)) return null;
    const { material, basis, notes } = materialOf(r);
    if (!material) return null;
    const ambientTemperatureK = r.preheatC !== null ? r.preheatC + KELVIN_AT_ZERO_CELSIUS : ROOM_TEMPERATURE_K;
    if (!(ambientTemperatureK >= 0) || ambientTemperatureK >= material.meltingTemperatureK) return null;
    try {
      // The steps of analyzeMeltPool that the criteria need (no regime or energy summary).
      const m = material;
      const pool = eagarTsaiMeltPool({
        laserPowerW: p!, absorptivity: m.absorptivity, scanSpeedMmPerS: v!, spotDiameterUm: d!, densityKgPerM3: m.densityKgPerM3,
        specificHeatJPerKgK: m.specificHeatJPerKgK, thermalConductivityWPerMK: m.thermalConductivityWPerMK, meltingTemperatureK: m.meltingTemperatureK, ambientTemperatureK,
      });
      const enthalpy = normalizedEnthalpy({
        laserPowerW: p!, absorptivity: m.absorptivity, scanSpeedMmPerS: v!, spotDiameterUm: d!, densityKgPerM3: m.densityKgPerM3,
        specificHeatJPerKgK: m.specificHeatJPerKgK, thermalConductivityWPerMK: m.thermalConductivityWPerMK, meltingTemperatureK: m.meltingTemperatureK,
      });
      const criteria = evaluateCriteria(
        { widthUm: pool.widthUm, depthUm: pool.depthUm, lengthUm: pool.lengthUm, melted: pool.melted, hatchSpacingUm: r.hatchSpacingUm, layerThicknessUm: r.layerThicknessUm, normalizedEnthalpy: enthalpy, meltingTemperatureK: m.meltingTemperatureK, boilingTemperatureK: m.boilingTemperatureK },
        criteriaOptions,
      );
      return {
        model: `Eagar–Tsai (${pool.method === "surface" ? "precomputed surface" : "direct integration"}), properties ${basis}`,
        meltPool: { widthUm: pool.widthUm, depthUm: pool.depthUm, lengthUm: pool.lengthUm, melted: pool.melted },
        criteria: criteria.map((c) => ({ mode: c.mechanism, name: c.rule, value: c.value, threshold: c.threshold, comparison: c.comparison, fired: c.fired, margin: c.margin })),
        inputs: () => ({
          absorptivity: m.absorptivity,
          densityKgPerM3: m.densityKgPerM3,
          specificHeatJPerKgK: m.specificHeatJPerKgK,
          thermalConductivityWPerMK: m.thermalConductivityWPerMK,
          meltingTemperatureK: m.meltingTemperatureK,
          ambientTemperatureK,
          normalizedEnthalpy: Number(enthalpy.toPrecision(5)),
        }),
        notes: notes.length || pool.notes.length ? [...notes, ...pool.notes] : NO_NOTES,
      };
    } catch (error) {
      if (error instanceof RangeError) return null;
      throw error;
    }
  };
}
