/**
 * Source quality: a score in [0, 1] from what a reviewer can verify about a source — what kind of
 * publication it is, how density was measured, what evidence backs the outcomes, and which
 * process details it reports — with configurable weights and an explanation in words. A reviewer
 * may override the score with a reason; the explanation then says so.
 *
 * The attribute list follows DOMAIN.md ("Source quality"). The numeric scores and weights below are
 * this project's defaults (from memory, no published scale): every one is a setting.
 */
import type { SettingDef } from "./setting-def";

/** What the score reads from a source. */
export interface SourceAttributes {
  kind: string;
  densityMethod: string;
  outcomeEvidence: string;
  machineStated: boolean;
  /** The spot-size definition the source states; null or "unstated" when it does not. */
  spotSizeDefinition: string | null;
  powderReported: boolean;
  atmosphereReported: boolean;
  qualityOverride: number | null;
  qualityOverrideReason: string | null;
}

const NOTE = "project default (from memory; no published scale), configurable";

/** Scores per source kind. */
export const SOURCE_KIND_SCORES: Record<string, { label: string; score: number }> = {
  journal_article: { label: "peer-reviewed journal article", score: 1 },
  conference_paper: { label: "conference paper", score: 0.85 },
  thesis: { label: "thesis", score: 0.85 },
  report: { label: "report", score: 0.75 },
  preprint: { label: "preprint (not yet peer reviewed)", score: 0.7 },
  shop_trial: { label: "documented shop trial", score: 0.6 },
};

/** Scores per density method. Archimedes per ASTM B962 and X-ray CT measure the whole part. */
export const DENSITY_METHOD_SCORES: Record<string, { label: string; score: number }> = {
  archimedes: { label: "density by Archimedes (ASTM B962)", score: 1 },
  ct: { label: "density by X-ray CT", score: 1 },
  image_analysis: { label: "density by image analysis of cross-sections", score: 0.8 },
  other: { label: "density by another method", score: 0.6 },
  unknown: { label: "density method not stated", score: 0.4 },
};

/** Scores per kind of outcome evidence. */
export const OUTCOME_EVIDENCE_SCORES: Record<string, { label: string; score: number }> = {
  micrographs: { label: "outcomes backed by micrographs", score: 1 },
  density_only: { label: "outcomes backed by density values only", score: 0.8 },
  statement_only: { label: "outcomes stated without evidence", score: 0.5 },
};

const REPORTED_ITEMS = [
  { key: "spot", label: "spot-size definition" },
  { key: "powder", label: "powder size" },
  { key: "atmosphere", label: "atmosphere" },
  { key: "machine", label: "machine" },
] as const;

function optionDefs(group: string, prefix: string, table: Record<string, { label: string; score: number }>): SettingDef[] {
  return Object.entries(table).map(([id, o]) => ({
    key: `${prefix}.${id}`,
    group,
    label: `Score: ${o.label}`,
    unit: "",
    defaultValue: o.score,
    min: 0,
    max: 1,
    source: NOTE,
  }));
}

/** Every setting the source score reads. */
export const SOURCE_QUALITY_SETTING_DEFS: readonly SettingDef[] = [
  { key: "quality.weight.kind", group: "Source quality", label: "Weight of the source kind", unit: "", defaultValue: 0.3, min: 0, max: 1, source: NOTE },
  { key: "quality.weight.densityMethod", group: "Source quality", label: "Weight of the density method", unit: "", defaultValue: 0.3, min: 0, max: 1, source: NOTE },
  { key: "quality.weight.outcomeEvidence", group: "Source quality", label: "Weight of the outcome evidence", unit: "", defaultValue: 0.2, min: 0, max: 1, source: NOTE },
  { key: "quality.weight.reported", group: "Source quality", label: "Weight of the reported process details", unit: "", defaultValue: 0.2, min: 0, max: 1, source: NOTE },
  ...optionDefs("Source quality", "quality.kind", SOURCE_KIND_SCORES),
  ...optionDefs("Source quality", "quality.densityMethod", DENSITY_METHOD_SCORES),
  ...optionDefs("Source quality", "quality.outcomeEvidence", OUTCOME_EVIDENCE_SCORES),
];

/** Values of the source-quality settings, keyed as in SOURCE_QUALITY_SETTING_DEFS. */
export type SourceQualitySettings = Readonly<Record<string, number>>;

export interface SourceQualityPart {
  /** "kind" | "densityMethod" | "outcomeEvidence" | "reported" */
  part: string;
  label: string;
  score: number;
  weight: number;
}

export interface SourceQuality {
  /** The score used: the override when there is one, else the computed score. In [0, 1]. */
  score: number;
  computedScore: number;
  overridden: boolean;
  parts: SourceQualityPart[];
  /** One paragraph in words. */
  explanation: string;
}

function setting(settings: SourceQualitySettings, key: string): number {
  const value = settings[key];
  if (value !== undefined) return value;
  const def = SOURCE_QUALITY_SETTING_DEFS.find((d) => d.key === key);
  return def ? def.defaultValue : 0;
}

const pct = (x: number) => `${Math.round(x * 100)}%`;
const two = (x: number) => x.toFixed(2);

/**
 * Scores a source: the weighted mean of four part scores (kind, density method, outcome evidence,
 * share of the four process details reported), or the reviewer's override when one is set.
 * An attribute value the tables do not know scores 0 and the explanation says so.
 *
 * @example
 * scoreSource({ kind: "journal_article", densityMethod: "archimedes", outcomeEvidence: "micrographs", machineStated: true,
 *   spotSizeDefinition: "one_over_e2", powderReported: true, atmosphereReported: true, qualityOverride: null, qualityOverrideReason: null }, {}).score; // 1
 */
export function scoreSource(source: SourceAttributes, settings: SourceQualitySettings): SourceQuality {
  const lookup = (prefix: string, table: Record<string, { label: string; score: number }>, id: string) => {
    const known = table[id];
    return known ? { label: known.label, score: setting(settings, `${prefix}.${id}`) } : { label: `unrecognised value "${id}"`, score: 0 };
  };
  const kind = lookup("quality.kind", SOURCE_KIND_SCORES, source.kind);
  const density = lookup("quality.densityMethod", DENSITY_METHOD_SCORES, source.densityMethod);
  const evidence = lookup("quality.outcomeEvidence", OUTCOME_EVIDENCE_SCORES, source.outcomeEvidence);
  const reportedFlags: Record<(typeof REPORTED_ITEMS)[number]["key"], boolean> = {
    spot: source.spotSizeDefinition !== null && source.spotSizeDefinition !== "unstated",
    powder: source.powderReported,
    atmosphere: source.atmosphereReported,
    machine: source.machineStated,
  };
  const reportedCount = REPORTED_ITEMS.filter((i) => reportedFlags[i.key]).length;
  const missing = REPORTED_ITEMS.filter((i) => !reportedFlags[i.key]).map((i) => i.label);
  const parts: SourceQualityPart[] = [
    { part: "kind", label: kind.label, score: kind.score, weight: setting(settings, "quality.weight.kind") },
    { part: "densityMethod", label: density.label, score: density.score, weight: setting(settings, "quality.weight.densityMethod") },
    { part: "outcomeEvidence", label: evidence.label, score: evidence.score, weight: setting(settings, "quality.weight.outcomeEvidence") },
    {
      part: "reported",
      label: missing.length ? `${reportedCount} of ${REPORTED_ITEMS.length} process details reported (missing: ${missing.join(", ")})` : "all four process details reported (spot-size definition, powder size, atmosphere, machine)",
      score: reportedCount / REPORTED_ITEMS.length,
      weight: setting(settings, "quality.weight.reported"),
    },
  ];
  const totalWeight = parts.reduce((s, p) => s + p.weight, 0);
  const computedScore = totalWeight > 0 ? clamp01(parts.reduce((s, p) => s + p.weight * p.score, 0) / totalWeight) : 0;
  const overridden = source.qualityOverride !== null && Number.isFinite(source.qualityOverride);
  const score = overridden ? clamp01(source.qualityOverride as number) : computedScore;
  const sentence = parts.map((p) => `${p.label} (${two(p.score)}, weight ${two(p.weight)})`).join("; ");
  let explanation = `Score ${pct(computedScore)} from the weighted mean of: ${sentence}.`;
  if (overridden) {
    explanation = `A reviewer set the score to ${pct(score)}${source.qualityOverrideReason ? `: "${source.qualityOverrideReason}"` : ""}. Without the override it would be ${pct(computedScore)}, from: ${sentence}.`;
  }
  return { score, computedScore, overridden, parts, explanation };
}

function clamp01(x: number): number {
  return Math.min(1, Math.max(0, x));
}
