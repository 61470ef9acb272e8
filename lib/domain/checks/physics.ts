/**
 * Outcome versus physics: a recorded outcome that the melt-pool criteria contradict beyond a
 * margin (labelled dense where lack of fusion is strongly predicted, say). The criteria values
 * come in precomputed (the melt-pool model is the caller's business); this rule only judges them,
 * and every finding names the criterion, its value, its threshold and the margin.
 *
 * A conduction-mode model underestimates depth once keyholing starts (DOMAIN.md), so a keyhole
 * label is contradicted only when the keyhole criteria are clear by the margin and another defect
 * is strongly predicted; the same holds for balling. A lack-of-fusion label is contradicted when
 * full fusion is predicted by the margin (a deeper real pool only strengthens that).
 */
import { settingOf, type CheckSettings } from "../check-settings";
import { fmt } from "./fields";
import type { CheckRecord, Finding, RuleInfo } from "./types";

export type DefectMode = "lack_of_fusion" | "keyhole" | "balling";

export interface CriterionValue {
  mode: DefectMode;
  /** How the criterion reads, e.g. "W/D ≤ 2.5" or "(h/W)² + t/(t + D) ≥ 1". */
  name: string;
  value: number;
  threshold: number;
  /** "atLeast": the defect is predicted when value ≥ threshold; "atMost": when value ≤ threshold. */
  direction: "atLeast" | "atMost";
}

export interface PhysicsAssessment {
  /** Which model produced the numbers, e.g. "Eagar–Tsai (precomputed surface)". */
  model: string;
  meltPool: { widthUm: number; depthUm: number; lengthUm: number; melted: boolean };
  criteria: readonly CriterionValue[];
  /** The inputs the model used (properties, absorptivity, ...), for the reviewer. */
  inputs: Record<string, number | string>;
  notes: readonly string[];
}

const LABEL: Record<DefectMode, string> = { lack_of_fusion: "lack of fusion", keyhole: "keyhole porosity", balling: "balling" };

/** Largest margin reported, so "no melting at all" stays a finite, JSON-safe number. */
const MARGIN_CAP = 1000;

/**
 * How far a criterion is past its threshold, relative to it: > 0 when the defect is predicted
 * (0.25 = 25 % beyond), < 0 when it is not.
 *
 * @example
 * criterionMargin({ mode: "balling", name: "L/W ≥ 2.3", value: 4.6, threshold: 2.3, direction: "atLeast" }); // 1
 * criterionMargin({ mode: "keyhole", name: "W/D ≤ 2.5", value: 5, threshold: 2.5, direction: "atMost" });    // -0.5
 */
export function criterionMargin(c: CriterionValue): number {
  if (!(c.threshold > 0) || !Number.isFinite(c.value)) return c.direction === "atLeast" ? MARGIN_CAP : -MARGIN_CAP;
  if (c.direction === "atLeast") return Math.min(MARGIN_CAP, c.value / c.threshold - 1);
  if (c.value <= 0) return MARGIN_CAP;
  return Math.min(MARGIN_CAP, c.threshold / c.value - 1);
}

function strongest(criteria: readonly CriterionValue[], mode: DefectMode): { criterion: CriterionValue; margin: number } | null {
  let best: { criterion: CriterionValue; margin: number } | null = null;
  for (const c of criteria) {
    if (c.mode !== mode) continue;
    const margin = criterionMargin(c);
    if (!best || margin > best.margin) best = { criterion: c, margin };
  }
  return best;
}

export const PHYSICS_RULE_INFO: RuleInfo = {
  code: "physics.outcome_conflict",
  severity: "warning",
  title: "Outcome contradicts the melt-pool criteria",
  description:
    "The recorded outcome disagrees with the melt-pool criteria by more than the margin: labelled dense where a defect is strongly predicted, labelled lack of fusion where full fusion is predicted, or labelled keyhole or balling where that criterion is clear and another defect is strongly predicted. Check the outcome and the four process values against the source; the criteria are indicators, so waive with a reason when the source's evidence is clear.",
  source:
    "Eagar & Tsai, Welding Journal 62(12):346s–355s (1983) melt pool; criteria as listed by Sheikh et al., npj Comput. Mater. 10:252 (2024); Tang, Pistorius & Beuth, Addit. Manuf. 14:39–48 (2017) for overlap (from memory)",
  thresholdKeys: ["physics.margin", "physics.lackOfFusion.overlap", "physics.balling.lengthToWidth", "physics.keyhole.widthToDepth"],
  scope: "record",
};

function describe(c: CriterionValue, margin: number): string {
  return `${c.name.replace(/\s*[≥≤].*$/, "")} = ${fmt(c.value)} (${LABEL[c.mode]} at ${c.direction === "atLeast" ? "≥" : "≤"} ${fmt(c.threshold)}, ${margin >= 0 ? `${Math.round(margin * 100)} % beyond` : `${Math.round(-margin * 100)} % clear`})`;
}

/**
 * The conflict between a record's outcome and the criteria, or null. Outcomes other than dense,
 * keyhole, lack of fusion and balling are not judged.
 *
 * @example
 * outcomeVersusPhysics(record labelled "dense", assessment with D ≤ t at value 2, threshold 1, settings)
 * // { code: "physics.outcome_conflict", message: "Labelled dense, but ... lack of fusion ...", ... }
 */
export function outcomeVersusPhysics(record: CheckRecord, physics: PhysicsAssessment | null, settings: CheckSettings): Finding | null {
  if (!physics) return null;
  const margin = settingOf(settings, "physics.margin");
  const modes: DefectMode[] = ["lack_of_fusion", "keyhole", "balling"];
  const byMode = new Map(modes.map((m) => [m, strongest(physics.criteria, m)]));
  const predicted = modes
    .map((m) => byMode.get(m))
    .filter((x): x is { criterion: CriterionValue; margin: number } => x !== null && x !== undefined && x.margin >= margin)
    .sort((a, b) => b.margin - a.margin);
  const details = {
    inputs: { outcome: record.outcome, model: physics.model, widthUm: round(physics.meltPool.widthUm), depthUm: round(physics.meltPool.depthUm), lengthUm: round(physics.meltPool.lengthUm), ...physics.inputs },
    thresholds: { margin },
    criteria: physics.criteria.map((c) => ({ ...c, value: round(c.value), margin: round(criterionMargin(c)) })),
    notes: [...physics.notes],
  };
  const outcome = record.outcome;
  let message: string | null = null;
  if (outcome === "dense" && predicted[0]) {
    const p = predicted[0];
    message = `Labelled dense, but the melt-pool model strongly predicts ${LABEL[p.criterion.mode]}: ${describe(p.criterion, p.margin)}.`;
  } else if (outcome === "lack_of_fusion") {
    const lof = byMode.get("lack_of_fusion");
    if (lof && lof.margin <= -margin) message = `Labelled lack of fusion, but the melt-pool model predicts full fusion: ${describe(lof.criterion, lof.margin)}.`;
  } else if (outcome === "keyhole" || outcome === "balling") {
    const own = byMode.get(outcome);
    const other = predicted.find((p) => p.criterion.mode !== outcome);
    if (own && own.margin <= -margin && other) {
      message = `Labelled ${LABEL[outcome]}, but that criterion is clear (${describe(own.criterion, own.margin)}) while ${LABEL[other.criterion.mode]} is strongly predicted (${describe(other.criterion, other.margin)}).`;
    }
  }
  if (!message) return null;
  return {
    code: PHYSICS_RULE_INFO.code,
    severity: "warning",
    message: `${message} Check the outcome and the process values against the source; waive with the source's evidence if the label stands.`,
    details,
  };
}

function round(x: number): number {
  return Number.isFinite(x) ? Number(x.toPrecision(5)) : x;
}
