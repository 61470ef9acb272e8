/**
 * Shapes shared by the check rules: the record as the checks see it (canonical values plus what
 * was entered), a finding, and a rule's catalogue entry.
 */
import type { CheckSettings } from "../check-settings";

export type Severity = "error" | "warning" | "info";

/** Severity order, worst first: error 0, warning 1, info 2. */
export const SEVERITY_RANK: Record<Severity, number> = { error: 0, warning: 1, info: 2 };

/** Record fields entered as a number with a unit (the same names the record form uses). */
export type CheckedField =
  | "laserPower"
  | "scanSpeed"
  | "hatchSpacing"
  | "layerThickness"
  | "spotDiameter"
  | "preheat"
  | "powderD10"
  | "powderD50"
  | "powderD90"
  | "relativeDensity";

export interface EnteredText {
  text: string;
  unit: string;
  provenance?: string;
}

/** A build record as the checks read it: canonical units, plus what was typed for audit and fixes. */
export interface CheckRecord {
  id: number;
  sourceId: number;
  alloyKey: string;
  /** Composition stored with the record's material (wt% or at% per `compositionBasis`); empty when the alloy is unknown. */
  components: readonly { element: string; amount: number; isBalance: boolean }[];
  compositionBasis: string;
  laserPowerW: number | null;
  scanSpeedMmPerS: number | null;
  hatchSpacingUm: number | null;
  layerThicknessUm: number | null;
  /** 1/e² diameter. */
  spotDiameterUm: number | null;
  preheatC: number | null;
  powderD10Um: number | null;
  powderD50Um: number | null;
  powderD90Um: number | null;
  relativeDensityPct: number | null;
  volumetricEnergyJMm3: number | null;
  outcome: string;
  machine: string | null;
  atmosphere: string | null;
  spotDefinition: string | null;
  entered: Partial<Record<CheckedField, EnteredText>>;
  /**
   * Set by loaders that know every entered value is "reported" (no assumed or derived one), so
   * rules that only look for assumed values can skip reading `entered`.
   */
  enteredAllReported?: boolean;
}

/** Extra structured facts of a finding, shown in review and printed by the CLI. */
export interface FindingDetails {
  field?: CheckedField;
  inputs?: Record<string, number | string | null>;
  thresholds?: Record<string, number>;
  /** The one-step fix review offers: enter `value` with `unit` in `field`. */
  suggestedFix?: { field: CheckedField; value: string; unit: string; canonicalValue: number };
  [key: string]: unknown;
}

export interface Finding {
  code: string;
  severity: Severity;
  /** What is wrong and how to fix it, in one or two sentences. */
  message: string;
  /** The other record of a pair finding (duplicates, conflicts). */
  relatedRecordId?: number;
  details: FindingDetails;
}

/** Catalogue entry of a rule. */
export interface RuleInfo {
  /** Stable code, the key of flags in the database. */
  code: string;
  severity: Severity;
  title: string;
  /** What the rule checks and how a reviewer resolves it. */
  description: string;
  /** The publication, standard or "common practice" note it rests on. */
  source: string;
  /** Setting keys whose values the rule reads. */
  thresholdKeys: readonly string[];
  /** "record": judged from the record alone; "collection": needs the other records too. */
  scope: "record" | "collection";
}

/**
 * Rules judged from one record alone. Closely related rules (the hard limit, unit slip and range
 * of one field, say) are judged together in one pass and give at most one finding between them.
 */
export interface RecordRule {
  infos: readonly RuleInfo[];
  check: (record: CheckRecord, settings: CheckSettings) => Finding | null;
}
