/**
 * The rule catalogue and the entry points that run it.
 *
 * Every rule has a stable code (the key of flags), a severity, a message that says how to fix the
 * finding, the source it rests on and the setting keys it reads. `RULE_CATALOGUE` lists them all
 * for the rules page; `checkRecords` runs them over a set of records.
 */
import { settingOf, type CheckSettings } from "../check-settings";
import { findDuplicatePairs, pairsForReview, tolerancesFrom, type DuplicatePair } from "../duplicates";
import { forEachNeighbourhood, neighbourParamsFrom } from "../neighbours";
import { ASSUMED_RULES } from "./assumed";
import { DUPLICATE_RULE_INFO, duplicateFinding, NEIGHBOUR_RULE_INFO, neighbourFinding } from "./collection";
import { COMPOSITION_RULES } from "./composition";
import { CROSS_FIELD_RULES } from "./cross-field";
import { outcomeVersusPhysics, PHYSICS_RULE_INFO, type PhysicsAssessment } from "./physics";
import type { CheckRecord, Finding, RecordRule, RuleInfo } from "./types";
import { VALUE_RULES } from "./values";

export type { CheckRecord, Finding, RuleInfo, Severity, CheckedField, FindingDetails } from "./types";
export { SEVERITY_RANK } from "./types";
export type { PhysicsAssessment, CriterionValue, DefectMode } from "./physics";

/** Rules judged from one record alone, in catalogue order. */
export const RECORD_RULES: readonly RecordRule[] = [...VALUE_RULES, ...CROSS_FIELD_RULES, ...COMPOSITION_RULES, ...ASSUMED_RULES];

/** Every rule, in the order the rules page lists them. */
export const RULE_CATALOGUE: readonly RuleInfo[] = [
  ...RECORD_RULES.flatMap((r) => r.infos),
  PHYSICS_RULE_INFO,
  DUPLICATE_RULE_INFO.exact,
  DUPLICATE_RULE_INFO.near,
  DUPLICATE_RULE_INFO.label_conflict,
  NEIGHBOUR_RULE_INFO,
];

const BY_CODE = new Map(RULE_CATALOGUE.map((r) => [r.code, r]));

/** Codes of the rules whose findings depend on other records. */
export const DUPLICATE_CODES: readonly string[] = [DUPLICATE_RULE_INFO.exact.code, DUPLICATE_RULE_INFO.near.code, DUPLICATE_RULE_INFO.label_conflict.code];

/** The catalogue entry of a code, or undefined. @example ruleInfo("duplicate.exact")?.severity; // "error" */
export function ruleInfo(code: string): RuleInfo | undefined {
  return BY_CODE.get(code);
}

/**
 * Findings of the single-record rules (and the physics rule when an assessment is given).
 *
 * @example
 * checkRecord({ ...record, scanSpeedMmPerS: 0.8, entered: { scanSpeed: { text: "0.8", unit: "mm/s" } } }, defaultCheckSettings())
 * // [{ code: "unit_slip.scan_speed", severity: "warning", details: { suggestedFix: { unit: "m/s", ... } }, ... }, ...]
 */
export function checkRecord(record: CheckRecord, settings: CheckSettings, physics: PhysicsAssessment | null = null): Finding[] {
  const out: Finding[] = [];
  for (const rule of RECORD_RULES) {
    const f = rule.check(record, settings);
    if (f) out.push(f);
  }
  const p = outcomeVersusPhysics(record, physics, settings);
  if (p) out.push(p);
  return out;
}

export interface CheckRecordsOptions {
  /** Records whose single-record and neighbour findings are wanted; all when absent. */
  targets?: ReadonlySet<number>;
  /** Pairs marked distinct by a reviewer. */
  isDistinct?: (a: number, b: number) => boolean;
  /** The melt-pool assessment of a record, or null when it cannot be made. */
  physics?: (record: CheckRecord) => PhysicsAssessment | null;
}

export interface CheckRecordsResult {
  /** Single-record, physics and neighbour findings of each target. */
  findings: Map<number, Finding[]>;
  /** Duplicate findings of every record in the set (they are cheap and others' depend on them). */
  duplicateFindings: Map<number, Finding[]>;
  pairs: DuplicatePair[];
}

/**
 * Runs every rule over a set of records (typically all records of the alloys concerned): the
 * single-record rules and neighbours for the targets, duplicates for everyone.
 *
 * @example
 * const { findings, duplicateFindings } = checkRecords(records, defaultCheckSettings());
 */
export function checkRecords(records: readonly CheckRecord[], settings: CheckSettings, options: CheckRecordsOptions = {}): CheckRecordsResult {
  const targets = options.targets;
  const findings = new Map<number, Finding[]>();
  for (const r of records) {
    if (targets && !targets.has(r.id)) continue;
    findings.set(r.id, checkRecord(r, settings, options.physics ? options.physics(r) : null));
  }
  const minCount = settingOf(settings, "neighbours.minCount");
  const share = settingOf(settings, "neighbours.disagreeFraction");
  forEachNeighbourhood(records, neighbourParamsFrom(settings), targets, (i, found, indices, distances) => {
    if (found < minCount || found === 0) return;
    const record = records[i]!;
    let disagreeing = 0;
    for (let k = 0; k < found; k++) if (records[indices[k]!]!.outcome !== record.outcome) disagreeing++;
    if (disagreeing / found + 1e-12 < share) return; // the common case: no objects built
    const list = Array.from({ length: found }, (_, k) => ({ id: records[indices[k]!]!.id, outcome: records[indices[k]!]!.outcome, distance: distances[k]! }));
    const f = neighbourFinding(record, list, settings);
    if (f) findings.get(record.id)?.push(f);
  });
  const pairs = findDuplicatePairs(records, tolerancesFrom(settings), { isDistinct: options.isDistinct });
  const duplicateFindings = new Map<number, Finding[]>();
  for (const p of pairsForReview(pairs)) {
    const f = duplicateFinding(byId(records, p.recordId), byId(records, p.relatedId), p.kind, p.others);
    const list = duplicateFindings.get(p.recordId);
    if (list) list.push(f);
    else duplicateFindings.set(p.recordId, [f]);
  }
  return { findings, duplicateFindings, pairs };
}

const indexCache = new WeakMap<readonly CheckRecord[], Map<number, CheckRecord>>();
function byId(records: readonly CheckRecord[], id: number): CheckRecord {
  let index = indexCache.get(records);
  if (!index) indexCache.set(records, (index = new Map(records.map((r) => [r.id, r]))));
  const r = index.get(id);
  if (!r) throw new RangeError(`checkRecords: no record ${id} in the set`);
  return r;
}
