/**
 * Record quality: the completeness of a record's own fields — each reported, derived, assumed
 * (filled from a default) or missing — times its source's score (DOMAIN.md, "Source quality").
 * Field weights and provenance factors are this project's defaults (from memory), all settings.
 */
import type { SettingDef } from "./setting-def";

export type FieldProvenance = "reported" | "derived" | "assumed";

/** What completeness reads from a record: which fields carry a value and where it came from. */
export interface CompletenessInput {
  /** Whether each field has a value (true) and, when known, its provenance. */
  fields: Partial<Record<CompletenessField, { present: boolean; provenance?: FieldProvenance | undefined }>>;
}

export const COMPLETENESS_FIELDS = ["laserPower", "scanSpeed", "hatchSpacing", "layerThickness", "spotDiameter", "powderD50", "result"] as const;
export type CompletenessField = (typeof COMPLETENESS_FIELDS)[number];

const FIELD_LABEL: Record<CompletenessField, string> = {
  laserPower: "laser power",
  scanSpeed: "scan speed",
  hatchSpacing: "hatch spacing",
  layerThickness: "layer thickness",
  spotDiameter: "spot diameter",
  powderD50: "powder D50",
  result: "outcome or relative density",
};

const NOTE = "project default (from memory), configurable";
const WEIGHTS: Record<CompletenessField, number> = {
  laserPower: 1,
  scanSpeed: 1,
  hatchSpacing: 1,
  layerThickness: 1,
  spotDiameter: 0.5,
  powderD50: 0.25,
  result: 1,
};

export const RECORD_QUALITY_SETTING_DEFS: readonly SettingDef[] = [
  ...COMPLETENESS_FIELDS.map((f) => ({
    key: `completeness.weight.${f}`,
    group: "Record completeness",
    label: `Weight of ${FIELD_LABEL[f]}`,
    unit: "",
    defaultValue: WEIGHTS[f],
    min: 0,
    max: 10,
    source: NOTE,
  })),
  { key: "completeness.factor.derived", group: "Record completeness", label: "Credit for a derived value", unit: "", defaultValue: 0.8, min: 0, max: 1, source: NOTE },
  { key: "completeness.factor.assumed", group: "Record completeness", label: "Credit for an assumed (default) value", unit: "", defaultValue: 0.5, min: 0, max: 1, source: NOTE },
];

export interface Completeness {
  /** In [0, 1]. */
  value: number;
  /** Fields that count less than full: missing, derived or assumed. */
  shortfalls: { field: CompletenessField; label: string; state: "missing" | "derived" | "assumed" }[];
}

function setting(settings: Readonly<Record<string, number>>, key: string): number {
  return settings[key] ?? RECORD_QUALITY_SETTING_DEFS.find((d) => d.key === key)?.defaultValue ?? 0;
}

/**
 * Weighted share of the record's fields that are present, a reported value counting fully, a
 * derived or assumed one counting its factor, a missing one nothing.
 *
 * @example
 * recordCompleteness({ fields: { laserPower: { present: true }, scanSpeed: { present: true }, hatchSpacing: { present: true },
 *   layerThickness: { present: true }, spotDiameter: { present: true, provenance: "assumed" }, powderD50: { present: true },
 *   result: { present: true } } }, {}).value; // (1+1+1+1+0.5·0.5+0.25+1) / 5.75 ≈ 0.913
 */
export function recordCompleteness(input: CompletenessInput, settings: Readonly<Record<string, number>>): Completeness {
  let total = 0;
  let got = 0;
  const shortfalls: Completeness["shortfalls"] = [];
  const derived = setting(settings, "completeness.factor.derived");
  const assumed = setting(settings, "completeness.factor.assumed");
  for (const field of COMPLETENESS_FIELDS) {
    const weight = setting(settings, `completeness.weight.${field}`);
    total += weight;
    const f = input.fields[field];
    if (!f || !f.present) {
      shortfalls.push({ field, label: FIELD_LABEL[field], state: "missing" });
      continue;
    }
    const provenance = f.provenance ?? "reported";
    const factor = provenance === "reported" ? 1 : provenance === "derived" ? derived : assumed;
    if (provenance !== "reported") shortfalls.push({ field, label: FIELD_LABEL[field], state: provenance });
    got += weight * factor;
  }
  return { value: total > 0 ? got / total : 0, shortfalls };
}

/**
 * A record's quality: its source's score times its completeness, rounded to three decimals.
 *
 * @example
 * recordQuality(0.9, 0.8); // 0.72
 */
export function recordQuality(sourceScore: number, completeness: number): number {
  if (!Number.isFinite(sourceScore) || !Number.isFinite(completeness)) {
    throw new RangeError(`recordQuality: scores must be finite, got ${sourceScore} and ${completeness}`);
  }
  const q = Math.min(1, Math.max(0, sourceScore)) * Math.min(1, Math.max(0, completeness));
  return Math.round(q * 1000) / 1000;
}

/** What each completeness field reads from a record of the checks. */
interface CompletenessSource {
  laserPowerW: number | null;
  scanSpeedMmPerS: number | null;
  hatchSpacingUm: number | null;
  layerThicknessUm: number | null;
  spotDiameterUm: number | null;
  powderD50Um: number | null;
  relativeDensityPct: number | null;
  outcome: string;
  entered: Partial<Record<string, { provenance?: string }>>;
  /** When true every entered value is reported and `entered` is not read. */
  enteredAllReported?: boolean;
}

function provenanceOf(text: string | undefined): FieldProvenance | undefined {
  return text === "reported" || text === "derived" || text === "assumed" ? text : undefined;
}

/**
 * The completeness input of a record: a field is present when its canonical value is, with the
 * provenance recorded when it was entered; the result is present when the outcome is known or a
 * relative density is given.
 *
 * @example
 * completenessInputOf(record).fields.spotDiameter; // { present: true, provenance: "assumed" }
 */
export function completenessInputOf(r: CompletenessSource): CompletenessInput {
  const entered = r.enteredAllReported ? {} : r.entered;
  const f = (value: number | null, field: string) => ({ present: value !== null, provenance: provenanceOf(entered[field]?.provenance) });
  return {
    fields: {
      laserPower: f(r.laserPowerW, "laserPower"),
      scanSpeed: f(r.scanSpeedMmPerS, "scanSpeed"),
      hatchSpacing: f(r.hatchSpacingUm, "hatchSpacing"),
      layerThickness: f(r.layerThicknessUm, "layerThickness"),
      spotDiameter: f(r.spotDiameterUm, "spotDiameter"),
      powderD50: f(r.powderD50Um, "powderD50"),
      result: { present: (r.outcome !== "unknown" && r.outcome !== "") || r.relativeDensityPct !== null, provenance: provenanceOf(entered.relativeDensity?.provenance) },
    },
  };
}

const weightCache = new WeakMap<object, { weights: number[]; total: number; derived: number; assumed: number }>();

/**
 * The same value as `recordCompleteness(completenessInputOf(r), settings).value`, without building
 * the intermediate objects: a check run computes it for every record.
 *
 * @example
 * completenessValueOf(record, settings) === recordCompleteness(completenessInputOf(record), settings).value; // true
 */
export function completenessValueOf(r: CompletenessSource, settings: Readonly<Record<string, number>>): number {
  let w = weightCache.get(settings);
  if (!w) {
    const weights = COMPLETENESS_FIELDS.map((f) => setting(settings, `completeness.weight.${f}`));
    w = { weights, total: weights.reduce((a, b) => a + b, 0), derived: setting(settings, "completeness.factor.derived"), assumed: setting(settings, "completeness.factor.assumed") };
    weightCache.set(settings, w);
  }
  if (!(w.total > 0)) return 0;
  const entered = r.enteredAllReported ? null : r.entered;
  const credit = (present: boolean, field: string) => {
    if (!present) return 0;
    const p = entered?.[field]?.provenance;
    return p === "derived" ? w.derived : p === "assumed" ? w.assumed : 1;
  };
  const [wp, wv, wh, wt, wd, w50, wr] = w.weights as [number, number, number, number, number, number, number];
  const got =
    wp * credit(r.laserPowerW !== null, "laserPower") +
    wv * credit(r.scanSpeedMmPerS !== null, "scanSpeed") +
    wh * credit(r.hatchSpacingUm !== null, "hatchSpacing") +
    wt * credit(r.layerThicknessUm !== null, "layerThickness") +
    wd * credit(r.spotDiameterUm !== null, "spotDiameter") +
    w50 * credit(r.powderD50Um !== null, "powderD50") +
    wr * credit((r.outcome !== "unknown" && r.outcome !== "") || r.relativeDensityPct !== null, "relativeDensity");
  return got / w.total;
}
