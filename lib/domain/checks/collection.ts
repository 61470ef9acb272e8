/**
 * Rules that need the other records: duplicates (exact, near, label conflict) and neighbour
 * disagreement. The detection lives in duplicates.ts and neighbours.ts; this file turns their
 * results into findings and lists the rules in the catalogue.
 */
import { settingOf, type CheckSettings } from "../check-settings";
import { outcomeLabel, isOutcome } from "../outcomes";
import type { PairKind } from "../duplicates";
import type { Neighbour } from "../neighbours";
import type { CheckRecord, Finding, RuleInfo } from "./types";

const DUPLICATE_SOURCE = "DOMAIN.md, \"Duplicates\" (tolerances: P ±1 % or 2 W, v ±1 %, h and t ±1 µm, d ±2 µm, each element within 0.5 wt%)";

export const DUPLICATE_RULE_INFO: Record<PairKind, RuleInfo> = {
  exact: {
    code: "duplicate.exact",
    severity: "error",
    title: "Exact duplicate",
    description: "The record repeats an earlier record of the same source value for value (each value rounded to the precision it was entered with): double entry or a repeated row. Merge it into the earlier record, or mark the pair distinct if they really are two builds.",
    source: DUPLICATE_SOURCE,
    thresholdKeys: [],
    scope: "collection",
  },
  near: {
    code: "duplicate.near",
    severity: "warning",
    title: "Near duplicate",
    description: "Same alloy, every process value within tolerance and the same result as an earlier record, in this source or another: republished data, double entry or a fill-down error. Merge, or mark the pair distinct.",
    source: DUPLICATE_SOURCE,
    thresholdKeys: ["duplicates.power.relPct", "duplicates.power.absW", "duplicates.speed.relPct", "duplicates.hatch.absUm", "duplicates.layer.absUm", "duplicates.spot.absUm", "duplicates.composition.wtPct", "duplicates.density.samePct"],
    scope: "collection",
  },
  label_conflict: {
    code: "duplicate.label_conflict",
    severity: "warning",
    title: "Same parameters, conflicting outcome",
    description: "An earlier record has the same alloy and process values (within tolerance) but a different outcome, or a relative density further apart than replicate specimens would be. One of the two labels, or one of the values, is probably wrong: check both against their sources, fix the wrong one, or mark the pair distinct.",
    source: DUPLICATE_SOURCE,
    thresholdKeys: ["duplicates.power.relPct", "duplicates.power.absW", "duplicates.speed.relPct", "duplicates.hatch.absUm", "duplicates.layer.absUm", "duplicates.spot.absUm", "duplicates.composition.wtPct", "duplicates.density.conflictPct"],
    scope: "collection",
  },
};

export const NEIGHBOUR_RULE_INFO: RuleInfo = {
  code: "neighbours.disagree",
  severity: "warning",
  title: "Neighbours disagree",
  description: "Most of the record's nearest neighbours in normalized parameter space (same alloy, known outcome, within the search radius) carry another outcome. The label or a process value may be wrong; check them against the source, or waive if the source's evidence is clear (process windows do have sharp edges).",
  source: "common practice (consistency of labels in parameter space); k, radius and share are project defaults (from memory)",
  thresholdKeys: ["neighbours.count", "neighbours.minCount", "neighbours.disagreeFraction", "neighbours.radius", "neighbours.scale.power", "neighbours.scale.speed", "neighbours.scale.hatch", "neighbours.scale.layer"],
  scope: "collection",
};

const label = (outcome: string) => (isOutcome(outcome) ? outcomeLabel(outcome).toLowerCase() : outcome);

/**
 * The finding for a record paired with an earlier one.
 *
 * @example
 * duplicateFinding(record, earlier, "exact", [earlier.id]).code; // "duplicate.exact"
 */
export function duplicateFinding(record: CheckRecord, related: CheckRecord, kind: PairKind, others: readonly number[]): Finding {
  const info = DUPLICATE_RULE_INFO[kind];
  const where = related.sourceId === record.sourceId ? "the same source" : `source ${related.sourceId}`;
  const more = others.length > 1 ? ` (earlier matches: ${others.slice(0, 10).map((id) => `#${id}`).join(", ")}${others.length > 10 ? ", …" : ""})` : "";
  let message: string;
  if (kind === "exact") message = `Repeats record #${related.id} of ${where} value for value${more}. Merge it into #${related.id}, or mark the pair distinct if they are two builds.`;
  else if (kind === "near") message = `Matches record #${related.id} of ${where} within the duplicate tolerances, with the same result${more}. Merge if it is the same build reported twice; otherwise mark the pair distinct.`;
  else {
    const what =
      record.outcome !== related.outcome
        ? `outcome ${label(record.outcome)} here, ${label(related.outcome)} there`
        : `relative density ${record.relativeDensityPct} % here, ${related.relativeDensityPct} % there`;
    message = `Same parameters as record #${related.id} of ${where}, but ${what}${more}. Check both against their sources and fix the wrong one, or mark the pair distinct.`;
  }
  return {
    code: info.code,
    severity: info.severity,
    message,
    relatedRecordId: related.id,
    details: {
      kind,
      others: others.slice(0, 50),
      inputs: {
        laserPowerW: record.laserPowerW,
        scanSpeedMmPerS: record.scanSpeedMmPerS,
        hatchSpacingUm: record.hatchSpacingUm,
        layerThicknessUm: record.layerThicknessUm,
        spotDiameterUm: record.spotDiameterUm,
        outcome: record.outcome,
        relativeDensityPct: record.relativeDensityPct,
        relatedOutcome: related.outcome,
        relatedRelativeDensityPct: related.relativeDensityPct,
      },
    },
  };
}

/**
 * The neighbour-disagreement finding for a record, or null when too few neighbours are near or
 * enough of them agree.
 *
 * @example
 * neighbourFinding(denseRecord, sixKeyholeNeighbours, defaultCheckSettings())?.code; // "neighbours.disagree"
 */
export function neighbourFinding(record: CheckRecord, neighbours: readonly Neighbour[], settings: CheckSettings): Finding | null {
  const minCount = settingOf(settings, "neighbours.minCount");
  const share = settingOf(settings, "neighbours.disagreeFraction");
  if (neighbours.length < minCount || neighbours.length === 0) return null;
  const others = neighbours.filter((n) => n.outcome !== record.outcome);
  const fraction = others.length / neighbours.length;
  if (fraction + 1e-12 < share) return null;
  const counts = new Map<string, number>();
  for (const n of others) counts.set(n.outcome, (counts.get(n.outcome) ?? 0) + 1);
  const [majority, majorityCount] = [...counts.entries()].sort((a, b) => b[1] - a[1] || a[0].localeCompare(b[0]))[0]!;
  return {
    code: NEIGHBOUR_RULE_INFO.code,
    severity: NEIGHBOUR_RULE_INFO.severity,
    message: `Labelled ${label(record.outcome)}, but ${others.length} of its ${neighbours.length} nearest neighbours (same alloy) carry another outcome, ${majorityCount} of them ${label(majority)}. Check the outcome and the process values against the source; waive if the source's evidence is clear.`,
    details: {
      inputs: { outcome: record.outcome, disagreeing: others.length, compared: neighbours.length, majorityOutcome: majority },
      thresholds: { minCount, disagreeFraction: share },
      neighbours: neighbours.map((n) => ({ id: n.id, outcome: n.outcome, distance: Number(n.distance.toFixed(3)) })),
    },
  };
}
