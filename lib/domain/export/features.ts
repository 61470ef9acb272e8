/**
 * The feature catalogue of a training set: every column's name (canonical snake_case with its
 * unit), group, unit and definition, and the computation of a row's features from its process
 * point and its material. Physics features come from the melt-pool core's fast surface method
 * (meltpool-batch.ts, the same numbers as meltpool-analysis.ts), memoized per distinct parameter set.
 */
import { resolveAlloyProperties } from "../alloy-properties";
import type { Composition } from "../composition";
import { compositionFractions } from "../composition";
import { energyDensities } from "../energy-density";
import { MELTPOOL_SLOT_COUNT, MELTPOOL_SLOTS, meltPoolInto } from "../meltpool-batch";
import { materialFromProperties, type MeltPoolMaterial } from "../meltpool-analysis";
import { mixtureProperties, type MixtureProperties } from "../properties";
import type { ProcessPoint } from "./process-point";
import { TupleMemo } from "./tuple-memo";
import type { FeatureGroup } from "./types";

export interface FeatureDef {
  name: string;
  group: FeatureGroup;
  /** "1" for a dimensionless quantity. */
  unit: string;
  definition: string;
}

/** Room temperature when no preheat is given (common practice: 298.15 K). */
export const AMBIENT_WITHOUT_PREHEAT_K = 298.15;
const KELVIN_AT_ZERO_CELSIUS = 273.15; // exact, SI

const f = (name: string, group: FeatureGroup, unit: string, definition: string): FeatureDef => ({ name, group, unit, definition });

const ET = "Eagar–Tsai quasi-steady moving Gaussian source (Welding Journal 62(12):346s–355s, 1983, Eq. 10), σ = d/4, surface method of the melt-pool core, with the alloy's property set";
const CRIT = "signed relative margin of the criterion (positive: fires, negative: missed by that fraction of its threshold), defaults as listed by Sheikh et al., npj Comput. Mater. 10:252, 2024";

/** The catalogue of fixed features, in output order within each group. */
export const FEATURE_CATALOGUE: readonly FeatureDef[] = [
  f("laser_power_w", "process", "W", "laser power P"),
  f("scan_speed_mm_s", "process", "mm/s", "scan speed v"),
  f("hatch_spacing_um", "process", "µm", "hatch spacing h"),
  f("layer_thickness_um", "process", "µm", "layer thickness t"),
  f("spot_diameter_um", "process", "µm", "laser spot diameter d, 1/e² definition (other definitions converted on entry)"),
  f("preheat_c", "process", "°C", "build-plate preheat temperature"),
  f("powder_d50_um", "process", "µm", "median powder particle size D50"),
  f("linear_energy_density_j_mm", "energy", "J/mm", "E_l = P/v"),
  f("areal_energy_density_j_mm2", "energy", "J/mm²", "E_a = P/(v·h)"),
  f("volumetric_energy_density_j_mm3", "energy", "J/mm³", "E_v = P/(v·h·t)"),
  f("meltpool_width_um", "meltpool", "µm", `melt-pool width W: ${ET}`),
  f("meltpool_depth_um", "meltpool", "µm", `melt-pool depth D: ${ET}`),
  f("meltpool_length_um", "meltpool", "µm", `melt-pool length L: ${ET}`),
  f("meltpool_peak_temperature_k", "meltpool", "K", `peak surface temperature: ${ET}`),
  f("normalized_enthalpy", "meltpool", "1", "ΔH/h_s = A·P/(π·h_s·√(α·v·a³)), h_s = ρ·c·T_melt, a = beam radius (King et al., J. Mater. Process. Technol. 214(12):2915–2925, 2014)"),
  f("meltpool_width_to_depth", "meltpool", "1", "W/D (empty when nothing melts)"),
  f("meltpool_length_to_width", "meltpool", "1", "L/W (empty when nothing melts)"),
  f("hatch_to_width", "meltpool", "1", "h/W (empty when nothing melts)"),
  f("depth_to_layer", "meltpool", "1", "D/t: melt-pool depth over layer thickness"),
  f("margin_lack_of_fusion_depth", "meltpool", "1", `D/t ≤ 1: ${CRIT}`),
  f("margin_lack_of_fusion_overlap", "meltpool", "1", `(h/W)² + t/(t + D) ≥ 1: ${CRIT}`),
  f("margin_balling", "meltpool", "1", `L/W ≥ 2.3: ${CRIT}`),
  f("margin_keyhole_aspect", "meltpool", "1", `W/D ≤ 2.5: ${CRIT}`),
  f("margin_keyhole_enthalpy", "meltpool", "1", `ΔH/h_s > π·T_boil/T_melt: ${CRIT}`),
  f("absorptivity", "meltpool", "1", "absorptivity A used by the physics (curated set of the alloy, else 0.35 by common practice)"),
  f("properties_estimated", "meltpool", "1", "1 when a property the physics used was estimated (rule of mixtures or default), else 0"),
  f("mix_molar_mass_g_mol", "mixture", "g/mol", "M = Σ x_i·M_i (x: atomic fraction; CIAAW atomic weights)"),
  f("mix_density_kg_m3", "mixture", "kg/m³", "ρ from the ideal specific volume 1/ρ = Σ w_i/ρ_i (w: mass fraction)"),
  f("mix_specific_heat_j_kg_k", "mixture", "J/(kg·K)", "c_p = Σ w_i·c_p,i (Neumann–Kopp)"),
  f("mix_melting_point_k", "mixture", "K", "Σ x_i·T_m,i (crude)"),
  f("mix_boiling_point_k", "mixture", "K", "Σ x_i·T_b,i (crude)"),
  f("mix_latent_heat_j_kg", "mixture", "J/kg", "Σ w_i·ΔH_f,i/M_i"),
  f("mix_thermal_conductivity_w_m_k", "mixture", "W/(m·K)", "Σ x_i·k_i of the pure elements (far above real alloys: an estimate only)"),
  f("mix_electronegativity_mean", "mixture", "1", "χ̄ = Σ x_i·χ_i (Pauling)"),
  f("mix_electronegativity_spread", "mixture", "1", "Δχ = √(Σ x_i·(χ_i − χ̄)²)"),
  f("mix_valence_electron_concentration", "mixture", "1", "VEC = Σ x_i·VEC_i"),
  f("mix_atomic_size_mismatch_pct", "mixture", "%", "δ = 100·√(Σ x_i·(1 − r_i/r̄)²)"),
  f("record_quality", "provenance", "1", "record quality in [0, 1]: its source's score times the completeness of its own fields (empty when not yet scored)"),
  f("source_year", "provenance", "year", "publication year of the record's source"),
];

/** Composition columns: one per element, wt%, zero when the element is absent. @example compositionFeature("Cr").name; // "cr_wt_pct" */
export function compositionFeature(element: string): FeatureDef {
  return f(`${element.toLowerCase()}_wt_pct`, "composition", "wt%", `${element} content of the record's material in wt% (nominal grade composition or as measured), 0 when absent`);
}

/** What the features of one material need, computed once per material. */
export interface MaterialContext {
  /** Identity of the material for memoization: alloy key and composition. */
  key: string;
  alloyKey: string;
  material: MeltPoolMaterial | null;
  propertiesEstimated: boolean;
  mixture: MixtureProperties | null;
  wtPct: ReadonlyMap<string, number>;
}

/**
 * The material context of an alloy key and composition: the physics property set (curated or
 * mixture), the mixture properties and the wt% of each element.
 *
 * @example materialContext("316L", composition).material?.absorptivity; // 0.35
 */
export function materialContext(alloyKey: string, composition: Composition | null): MaterialContext {
  const key = `${alloyKey}|${composition ? composition.components.map((c) => `${c.element}${c.amount}`).join(",") : ""}`;
  let material: MeltPoolMaterial | null = null;
  let propertiesEstimated = false;
  const props = resolveAlloyProperties({ alloyKey, composition });
  if (props.ok) {
    try {
      material = materialFromProperties(props.properties);
      propertiesEstimated = ["absorptivity", "densityKgPerM3", "specificHeatJPerKgK", "thermalConductivityWPerMK", "liquidusK"].some(
        (n) => props.properties[n as keyof typeof props.properties]?.estimated === true,
      );
    } catch {
      material = null;
    }
  }
  let mixture: MixtureProperties | null = null;
  const wtPct = new Map<string, number>();
  if (composition && composition.components.length) {
    try {
      mixture = mixtureProperties(composition);
      for (const c of compositionFractions(composition)) wtPct.set(c.element, c.massFraction * 100);
    } catch {
      mixture = null;
    }
  }
  return { key, alloyKey, material, propertiesEstimated, mixture, wtPct };
}

/** 10^n for n = −POW10_OFFSET … POW10_OFFSET, each computed as `10 ** n` (so the same doubles as computing it in place). */
const POW10_OFFSET = 400;
const POW10 = Float64Array.from({ length: 2 * POW10_OFFSET + 1 }, (_, i) => 10 ** (i - POW10_OFFSET));

/** Rounds to 10 significant digits so files stay readable and small. @example roundSig(1/3); // 0.3333333333 */
export function roundSig(x: number | null): number | null {
  if (x === null || !Number.isFinite(x)) return null;
  return roundSigFinite(x);
}

/** roundSig with NaN for "no value", for typed-array columns. @example roundSigOrNaN(Infinity); // NaN */
export function roundSigOrNaN(x: number): number {
  return Number.isFinite(x) ? roundSigFinite(x) : NaN;
}

function roundSigFinite(x: number): number {
  if (x === 0) return 0;
  const e = Math.floor(Math.log10(Math.abs(x)));
  const scale = POW10[9 - e + POW10_OFFSET]!;
  const r = Math.round(x * scale) / scale;
  return Number.isFinite(r) ? r : x;
}

const MELTPOOL_NAMES = FEATURE_CATALOGUE.filter((d) => d.group === "meltpool").map((d) => d.name);
const at = (name: string): number => {
  const i = MELTPOOL_NAMES.indexOf(name);
  if (i < 0) throw new RangeError(`features: no melt-pool feature ${name}`);
  return i;
};
/** Positions of the melt-pool features in their group, resolved once. */
const MP = {
  width: at("meltpool_width_um"),
  depth: at("meltpool_depth_um"),
  length: at("meltpool_length_um"),
  peak: at("meltpool_peak_temperature_k"),
  enthalpy: at("normalized_enthalpy"),
  widthToDepth: at("meltpool_width_to_depth"),
  lengthToWidth: at("meltpool_length_to_width"),
  hatchToWidth: at("hatch_to_width"),
  depthToLayer: at("depth_to_layer"),
  absorptivity: at("absorptivity"),
  estimated: at("properties_estimated"),
  marginLackOfFusionDepth: at("margin_lack_of_fusion_depth"),
  marginLackOfFusionOverlap: at("margin_lack_of_fusion_overlap"),
  marginBalling: at("margin_balling"),
  marginKeyholeAspect: at("margin_keyhole_aspect"),
  marginKeyholeEnthalpy: at("margin_keyhole_enthalpy"),
};
/** Context id, P, v, d, h, t and the ambient temperature: what a melt-pool solve depends on. */
const MEMO_KEY_WIDTH = 7;

/** Provenance of a row. */
export interface RowProvenance {
  recordQuality: number | null;
  sourceYear: number | null;
}

export interface FeatureComputer {
  columns: readonly FeatureDef[];
  /** Writes the row's features into `out` in column order; NaN = missing. */
  compute(point: ProcessPoint, ctx: MaterialContext, provenance: RowProvenance, out: Float64Array): void;
  /** Distinct parameter sets solved so far (memo size). */
  readonly solves: number;
}

const ratio = (a: number, b: number): number => (b > 0 && Number.isFinite(a / b) ? a / b : NaN);
const num = (x: number | null | undefined): number => (x === null || x === undefined ? NaN : x);
const MIXTURE_WIDTH = FEATURE_CATALOGUE.filter((d) => d.group === "mixture").length;

/**
 * A feature computer for the chosen groups; composition columns for the given elements;
 * `expectedRows` sizes its memo (a hint only).
 *
 * @example
 * const fc = createFeatureComputer(["process", "energy"], []);
 * const out = new Float64Array(fc.columns.length);
 * fc.compute(point, materialContext("316L", comp), { recordQuality: 0.8, sourceYear: 2021 }, out); // out = [200, 800, …, 83.33]
 */
export function createFeatureComputer(groups: readonly FeatureGroup[], compositionElements: readonly string[], expectedRows = 1024): FeatureComputer {
  const chosen = new Set(groups);
  const columns: FeatureDef[] = [];
  const sortedElements = [...compositionElements].sort();
  for (const g of ["process", "energy", "meltpool", "mixture", "composition", "provenance"] as const) {
    if (!chosen.has(g)) continue;
    if (g === "composition") columns.push(...sortedElements.map(compositionFeature));
    else columns.push(...FEATURE_CATALOGUE.filter((d) => d.group === g));
  }
  const width = MELTPOOL_NAMES.length;
  // Sized for the rows to come (at most one solve per row), so neither the pool nor the memo grows on the way.
  const capacity = Math.max(16, Math.min(expectedRows, 1 << 22));
  let pool = new Float64Array(width * capacity);
  let used = 0;
  const memo = new TupleMemo(MEMO_KEY_WIDTH, capacity);
  const ctxIds = new Map<string, number>();
  const mixtureRows = new Map<string, Float64Array>();

  const key: (number | null)[] = new Array<number | null>(MEMO_KEY_WIDTH).fill(null);
  const solved = new Float64Array(MELTPOOL_SLOT_COUNT);

  const meltpool = (p: ProcessPoint, ctx: MaterialContext, out: Float64Array, at: number): void => {
    const m = ctx.material;
    if (!m || p.laserPowerW === null || p.scanSpeedMmPerS === null || p.spotDiameterUm === null) {
      out.fill(NaN, at, at + width);
      return;
    }
    const ambient = p.preheatC === null ? AMBIENT_WITHOUT_PREHEAT_K : p.preheatC + KELVIN_AT_ZERO_CELSIUS;
    let id = ctxIds.get(ctx.key);
    if (id === undefined) ctxIds.set(ctx.key, (id = ctxIds.size));
    key[0] = id;
    key[1] = p.laserPowerW;
    key[2] = p.scanSpeedMmPerS;
    key[3] = p.spotDiameterUm;
    key[4] = p.hatchSpacingUm;
    key[5] = p.layerThicknessUm;
    key[6] = ambient;
    const hit = memo.get(key);
    if (hit >= 0) {
      out.set(pool.subarray(hit, hit + width), at);
      return;
    }
    if (used + width > pool.length) {
      const bigger = new Float64Array(pool.length * 2);
      bigger.set(pool);
      pool = bigger;
    }
    const at0 = used;
    pool.fill(NaN, at0, at0 + width);
    try {
      meltPoolInto(p.laserPowerW, p.scanSpeedMmPerS, p.spotDiameterUm, p.hatchSpacingUm, p.layerThicknessUm, ambient, m, solved, 0);
      const w = solved[MELTPOOL_SLOTS.widthUm]!;
      const d = solved[MELTPOOL_SLOTS.depthUm]!;
      const l = solved[MELTPOOL_SLOTS.lengthUm]!;
      const melted = solved[MELTPOOL_SLOTS.melted] === 1;
      const put = (j: number, v: number) => (pool[at0 + j] = roundSigOrNaN(v));
      put(MP.width, w);
      put(MP.depth, d);
      put(MP.length, l);
      put(MP.peak, solved[MELTPOOL_SLOTS.peakTemperatureK]!);
      put(MP.enthalpy, solved[MELTPOOL_SLOTS.normalizedEnthalpy]!);
      put(MP.widthToDepth, melted ? ratio(w, d) : NaN);
      put(MP.lengthToWidth, melted ? ratio(l, w) : NaN);
      put(MP.hatchToWidth, melted && p.hatchSpacingUm !== null ? ratio(p.hatchSpacingUm, w) : NaN);
      put(MP.depthToLayer, p.layerThicknessUm !== null ? ratio(d, p.layerThicknessUm) : NaN);
      put(MP.absorptivity, m.absorptivity);
      put(MP.estimated, ctx.propertiesEstimated ? 1 : 0);
      put(MP.marginLackOfFusionDepth, solved[MELTPOOL_SLOTS.marginLackOfFusionDepth]!);
      put(MP.marginLackOfFusionOverlap, solved[MELTPOOL_SLOTS.marginLackOfFusionOverlap]!);
      put(MP.marginBalling, solved[MELTPOOL_SLOTS.marginBalling]!);
      put(MP.marginKeyholeAspect, solved[MELTPOOL_SLOTS.marginKeyholeAspect]!);
      put(MP.marginKeyholeEnthalpy, solved[MELTPOOL_SLOTS.marginKeyholeEnthalpy]!);
    } catch (error) {
      if (!(error instanceof RangeError)) throw error;
    }
    memo.add(key, at0);
    used += width;
    out.set(pool.subarray(at0, at0 + width), at);
  };
  const mixtureOf = (ctx: MaterialContext): Float64Array => {
    let row = mixtureRows.get(ctx.key);
    if (row) return row;
    const m = ctx.mixture;
    row = new Float64Array(MIXTURE_WIDTH + sortedElements.length).fill(NaN);
    if (m) {
      [m.molarMassGPerMol, m.densityKgPerM3, m.specificHeatJPerKgK, m.meltingTemperatureK, m.boilingTemperatureK, m.latentHeatJPerKg, m.thermalConductivityWPerMK,
        m.electronegativityMean, m.electronegativitySpread, m.valenceElectronConcentration, m.atomicSizeMismatchPct].forEach((v, j) => (row![j] = num(roundSig(v))));
    }
    if (ctx.wtPct.size) sortedElements.forEach((el, j) => (row![MIXTURE_WIDTH + j] = num(roundSig(ctx.wtPct.get(el) ?? 0))));
    mixtureRows.set(ctx.key, row);
    return row;
  };

  const compute = (p: ProcessPoint, ctx: MaterialContext, prov: RowProvenance, out: Float64Array): void => {
    let at = 0;
    if (chosen.has("process")) {
      out[at++] = num(p.laserPowerW);
      out[at++] = num(p.scanSpeedMmPerS);
      out[at++] = num(p.hatchSpacingUm);
      out[at++] = num(p.layerThicknessUm);
      out[at++] = num(p.spotDiameterUm);
      out[at++] = num(p.preheatC);
      out[at++] = num(p.powderD50Um);
    }
    if (chosen.has("energy")) {
      const e = energyDensities(p);
      out[at++] = roundSigOrNaN(num(e.linearJPerMm));
      out[at++] = roundSigOrNaN(num(e.arealJPerMm2));
      out[at++] = roundSigOrNaN(num(e.volumetricJPerMm3));
    }
    if (chosen.has("meltpool")) {
      meltpool(p, ctx, out, at);
      at += width;
    }
    if (chosen.has("mixture") || chosen.has("composition")) {
      const row = mixtureOf(ctx);
      if (chosen.has("mixture")) {
        out.set(row.subarray(0, MIXTURE_WIDTH), at);
        at += MIXTURE_WIDTH;
      }
      if (chosen.has("composition")) {
        out.set(row.subarray(MIXTURE_WIDTH), at);
        at += sortedElements.length;
      }
    }
    if (chosen.has("provenance")) {
      out[at++] = num(prov.recordQuality);
      out[at++] = num(prov.sourceYear);
    }
  };

  return {
    columns,
    compute,
    get solves() {
      return memo.size;
    },
  };
}
