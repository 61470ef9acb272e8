/**
 * Defect criteria on a predicted melt pool. Defaults as listed by Sheikh et al. (npj Comput. Mater.
 * 10:252, 2024); every threshold is configurable. A conduction-mode model underestimates depth once
 * keyholing starts, so these are indicators: each result carries its value, threshold and margin so
 * a label-versus-physics conflict can be raised only beyond a chosen margin.
 */

export type Mechanism = "lack_of_fusion" | "balling" | "keyhole";

export type CriterionName =
  | "lack_of_fusion_depth"
  | "lack_of_fusion_overlap"
  | "lack_of_fusion_overlap_tang"
  | "balling_aspect"
  | "keyhole_aspect"
  | "keyhole_enthalpy";

export interface CriterionResult {
  name: CriterionName;
  mechanism: Mechanism;
  /** The rule in words, e.g. "D/t <= 1". */
  rule: string;
  /** The criterion's quantity; null when an input is missing or it is undefined (no melting). */
  value: number | null;
  /** Null only when the default threshold cannot be formed (keyhole_enthalpy without T_boil). */
  threshold: number | null;
  comparison: "<=" | ">=" | ">";
  fired: boolean;
  /**
   * Relative distance from the threshold, positive when the criterion fires and negative when it
   * is missed: (value − threshold)/threshold for ">=" and ">", (threshold − value)/threshold for "<=".
   */
  margin: number | null;
  inputs: Record<string, number | null>;
  source: string;
  note?: string;
}

export interface CriteriaThresholds {
  /** Lack of fusion when D/t ≤ this (Sheikh et al. 2024). */
  lackOfFusionDepthRatio: number;
  /** Lack of fusion when (h/W)² + t/(t + D) ≥ this (Sheikh et al. 2024). */
  lackOfFusionOverlap: number;
  /** Lack of fusion when (h/W)² + (t/D)² > this (Tang, Pistorius & Beuth 2017, from memory). */
  lackOfFusionOverlapTang: number;
  /** Balling when L/W ≥ this (Sheikh et al. 2024). */
  ballingLengthToWidth: number;
  /** Keyhole when W/D ≤ this (Sheikh et al. 2024; Johnson et al. 2019 used 1.5, from memory). */
  keyholeWidthToDepth: number;
  /** Keyhole when ΔH/h_s > this; null means π·T_boil/T_melt. */
  keyholeNormalizedEnthalpy: number | null;
}

export const DEFAULT_CRITERIA_THRESHOLDS: Readonly<CriteriaThresholds> = {
  lackOfFusionDepthRatio: 1,
  lackOfFusionOverlap: 1,
  lackOfFusionOverlapTang: 1,
  ballingLengthToWidth: 2.3,
  keyholeWidthToDepth: 2.5,
  keyholeNormalizedEnthalpy: null,
};

/** Criteria evaluated unless the caller chooses others: the set of Sheikh et al. (2024). */
export const DEFAULT_CRITERIA: readonly CriterionName[] = [
  "lack_of_fusion_depth",
  "lack_of_fusion_overlap",
  "balling_aspect",
  "keyhole_aspect",
  "keyhole_enthalpy",
];

export interface CriteriaInputs {
  widthUm: number;
  depthUm: number;
  lengthUm: number;
  melted: boolean;
  hatchSpacingUm?: number | null;
  layerThicknessUm?: number | null;
  normalizedEnthalpy?: number | null;
  meltingTemperatureK: number;
  boilingTemperatureK?: number | null;
}

export interface CriteriaOptions {
  thresholds?: Partial<CriteriaThresholds>;
  include?: readonly CriterionName[];
}

const SHEIKH = "Sheikh et al., npj Comput. Mater. 10:252 (2024)";
const KEYHOLE_ASPECT_SOURCE = `${SHEIKH}; Johnson et al., Acta Mater. 176:199–210 (2019) used 1.5 (from memory)`;
const KEYHOLE_ENTHALPY_SOURCE = "King et al., J. Mater. Process. Technol. 214(12):2915–2925 (2014); threshold π·T_boil/T_melt as in " + SHEIKH;

function usable(value: number | null | undefined): number | null {
  return typeof value === "number" && Number.isFinite(value) && value > 0 ? value : null;
}

/**
 * A criterion's result with its verdict. Every result is built with the same fields in the same
 * order (note last, undefined when there is none) so the engine keeps one object shape for all.
 */
function judged(
  name: CriterionName,
  mechanism: Mechanism,
  rule: string,
  value: number | null,
  threshold: number | null,
  comparison: CriterionResult["comparison"],
  inputs: Record<string, number | null>,
  source: string,
  note: string | undefined,
): CriterionResult {
  let fired = false;
  let margin: number | null = null;
  if (value !== null && threshold !== null) {
    margin = comparison === "<=" ? (threshold - value) / threshold : (value - threshold) / threshold;
    fired = comparison === ">" ? value > threshold : margin >= 0;
  }
  const r: CriterionResult = { name, mechanism, rule, value, threshold, comparison, fired, margin, inputs, source };
  if (note !== undefined) r.note = note;
  return r;
}

function checkThresholds(t: CriteriaThresholds): void {
  for (const [name, value] of Object.entries(t)) {
    if (value === null && name === "keyholeNormalizedEnthalpy") continue;
    if (typeof value !== "number" || !Number.isFinite(value) || value <= 0) {
      throw new RangeError(`evaluateCriteria: threshold ${name} must be a positive number, got ${String(value)}`);
    }
  }
}

interface ResolvedCriteriaOptions {
  t: CriteriaThresholds;
  include: ReadonlySet<CriterionName>;
  /** What the options held when they were checked; a caller that mutates them is checked again. */
  seen: { thresholds: Partial<CriteriaThresholds> | undefined; include: readonly CriterionName[] | undefined };
}

const DEFAULT_RESOLVED: ResolvedCriteriaOptions = { t: { ...DEFAULT_CRITERIA_THRESHOLDS }, include: new Set(DEFAULT_CRITERIA), seen: { thresholds: undefined, include: undefined } };
/** Checked thresholds per options object: a caller that reuses its options pays for the check once. */
const resolvedCache = new WeakMap<CriteriaOptions, ResolvedCriteriaOptions>();
const THRESHOLD_KEYS = Object.keys(DEFAULT_CRITERIA_THRESHOLDS) as (keyof CriteriaThresholds)[];

function resolvedOptions(options: CriteriaOptions): ResolvedCriteriaOptions {
  if (!options.thresholds && !options.include) return DEFAULT_RESOLVED;
  const cached = resolvedCache.get(options);
  if (cached && cached.seen.include === options.include && sameThresholds(cached.seen.thresholds, options.thresholds)) return cached;
  const t: CriteriaThresholds = { ...DEFAULT_CRITERIA_THRESHOLDS, ...options.thresholds };
  checkThresholds(t);
  const resolved: ResolvedCriteriaOptions = {
    t,
    include: new Set(options.include ?? DEFAULT_CRITERIA),
    seen: { thresholds: options.thresholds ? { ...options.thresholds } : undefined, include: options.include },
  };
  resolvedCache.set(options, resolved);
  return resolved;
}

function sameThresholds(a: Partial<CriteriaThresholds> | undefined, b: Partial<CriteriaThresholds> | undefined): boolean {
  if (!a || !b) return a === b;
  for (const key of THRESHOLD_KEYS) if (a[key] !== b[key]) return false;
  return true;
}

/**
 * Evaluates the defect criteria on a melt pool.
 *
 * @example
 * evaluateCriteria({ widthUm: 120, depthUm: 50, lengthUm: 400, melted: true, hatchSpacingUm: 100,
 *   layerThicknessUm: 30, normalizedEnthalpy: 6.4, meltingTemperatureK: 1723, boilingTemperatureK: 3090 });
 * // balling_aspect fires (L/W = 3.33 ≥ 2.3), keyhole_enthalpy fires (6.4 > 5.63), ...
 */
export function evaluateCriteria(inputs: CriteriaInputs, options: CriteriaOptions = {}): CriterionResult[] {
  const { t, include } = resolvedOptions(options);
  const W = inputs.melted ? usable(inputs.widthUm) : null;
  const D = inputs.melted ? usable(inputs.depthUm) : null;
  const L = inputs.melted ? usable(inputs.lengthUm) : null;
  const h = usable(inputs.hatchSpacingUm);
  const layer = usable(inputs.layerThicknessUm);
  const noMelt = inputs.melted ? undefined : "no melting";
  const results: CriterionResult[] = [];

  if (include.has("lack_of_fusion_depth")) {
    let value: number | null = null;
    let note: string | undefined;
    if (layer === null) note = "needs the layer thickness";
    else value = inputs.melted ? (D ?? 0) / layer : 0;
    results.push(judged("lack_of_fusion_depth", "lack_of_fusion", "D/t <= threshold", value, t.lackOfFusionDepthRatio, "<=",
      { depthUm: inputs.depthUm, layerThicknessUm: layer }, SHEIKH, note ?? noMelt));
  }
  if (include.has("lack_of_fusion_overlap")) {
    const missing = h === null || layer === null ? "needs hatch spacing and layer thickness" : undefined;
    const value = missing || W === null || D === null || h === null || layer === null ? null : (h / W) ** 2 + layer / (layer + D);
    const r = judged("lack_of_fusion_overlap", "lack_of_fusion", "(h/W)^2 + t/(t + D) >= threshold", value, t.lackOfFusionOverlap, ">=",
      { widthUm: inputs.widthUm, depthUm: inputs.depthUm, hatchSpacingUm: h, layerThicknessUm: layer }, SHEIKH, missing ?? noMelt);
    // Without a melt pool there is no overlap at all: the criterion fires without a finite value.
    if (!missing && !inputs.melted) r.fired = true;
    results.push(r);
  }
  if (include.has("lack_of_fusion_overlap_tang")) {
    const missing = h === null || layer === null ? "needs hatch spacing and layer thickness" : undefined;
    const value = missing || W === null || D === null || h === null || layer === null ? null : (h / W) ** 2 + (layer / D) ** 2;
    const r = judged("lack_of_fusion_overlap_tang", "lack_of_fusion", "(h/W)^2 + (t/D)^2 > threshold", value, t.lackOfFusionOverlapTang, ">",
      { widthUm: inputs.widthUm, depthUm: inputs.depthUm, hatchSpacingUm: h, layerThicknessUm: layer },
      "Tang, Pistorius & Beuth, Additive Manufacturing 14:39–48 (2017), from memory", missing ?? noMelt);
    if (!missing && !inputs.melted) r.fired = true;
    results.push(r);
  }
  if (include.has("balling_aspect")) {
    results.push(judged("balling_aspect", "balling", "L/W >= threshold", L !== null && W !== null ? L / W : null, t.ballingLengthToWidth, ">=",
      { lengthUm: inputs.lengthUm, widthUm: inputs.widthUm }, SHEIKH, noMelt));
  }
  if (include.has("keyhole_aspect")) {
    results.push(judged("keyhole_aspect", "keyhole", "W/D <= threshold", W !== null && D !== null ? W / D : null, t.keyholeWidthToDepth, "<=",
      { widthUm: inputs.widthUm, depthUm: inputs.depthUm }, KEYHOLE_ASPECT_SOURCE, noMelt));
  }
  if (include.has("keyhole_enthalpy")) {
    const tb = usable(inputs.boilingTemperatureK);
    const threshold = t.keyholeNormalizedEnthalpy ?? (tb !== null ? (Math.PI * tb) / inputs.meltingTemperatureK : null);
    const enthalpy = typeof inputs.normalizedEnthalpy === "number" && Number.isFinite(inputs.normalizedEnthalpy) ? inputs.normalizedEnthalpy : null;
    const note = threshold === null ? "needs the boiling temperature for the default threshold π·T_boil/T_melt" : enthalpy === null ? "needs the normalized enthalpy" : undefined;
    results.push(judged("keyhole_enthalpy", "keyhole", t.keyholeNormalizedEnthalpy === null ? "ΔH/h_s > π·T_boil/T_melt" : "ΔH/h_s > threshold", enthalpy, threshold, ">",
      { normalizedEnthalpy: enthalpy, boilingTemperatureK: tb, meltingTemperatureK: inputs.meltingTemperatureK }, KEYHOLE_ENTHALPY_SOURCE, note));
  }
  return results;
}
