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
import { physicsProvider } from "../domain/checks/physics-input";
import { completenessValueOf, recordQuality } from "../domain/record-quality";
import { scoreSource } from "../domain/source-quality";
import { appendAuditRaw } from "../db/audit-raw";
import { loadCheckRecords, loadPropertyOverrides, loadSourceAttributes, recordKeys, reopenAcceptedRecords, writeQualityScores, type CheckInputRow } from "../db/check-inputs";
import { sqlite, type SqliteDatabase } from "../db/connection";
import type { RecordWrite } from "../db/records";
import { flagFingerprint, flagsForRun, insertFlag, recordsWithOpenFlagsRelatedTo, refreshFlag, reopenFlag, resolveFlagAuto, type FlagForRun, type FlagWrite } from "../db/flags";
import { distinctPairKeys, pairKey } from "../db/pairs";
import { z } from "zod";
import { requireRole, type Actor } from "./actor";
import { checkSettingsVersionSync, currentCheckSettingsSync, isoNow, type SettingsVersionInfo } from "./check-settings";
import { fail, guard, invalid, ok, type Result } from "./result";

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
 * Runs the checks synchronously inside one transaction on the raw connection. `scope` "all"
 * checks every active record; a list checks those records (and refreshes the duplicate flags of
 * records that pair with them).
 */
export function runChecksSync(scope: "all" | readonly number[], options: RunChecksOptions = {}, db: SqliteDatabase = sqlite()): CheckRunSummary {
  const started = performance.now();
  const settings = options.settingsVersion ?? currentCheckSettingsSync(db);
  const now = options.now ?? (() => new Date());
  return db.transaction((): CheckRunSummary => {
    const at = isoNow(now());
    let loaded: CheckInputRow[];
    let targets: Set<number> | undefined;
    if (scope === "all") loaded = loadCheckRecords(db, "all");
    else {
      const keys = recordKeys(db, [...new Set(scope)]).filter((k) => k.status !== "rejected" && k.status !== "merged");
      targets = new Set(keys.map((k) => k.id));
      loaded = loadCheckRecords(db, [...new Set(keys.map((k) => k.alloyKey))]);
    }
    const distinct = distinctPairKeys(db);
    const result = checkRecords(loaded, settings.values, {
      targets,
      isDistinct: (a, b) => distinct.has(pairKey(a, b)),
      physics: physicsProvider(settings.values, loadPropertyOverrides(db)),
    });
    const byId = new Map(loaded.map((r) => [r.id, r]));

    // Which records get which rules re-judged.
    const fullIds = targets ? [...targets] : loaded.map((r) => r.id);
    const dupOnly = new Set<number>();
    if (targets) {
      for (const p of result.pairs) {
        if (targets.has(p.a) && !targets.has(p.b)) dupOnly.add(p.b);
      }
      for (const id of recordsWithOpenFlagsRelatedTo(db, fullIds, DUPLICATE_CODES)) if (!targets.has(id)) dupOnly.add(id);
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
    for (const f of flagsForRun(db, scope === "all" ? "all" : [...wanted.keys()])) {
      existing.set(f.fingerprint, f);
      if (f.recordId === null) continue;
      const list = existingOfRecord.get(f.recordId);
      if (list) list.push(f);
      else existingOfRecord.set(f.recordId, [f]);
    }

    const summary: CheckRunSummary = { settingsVersion: settings.version, records: fullIds.length, opened: 0, reopened: 0, refreshed: 0, stale: 0, openByCode: {}, qualityUpdated: 0, backToReview: [], ms: 0 };
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
          insertFlag(db, write(), at);
          summary.opened++;
          if (f.severity === "error") newErrors.add(recordId);
        } else if (old.state === "open") {
          if (old.message !== f.message || old.severity !== f.severity || old.settingsVersion !== settings.version) {
            refreshFlag(db, old.id, write());
            summary.refreshed++;
          }
        } else if (old.state === "resolved" && old.resolution !== null && REOPENABLE.has(old.resolution)) {
          reopenFlag(db, old.id, write());
          summary.reopened++;
          if (f.severity === "error") newErrors.add(recordId);
        } else continue; // waived or decided by a reviewer: stays as decided
        summary.openByCode[f.code] = (summary.openByCode[f.code] ?? 0) + 1;
      }
      for (const old of existingOfRecord.get(recordId) ?? []) {
        if (old.state !== "open" || seen.has(old.fingerprint)) continue;
        if (dupOnly.has(recordId) && !dupCodes.has(old.ruleCode)) continue;
        const fixed = options.fixedFlag && options.fixedFlag.id === old.id;
        resolveFlagAuto(db, old.id, fixed ? "fix" : "stale", fixed ? options.fixedFlag!.reason : "the finding no longer appears", options.actor?.id ?? null, settings.version, at);
        summary.stale += fixed ? 0 : 1;
      }
    }

    // Quality: source score × completeness, for the fully checked records.
    const sources = loadSourceAttributes(db, [...new Set(fullIds.map((id) => byId.get(id)?.sourceId).filter((x): x is number => x !== undefined))]);
    const sourceScores = new Map([...sources].map(([id, s]) => [id, scoreSource(s, settings.values).score]));
    const scores: [number, number][] = [];
    for (const id of fullIds) {
      const r = byId.get(id);
      if (!r) continue;
      const q = recordQuality(sourceScores.get(r.sourceId) ?? 0, completenessValueOf(r, settings.values));
      if (r.qualityScore !== q) scores.push([id, q]);
    }
    writeQualityScores(db, scores);
    summary.qualityUpdated = scores.length;

    summary.backToReview = reopenAcceptedRecords(db, [...newErrors], at);
    for (const id of summary.backToReview) {
      appendAuditRaw(db, {
        actorId: options.actor?.id ?? null, actorName: options.actor?.name ?? "checks", action: "reopen", entityType: "record", entityId: id,
        before: { status: "accepted" }, after: { status: "needs_review" }, reason: `an error flag opened under settings version ${settings.version}`, at,
      });
    }
    summary.ms = Math.round(performance.now() - started);
    return summary;
  })();
}

/**
 * Quality scores for records about to be written in bulk, the same as a check run would give
 * (source score × completeness under the current settings), so the run that follows the write
 * finds them current and rewrites none. Source scores are read once per source.
 */
export function qualityScorer(db: SqliteDatabase = sqlite()): (w: Omit<RecordWrite, "materialId">) => number {
  const settings = currentCheckSettingsSync(db).values;
  const sourceScores = new Map<number, number>();
  return (w) => {
    let score = sourceScores.get(w.sourceId);
    if (score === undefined) {
      const attributes = loadSourceAttributes(db, [w.sourceId]).get(w.sourceId);
      score = attributes ? scoreSource(attributes, settings).score : 0;
      sourceScores.set(w.sourceId, score);
    }
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
    return recordQuality(score, completeness);
  };
}

/**
 * The checks run after a save or an import commits. A failure here must not undo the save: it is
 * logged, and the next `meltledger check` catches the records up.
 */
export function checksAfterSave(ids: readonly number[]): CheckRunSummary | null {
  if (!ids.length) return null;
  try {
    return runChecksSync(ids);
  } catch (error) {
    console.error("[meltledger] checks after save failed; run `meltledger check` to catch up", error);
    return null;
  }
}

const runSchema = z.object({
  all: z.boolean().default(false),
  recordIds: z.array(z.coerce.number().int().positive()).default([]),
  settingsVersion: z.coerce.number().int().positive().nullish(),
});

/**
 * Runs the checks as a batch: every record (`all`) or the given ids; optionally under an older
 * settings version, to reproduce an earlier run. Audited as one event.
 */
export async function runChecks(input: unknown, actor: Actor): Promise<Result<CheckRunSummary>> {
  return guard(async () => {
    requireRole(actor, "contributor");
    const parsed = runSchema.safeParse(input);
    if (!parsed.success) return invalid(parsed.error);
    const { all, recordIds, settingsVersion } = parsed.data;
    if (!all && !recordIds.length) return fail("invalid_input", "Say which records to check: --all, or record ids.");
    const db = sqlite();
    let version: SettingsVersionInfo | undefined;
    if (settingsVersion) {
      const found = checkSettingsVersionSync(settingsVersion, db);
      if (!found) return fail("not_found", `There is no settings version ${settingsVersion}.`);
      version = found;
    }
    const summary = runChecksSync(all ? "all" : recordIds, { settingsVersion: version, actor }, db);
    appendAuditRaw(db, {
      actorId: actor.id, actorName: actor.name, action: "check", entityType: "check_run", entityId: all ? "all" : `${recordIds.length} records`,
      after: { settingsVersion: summary.settingsVersion, records: summary.records, opened: summary.opened, reopened: summary.reopened, stale: summary.stale, refreshed: summary.refreshed }, at: isoNow(),
    });
    return ok(summary);
  });
}
