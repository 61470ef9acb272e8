/**
 * Labels of a training set: binary success, the multi-class outcome, or relative density for
 * regression. Success for a binary label = dense and relative density ≥ a threshold (DOMAIN.md,
 * "Outcomes": 99.0 % default; 99.5 % is also common practice).
 */
import type { ExportRecord, LabelRule } from "./types";

/** Outcomes that are failures whatever the density says. */
const DEFECTS = new Set(["keyhole", "lack_of_fusion", "balling", "cracking", "other"]);

/** Classes of the multi-class label, in output order ("unknown" is no label). */
export const MULTICLASS_CLASSES = ["dense", "keyhole", "lack_of_fusion", "balling", "cracking", "other"] as const;
export const BINARY_CLASSES = ["success", "failure"] as const;

export type LabelResult =
  | { ok: true; label: number | string; className: string | null }
  | { ok: false; reason: string };

/**
 * The label of one record under a rule. Binary: 1 (success) when dense with density ≥ the
 * threshold; 0 (failure) for a defect outcome or a density below it; no label otherwise (dense or
 * unknown without a density, unknown at or above it). Multi-class: the outcome, except unknown.
 * Density: the relative density in %.
 *
 * @example
 * labelOf({ outcome: "dense", relativeDensityPct: 99.4 }, { scheme: "binary", densityThresholdPct: 99 });
 * // { ok: true, label: 1, className: "success" }
 */
export function labelOf(record: Pick<ExportRecord, "outcome" | "relativeDensityPct">, rule: LabelRule): LabelResult {
  const density = typeof record.relativeDensityPct === "number" && Number.isFinite(record.relativeDensityPct) ? record.relativeDensityPct : null;
  switch (rule.scheme) {
    case "binary": {
      if (DEFECTS.has(record.outcome)) return { ok: true, label: 0, className: "failure" };
      if (density !== null && density < rule.densityThresholdPct) return { ok: true, label: 0, className: "failure" };
      if (record.outcome === "dense" && density !== null) return { ok: true, label: 1, className: "success" };
      return { ok: false, reason: record.outcome === "dense" ? "dense without a relative density" : "outcome unknown and density not below the threshold" };
    }
    case "multiclass":
      if ((MULTICLASS_CLASSES as readonly string[]).includes(record.outcome)) return { ok: true, label: record.outcome, className: record.outcome };
      return { ok: false, reason: "outcome unknown" };
    case "density":
      if (density !== null) return { ok: true, label: density, className: null };
      return { ok: false, reason: "no relative density" };
  }
}

/**
 * The classes a rule can give, in a fixed order; null for regression.
 *
 * @example labelClasses({ scheme: "binary", densityThresholdPct: 99 }); // ["success", "failure"]
 */
export function labelClasses(rule: LabelRule): readonly string[] | null {
  return rule.scheme === "binary" ? BINARY_CLASSES : rule.scheme === "multiclass" ? MULTICLASS_CLASSES : null;
}

/**
 * The rule in words, for the datasheet and the manifest.
 *
 * @example describeLabelRule({ scheme: "density", densityThresholdPct: 99 }); // "label = relative density in % (regression) …"
 */
export function describeLabelRule(rule: LabelRule): string {
  switch (rule.scheme) {
    case "binary":
      return `label = 1 (success) when the outcome is dense and the relative density is at least ${rule.densityThresholdPct} %; 0 (failure) when the outcome is keyhole, lack of fusion, balling, cracking or other, or the relative density is below ${rule.densityThresholdPct} %; records fitting neither (dense or unknown without a density, unknown at or above the threshold) have no label and are left out`;
    case "multiclass":
      return `label = the outcome (${MULTICLASS_CLASSES.join(", ")}); records whose outcome is unknown are left out`;
    case "density":
      return "label = relative density in % (regression); records without a relative density are left out";
  }
}
