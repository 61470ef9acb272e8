import type { Statement } from "better-sqlite3";
import type { SqliteDatabase } from "./connection";
import { sqliteNullOrder, type SqlExecutor } from "./sql";

export type FlagState = "open" | "resolved" | "waived";

/** A flag as stored, details parsed. */
export interface FlagRow {
  id: number;
  recordId: number | null;
  relatedRecordId: number | null;
  sourceId: number | null;
  ruleCode: string;
  severity: string;
  message: string;
  details: Record<string, unknown>;
  fingerprint: string;
  state: FlagState;
  resolution: string | null;
  reason: string | null;
  resolvedById: number | null;
  resolvedAt: string | null;
  settingsVersion: number | null;
  version: number;
  createdAt: string;
}

/** A flag with what a list or the CLI shows beside it. */
export interface FlagListRow extends FlagRow {
  importFile: string | null;
  importRow: number | null;
  recordStatus: string | null;
  resolvedByName: string | null;
}

/** What a check run writes for one finding. */
export interface FlagWrite {
  recordId: number;
  relatedRecordId: number | null;
  sourceId: number | null;
  ruleCode: string;
  severity: string;
  message: string;
  details: string;
  fingerprint: string;
  settingsVersion: number;
}

/** One flag per finding: rule, record and (for pairs) the related record. */
export function flagFingerprint(ruleCode: string, recordId: number, relatedRecordId: number | null | undefined): string {
  return `${ruleCode}|${recordId}|${relatedRecordId ?? ""}`;
}

type RawFlag = Omit<FlagRow, "details"> & { details: string };

function parseDetails(text: string): Record<string, unknown> {
  try {
    const v: unknown = JSON.parse(text);
    return v && typeof v === "object" && !Array.isArray(v) ? (v as Record<string, unknown>) : {};
  } catch {
    return {};
  }
}

function toRow<T extends RawFlag>(r: T): Omit<T, "details"> & { details: Record<string, unknown> } {
  return { ...r, details: parseDetails(r.details) };
}

const statements = new WeakMap<SqliteDatabase, Map<string, Statement<unknown[]>>>();
function stmt(db: SqliteDatabase, sql: string): Statement<unknown[]> {
  let m = statements.get(db);
  if (!m) statements.set(db, (m = new Map()));
  let s = m.get(sql);
  if (!s) m.set(sql, (s = db.prepare(sql)));
  return s;
}

function chunks<T>(items: readonly T[], size = 500): T[][] {
  const out: T[][] = [];
  for (let i = 0; i < items.length; i += size) out.push(items.slice(i, i + size));
  return out;
}

/** Every flag (any state) of the given records; all flags with a record when `ids` is "all". */
export function flagsOfRecords(db: SqliteDatabase, ids: readonly number[] | "all"): FlagRow[] {
  if (ids === "all") return (db.prepare(`SELECT * FROM Flag WHERE recordId IS NOT NULL`).all() as RawFlag[]).map(toRow);
  const out: FlagRow[] = [];
  for (const part of chunks(ids)) {
    const rows = db.prepare(`SELECT * FROM Flag WHERE recordId IN (${part.map(() => "?").join(",")})`).all(...part) as RawFlag[];
    for (const r of rows) out.push(toRow(r));
  }
  return out;
}

/** The columns a check run compares (not the details: a finding's wording and settings version decide a refresh). */
export interface FlagForRun {
  id: number;
  recordId: number | null;
  ruleCode: string;
  severity: string;
  message: string;
  fingerprint: string;
  state: FlagState;
  resolution: string | null;
  settingsVersion: number | null;
}

/** Flags of the given records (or every flag with a record) for a check run. */
export function flagsForRun(db: SqliteDatabase, ids: readonly number[] | "all"): FlagForRun[] {
  const cols = `id, recordId, ruleCode, severity, message, fingerprint, state, resolution, settingsVersion`;
  if (ids === "all") return db.prepare(`SELECT ${cols} FROM Flag WHERE recordId IS NOT NULL`).all() as FlagForRun[];
  const out: FlagForRun[] = [];
  for (const part of chunks(ids)) out.push(...(db.prepare(`SELECT ${cols} FROM Flag WHERE recordId IN (${part.map(() => "?").join(",")})`).all(...part) as FlagForRun[]));
  return out;
}

/** Records whose open flags of the given codes point at one of `ids` as the related record. */
export function recordsWithOpenFlagsRelatedTo(db: SqliteDatabase, ids: readonly number[], codes: readonly string[]): number[] {
  const out = new Set<number>();
  for (const part of chunks(ids)) {
    const rows = db
      .prepare(`SELECT DISTINCT recordId FROM Flag WHERE state = 'open' AND relatedRecordId IN (${part.map(() => "?").join(",")}) AND ruleCode IN (${codes.map(() => "?").join(",")})`)
      .all(...part, ...codes) as { recordId: number }[];
    for (const r of rows) out.add(r.recordId);
  }
  return [...out];
}

export function insertFlag(db: SqliteDatabase, w: FlagWrite, at: string): number {
  return Number(
    stmt(db, `INSERT INTO Flag (recordId, relatedRecordId, sourceId, ruleCode, severity, message, details, fingerprint, state, settingsVersion, version, createdAt) VALUES (?, ?, ?, ?, ?, ?, ?, ?, 'open', ?, 1, ?)`).run(
      w.recordId, w.relatedRecordId, w.sourceId, w.ruleCode, w.severity, w.message, w.details, w.fingerprint, w.settingsVersion, at,
    ).lastInsertRowid,
  );
}

/** New wording or details for an open flag (thresholds changed, say); bumps its version. */
export function refreshFlag(db: SqliteDatabase, id: number, w: FlagWrite): void {
  stmt(db, `UPDATE Flag SET severity = ?, message = ?, details = ?, sourceId = ?, settingsVersion = ?, version = version + 1 WHERE id = ?`).run(w.severity, w.message, w.details, w.sourceId, w.settingsVersion, id);
}

/** A finding that was stale or fixed came back: the flag is open again. */
export function reopenFlag(db: SqliteDatabase, id: number, w: FlagWrite): void {
  stmt(db, `UPDATE Flag SET state = 'open', resolution = NULL, reason = NULL, resolvedById = NULL, resolvedAt = NULL, severity = ?, message = ?, details = ?, sourceId = ?, settingsVersion = ?, version = version + 1 WHERE id = ?`).run(
    w.severity, w.message, w.details, w.sourceId, w.settingsVersion, id,
  );
}

/** Open flags whose finding disappeared, resolved as "stale" (or as `resolution`, e.g. "fix"). */
export function resolveFlagAuto(db: SqliteDatabase, id: number, resolution: string, reason: string | null, actorId: number | null, settingsVersion: number, at: string): void {
  stmt(db, `UPDATE Flag SET state = 'resolved', resolution = ?, reason = ?, resolvedById = ?, resolvedAt = ?, settingsVersion = ?, version = version + 1 WHERE id = ? AND state = 'open'`).run(resolution, reason, actorId, at, settingsVersion, id);
}

export function getFlag(db: SqliteDatabase, id: number): FlagRow | null {
  const r = stmt(db, `SELECT * FROM Flag WHERE id = ?`).get(id) as RawFlag | undefined;
  return r ? toRow(r) : null;
}

/** A reviewer's change of state, only if the flag is still at `version`; false means someone else acted first. */
export function setFlagStateIfVersion(db: SqliteDatabase, id: number, version: number, s: { state: FlagState; resolution: string; reason: string | null; actorId: number | null; at: string }): boolean {
  const r = stmt(db, `UPDATE Flag SET state = ?, resolution = ?, reason = ?, resolvedById = ?, resolvedAt = ?, version = version + 1 WHERE id = ? AND version = ?`).run(s.state, s.resolution, s.reason, s.actorId, s.at, id, version);
  return r.changes === 1;
}

export interface FlagFilter {
  recordId?: number | null;
  sourceId?: number | null;
  state?: FlagState | null;
  /** Literal prefix of the rule code: "range" matches "range.scan_speed". */
  codePrefix?: string | null;
  severity?: string | null;
  limit?: number | null;
  offset?: number | null;
}

function where(f: FlagFilter): { sql: string; params: unknown[] } {
  const parts: string[] = [];
  const params: unknown[] = [];
  if (f.recordId != null) { parts.push("f.recordId = ?"); params.push(f.recordId); }
  if (f.sourceId != null) { parts.push("f.sourceId = ?"); params.push(f.sourceId); }
  if (f.state) { parts.push("f.state = ?"); params.push(f.state); }
  if (f.severity) { parts.push("f.severity = ?"); params.push(f.severity); }
  if (f.codePrefix) {
    parts.push("f.ruleCode LIKE ? ESCAPE '\\'");
    params.push(`${f.codePrefix.replace(/[%_\\]/g, (m) => `\\${m}`)}%`);
  }
  return { sql: parts.length ? `WHERE ${parts.join(" AND ")}` : "", params };
}

const SEVERITY_ORDER = `CASE f.severity WHEN 'error' THEN 0 WHEN 'warning' THEN 1 ELSE 2 END`;

/** Flags matching a filter, worst first then by record and id, with the record's import file and row. */
export function listFlags(db: SqliteDatabase, f: FlagFilter = {}): FlagListRow[] {
  const w = where(f);
  const limit = f.limit ?? -1;
  const rows = db
    .prepare(
      `SELECT f.*, r.importFile AS importFile, r.importRow AS importRow, r.status AS recordStatus, u.name AS resolvedByName
       FROM Flag f LEFT JOIN BuildRecord r ON r.id = f.recordId LEFT JOIN User u ON u.id = f.resolvedById
       ${w.sql} ORDER BY f.recordId, ${SEVERITY_ORDER}, f.id LIMIT ? OFFSET ?`,
    )
    .all(...w.params, limit, f.offset ?? 0) as (RawFlag & { importFile: string | null; importRow: number | null; recordStatus: string | null; resolvedByName: string | null })[];
  return rows.map(toRow);
}

export function countFlags(db: SqliteDatabase, f: FlagFilter = {}): number {
  const w = where(f);
  return (db.prepare(`SELECT COUNT(*) AS n FROM Flag f ${w.sql}`).get(...w.params) as { n: number }).n;
}

export interface FlagCounts {
  byRule: { ruleCode: string; severity: string; count: number }[];
  bySource: { sourceId: number | null; title: string | null; count: number }[];
  bySeverity: Record<string, number>;
  records: number;
}

/**
 * Counts of open flags by rule, by source and by severity, and how many records carry one.
 * Engine-neutral (sql.ts): runs on SQLite and PostgreSQL alike.
 */
export async function openFlagCounts(db: SqlExecutor): Promise<FlagCounts> {
  const byRule = await db.all<FlagCounts["byRule"][number]>(
    `SELECT "ruleCode" AS "ruleCode", "severity", COUNT(*) AS count FROM "Flag" WHERE "state" = 'open' GROUP BY "ruleCode", "severity" ORDER BY count DESC, "ruleCode", "severity"`,
  );
  // the title is grouped too (PostgreSQL wants every selected column grouped); a source has one title
  const bySource = await db.all<FlagCounts["bySource"][number]>(
    `SELECT f."sourceId" AS "sourceId", s."title" AS title, COUNT(*) AS count FROM "Flag" f LEFT JOIN "Source" s ON s."id" = f."sourceId"
     WHERE f."state" = 'open' GROUP BY f."sourceId", s."title" ORDER BY count DESC, f."sourceId"${sqliteNullOrder(db.engine, "ASC")}`,
  );
  const bySeverity = Object.fromEntries((await db.all<{ severity: string; n: number }>(`SELECT "severity", COUNT(*) AS n FROM "Flag" WHERE "state" = 'open' GROUP BY "severity"`)).map((r) => [r.severity, r.n]));
  const records = (await db.get<{ n: number }>(`SELECT COUNT(DISTINCT "recordId") AS n FROM "Flag" WHERE "state" = 'open'`))!.n;
  return { byRule, bySource, bySeverity, records };
}

/**
 * One page of the review queue: records with open flags (matching the filter), worst first — by
 * their worst severity, then by how many open flags they carry, then by id.
 */
export function reviewQueuePage(db: SqliteDatabase, f: { codePrefix?: string | null; sourceId?: number | null; offset: number; limit: number }): { recordIds: number[]; total: number } {
  const w = where({ state: "open", codePrefix: f.codePrefix, sourceId: f.sourceId });
  const total = (db.prepare(`SELECT COUNT(DISTINCT f.recordId) AS n FROM Flag f ${w.sql} AND f.recordId IS NOT NULL`).get(...w.params) as { n: number }).n;
  const rows = db
    .prepare(`SELECT f.recordId AS id, MIN(${SEVERITY_ORDER}) AS worst, COUNT(*) AS n FROM Flag f ${w.sql} AND f.recordId IS NOT NULL GROUP BY f.recordId ORDER BY worst, n DESC, f.recordId LIMIT ? OFFSET ?`)
    .all(...w.params, f.limit, f.offset) as { id: number }[];
  return { recordIds: rows.map((r) => r.id), total };
}

/** Open flags of one record, worst first. */
export function openFlagsOfRecord(db: SqliteDatabase, recordId: number): FlagRow[] {
  return (db.prepare(`SELECT * FROM Flag f WHERE f.recordId = ? AND f.state = 'open' ORDER BY ${SEVERITY_ORDER}, f.id`).all(recordId) as RawFlag[]).map(toRow);
}
