/**
 * Assumed values: fields filled from a default because the source did not report them (spot size
 * not given, say). They are shown as information and lower the record's completeness.
 */
import { canonicalValue, capitalize, CHECKED_FIELDS, fmt, type FieldInfo } from "./fields";
import { CANONICAL_UNIT } from "../units";
import type { CheckRecord, Finding, RecordRule, RuleInfo } from "./types";

function assumedInfo(info: FieldInfo): RuleInfo {
  return {
    code: `assumed.${info.slug}`,
    severity: "info",
    title: `${capitalize(info.label)} assumed, not reported`,
    description: `The ${info.label} was filled from a default because the source does not report it. It lowers the record's quality; replace it if the source (or its supplement) gives the value.`,
    source: 'DOMAIN.md, "Source quality" (reported versus assumed parameters)',
    thresholdKeys: ["completeness.factor.assumed"],
    scope: "record",
  };
}

function assumedFinding(r: CheckRecord, info: FieldInfo): Finding | null {
  if (r.enteredAllReported) return null;
  const entered = r.entered[info.field];
  if (entered?.provenance !== "assumed") return null;
  const value = canonicalValue(r, info);
  return {
    code: `assumed.${info.slug}`,
    severity: "info",
    message: `${capitalize(info.label)} ${value === null ? entered.text : `${fmt(value)} ${CANONICAL_UNIT[info.quantity]}`} is an assumed default, not a reported value. Replace it if the source gives it; otherwise leave it (the record's quality counts it at a discount).`,
    details: {
      field: info.field,
      inputs: { [info.key]: value, enteredText: entered.text, enteredUnit: entered.unit },
      suggestedFix: { field: info.field, value: entered.text, unit: entered.unit || CANONICAL_UNIT[info.quantity], canonicalValue: value ?? 0 },
    },
  };
}

/** One rule per field; each is judged on its own (a record may carry several assumed values). */
export const ASSUMED_RULES: readonly RecordRule[] = CHECKED_FIELDS.map((info) => ({ infos: [assumedInfo(info)], check: (r: CheckRecord) => assumedFinding(r, info) }));
