/**
 * The melt-pool numbers of many parameter sets, written into a flat Float64Array: the same values
 * as `analyzeMeltPool(…, { method: "surface" })` with the default criteria, bit for bit, without the
 * objects, notes and texts a single analysis carries. Each solve reads the shipped surface once;
 * inputs the surface does not cover, or that are invalid, go through `analyzeMeltPool` itself, so
 * the fallback to direct integration and every RangeError stay exactly as there.
 *
 * The formulas below are those of meltpool.ts (Eagar–Tsai groups, Welding Journal 62(12):346s–355s,
 * 1983), normalized-enthalpy.ts (King et al., J. Mater. Process. Technol. 214(12):2915–2925, 2014)
 * and criteria.ts (Sheikh et al., npj Comput. Mater. 10:252, 2024), written in the same order of
 * operations so the doubles come out identical; meltpool-batch.test.ts holds them to it.
 */
import { DEFAULT_CRITERIA_THRESHOLDS } from "./criteria";
import { createSurface, type EagarTsaiSurface, type SurfaceLookup } from "./eagar-tsai-surface";
import { shippedSurface } from "./meltpool";
import { analyzeMeltPool, type MeltPoolMaterial } from "./meltpool-analysis";

/** Slots of one solve in the output array. Margins are NaN when the criterion has no value. */
export const MELTPOOL_SLOTS = {
  widthUm: 0,
  depthUm: 1,
  lengthUm: 2,
  peakTemperatureK: 3,
  normalizedEnthalpy: 4,
  /** 1 when the pool melts, 0 when it does not. */
  melted: 5,
  marginLackOfFusionDepth: 6,
  marginLackOfFusionOverlap: 7,
  marginBalling: 8,
  marginKeyholeAspect: 9,
  marginKeyholeEnthalpy: 10,
} as const;
export const MELTPOOL_SLOT_COUNT = 11;

const finitePositive = (x: number): boolean => Number.isFinite(x) && x > 0;
const usable = (x: number | null): number | null => (x !== null && Number.isFinite(x) && x > 0 ? x : null);
/** Margin as criteria.ts forms it: (threshold − value)/threshold for "<=", (value − threshold)/threshold otherwise. */
const marginAtMost = (value: number | null, threshold: number): number => (value === null ? NaN : (threshold - value) / threshold);
const marginAtLeast = (value: number | null, threshold: number | null): number => (value === null || threshold === null ? NaN : (value - threshold) / threshold);

const PI_POW_1_5 = Math.PI ** 1.5;

interface TableReader {
  surface: EagarTsaiSurface;
  /** The table's ln u range (its peak axis), as its reader checks it. */
  lnU: { min: number; step: number; count: number };
}
let tableReaders: TableReader[] | null = null;

/**
 * The shipped surface's answer (the first of its tables, finest first, that covers the inputs), or
 * null where it has none ("outside"). A table whose ln u range leaves u out is skipped before it is
 * asked: it would answer "outside", with a reason text built for nobody.
 */
function readSurface(u: number, theta: number): Exclude<SurfaceLookup, { kind: "outside" }> | null {
  tableReaders ??= shippedSurface().tables.map((t) => ({ surface: createSurface([t]), lnU: t.peakLnU }));
  const lnU = Math.log(u);
  for (const r of tableReaders) {
    const f = (lnU - r.lnU.min) / r.lnU.step;
    if (!(f >= 0 && f <= r.lnU.count - 1)) continue;
    const found = r.surface.lookup(u, theta);
    if (found.kind !== "outside") return found;
  }
  return null;
}

/**
 * Solves one parameter set (1/e² spot diameter) into `out[at … at + MELTPOOL_SLOT_COUNT)`.
 * Throws the RangeError `analyzeMeltPool` throws for invalid inputs.
 *
 * @example
 * const out = new Float64Array(MELTPOOL_SLOT_COUNT);
 * meltPoolInto(200, 800, 80, 100, 30, 298.15, material, out, 0);
 * out[MELTPOOL_SLOTS.widthUm]; // the same as analyzeMeltPool(…).pool.widthUm
 */
export function meltPoolInto(
  laserPowerW: number,
  scanSpeedMmPerS: number,
  spotDiameterUm: number,
  hatchSpacingUm: number | null,
  layerThicknessUm: number | null,
  ambientTemperatureK: number,
  m: MeltPoolMaterial,
  out: Float64Array,
  at: number,
): void {
  const { absorptivity: A, densityKgPerM3: rho, specificHeatJPerKgK: c, thermalConductivityWPerMK: k, meltingTemperatureK: tMelt, boilingTemperatureK: tBoil } = m;
  const valid =
    finitePositive(laserPowerW) && finitePositive(scanSpeedMmPerS) && finitePositive(spotDiameterUm) && finitePositive(rho) && finitePositive(c) &&
    finitePositive(k) && finitePositive(tMelt) && finitePositive(A) && A <= 1 && Number.isFinite(ambientTemperatureK) && ambientTemperatureK >= 0 &&
    ambientTemperatureK < tMelt && (tBoil === null || finitePositive(tBoil));
  // Groups as in eagarTsaiGroups (meltpool.ts).
  const sigmaM = (spotDiameterUm * 1e-6) / 4;
  const alpha = k / (rho * c);
  const speedMPerS = scanSpeedMmPerS * 1e-3;
  const temperatureScaleK = (A * laserPowerW) / (2 * PI_POW_1_5 * k * sigmaM);
  const u = (speedMPerS * sigmaM) / (2 * alpha);
  const theta = (tMelt - ambientTemperatureK) / temperatureScaleK;
  const found = valid ? readSurface(u, theta) : null;
  if (found === null) {
    slow(laserPowerW, scanSpeedMmPerS, spotDiameterUm, hatchSpacingUm, layerThicknessUm, ambientTemperatureK, m, out, at);
    return;
  }
  const sigmaUm = sigmaM * 1e6;
  let melted: boolean;
  let widthUm = 0;
  let depthUm = 0;
  let lengthUm = 0;
  let peakG: number;
  if (found.kind === "pool") {
    melted = true;
    widthUm = 2 * found.pool.halfWidth * sigmaUm;
    depthUm = found.pool.depth * sigmaUm;
    lengthUm = found.pool.length * sigmaUm;
    peakG = found.pool.peakG;
  } else {
    melted = false;
    peakG = found.peakG;
    // Zero dimensions times σ, as eagarTsaiMeltPool writes them.
    widthUm = 2 * 0 * sigmaUm;
    depthUm = 0 * sigmaUm;
    lengthUm = 0 * sigmaUm;
  }
  // Normalized enthalpy as in normalized-enthalpy.ts.
  const hs = rho * c * tMelt;
  const a = (spotDiameterUm * 1e-6) / 2;
  const v = scanSpeedMmPerS * 1e-3;
  const enthalpy = (A * laserPowerW) / (Math.PI * hs * Math.sqrt(alpha * v * a ** 3));
  out[at + MELTPOOL_SLOTS.widthUm] = widthUm;
  out[at + MELTPOOL_SLOTS.depthUm] = depthUm;
  out[at + MELTPOOL_SLOTS.lengthUm] = lengthUm;
  out[at + MELTPOOL_SLOTS.peakTemperatureK] = ambientTemperatureK + temperatureScaleK * peakG;
  out[at + MELTPOOL_SLOTS.normalizedEnthalpy] = enthalpy;
  out[at + MELTPOOL_SLOTS.melted] = melted ? 1 : 0;
  writeMargins(widthUm, depthUm, lengthUm, melted, hatchSpacingUm, layerThicknessUm, enthalpy, tMelt, tBoil, out, at);
}

/** The five default criteria's margins, as evaluateCriteria (criteria.ts) forms them with default options. */
function writeMargins(
  widthUm: number,
  depthUm: number,
  lengthUm: number,
  melted: boolean,
  hatchSpacingUm: number | null,
  layerThicknessUm: number | null,
  enthalpy: number,
  tMelt: number,
  tBoil: number | null,
  out: Float64Array,
  at: number,
): void {
  const t = DEFAULT_CRITERIA_THRESHOLDS;
  const W = melted ? usable(widthUm) : null;
  const D = melted ? usable(depthUm) : null;
  const L = melted ? usable(lengthUm) : null;
  const h = usable(hatchSpacingUm);
  const layer = usable(layerThicknessUm);
  out[at + MELTPOOL_SLOTS.marginLackOfFusionDepth] = marginAtMost(layer === null ? null : melted ? (D ?? 0) / layer : 0, t.lackOfFusionDepthRatio);
  out[at + MELTPOOL_SLOTS.marginLackOfFusionOverlap] = marginAtLeast(W === null || D === null || h === null || layer === null ? null : (h / W) ** 2 + layer / (layer + D), t.lackOfFusionOverlap);
  out[at + MELTPOOL_SLOTS.marginBalling] = marginAtLeast(L !== null && W !== null ? L / W : null, t.ballingLengthToWidth);
  out[at + MELTPOOL_SLOTS.marginKeyholeAspect] = marginAtMost(W !== null && D !== null ? W / D : null, t.keyholeWidthToDepth);
  const tb = usable(tBoil);
  const threshold = t.keyholeNormalizedEnthalpy ?? (tb !== null ? (Math.PI * tb) / tMelt : null);
  out[at + MELTPOOL_SLOTS.marginKeyholeEnthalpy] = marginAtLeast(Number.isFinite(enthalpy) ? enthalpy : null, threshold);
}

/** The full analysis, for inputs the surface does not cover (direct integration) or that are invalid (it throws). */
function slow(
  laserPowerW: number,
  scanSpeedMmPerS: number,
  spotDiameterUm: number,
  hatchSpacingUm: number | null,
  layerThicknessUm: number | null,
  ambientTemperatureK: number,
  material: MeltPoolMaterial,
  out: Float64Array,
  at: number,
): void {
  const r = analyzeMeltPool({ laserPowerW, scanSpeedMmPerS, spotDiameterUm, hatchSpacingUm, layerThicknessUm, ambientTemperatureK, material }, { method: "surface" });
  out[at + MELTPOOL_SLOTS.widthUm] = r.pool.widthUm;
  out[at + MELTPOOL_SLOTS.depthUm] = r.pool.depthUm;
  out[at + MELTPOOL_SLOTS.lengthUm] = r.pool.lengthUm;
  out[at + MELTPOOL_SLOTS.peakTemperatureK] = r.pool.peakTemperatureK;
  out[at + MELTPOOL_SLOTS.normalizedEnthalpy] = r.normalizedEnthalpy;
  out[at + MELTPOOL_SLOTS.melted] = r.pool.melted ? 1 : 0;
  const margin = (name: string): number => r.criteria.find((x) => x.name === name)?.margin ?? NaN;
  out[at + MELTPOOL_SLOTS.marginLackOfFusionDepth] = margin("lack_of_fusion_depth");
  out[at + MELTPOOL_SLOTS.marginLackOfFusionOverlap] = margin("lack_of_fusion_overlap");
  out[at + MELTPOOL_SLOTS.marginBalling] = margin("balling_aspect");
  out[at + MELTPOOL_SLOTS.marginKeyholeAspect] = margin("keyhole_aspect");
  out[at + MELTPOOL_SLOTS.marginKeyholeEnthalpy] = margin("keyhole_enthalpy");
}
