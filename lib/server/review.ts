/**
 * Use cases of the review queue: act on a flag (waive, fix, reject the record, merge or separate a
 * duplicate pair), accept a record, the same on a selection, and override a source's quality.
 *
 * Every action is one writing transaction (sql().transaction, either engine): the version the
 * reviewer saw is checked (a second reviewer gets a conflict naming who acted, never a lost
 * update), the change and its audit event are written together, and the checks of the records
 * concerned run inside it (runChecksIn). The bodies do database work only, so PostgreSQL may run
 * them again after a serialization failure. A waiver, which changes the flag alone, is one atomic
 * write of the flag and its audit event (setFlagStateAudited) after one read.
 * Bad input (an unknown flag, a stale version, a missing reason) comes back as an error and
 * changes nothing.
 */
import { DUPLICATE_CODES } from "../domain/checks/index";
import { checkHardLimit, parseQuantity } from "../domain/units";
import { energyDensities } from "../domain/energy-density";
import { appendAuditEvent } from "../db/audit";
import { getFlag, getFlagForAction, openFlagsOfRecord, recordsWithOpenFlagsRelatedTo, setFlagStateAudited, setFlagStateIfVersion, type FlagRow } from "../db/flags";
import { getPairDecision, insertPairDecision } from "../db/pairs";
import { getReviewRecord, getSourceOverride, recordIdsOfSource, setSourceQualityOverrideIfVersion, updateRecordIfVersion, type ReviewRecordRow } from "../db/reviews";
import { sql, type SqlExecutor, type SqlValue } from "../db/sql";
import { canonicalKeyOf, normalizeQuantities, RECORD_QUANTITY_FIELDS, RECORD_QUANTITY_FIELD_NAMES, type RecordQuantityField } from "../schemas/record";
import { acceptRecordSchema, bulkFlagActionSchema, flagActionSchema, type FlagAction } from "../schemas/review";
import { sourceQualityOverrideSchema } from "../schemas/review";
import { requireRole, type Actor } from "./actor";
import { isoNow } from "./check-settings";
import { runChecksIn, type CheckRunSummary } from "./checks";
import { AppFailure, fail, guard, invalid, nulRefusal, ok, type Result } from "./result";

export interface FlagActionResult {
  flagId: number;
  action: FlagAction;
  state: string;
  resolution: string | null;
  recordId: number | null;
  recordStatus: string | null;
  recordVersion: number | null;
  /** For a fix: whether the finding went away (false: the value was saved but the flag stays open). */
  resolved: boolean;
  checks: CheckRunSummary | null;
}

const DUPLICATES = new Set(DUPLICATE_CODES);

function failure(code: "not_found" | "conflict" | "invalid_input", message: string, details?: Record<string, unknown>): never {
  throw new AppFailure(details ? { code, message, details } : { code, message });
}

function describeState(f: FlagRow): string {
  if (f.state === "open") return "open";
  return `${f.state}${f.resolution ? ` (${f.resolution})` : ""}${f.resolvedAt ? ` at ${f.resolvedAt}` : ""}`;
}

type ActionFlag = NonNullable<Awaited<ReturnType<typeof getFlagForAction>>>;

/** The flag as the reviewer saw it, or a failure: not found, changed since (naming who acted), no longer open. */
async function loadFlagForAction(db: SqlExecutor, flagId: number, version: number | null): Promise<ActionFlag> {
  const flag = await getFlagForAction(db, flagId);
  if (!flag) failure("not_found", `There is no flag ${flagId}.`);
  if (version !== null && flag.version !== version) {
    const who = flag.resolvedByName;
    failure(
      "conflict",
      `Flag ${flagId} changed since you loaded it (you saw version ${version}, it is now version ${flag.version}, ${describeState(flag)}${who ? ` by ${who}` : ""}). Nothing was changed; reload to see it.`,
      { currentVersion: flag.version, state: flag.state },
    );
  }
  if (flag.state !== "open") failure("conflict", `Flag ${flagId} is already ${describeState(flag)}; nothing was changed.`, { currentVersion: flag.version, state: flag.state });
  return flag;
}

async function recordOf(db: SqlExecutor, flag: FlagRow): Promise<ReviewRecordRow> {
  if (flag.recordId === null) failure("invalid_input", `Flag ${flag.id} belongs to no record.`);
  const rec = await getReviewRecord(db, flag.recordId);
  if (!rec) failure("not_found", `Record ${flag.recordId} of flag ${flag.id} does not exist.`);
  return rec;
}

function audit(db: SqlExecutor, actor: Actor, action: string, entityType: string, entityId: number | string, before: unknown, after: unknown, reason: string | null, at: string): Promise<void> {
  return appendAuditEvent(db, { actorId: actor.id, actorName: actor.name, action, entityType, entityId, before, after, reason, at });
}

/** The flag changed between reading and writing it (only when the version was not given). */
function lostRace(flagId: number): never {
  failure("conflict", `Flag ${flagId} changed while saving; nothing was changed. Reload and try again.`);
}

/** Resolves the open flags of a record (apart from `except`) with the record's fate, audited. */
async function closeRecordFlags(db: SqlExecutor, recordId: number, resolution: string, reason: string | null, actor: Actor, at: string, except: number): Promise<void> {
  for (const f of await openFlagsOfRecord(db, recordId)) {
    if (f.id === except) continue;
    if (await setFlagStateIfVersion(db, f.id, f.version, { state: "resolved", resolution, reason, actorId: actor.id, at })) {
      await audit(db, actor, resolution, "flag", f.id, { state: "open" }, { state: "resolved", resolution }, reason, at);
    }
  }
}

function parseEntered(text: string): Partial<Record<RecordQuantityField, { text: string; unit: string; provenance: string }>> {
  try {
    const v: unknown = JSON.parse(text);
    return v && typeof v === "object" ? (v as Partial<Record<RecordQuantityField, { text: string; unit: string; provenance: string }>>) : {};
  } catch {
    return {};
  }
}

/** The record columns a corrected value changes: its canonical value, what was entered, and E_v. */
function fixedColumns(rec: ReviewRecordRow, field: RecordQuantityField, value: string, unit: string): Record<string, SqlValue> {
  const quantity = RECORD_QUANTITY_FIELDS[field];
  const parsed = parseQuantity(unit ? `${value} ${unit}` : value, quantity);
  if (!parsed.ok) failure("invalid_input", parsed.message, { fieldErrors: { "fix.value": [parsed.message] } });
  const limit = checkHardLimit(parsed.value, quantity);
  if (limit) failure("invalid_input", limit, { fieldErrors: { "fix.value": [limit] } });
  const blank = Object.fromEntries(RECORD_QUANTITY_FIELD_NAMES.map((f) => [f, { value: "", unit: "" }])) as Record<RecordQuantityField, { value: string; unit: string }>;
  const normalized = normalizeQuantities({ ...blank, [field]: { value, unit }, spotDefinition: (rec.spotDefinition as "one_over_e2" | "d4sigma" | "fwhm" | null) ?? null, provenance: {} });
  const key = canonicalKeyOf(field) as keyof ReviewRecordRow;
  const canonical = normalized[key as keyof typeof normalized] as number | null;
  const entered = parseEntered(rec.enteredValues);
  entered[field] = { text: value, unit: unit || parsed.unit, provenance: "reported" };
  const next = { ...rec, [key]: canonical } as ReviewRecordRow;
  const ev = energyDensities({ laserPowerW: next.laserPowerW, scanSpeedMmPerS: next.scanSpeedMmPerS, hatchSpacingUm: next.hatchSpacingUm, layerThicknessUm: next.layerThicknessUm }).volumetricJPerMm3;
  return { [key]: canonical, volumetricEnergyJMm3: ev, enteredValues: JSON.stringify(entered) };
}

function suggestedFixOf(flag: FlagRow): { field: RecordQuantityField; value: string; unit: string } | null {
  const s = flag.details.suggestedFix as { field?: unknown; value?: unknown; unit?: unknown } | undefined;
  if (!s || typeof s.field !== "string" || typeof s.value !== "string" || !(RECORD_QUANTITY_FIELD_NAMES as string[]).includes(s.field)) return null;
  return { field: s.field as RecordQuantityField, value: s.value, unit: typeof s.unit === "string" ? s.unit : "" };
}

type ParsedAction = ReturnType<typeof flagActionSchema.parse>;

/** Refuses an action on a flag whose record is gone, rejected or merged. */
function requireActionable(flag: ActionFlag): void {
  if (flag.recordId === null) failure("invalid_input", `Flag ${flag.id} belongs to no record.`);
  if (flag.recordStatus === null) failure("not_found", `Record ${flag.recordId} of flag ${flag.id} does not exist.`);
  if (flag.recordStatus === "rejected" || flag.recordStatus === "merged") failure("conflict", `Record ${flag.recordId} is ${flag.recordStatus}; its flags can no longer be acted on.`);
}

/**
 * A waiver changes the flag alone (no record, no re-check): one read to check what the reviewer
 * saw, then the change and its audit event in one atomic write (setFlagStateAudited), which lands
 * only if the flag is still open at that version. Kept this lean because reviewers waive in bulk
 * and many at once.
 */
async function waiveFlag(input: ParsedAction, actor: Actor): Promise<FlagActionResult> {
  const db = sql();
  const flag = await loadFlagForAction(db, input.flagId, input.version);
  requireActionable(flag);
  const at = isoNow();
  const done = await setFlagStateAudited(db, flag.id, flag.version, { state: "waived", resolution: "waive", reason: input.reason, actorId: actor.id, at }, {
    actorId: actor.id, actorName: actor.name, action: "waive", entityType: "flag", entityId: flag.id,
    before: { state: "open", ruleCode: flag.ruleCode, recordId: flag.recordId }, after: { state: "waived" }, reason: input.reason,
  });
  if (!done) {
    // someone acted between the read and the write: say who and what, as for a stale version
    requireActionable(await loadFlagForAction(db, flag.id, flag.version));
    lostRace(flag.id);
  }
  return {
    flagId: flag.id, action: "waive", state: "waived", resolution: "waive", recordId: flag.recordId, recordStatus: flag.recordStatus, recordVersion: flag.recordVersion, resolved: true, checks: null,
  };
}

/** One action on one flag; a waiver goes its own lean way, every other action is one transaction. */
function actOnFlag(input: ParsedAction, actor: Actor): Promise<FlagActionResult> {
  return input.action === "waive" ? waiveFlag(input, actor) : sql().transaction((tx) => act(tx, input, actor));
}

async function act(db: SqlExecutor, input: ParsedAction, actor: Actor): Promise<FlagActionResult> {
  const at = isoNow();
  const flag = await loadFlagForAction(db, input.flagId, input.version);
  requireActionable(flag);
  const reason = input.reason;
  const rec = await recordOf(db, flag);
  let checks: CheckRunSummary | null = null;
  let resolved = true;
  switch (input.action) {
    case "waive":
      throw new RangeError("act: a waiver goes through waiveFlag");
    case "fix": {
      if (input.recordVersion !== null && input.recordVersion !== rec.version) {
        failure("conflict", `Record ${rec.id} was saved after you loaded it (you saw version ${input.recordVersion}, it is now version ${rec.version}). Nothing was changed; reload to see it.`, { currentVersion: rec.version });
      }
      const fix = input.fix ?? suggestedFixOf(flag);
      if (!fix) failure("invalid_input", `Flag ${flag.id} (${flag.ruleCode}) has no suggested fix: give the field, the corrected value and its unit.`, { fieldErrors: { "fix.value": ["Enter the corrected value."] } });
      const set = fixedColumns(rec, fix.field, fix.value, fix.unit);
      if (!(await updateRecordIfVersion(db, rec.id, rec.version, set, actor.id, at))) failure("conflict", `Record ${rec.id} changed while saving; nothing was changed. Reload and try again.`);
      const entered = parseEntered(rec.enteredValues)[fix.field];
      await audit(db, actor, "update", "record", rec.id, { [fix.field]: entered ?? null }, { [fix.field]: { text: fix.value, unit: fix.unit } }, reason ?? `fixed from review (flag ${flag.id}, ${flag.ruleCode})`, at);
      checks = await runChecksIn(db, [rec.id], { actor, fixedFlag: { id: flag.id, reason: reason ?? `${fix.field} set to ${fix.value} ${fix.unit}`.trim() } });
      const after = (await getFlag(db, flag.id))!;
      resolved = after.state !== "open";
      await audit(db, actor, "fix", "flag", flag.id, { state: "open" }, { state: after.state, resolution: after.resolution }, reason, at);
      break;
    }
    case "reject": {
      if (!(await updateRecordIfVersion(db, rec.id, input.recordVersion ?? rec.version, { status: "rejected" }, actor.id, at))) {
        failure("conflict", `Record ${rec.id} was saved after you loaded it (now version ${rec.version}). Nothing was changed; reload to see it.`, { currentVersion: rec.version });
      }
      await audit(db, actor, "reject", "record", rec.id, { status: rec.status }, { status: "rejected" }, reason, at);
      if (!(await setFlagStateIfVersion(db, flag.id, flag.version, { state: "resolved", resolution: "reject", reason, actorId: actor.id, at }))) lostRace(flag.id);
      await audit(db, actor, "reject", "flag", flag.id, { state: "open" }, { state: "resolved", resolution: "reject" }, reason, at);
      await closeRecordFlags(db, rec.id, "reject", reason, actor, at, flag.id);
      const affected = await recordsWithOpenFlagsRelatedTo(db, [rec.id], DUPLICATE_CODES);
      if (affected.length) checks = await runChecksIn(db, affected, { actor });
      break;
    }
    case "merge":
    case "distinct": {
      if (!DUPLICATES.has(flag.ruleCode) || flag.relatedRecordId === null) {
        failure("invalid_input", `Flag ${flag.id} (${flag.ruleCode}) is not a duplicate pair; ${input.action} applies to duplicate and label-conflict flags only.`);
      }
      const other = await getReviewRecord(db, flag.relatedRecordId);
      if (!other) failure("not_found", `Record ${flag.relatedRecordId} of the pair does not exist.`);
      const existing = await getPairDecision(db, rec.id, other.id);
      if (existing) failure("conflict", `Records ${Math.min(rec.id, other.id)} and ${Math.max(rec.id, other.id)} were already marked ${existing.decision} at ${existing.decidedAt}; nothing was changed.`);
      if (input.action === "merge" && (other.status === "rejected" || other.status === "merged")) {
        failure("conflict", `Record ${other.id} is ${other.status}; merge into a record that is still in the collection.`);
      }
      await insertPairDecision(db, { a: rec.id, b: other.id, decision: input.action === "merge" ? "merged" : "distinct", reason, actorId: actor.id, at });
      if (!(await setFlagStateIfVersion(db, flag.id, flag.version, { state: "resolved", resolution: input.action, reason, actorId: actor.id, at }))) lostRace(flag.id);
      await audit(db, actor, input.action, "flag", flag.id, { state: "open", pair: [other.id, rec.id] }, { state: "resolved", resolution: input.action }, reason, at);
      if (input.action === "merge") {
        if (!(await updateRecordIfVersion(db, rec.id, input.recordVersion ?? rec.version, { status: "merged", mergedIntoId: other.id }, actor.id, at))) {
          failure("conflict", `Record ${rec.id} was saved after you loaded it (now version ${rec.version}). Nothing was changed; reload to see it.`, { currentVersion: rec.version });
        }
        await audit(db, actor, "merge", "record", rec.id, { status: rec.status, mergedIntoId: null }, { status: "merged", mergedIntoId: other.id }, reason, at);
        await closeRecordFlags(db, rec.id, "merge", reason ?? `merged into record ${other.id}`, actor, at, flag.id);
        checks = await runChecksIn(db, [other.id, ...(await recordsWithOpenFlagsRelatedTo(db, [rec.id], DUPLICATE_CODES))], { actor });
      } else {
        checks = await runChecksIn(db, [rec.id], { actor });
      }
      break;
    }
  }
  const after = (await getFlag(db, flag.id))!;
  const recAfter = (await getReviewRecord(db, rec.id))!;
  return { flagId: flag.id, action: input.action, state: after.state, resolution: after.resolution, recordId: rec.id, recordStatus: recAfter.status, recordVersion: recAfter.version, resolved, checks };
}

/**
 * One action on one flag. Waive, reject and distinct need a reason; fix takes the corrected value
 * (the flag's suggested fix when none is given) and is checked against the record version too.
 */
export async function resolveFlag(input: unknown, actor: Actor): Promise<Result<FlagActionResult>> {
  return guard(async () => {
    requireRole(actor, "reviewer");
    const nul = nulRefusal(input);
    if (nul) return nul;
    const parsed = flagActionSchema.safeParse(input);
    if (!parsed.success) return invalid(parsed.error, "The action needs attention; nothing was changed.");
    return ok(await actOnFlag(parsed.data, actor));
  });
}

export interface BulkItemResult {
  flagId: number;
  ok: boolean;
  error?: { code: string; message: string };
  result?: FlagActionResult;
}

/**
 * The same action on a selection of flags. Each flag is its own transaction: one that changed
 * meanwhile is reported as a conflict and the others still go through.
 */
export async function resolveFlagsBulk(input: unknown, actor: Actor): Promise<Result<{ done: number; failed: number; items: BulkItemResult[] }>> {
  return guard(async () => {
    requireRole(actor, "reviewer");
    const nul = nulRefusal(input);
    if (nul) return nul;
    const parsed = bulkFlagActionSchema.safeParse(input);
    if (!parsed.success) return invalid(parsed.error, "The bulk action needs attention; nothing was changed.");
    const items: BulkItemResult[] = [];
    for (const item of parsed.data.items) {
      try {
        const result = await actOnFlag({ flagId: item.flagId, version: item.version, recordVersion: null, action: parsed.data.action, reason: parsed.data.reason, fix: null }, actor);
        items.push({ flagId: item.flagId, ok: true, result });
      } catch (error) {
        if (error instanceof AppFailure) items.push({ flagId: item.flagId, ok: false, error: { code: error.error.code, message: error.error.message } });
        else throw error;
      }
    }
    const done = items.filter((i) => i.ok).length;
    return ok({ done, failed: items.length - done, items });
  });
}

/**
 * Accepts a record: refused while an error flag of it is open. Its open warnings and notes are
 * resolved as accepted with it.
 */
export async function acceptRecord(input: unknown, actor: Actor): Promise<Result<{ recordId: number; version: number; acceptedFlags: number }>> {
  return guard(async () => {
    requireRole(actor, "reviewer");
    const nul = nulRefusal(input);
    if (nul) return nul;
    const parsed = acceptRecordSchema.safeParse(input);
    if (!parsed.success) return invalid(parsed.error, "The action needs attention; nothing was changed.");
    return sql().transaction(async (db): Promise<Result<{ recordId: number; version: number; acceptedFlags: number }>> => {
      const at = isoNow();
      const { recordId, version, reason } = parsed.data;
      const rec = await getReviewRecord(db, recordId);
      if (!rec) return fail("not_found", `There is no record ${recordId}.`);
      if (version !== null && rec.version !== version) {
        return fail("conflict", `Record ${recordId} was saved after you loaded it (you saw version ${version}, it is now version ${rec.version}). Nothing was changed; reload to see it.`, { currentVersion: rec.version });
      }
      if (rec.status === "accepted") return fail("conflict", `Record ${recordId} is already accepted.`);
      if (rec.status === "rejected" || rec.status === "merged") return fail("conflict", `Record ${recordId} is ${rec.status}; it cannot be accepted.`);
      const open = await openFlagsOfRecord(db, recordId);
      const errors = open.filter((f) => f.severity === "error");
      if (errors.length) {
        return fail("conflict", `Record ${recordId} still has ${errors.length} open error flag${errors.length === 1 ? "" : "s"} (${errors.map((f) => `${f.ruleCode} #${f.id}`).join(", ")}); fix, waive or resolve them first.`, { openErrors: errors.map((f) => f.id) });
      }
      if (!(await updateRecordIfVersion(db, recordId, rec.version, { status: "accepted" }, actor.id, at))) return fail("conflict", `Record ${recordId} changed while saving; reload and try again.`);
      await audit(db, actor, "accept", "record", recordId, { status: rec.status }, { status: "accepted" }, reason, at);
      for (const f of open) {
        if (!(await setFlagStateIfVersion(db, f.id, f.version, { state: "resolved", resolution: "accept", reason: reason ?? "accepted with the record", actorId: actor.id, at }))) lostRace(f.id);
        await audit(db, actor, "accept", "flag", f.id, { state: "open" }, { state: "resolved", resolution: "accept" }, reason ?? "accepted with the record", at);
      }
      return ok({ recordId, version: rec.version + 1, acceptedFlags: open.length });
    });
  });
}

/**
 * Sets or clears a reviewer's override of a source's quality score (a reason is required to set
 * one) and recomputes the quality of the source's records.
 */
export async function setSourceQualityOverride(input: unknown, actor: Actor): Promise<Result<{ sourceId: number; version: number; records: number }>> {
  return guard(async () => {
    requireRole(actor, "reviewer");
    const nul = nulRefusal(input);
    if (nul) return nul;
    const parsed = sourceQualityOverrideSchema.safeParse(input);
    if (!parsed.success) return invalid(parsed.error, "The override needs attention; nothing was changed.");
    return sql().transaction(async (db): Promise<Result<{ sourceId: number; version: number; records: number }>> => {
      const at = isoNow();
      const { sourceId, version, score, reason } = parsed.data;
      const before = await getSourceOverride(db, sourceId);
      if (!before) return fail("not_found", `There is no source ${sourceId}.`);
      if (!(await setSourceQualityOverrideIfVersion(db, sourceId, version, score, score === null ? null : reason, actor.id, at))) {
        return fail("conflict", `Source ${sourceId} was saved after you loaded it (you saw version ${version}, it is now version ${before.version}). Nothing was changed; reload to see it.`, { currentVersion: before.version });
      }
      await audit(db, actor, score === null ? "clear_quality_override" : "quality_override", "source", sourceId, { qualityOverride: before.qualityOverride, reason: before.qualityOverrideReason }, { qualityOverride: score }, reason, at);
      const ids = await recordIdsOfSource(db, sourceId);
      if (ids.length) await runChecksIn(db, ids, { actor });
      return ok({ sourceId, version: version + 1, records: ids.length });
    });
  });
}
