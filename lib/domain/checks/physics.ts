/**
 * Outcome versus physics: a recorded outcome that the melt-pool criteria contradict beyond a
 * margin (labelled dense where lack of fusion is strongly predicted, say). The criteria values
 * come in precomputed (the melt-pool model is the caller's business); this rule only judges them,
 * and every finding names the criterion, its value, its threshold and the margin.
 *
 * A conduction-mode model underestimates depth once keyholing starts (DOMAIN.md), so a keyhole
 * label is contradicted only when the keyhole criteria are clear by the margin and another defect
 * is strongly predicted; the same holds for balling. A lack-of-fusion label is contradicted when
 * full fusion is predicted by the margin (a deeper real pool only strengthens that). Each mechanism
 * has its own margin; "clear" means clear by that margin, at most 50 %.
 */
import { settingOf, type CheckSettings } from "../check-settings";
import { fmt } from "./fields";
import type { CheckRecord, Finding, RuleInfo } from "./types";

export type DefectMode = "lack_of_fusion" | "keyhole" | "balling";

/** One defect criterion as the melt-pool analysis reports it (criteria.ts, CriterionResult). */
export interface CriterionValue {
  mode: DefectMode;
  /** The rule in words, e.g. "W/D <= threshold". */
  name: string;
  value: number | null;
  threshold: number | null;
  comparison: "<=" | ">=" | ">";
  fired: boolean;
  /** (value − threshold)/threshold for ">=" and ">", (threshold − value)/threshold for "<="; null when not evaluable. */
  margin: number | null;
}

export interface PhysicsAssessment {
  /** Which model produced the numbers, e.g. "Eagar–Tsai (precomputed surface)". */
  model: string;
  meltPool: { widthUm: number; depthUm: number; lengthUm: number; melted: boolean };
  criteria: readonly CriterionValue[];
  /** The inputs the model used (properties, absorptivity, ...), for the reviewer; built only when a finding is made. */
  inputs: () => Record<string, number | string>;
  notes: readonly string[];
}

const LABEL: Record<DefectMode, string> = { lack_of_fusion: "lack of fusion", keyhole: "keyhole porosity", balling: "balling" };

/** Margin given to a criterion that fired without a finite value (no melt pool at all). */
const MARGIN_CAP = 1000;

/**
 * How far a criterion is past its threshold, relative to it: > 0 when the defect is predicted
 * (0.25 = 25 % beyond), < 0 when it is not, null when it could not be evaluated.
 *
 * @example
 * criterionMargin({ mode: "balling", name: "L/W >= threshold", value: 4.6, threshold: 2.3, comparison: ">=", fired: true, margin: 1 }); // 1
 * criterionMargin({ mode: "lack_of_fusion", name: "overlap", value: null, threshold: 1, comparison: ">=", fired: true, margin: null }); // 1000
 */
export function criterionMargin(c: CriterionValue): number | null {
  if (c.margin !== null && Number.isFinite(c.margin)) return Math.min(MARGIN_CAP, c.margin);
  return c.fired ? MARGIN_CAP : null;
}

/**
 * The strongest criterion of a mechanism and whether all of its evaluable criteria agree (fire).
 * A mechanism counts as strongly predicted only when its criteria agree and the strongest is past
 * the margin: one indicator alone (the enthalpy rule, say) is not enough to contradict a label.
 */
function strongest(criteria: readonly CriterionValue[], mode: DefectMode): { criterion: CriterionValue; margin: number; agree: boolean } | null {
  let best: { criterion: CriterionValue; margin: number; agree: boolean } | null = null;
  let agree = true;
  for (const c of criteria) {
    if (c.mode !== mode) continue;
    const margin = criterionMargin(c);
    if (margin === null) continue;
    if (!c.fired) agree = false;
    if (!best || margin > best.margin) best = { criterion: c, margin, agree: true };
  }
  return best ? { ...best, agree } : null;
}

export const PHYSICS_RULE_INFO: RuleInfo = {
  code: "physics.outcome_conflict",
  severity: "warning",
  title: "Outcome contradicts the melt-pool criteria",
  description:
    "The recorded outcome disagrees with the melt-pool criteria by more than the margin: labelled dense where a defect is strongly predicted (every criterion of that mechanism fires, one of them beyond the margin), labelled lack of fusion where full fusion is predicted, or labelled keyhole or balling where that criterion is clear and another defect is strongly predicted. Check the outcome and the four process values against the source; the criteria are indicators, so waive with a reason when the source's evidence is clear.",
  source:
    "Eagar & Tsai, Welding Journal 62(12):346s–355s (1983) melt pool; criteria as listed by Sheikh et al., npj Comput. Mater. 10:252 (2024); Tang, Pistorius & Beuth, Addit. Manuf. 14:39–48 (2017) for overlap (from memory)",
  thresholdKeys: ["physics.margin.lackOfFusion", "physics.margin.keyhole", "physics.margin.balling", "physics.lackOfFusion.overlap", "physics.balling.lengthToWidth", "physics.keyhole.widthToDepth"],
  scope: "record",
};

function describe(c: CriterionValue, margin: number): string {
  const quantity = c.name.replace(/\s*(<=|>=|>|≤|≥).*$/, "");
  const how = margin >= MARGIN_CAP ? "no melt pool at all" : margin >= 0 ? `${Math.round(margin * 100)} % beyond` : `${Math.round(-margin * 100)} % clear`;
  const value = c.value === null ? "undefined" : fmt(c.value);
  return `${quantity} = ${value} (${LABEL[c.mode]} at ${c.comparison === "<=" ? "≤" : c.comparison === ">=" ? "≥" : ">"} ${c.threshold === null ? "?" : fmt(c.threshold)}, ${how})`;
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
  const margins: Record<DefectMode, number> = {
    lack_of_fusion: settingOf(settings, "physics.margin.lackOfFusion"),
    keyhole: settingOf(settings, "physics.margin.keyhole"),
    balling: settingOf(settings, "physics.margin.balling"),
  };
  const modes: DefectMode[] = ["lack_of_fusion", "keyhole", "balling"];
  const byMode = new Map(modes.map((m) => [m, strongest(physics.criteria, m)]));
  // Strongly predicted: beyond the mechanism's margin; ordered by how far past it.
  const predicted = modes
    .map((m) => byMode.get(m))
    .filter((x): x is { criterion: CriterionValue; margin: number; agree: boolean } => x !== null && x !== undefined && x.agree && x.margin >= margins[x.criterion.mode])
    .sort((a, b) => b.margin - margins[b.criterion.mode] - (a.margin - margins[a.criterion.mode]));
  const outcome = record.outcome;
  let message: string | null = null;
  if (outcome === "dense" && predicted[0]) {
    const p = predicted[0];
    message = `Labelled dense, but the melt-pool model strongly predicts ${LABEL[p.criterion.mode]}: ${describe(p.criterion, p.margin)}.`;
  } else if (outcome === "lack_of_fusion") {
    const lof = byMode.get("lack_of_fusion");
    if (lof && lof.margin <= -clear(margins.lack_of_fusion)) message = `Labelled lack of fusion, but the melt-pool model predicts full fusion: ${describe(lof.criterion, lof.margin)}.`;
  } else if (outcome === "keyhole" || outcome === "balling") {
    const own = byMode.get(outcome);
    const other = predicted.find((p) => p.criterion.mode !== outcome);
    if (own && own.margin <= -clear(margins[outcome]) && other) {
      message = `Labelled ${LABEL[outcome]}, but that criterion is clear (${describe(own.criterion, own.margin)}) while ${LABEL[other.criterion.mode]} is strongly predicted (${describe(other.criterion, other.margin)}).`;
    }
  }
  if (!message) return null;
  const details = {
    inputs: { outcome: record.outcome, model: physics.model, widthUm: round(physics.meltPool.widthUm), depthUm: round(physics.meltPool.depthUm), lengthUm: round(physics.meltPool.lengthUm), ...physics.inputs() },
    thresholds: { marginLackOfFusion: margins.lack_of_fusion, marginKeyhole: margins.keyhole, marginBalling: margins.balling },
    criteria: physics.criteria.map((c) => ({ mode: c.mode, name: c.name, value: c.value === null ? null : round(c.value), threshold: c.threshold, comparison: c.comparison, fired: c.fired, margin: c.margin === null ? null : round(c.margin) })),
    notes: [...physics.notes],
  };
  return {
    code: PHYSICS_RULE_INFO.code,
    severity: "warning",
    message: `${message} Check the outcome and the process values against the source; waive with the source's evidence if the label stands.`,
    details,
  };
}

/** How far a criterion must be clear to count as clearly not predicted: the margin, at most 50 % (a margin is at most −100 % on that side). */
function clear(margin: number): number {
  return Math.min(margin, 0.5);
}

function round(x: number): number {
  return Number.isFinite(x) ? Number(x.toPrecision(5)) : x;
}
