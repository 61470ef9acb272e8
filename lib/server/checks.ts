/**
 * Use case: run the checks over some records or all of them, and keep the flags in step.
 *
 * One flag per finding (its fingerprint: rule, record, related record). A run inserts new
 * findings, refreshes the wording of open flags, reopens a flag whose finding came back after it
 * went stale or was fixed, and resolves open flags whose finding disappeared as "stale". Waived
 * and reviewer-resolved flags are left alone. Every flag records the settings version it was
 * raised or refreshed under, and each record's quality score (source score × completeness) is
 * recomputed. Duplicates and neighbours look at every active record of the alloys concerned.
 */
import { checkRecords, DUPLICATE_CODES, type Finding } from "../domain/checks/index";
import type { CheckSettings } from "../domain/check-settings";
import { physicsProvider } from "../domain/checks/physics-input";
import { completenessValueOf, recordQuality } from "../domain/record-quality";
import { scoreSource } from "../domain/source-quality";
import { appendAuditEvent } from "../db/audit";
import { loadCheckRecords, loadPropertyOverrides, loadSourceAttributes, recordKeys, reopenAcceptedRecords, writeQualityScores, type CheckInputRow } from "../db/check-inputs";
import type { RecordWrite } from "../db/records";
import { flagFingerprint, flagsForRun, insertFlags, recordsWithOpenFlagsRelatedTo, refreshFlags, reopenFlags, resolveFlagsAuto, type FlagForRun, type FlagWrite } from "../db/flags";
import { distinctPairKeys, pairKey } from "../db/pairs";
import { sql, type SqlExecutor } from "../db/sql";
import { z } from "zod";
import { requireRole, type Actor } from "./actor";
import { checkSettingsVersion, currentCheckSettings, isoNow, type SettingsVersionInfo } from "./check-settings";
import { fail, guard, invalid, nulRefusal, ok, type Result } from "./result";
import { rowIdSchema } from "../schemas/ids";

export interface CheckRunSummary {
  settingsVersion: number;
  /** Records whose checks ran. */
  records: number;
  opened: number;
  reopened: number;
  refreshed: number;
  stale: number;
  /** Open flags of the checked records after the run, by rule code. */
  openByCode: Record<string, number>;
  qualityUpdated: number;
  /** Accepted records sent back to review because an error flag opened on them. */
  backToReview: number[];
  ms: number;
}

/** Resolutions after which a finding that comes back is raised again. */
const REOPENABLE = new Set(["stale", "fix"]);

export interface RunChecksOptions {
  /** Run under this settings version instead of the newest (a reproducible re-run). */
  settingsVersion?: SettingsVersionInfo;
  actor?: Actor | null;
  /** The flag being fixed: if its finding disappears it is resolved as "fix", not "stale". */
  fixedFlag?: { id: number; reason: string | null } | null;
  now?: () => Date;
}

/**
 * Runs the checks inside the caller's open writing transaction (`tx` of sql().transaction), so
 * they commit with whatever the caller changed. `scope` "all" checks every active record; a list
 * checks those records (and refreshes the duplicate flags of records that pair with them).
 * Database work only: on PostgreSQL the transaction may run it again after a serialization failure.
 */
export async function runChecksIn(tx: SqlExecutor, scope: "all" | readonly number[], options: RunChecksOptions = {}): Promise<CheckRunSummary> {
  const started = performance.now();
  const settings = options.settingsVersion ?? (await currentCheckSettings(tx));
  const at = isoNow((options.now ?? (() => new Date()))());
  let loaded: CheckInputRow[];
  let targets: Set<number> | undefined;
  if (scope === "all") loaded = await loadCheckRecords(tx, "all");
  else {
    const keys = (await recordKeys(tx, [...new Set(scope)])).filter((k) => k.status !== "rejected" && k.status !== "merged");
    targets = new Set(keys.map((k) => k.id));
    loaded = await loadCheckRecords(tx, [...new Set(keys.map((k) => k.alloyKey))]);
  }
  const distinct = await distinctPairKeys(tx);
  const result = checkRecords(loaded, settings.values, {
    targets,
    isDistinct: (a, b) => distinct.has(pairKey(a, b)),
    physics: physicsProvider(settings.values, await loadPropertyOverrides(tx)),
  });
  const byId = new Map(loaded.map((r) => [r.id, r]));

  // Which records get which rules re-judged.
  const fullIds = targets ? [...targets] : loaded.map((r) => r.id);
  const dupOnly = new Set<number>();
  if (targets) {
    for (const p of result.pairs) {
      if (targets.has(p.a) && !targets.has(p.b)) dupOnly.add(p.b);
    }
    for (const id of await recordsWithOpenFlagsRelatedTo(tx, fullIds, DUPLICATE_CODES)) if (!targets.has(id)) dupOnly.add(id);
  }
  const none: Finding[] = [];
  const wanted = new Map<number, Finding[]>();
  for (const id of fullIds) {
    const own = result.findings.get(id) ?? none;
    const dups = result.duplicateFindings.get(id);
    wanted.set(id, dups ? [...own, ...dups] : own);
  }
  for (const id of dupOnly) wanted.set(id, result.duplicateFindings.get(id) ?? none);

  const existing = new Map<string, FlagForRun>();
  const existingOfRecord = new Map<number, FlagForRun[]>();
  for (const f of await flagsForRun(tx, scope === "all" ? "all" : [...wanted.keys()])) {
    existing.set(f.fingerprint, f);
    if (f.recordId === null) continue;
    const list = existingOfRecord.get(f.recordId);
    if (list) list.push(f);
    else existingOfRecord.set(f.recordId, [f]);
  }

  const summary: CheckRunSummary = { settingsVersion: settings.version, records: fullIds.length, opened: 0, reopened: 0, refreshed: 0, stale: 0, openByCode: {}, qualityUpdated: 0, backToReview: [], ms: 0 };
  const inserts: FlagWrite[] = [];
  const refreshes: { id: number; write: FlagWrite }[] = [];
  const reopens: { id: number; write: FlagWrite }[] = [];
  const resolves: { id: number; resolution: string; reason: string | null }[] = [];
  const newErrors = new Set<number>();
  const dupCodes = new Set(DUPLICATE_CODES);
  const seen = new Set<string>();
  for (const [recordId, findings] of wanted) {
    const previous = existingOfRecord.get(recordId);
    if (!findings.length && !previous) continue;
    const record = byId.get(recordId);
    seen.clear();
    for (const f of findings) {
      const fingerprint = flagFingerprint(f.code, recordId, f.relatedRecordId);
      if (seen.has(fingerprint)) continue;
      seen.add(fingerprint);
      // Details are serialized only when a flag is written: an unchanged finding costs nothing.
      const write = (): FlagWrite => ({
        recordId, relatedRecordId: f.relatedRecordId ?? null, sourceId: record?.sourceId ?? null, ruleCode: f.code, severity: f.severity,
        message: f.message, details: JSON.stringify(f.details), fingerprint, settingsVersion: settings.version,
      });
      const old = existing.get(fingerprint);
      if (!old) {
        inserts.push(write());
        summary.opened++;
        if (f.severity === "error") newErrors.add(recordId);
      } else if (old.state === "open") {
        if (old.message !== f.message || old.severity !== f.severity || old.settingsVersion !== settings.version) {
          refreshes.push({ id: old.id, write: write() });
          summary.refreshed++;
        }
      } else if (old.state === "resolved" && old.resolution !== null && REOPENABLE.has(old.resolution)) {
        reopens.push({ id: old.id, write: write() });
        summary.reopened++;
        if (f.severity === "error") newErrors.add(recordId);
      } else continue; // waived or decided by a reviewer: stays as decided
      summary.openByCode[f.code] = (summary.openByCode[f.code] ?? 0) + 1;
    }
    for (const old of previous ?? []) {
      if (old.state !== "open" || seen.has(old.fingerprint)) continue;
      if (dupOnly.has(recordId) && !dupCodes.has(old.ruleCode)) continue;
      const fixed = options.fixedFlag && options.fixedFlag.id === old.id;
      resolves.push({ id: old.id, resolution: fixed ? "fix" : "stale", reason: fixed ? options.fixedFlag!.reason : "the finding no longer appears" });
      summary.stale += fixed ? 0 : 1;
    }
  }
  await insertFlags(tx, inserts, at);
  await refreshFlags(tx, refreshes);
  await reopenFlags(tx, reopens);
  await resolveFlagsAuto(tx, resolves, options.actor?.id ?? null, settings.version, at);

  // Quality: source score × completeness, for the fully checked records.
  const sourceScores = await sourceScoresOf(tx, fullIds.map((id) => byId.get(id)?.sourceId).filter((x): x is number => x !== undefined), settings.values);
  const scores: [number, number][] = [];
  for (const id of fullIds) {
    const r = byId.get(id);
    if (!r) continue;
    const q = recordQuality(sourceScores.get(r.sourceId)!, completenessValueOf(r, settings.values));
    if (r.qualityScore !== q) scores.push([id, q]);
  }
  await writeQualityScores(tx, scores);
  summary.qualityUpdated = scores.length;

  summary.backToReview = await reopenAcceptedRecords(tx, [...newErrors], at);
  for (const id of summary.backToReview) {
    await appendAuditEvent(tx, {
      actorId: options.actor?.id ?? null, actorName: options.actor?.name ?? "checks", action: "reopen", entityType: "record", entityId: id,
      before: { status: "accepted" }, after: { status: "needs_review" }, reason: `an error flag opened under settings version ${settings.version}`, at,
    });
  }
  summary.ms = Math.round(performance.now() - started);
  return summary;
}

/** The score of each named source under `settings`; a source that does not exist scores 0 (its records score as unsourced). */
async function sourceScoresOf(db: SqlExecutor, ids: Iterable<number>, settings: CheckSettings): Promise<Map<number, number>> {
  const unique = [...new Set(ids)];
  const attributes = await loadSourceAttributes(db, unique);
  return new Map(unique.map((id) => [id, attributes.has(id) ? scoreSource(attributes.get(id)!, settings).score : 0]));
}

/** runChecksIn in a writing transaction of its own. */
export async function runChecksNow(scope: "all" | readonly number[], options: RunChecksOptions = {}): Promise<CheckRunSummary> {
  return sql().transaction((tx) => runChecksIn(tx, scope, options));
}

/** The record quality of a row about to be written: source score × completeness under `settings`. */
function qualityOf(w: Omit<RecordWrite, "materialId">, sourceScore: number, settings: CheckSettings): number {
  const entered = w.enteredValues as Record<string, { provenance?: string } | undefined>;
  let allReported = true;
  for (const key in entered) if (entered[key]?.provenance !== "reported") allReported = false;
  const completeness = completenessValueOf(
    {
      laserPowerW: w.laserPowerW, scanSpeedMmPerS: w.scanSpeedMmPerS, hatchSpacingUm: w.hatchSpacingUm, layerThicknessUm: w.layerThicknessUm,
      spotDiameterUm: w.spotDiameterUm, powderD50Um: w.powderD50Um, relativeDensityPct: w.relativeDensityPct, outcome: w.outcome, entered, enteredAllReported: allReported,
    },
    settings,
  );
  return recordQuality(sourceScore, completeness);
}

/**
 * Quality scores for records about to be written in bulk, the same as a check run would give
 * (source score × completeness under the current settings), so the run that follows the write
 * finds them current and rewrites none. The settings and the named sources' scores are read up
 * front (on `db`, the database or the writer's transaction); the function returned is synchronous
 * and refuses a source it was not given.
 */
export async function qualityScorerFor(db: SqlExecutor, sourceIds: Iterable<number>): Promise<(w: Omit<RecordWrite, "materialId">) => number> {
  const settings = (await currentCheckSettings(db)).values;
  const ids = [...new Set(sourceIds)];
  const sourceScores = await sourceScoresOf(db, ids, settings);
  return (w) => {
    const score = sourceScores.get(w.sourceId);
    if (score === undefined) throw new RangeError(`qualityScorerFor: source ${w.sourceId} was not among the sources given (${ids.join(", ") || "none"})`);
    return qualityOf(w, score, settings);
  };
}

/**
 * The checks run after a save or an import commits. A failure here must not undo the save: it is
 * logged, and the next `meltledger check` catches the records up.
 */
export async function checksAfterSave(ids: readonly number[]): Promise<CheckRunSummary | null> {
  if (!ids.length) return null;
  try {
    return await runChecksNow(ids);
  } catch (error) {
    console.error("[meltledger] checks after save failed; run `meltledger check` to catch up", error);
    return null;
  }
}

const runSchema = z.object({
  all: z.boolean().default(false),
  recordIds: z.array(rowIdSchema).default([]),
  settingsVersion: rowIdSchema.nullish(),
});

/**
 * Runs the checks as a batch: every record (`all`) or the given ids; optionally under an older
 * settings version, to reproduce an earlier run. Audited as one event, in the run's transaction.
 */
export async function runChecks(input: unknown, actor: Actor): Promise<Result<CheckRunSummary>> {
  return guard(async () => {
    requireRole(actor, "contributor");
    const nul = nulRefusal(input);
    if (nul) return nul;
    const parsed = runSchema.safeParse(input);
    if (!parsed.success) return invalid(parsed.error);
    const { all, recordIds, settingsVersion } = parsed.data;
    if (!all && !recordIds.length) return fail("invalid_input", "Say which records to check: --all, or record ids.");
    let version: SettingsVersionInfo | undefined;
    if (settingsVersion) {
      const found = await checkSettingsVersion(settingsVersion);
      if (!found) return fail("not_found", `There is no settings version ${settingsVersion}.`);
      version = found;
    }
    const summary = await sql().transaction(async (tx) => {
      const s = await runChecksIn(tx, all ? "all" : recordIds, { settingsVersion: version, actor });
      await appendAuditEvent(tx, {
        actorId: actor.id, actorName: actor.name, action: "check", entityType: "check_run", entityId: all ? "all" : `${recordIds.length} records`,
        after: { settingsVersion: s.settingsVersion, records: s.records, opened: s.opened, reopened: s.reopened, stale: s.stale, refreshed: s.refreshed }, at: isoNow(),
      });
      return s;
    });
    return ok(summary);
  });
}
