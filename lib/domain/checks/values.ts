/**
 * Per-value rules: hard limits (error), plausible ranges (warning) and unit slips (warning with
 * the suggested unit). A value gets at most one of the three: a hard-limit breach outranks the
 * rest, and a unit slip replaces the plain range warning because it says more.
 */
import { settingOf, type CheckSettings } from "../check-settings";
import { CANONICAL_UNIT, checkHardLimit, HARD_LIMITS, toCanonical, unitOptions, type Quantity } from "../units";
import { canonicalValue, capitalize, CHECKED_FIELDS, fmt, type FieldInfo } from "./fields";
import type { CheckRecord, Finding, RecordRule, RuleInfo } from "./types";

/**
 * The standard factors a unit slip is made of (DOMAIN.md, "Unit slips"): × or ÷ 1,000 (kW/W,
 * m/s / mm/s, mm/µm), × 25.4 (in/s, mil) and ÷ 60 (mm/min). Percent versus fraction (× 100) is
 * the same kind of slip for relative density (common practice).
 */
const SLIP_FACTORS: readonly number[] = [1000, 1 / 1000, 25.4, 1 / 60];
const DENSITY_SLIP_FACTORS: readonly number[] = [100];

export interface SlipCandidate {
  /** The unit the value was probably meant in. */
  unit: string;
  /** The canonical value if it was. */
  canonicalValue: number;
  /** canonicalValue / stored canonical value. */
  factor: number;
}

function sameFactor(a: number, b: number): boolean {
  return Math.abs(a / b - 1) < 1e-9;
}

function enteredUnitOf(record: CheckRecord, info: FieldInfo): string {
  const unit = record.entered[info.field]?.unit;
  return unit && unitOptions(info.quantity).some((o) => o.id === unit) ? unit : CANONICAL_UNIT[info.quantity];
}

function inRange(value: number, min: number, max: number): boolean {
  return value >= min && value <= max;
}

/**
 * Units the value would be plausible in, had it been entered in them instead of the unit it was
 * entered in, reached by one standard factor; best first (closest to the middle of the range on a
 * log scale). Empty when the value is plausible already or no single factor helps. Temperatures
 * are not considered (their conversions are not factors).
 *
 * @example
 * unitSlipCandidates(0.8, "mm/s", "scanSpeed", { min: 50, max: 5000 }); // [{ unit: "m/s", canonicalValue: 800, factor: 1000 }]
 */
export function unitSlipCandidates(canonical: number, enteredUnit: string, quantity: Quantity, range: { min: number; max: number }): SlipCandidate[] {
  if (quantity === "preheat" || !Number.isFinite(canonical) || canonical <= 0 || inRange(canonical, range.min, range.max)) return [];
  const factors = quantity === "relativeDensity" ? DENSITY_SLIP_FACTORS : SLIP_FACTORS;
  const base = toCanonical(1, enteredUnit, quantity);
  const out: SlipCandidate[] = [];
  for (const option of unitOptions(quantity)) {
    if (option.id === enteredUnit) continue;
    const factor = toCanonical(1, option.id, quantity) / base;
    if (!factors.some((f) => sameFactor(f, factor))) continue;
    const candidate = Number((canonical * factor).toPrecision(12));
    if (inRange(candidate, range.min, range.max) && checkHardLimit(candidate, quantity) === null) out.push({ unit: option.id, canonicalValue: candidate, factor });
  }
  const centre = Math.sqrt(Math.max(range.min, 1e-9) * range.max);
  return out.sort((a, b) => Math.abs(Math.log(a.canonicalValue / centre)) - Math.abs(Math.log(b.canonicalValue / centre)));
}

const PLAUSIBLE_SOURCE = "DOMAIN.md plausible ranges (common practice, from memory)";

/** Plausible ranges of a settings version, read once per version rather than once per value. */
const rangeCache = new WeakMap<CheckSettings, Map<Quantity, { min: number; max: number }>>();
function rangeOf(settings: CheckSettings, quantity: Quantity): { min: number; max: number } {
  let m = rangeCache.get(settings);
  if (!m) rangeCache.set(settings, (m = new Map()));
  let r = m.get(quantity);
  if (!r) m.set(quantity, (r = { min: settingOf(settings, `range.${quantity}.min`), max: settingOf(settings, `range.${quantity}.max`) }));
  return r;
}

function insideHardLimit(value: number, quantity: Quantity): boolean {
  const { min, minInclusive, max } = HARD_LIMITS[quantity];
  return (minInclusive ? value >= min : value > min) && (max === null || value <= max);
}

function infosOf(info: FieldInfo): RuleInfo[] {
  const limit = HARD_LIMITS[info.quantity];
  const unit = CANONICAL_UNIT[info.quantity];
  const density = info.quantity === "relativeDensity";
  return [
    {
      code: `limit.${info.slug}`,
      severity: "error",
      title: `${capitalize(info.label)} outside its hard limit`,
      description: `A ${info.label} ${limit.minInclusive ? "below" : "at or below"} ${fmt(limit.min)} ${unit}${limit.max !== null ? ` or above ${fmt(limit.max)} ${unit}` : ""} cannot be right. Correct the value or its unit from the source, or reject the record.`,
      source: info.quantity === "preheat" ? "absolute zero (SI Brochure, 9th edition, section 2.3.1)" : "DOMAIN.md hard limits (physical bounds and machine capability, common practice)",
      thresholdKeys: [],
      scope: "record",
    },
    {
      code: `unit_slip.${info.slug}`,
      severity: "warning",
      title: `${capitalize(info.label)}: likely unit slip`,
      description: `The ${info.label} is outside its plausible range but lands inside it after one standard factor (× or ÷ 1,000, × 25.4, ÷ 60${density ? ", or × 100 for a fraction typed as %" : ""}). Review offers the suggested unit as a one-step fix; waive it if the source really says so.`,
      source: 'DOMAIN.md, "Unit slips" (the commonest error in compiled data; common practice)',
      thresholdKeys: [`range.${info.quantity}.min`, `range.${info.quantity}.max`],
      scope: "record",
    },
    {
      code: `range.${info.slug}`,
      severity: "warning",
      title: `${capitalize(info.label)} outside the plausible range`,
      description: `The ${info.label} is outside the range usual for LPBF. It may be real (an unusual machine or study); check it against the source, correct it, or waive with the reason.${density ? " Above 100 % usually means the reference density is off." : ""}`,
      source: PLAUSIBLE_SOURCE,
      thresholdKeys: [`range.${info.quantity}.min`, `range.${info.quantity}.max`],
      scope: "record",
    },
  ];
}

/** The one finding (or none) of a field: hard limit first, then unit slip, then range. */
function judgeValue(record: CheckRecord, settings: CheckSettings, info: FieldInfo): Finding | null {
  const value = canonicalValue(record, info);
  if (value === null) return null;
  const unit = CANONICAL_UNIT[info.quantity];
  if (!insideHardLimit(value, info.quantity)) {
    const limit = HARD_LIMITS[info.quantity];
    return {
      code: `limit.${info.slug}`,
      severity: "error",
      message: `${checkHardLimit(value, info.quantity) ?? ""} Correct the value or its unit from the source, or reject the record.`,
      details: { field: info.field, inputs: { [info.key]: value }, thresholds: { min: limit.min, ...(limit.max !== null ? { max: limit.max } : {}) } },
    };
  }
  const range = rangeOf(settings, info.quantity);
  if (value >= range.min && value <= range.max) return null;
  const entered = record.entered[info.field];
  const enteredUnit = enteredUnitOf(record, info);
  const text = entered?.text ?? String(value);
  const best = unitSlipCandidates(value, enteredUnit, info.quantity, range);
  if (best[0]) {
    const b = best[0];
    return {
      code: `unit_slip.${info.slug}`,
      severity: "warning",
      message: `${capitalize(info.label)} ${text} ${enteredUnit} (${fmt(value)} ${unit}) is outside the plausible ${fmt(range.min)}–${fmt(range.max)} ${unit}; in ${b.unit} it would be ${fmt(b.canonicalValue)} ${unit}. If the source means ${b.unit}, change the unit; otherwise waive with the reason.`,
      details: {
        field: info.field,
        inputs: { [info.key]: value, enteredText: text, enteredUnit },
        thresholds: { min: range.min, max: range.max },
        candidates: best.map((c) => ({ unit: c.unit, canonicalValue: c.canonicalValue })),
        suggestedFix: { field: info.field, value: text, unit: b.unit, canonicalValue: b.canonicalValue },
      },
    };
  }
  const low = value < range.min;
  let hint = "Check it against the source; correct it, or waive with the reason if the source really says so.";
  if (info.quantity === "relativeDensity" && !low) hint = "A relative density above 100 % usually means the reference (theoretical) density is off: check which reference the source used, then correct or waive.";
  return {
    code: `range.${info.slug}`,
    severity: "warning",
    message: `${capitalize(info.label)} ${fmt(value)} ${unit} is ${low ? "below" : "above"} the plausible ${fmt(range.min)}–${fmt(range.max)} ${unit}. ${hint}`,
    details: {
      field: info.field,
      inputs: { [info.key]: value, enteredText: entered?.text ?? null, enteredUnit: entered?.unit ?? null },
      thresholds: { min: range.min, max: range.max },
      suggestedFix: { field: info.field, value: text, unit: enteredUnit, canonicalValue: value },
    },
  };
}

/** Hard-limit, unit-slip and range rules of every entered field, one pass per field. */
export const VALUE_RULES: readonly RecordRule[] = CHECKED_FIELDS.map((info) => ({
  infos: infosOf(info),
  check: (record: CheckRecord, settings: CheckSettings) => judgeValue(record, settings, info),
}));
