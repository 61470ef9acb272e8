/**
 * Every threshold the checks read, with its default and the source of the default. Settings are
 * stored as versions (a new version per change), and each flag records the version it was raised
 * under, so a re-run with the same version reproduces it.
 *
 * Plain objects only; the zod schema for editing lives in lib/schemas/check-settings.ts.
 */
import { RECORD_QUALITY_SETTING_DEFS } from "./record-quality";
import { type SettingDef, validateSettingValues } from "./setting-def";
import { SOURCE_QUALITY_SETTING_DEFS } from "./source-quality";
import { CANONICAL_UNIT, PLAUSIBLE_RANGES, quantityLabel, QUANTITIES, type Quantity } from "./units";

const PLAUSIBLE_NOTE = "DOMAIN.md plausible range (common practice, from memory)";

function rangeDefs(quantity: Quantity): SettingDef[] {
  const r = PLAUSIBLE_RANGES[quantity];
  const unit = CANONICAL_UNIT[quantity];
  const label = quantityLabel(quantity);
  const max = quantity === "relativeDensity" ? 101 : Math.max(r.max * 100, 1e6);
  const min = quantity === "preheat" ? -273.15 : 0;
  return [
    { key: `range.${quantity}.min`, group: "Plausible ranges", label: `Lowest plausible ${label}`, unit, defaultValue: r.min, min, max, source: PLAUSIBLE_NOTE },
    { key: `range.${quantity}.max`, group: "Plausible ranges", label: `Highest plausible ${label}`, unit, defaultValue: r.max, min, max, source: PLAUSIBLE_NOTE },
  ];
}

/** Why the physics margins are what they are. */
const PHYSICS_MARGIN_NOTE =
  "DOMAIN.md: conflicts only beyond a margin (a conduction-mode model underestimates depth once keyholing starts); project calibration from memory, set so that well-known dense parameter sets of 316L, Ti-6Al-4V, AlSi10Mg and IN718 raise no conflict";

const SHEIKH_2024 = "Sheikh et al., npj Comput. Mater. 10:252 (2024), defaults as listed in DOMAIN.md";

/** Threshold definitions of the record and collection checks (quality weights are appended below). */
export const CHECK_THRESHOLD_DEFS: readonly SettingDef[] = [
  ...QUANTITIES.flatMap(rangeDefs),
  { key: "energy.volumetric.min", group: "Energy density", label: "Lowest usual volumetric energy density E_v", unit: "J/mm³", defaultValue: 10, min: 0, max: 1e4, source: PLAUSIBLE_NOTE },
  { key: "energy.volumetric.max", group: "Energy density", label: "Highest usual volumetric energy density E_v", unit: "J/mm³", defaultValue: 300, min: 0, max: 1e5, source: PLAUSIBLE_NOTE },
  { key: "geometry.spotToHatch.max", group: "Spot and hatch", label: "Largest spot diameter / hatch spacing", unit: "", defaultValue: 5, min: 1, max: 100, source: "tracks usually overlap by a fraction of the spot (common practice); the bound is from memory, configurable" },
  { key: "geometry.hatchToSpot.max", group: "Spot and hatch", label: "Largest hatch spacing / spot diameter", unit: "", defaultValue: 3, min: 1, max: 100, source: "a hatch several spot diameters wide leaves unfused gaps (common practice); the bound is from memory, configurable" },
  { key: "composition.sumTolerancePct", group: "Composition", label: "Allowed deviation of the composition sum from 100", unit: "wt%", defaultValue: 0.5, min: 0, max: 10, source: "DOMAIN.md: 100 ± 0.5 wt% after the balance is filled (common practice)" },
  { key: "physics.margin.lackOfFusion", group: "Outcome versus physics", label: "Margin beyond the lack-of-fusion criteria before a label is contradicted", unit: "", defaultValue: 0.75, min: 0, max: 1000, source: PHYSICS_MARGIN_NOTE },
  { key: "physics.margin.keyhole", group: "Outcome versus physics", label: "Margin beyond the keyhole criteria before a label is contradicted", unit: "", defaultValue: 0.75, min: 0, max: 1000, source: PHYSICS_MARGIN_NOTE },
  { key: "physics.margin.balling", group: "Outcome versus physics", label: "Margin beyond the balling criterion before a label is contradicted", unit: "", defaultValue: 3, min: 0, max: 1000, source: `${PHYSICS_MARGIN_NOTE}; the Eagar–Tsai pool of common dense 316L and IN718 parameters already has L/W of 3–7` },
  { key: "physics.lackOfFusion.overlap", group: "Outcome versus physics", label: "Lack of fusion when (h/W)² + t/(t + D) reaches", unit: "", defaultValue: 1, min: 0.1, max: 10, source: SHEIKH_2024 },
  { key: "physics.balling.lengthToWidth", group: "Outcome versus physics", label: "Balling when L/W reaches", unit: "", defaultValue: 2.3, min: 0.5, max: 20, source: SHEIKH_2024 },
  { key: "physics.keyhole.widthToDepth", group: "Outcome versus physics", label: "Keyhole when W/D falls to", unit: "", defaultValue: 2.5, min: 0.1, max: 20, source: `${SHEIKH_2024}; Johnson et al., Acta Mater. 176:199–210 (2019) used 1.5 (from memory)` },
  { key: "neighbours.count", group: "Neighbour agreement", label: "Neighbours compared (k)", unit: "", defaultValue: 7, min: 2, max: 50, source: "project default (from memory), configurable" },
  { key: "neighbours.minCount", group: "Neighbour agreement", label: "Fewest neighbours within the radius for a verdict", unit: "", defaultValue: 4, min: 1, max: 50, source: "project default (from memory), configurable" },
  { key: "neighbours.disagreeFraction", group: "Neighbour agreement", label: "Share of neighbours with another outcome that raises a flag", unit: "", defaultValue: 0.8, min: 0.5, max: 1, source: "project default (from memory), configurable" },
  { key: "neighbours.radius", group: "Neighbour agreement", label: "Search radius in normalized parameter space", unit: "", defaultValue: 1, min: 0.1, max: 10, source: "project default: one scale step in each parameter (from memory), configurable" },
  { key: "neighbours.scale.power", group: "Neighbour agreement", label: "Scale step of laser power (relative)", unit: "", defaultValue: 0.15, min: 0.01, max: 2, source: "project default (from memory): ln(P₁/P₂) / 0.15 is one unit of distance" },
  { key: "neighbours.scale.speed", group: "Neighbour agreement", label: "Scale step of scan speed (relative)", unit: "", defaultValue: 0.15, min: 0.01, max: 2, source: "project default (from memory)" },
  { key: "neighbours.scale.hatch", group: "Neighbour agreement", label: "Scale step of hatch spacing (relative)", unit: "", defaultValue: 0.2, min: 0.01, max: 2, source: "project default (from memory)" },
  { key: "neighbours.scale.layer", group: "Neighbour agreement", label: "Scale step of layer thickness (relative)", unit: "", defaultValue: 0.2, min: 0.01, max: 2, source: "project default (from memory)" },
  { key: "duplicates.power.relPct", group: "Duplicates", label: "Laser power tolerance (relative)", unit: "%", defaultValue: 1, min: 0, max: 50, source: "DOMAIN.md: P ±1 % or 2 W" },
  { key: "duplicates.power.absW", group: "Duplicates", label: "Laser power tolerance (absolute)", unit: "W", defaultValue: 2, min: 0, max: 100, source: "DOMAIN.md: P ±1 % or 2 W" },
  { key: "duplicates.speed.relPct", group: "Duplicates", label: "Scan speed tolerance (relative)", unit: "%", defaultValue: 1, min: 0, max: 50, source: "DOMAIN.md: v ±1 %" },
  { key: "duplicates.hatch.absUm", group: "Duplicates", label: "Hatch spacing tolerance", unit: "µm", defaultValue: 1, min: 0, max: 100, source: "DOMAIN.md: h and t ±1 µm" },
  { key: "duplicates.layer.absUm", group: "Duplicates", label: "Layer thickness tolerance", unit: "µm", defaultValue: 1, min: 0, max: 100, source: "DOMAIN.md: h and t ±1 µm" },
  { key: "duplicates.spot.absUm", group: "Duplicates", label: "Spot diameter tolerance", unit: "µm", defaultValue: 2, min: 0, max: 100, source: "DOMAIN.md: d ±2 µm" },
  { key: "duplicates.composition.wtPct", group: "Duplicates", label: "Composition tolerance per element", unit: "wt%", defaultValue: 0.5, min: 0, max: 10, source: "DOMAIN.md: each element within 0.5 wt%" },
  { key: "duplicates.density.samePct", group: "Duplicates", label: "Relative densities this close count as the same result", unit: "%", defaultValue: 0.1, min: 0, max: 10, source: "project default (from memory): a repeated density to a tenth of a point is a copy, not a replicate" },
  { key: "duplicates.density.conflictPct", group: "Duplicates", label: "Relative densities this far apart on the same parameters conflict", unit: "%", defaultValue: 5, min: 0, max: 100, source: "project default (from memory): replicate specimens rarely differ by more" },
];

/** Every setting a check run reads: thresholds, source-quality weights, completeness weights. */
export const CHECK_SETTING_DEFS: readonly SettingDef[] = [...CHECK_THRESHOLD_DEFS, ...SOURCE_QUALITY_SETTING_DEFS, ...RECORD_QUALITY_SETTING_DEFS];

const DEF_BY_KEY = new Map(CHECK_SETTING_DEFS.map((d) => [d.key, d]));

/** A complete set of setting values, keyed by SettingDef.key. */
export type CheckSettings = Readonly<Record<string, number>>;

/**
 * The defaults of every setting.
 *
 * @example
 * defaultCheckSettings()["range.scanSpeed.max"]; // 5000
 */
export function defaultCheckSettings(): CheckSettings {
  return Object.freeze(Object.fromEntries(CHECK_SETTING_DEFS.map((d) => [d.key, d.defaultValue])));
}

/**
 * A stored (possibly older, partial) set of values completed with the defaults; keys no longer
 * defined are dropped, so a version saved before a setting existed still runs.
 *
 * @example
 * completeCheckSettings({ "range.scanSpeed.max": 4000 })["range.scanSpeed.min"]; // 50
 */
export function completeCheckSettings(stored: Readonly<Record<string, unknown>>): CheckSettings {
  const out: Record<string, number> = {};
  for (const def of CHECK_SETTING_DEFS) {
    const v = stored[def.key];
    out[def.key] = typeof v === "number" && Number.isFinite(v) ? v : def.defaultValue;
  }
  return Object.freeze(out);
}

/**
 * Reads one setting; throws when the key is not defined (a typo in a rule is a bug).
 *
 * @example
 * settingOf(defaultCheckSettings(), "duplicates.spot.absUm"); // 2
 */
export function settingOf(settings: CheckSettings, key: string): number {
  const v = settings[key];
  if (v !== undefined) return v;
  const def = DEF_BY_KEY.get(key);
  if (!def) throw new RangeError(`settingOf: no setting "${key}"`);
  return def.defaultValue;
}

/** The definition of a setting, or undefined. @example settingDef("physics.margin")?.unit; // "" */
export function settingDef(key: string): SettingDef | undefined {
  return DEF_BY_KEY.get(key);
}

/**
 * Messages for values that break their definition or each other (a min above its max); empty when
 * the set may be saved.
 *
 * @example
 * checkSettingsProblems({ ...defaultCheckSettings(), "range.laserPower.min": 2000 });
 * // { "range.laserPower.min": "The lowest plausible laser power (2000) is above the highest (1000)." }
 */
export function checkSettingsProblems(values: Readonly<Record<string, number>>): Record<string, string> {
  const errors = validateSettingValues(CHECK_SETTING_DEFS, values);
  const pairs: [string, string, string][] = [
    ...QUANTITIES.map((q) => [`range.${q}.min`, `range.${q}.max`, `plausible ${quantityLabel(q)}`] as [string, string, string]),
    ["energy.volumetric.min", "energy.volumetric.max", "usual E_v"],
  ];
  for (const [lo, hi, label] of pairs) {
    const a = values[lo];
    const b = values[hi];
    if (a !== undefined && b !== undefined && a > b && !errors[lo]) errors[lo] = `The lowest ${label} (${a}) is above the highest (${b}).`;
  }
  const k = values["neighbours.count"];
  const m = values["neighbours.minCount"];
  if (k !== undefined && m !== undefined && m > k && !errors["neighbours.minCount"]) {
    errors["neighbours.minCount"] = `The fewest neighbours for a verdict (${m}) cannot exceed the neighbours compared (${k}).`;
  }
  return errors;
}
