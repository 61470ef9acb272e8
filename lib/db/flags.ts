import { appendAuditEvent, AUDIT_EVENT_COLUMNS, auditEventValues, type AuditInput } from "./audit";
import { sqliteNullOrder, type SqlDatabase, type SqlExecutor, type SqlValue } from "./sql";

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

function chunks<T>(items: readonly T[], size = 500): T[][] {
  const out: T[][] = [];
  for (let i = 0; i < items.length; i += size) out.push(items.slice(i, i + size));
  return out;
}

const placeholders = (n: number) => Array.from({ length: n }, () => "?").join(", ");

const FLAG_COLUMNS = `"id", "recordId", "relatedRecordId", "sourceId", "ruleCode", "severity", "message", "details", "fingerprint", "state", "resolution", "reason",
  "resolvedById", "resolvedAt", "settingsVersion", "version", "createdAt"`;
const F_COLUMNS = FLAG_COLUMNS.replace(/"(\w+)"/g, 'f."$1" AS "$1"');

/** Every flag (any state) of the given records; all flags with a record when `ids` is "all". */
export async function flagsOfRecords(db: SqlExecutor, ids: readonly number[] | "all"): Promise<FlagRow[]> {
  if (ids === "all") return (await db.all<RawFlag>(`SELECT ${FLAG_COLUMNS} FROM "Flag" WHERE "recordId" IS NOT NULL ORDER BY "id"`)).map(toRow);
  const out: FlagRow[] = [];
  for (const part of chunks(ids)) {
    for (const r of await db.all<RawFlag>(`SELECT ${FLAG_COLUMNS} FROM "Flag" WHERE "recordId" IN (${placeholders(part.length)}) ORDER BY "id"`, part)) out.push(toRow(r));
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

const RUN_COLUMNS = `"id", "recordId", "ruleCode", "severity", "message", "fingerprint", "state", "resolution", "settingsVersion"`;

/** Flags of the given records (or every flag with a record) for a check run. */
export async function flagsForRun(db: SqlExecutor, ids: readonly number[] | "all"): Promise<FlagForRun[]> {
  if (ids === "all") return db.all<FlagForRun>(`SELECT ${RUN_COLUMNS} FROM "Flag" WHERE "recordId" IS NOT NULL`);
  const out: FlagForRun[] = [];
  for (const part of chunks(ids)) out.push(...(await db.all<FlagForRun>(`SELECT ${RUN_COLUMNS} FROM "Flag" WHERE "recordId" IN (${placeholders(part.length)})`, part)));
  return out;
}

/** Records whose open flags of the given codes point at one of `ids` as the related record. */
export async function recordsWithOpenFlagsRelatedTo(db: SqlExecutor, ids: readonly number[], codes: readonly string[]): Promise<number[]> {
  const out = new Set<number>();
  if (!codes.length) return [];
  for (const part of chunks(ids)) {
    const rows = await db.all<{ recordId: number }>(
      `SELECT DISTINCT "recordId" AS "recordId" FROM "Flag" WHERE "state" = 'open' AND "relatedRecordId" IN (${placeholders(part.length)}) AND "ruleCode" IN (${placeholders(codes.length)}) AND "recordId" IS NOT NULL ORDER BY "recordId"`,
      [...part, ...codes],
    );
    for (const r of rows) out.add(r.recordId);
  }
  return [...out];
}

// Batched writes of a check run. Rows are many (tens of thousands on a full run): SQLite runs one
// prepared statement per row (synchronous underneath, the cheapest form there); PostgreSQL gets
// multi-row statements in chunks, since a round trip per row would take minutes.
const PG_INSERT_ROWS = 500; // × 10 parameters, far below PostgreSQL's 65,535 per statement
const PG_UPDATE_ROWS = 1000;

const INSERT_FLAG = `INSERT INTO "Flag" ("recordId", "relatedRecordId", "sourceId", "ruleCode", "severity", "message", "details", "fingerprint", "state", "settingsVersion", "version", "createdAt") VALUES `;
const INSERT_FLAG_ROW = `(?, ?, ?, ?, ?, ?, ?, ?, 'open', ?, 1, ?)`;

function insertParams(w: FlagWrite, at: string): SqlValue[] {
  return [w.recordId, w.relatedRecordId, w.sourceId, w.ruleCode, w.severity, w.message, w.details, w.fingerprint, w.settingsVersion, at];
}

/** Opens a flag per write (caller's transaction). */
export async function insertFlags(db: SqlExecutor, writes: readonly FlagWrite[], at: string): Promise<void> {
  if (db.engine === "sqlite") {
    const statement = INSERT_FLAG + INSERT_FLAG_ROW;
    for (const w of writes) await db.run(statement, insertParams(w, at));
    return;
  }
  for (const part of chunks(writes, PG_INSERT_ROWS)) {
    await db.run(INSERT_FLAG + part.map(() => INSERT_FLAG_ROW).join(", "), part.flatMap((w) => insertParams(w, at)));
  }
}

/**
 * One UPDATE per row on SQLite; on PostgreSQL `UPDATE … FROM (VALUES …)` in chunks, the VALUES
 * columns named column1, column2, … as both engines name them. `casts` gives each value's SQL type
 * (PostgreSQL cannot infer a parameter's type inside VALUES).
 */
async function updateEach(db: SqlExecutor, table: string, rows: readonly SqlValue[][], set: readonly string[], casts: readonly string[], extraWhere = ""): Promise<void> {
  if (!rows.length) return;
  if (db.engine === "sqlite") {
    const statement = `UPDATE "${table}" SET ${set.map((s) => s.replace(/\{(\d+)\}/g, "?")).join(", ")} WHERE "id" = ?${extraWhere}`;
    // the SET values in the order they appear, then the id (the row's first value)
    const order = set.flatMap((s) => [...s.matchAll(/\{(\d+)\}/g)].map((m) => Number(m[1])));
    for (const row of rows) await db.run(statement, [...order.map((i) => row[i]!), row[0]!]);
    return;
  }
  const valueRow = `(${casts.map((c) => `CAST(? AS ${c})`).join(", ")})`;
  const assignments = set.map((s) => s.replace(/\{(\d+)\}/g, (_, i: string) => `v.column${Number(i) + 1}`)).join(", ");
  const where = extraWhere.replace(/"(\w+)"/g, `"${table}"."$1"`);
  for (const part of chunks(rows, PG_UPDATE_ROWS)) {
    await db.run(`UPDATE "${table}" SET ${assignments} FROM (VALUES ${part.map(() => valueRow).join(", ")}) AS v WHERE "${table}"."id" = v.column1${where}`, part.flat());
  }
}

const WRITE_CASTS = ["INTEGER", "TEXT", "TEXT", "TEXT", "INTEGER", "INTEGER"];
const writeRow = (id: number, w: FlagWrite): SqlValue[] => [id, w.severity, w.message, w.details, w.sourceId, w.settingsVersion];

/** New wording or details for open flags (thresholds changed, say); bumps their version. */
export async function refreshFlags(db: SqlExecutor, updates: readonly { id: number; write: FlagWrite }[]): Promise<void> {
  await updateEach(db, "Flag", updates.map((u) => writeRow(u.id, u.write)), [`"severity" = {1}`, `"message" = {2}`, `"details" = {3}`, `"sourceId" = {4}`, `"settingsVersion" = {5}`, `"version" = "version" + 1`], WRITE_CASTS);
}

/** Findings that were stale or fixed came back: the flags are open again. */
export async function reopenFlags(db: SqlExecutor, updates: readonly { id: number; write: FlagWrite }[]): Promise<void> {
  await updateEach(
    db, "Flag", updates.map((u) => writeRow(u.id, u.write)),
    [`"state" = 'open'`, `"resolution" = NULL`, `"reason" = NULL`, `"resolvedById" = NULL`, `"resolvedAt" = NULL`, `"severity" = {1}`, `"message" = {2}`, `"details" = {3}`, `"sourceId" = {4}`, `"settingsVersion" = {5}`, `"version" = "version" + 1`],
    WRITE_CASTS,
  );
}

/** Open flags whose finding disappeared, resolved as "stale" (or as the given resolution, e.g. "fix"); flags no longer open are left alone. */
export async function resolveFlagsAuto(db: SqlExecutor, items: readonly { id: number; resolution: string; reason: string | null }[], actorId: number | null, settingsVersion: number, at: string): Promise<void> {
  await updateEach(
    db, "Flag", items.map((f) => [f.id, f.resolution, f.reason, actorId, at, settingsVersion]),
    [`"state" = 'resolved'`, `"resolution" = {1}`, `"reason" = {2}`, `"resolvedById" = {3}`, `"resolvedAt" = {4}`, `"settingsVersion" = {5}`, `"version" = "version" + 1`],
    ["INTEGER", "TEXT", "TEXT", "INTEGER", "TIMESTAMP(3)", "INTEGER"],
    ` AND "state" = 'open'`,
  );
}

export async function getFlag(db: SqlExecutor, id: number): Promise<FlagRow | null> {
  const r = await db.get<RawFlag>(`SELECT ${FLAG_COLUMNS} FROM "Flag" WHERE "id" = ?`, [id]);
  return r ? toRow(r) : null;
}

/** A flag for a review action, with its record's status and version and the name of who last acted on it. */
export async function getFlagForAction(db: SqlExecutor, id: number): Promise<(FlagRow & { recordStatus: string | null; recordVersion: number | null; resolvedByName: string | null }) | null> {
  const r = await db.get<RawFlag & { recordStatus: string | null; recordVersion: number | null; resolvedByName: string | null }>(
    `SELECT ${F_COLUMNS}, r."status" AS "recordStatus", r."version" AS "recordVersion", u."name" AS "resolvedByName"
     FROM "Flag" f LEFT JOIN "BuildRecord" r ON r."id" = f."recordId" LEFT JOIN "User" u ON u."id" = f."resolvedById" WHERE f."id" = ?`,
    [id],
  );
  return r ? toRow(r) : null;
}

/** A reviewer's change of state, only if the flag is still at `version`; false means someone else acted first. */
export async function setFlagStateIfVersion(db: SqlExecutor, id: number, version: number, s: { state: FlagState; resolution: string; reason: string | null; actorId: number | null; at: string }): Promise<boolean> {
  const r = await db.run(`UPDATE "Flag" SET "state" = ?, "resolution" = ?, "reason" = ?, "resolvedById" = ?, "resolvedAt" = ?, "version" = "version" + 1 WHERE "id" = ? AND "version" = ?`, [
    s.state, s.resolution, s.reason, s.actorId, s.at, id, version,
  ]);
  return r.changes === 1;
}

/**
 * A reviewer's change of state with its audit event, atomically, only if the flag is still open at
 * `version` and its record is neither rejected nor merged; false means someone else acted first
 * (and nothing was written). For the actions that
 * change nothing else (a waiver), so that many reviewers acting at once stay fast:
 * - PostgreSQL: one statement, the UPDATE in a WITH feeding the audit INSERT. It is its own
 *   transaction, at READ COMMITTED: a concurrent writer's committed row is re-checked against the
 *   version condition (so the second of two reviewers changes nothing, and an action lands once),
 *   and with no SERIALIZABLE snapshot there is no serialization failure to retry.
 * - SQLite has no UPDATE inside WITH: the two statements in one (IMMEDIATE) transaction.
 */
export async function setFlagStateAudited(
  db: SqlDatabase,
  id: number,
  version: number,
  s: { state: FlagState; resolution: string; reason: string | null; actorId: number | null; at: string },
  audit: AuditInput,
): Promise<boolean> {
  // only on a record still in the collection: a rejected or merged record's flags are closed
  const update = `UPDATE "Flag" SET "state" = ?, "resolution" = ?, "reason" = ?, "resolvedById" = ?, "resolvedAt" = ?, "version" = "version" + 1
    WHERE "id" = ? AND "version" = ? AND "state" = 'open'
      AND EXISTS (SELECT 1 FROM "BuildRecord" r WHERE r."id" = "Flag"."recordId" AND r."status" NOT IN ('rejected', 'merged'))`;
  const updateParams: SqlValue[] = [s.state, s.resolution, s.reason, s.actorId, s.at, id, version];
  const event = { ...audit, at: s.at };
  if (db.engine === "sqlite") {
    return db.transaction(async (tx) => {
      if ((await tx.run(update, updateParams)).changes !== 1) return false;
      await appendAuditEvent(tx, event);
      return true;
    });
  }
  // appendAuditEvent's columns and values, each typed: a SELECT list gives a parameter no column type
  const r = await db.get<{ id: number }>(
    `WITH changed AS (${update} RETURNING "id")
     INSERT INTO "AuditEvent" (${AUDIT_EVENT_COLUMNS})
     SELECT CAST(? AS INTEGER), CAST(? AS TEXT), CAST(? AS TEXT), CAST(? AS TEXT), CAST(? AS TEXT), CAST(? AS TEXT), CAST(? AS TEXT), CAST(? AS TEXT), CAST(? AS TIMESTAMP(3)) FROM changed
     RETURNING "id"`,
    [...updateParams, ...auditEventValues(event)],
  );
  return r !== undefined;
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

function where(f: FlagFilter): { sql: string; params: SqlValue[] } {
  const parts: string[] = [];
  const params: SqlValue[] = [];
  if (f.recordId != null) { parts.push(`f."recordId" = ?`); params.push(f.recordId); }
  if (f.sourceId != null) { parts.push(`f."sourceId" = ?`); params.push(f.sourceId); }
  if (f.state) { parts.push(`f."state" = ?`); params.push(f.state); }
  if (f.severity) { parts.push(`f."severity" = ?`); params.push(f.severity); }
  if (f.codePrefix) {
    // ILIKE: the prefix ignores case on both engines, as SQLite's LIKE always did
    parts.push(`f."ruleCode" ILIKE ? ESCAPE '\\'`);
    params.push(`${f.codePrefix.replace(/[%_\\]/g, (m) => `\\${m}`)}%`);
  }
  return { sql: parts.length ? `WHERE ${parts.join(" AND ")}` : "", params };
}

const SEVERITY_ORDER = `CASE f."severity" WHEN 'error' THEN 0 WHEN 'warning' THEN 1 ELSE 2 END`;

/** Flags matching a filter, worst first then by record and id, with the record's import file and row. */
export async function listFlags(db: SqlExecutor, f: FlagFilter = {}): Promise<FlagListRow[]> {
  const w = where(f);
  // LIMIT -1 (none) is SQLite's; LIMIT ALL is PostgreSQL's: a limit far above any table works on both
  const limit = f.limit ?? Number.MAX_SAFE_INTEGER;
  const rows = await db.all<RawFlag & { importFile: string | null; importRow: number | null; recordStatus: string | null; resolvedByName: string | null }>(
    `SELECT ${F_COLUMNS}, r."importFile" AS "importFile", r."importRow" AS "importRow", r."status" AS "recordStatus", u."name" AS "resolvedByName"
     FROM "Flag" f LEFT JOIN "BuildRecord" r ON r."id" = f."recordId" LEFT JOIN "User" u ON u."id" = f."resolvedById"
     ${w.sql} ORDER BY f."recordId"${sqliteNullOrder(db.engine, "ASC")}, ${SEVERITY_ORDER}, f."id" LIMIT ? OFFSET ?`,
    [...w.params, limit, f.offset ?? 0],
  );
  return rows.map(toRow);
}

export async function countFlags(db: SqlExecutor, f: FlagFilter = {}): Promise<number> {
  const w = where(f);
  return (await db.get<{ n: number }>(`SELECT COUNT(*) AS n FROM "Flag" f ${w.sql}`, w.params))!.n;
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
export async function reviewQueuePage(db: SqlExecutor, f: { codePrefix?: string | null; sourceId?: number | null; offset: number; limit: number }): Promise<{ recordIds: number[]; total: number }> {
  const w = where({ state: "open", codePrefix: f.codePrefix, sourceId: f.sourceId });
  const total = (await db.get<{ n: number }>(`SELECT COUNT(DISTINCT f."recordId") AS n FROM "Flag" f ${w.sql} AND f."recordId" IS NOT NULL`, w.params))!.n;
  const rows = await db.all<{ id: number }>(
    `SELECT f."recordId" AS id, MIN(${SEVERITY_ORDER}) AS worst, COUNT(*) AS n FROM "Flag" f ${w.sql} AND f."recordId" IS NOT NULL
     GROUP BY f."recordId" ORDER BY worst, n DESC, f."recordId" LIMIT ? OFFSET ?`,
    [...w.params, f.limit, f.offset],
  );
  return { recordIds: rows.map((r) => r.id), total };
}

/** Open flags of one record, worst first. */
export async function openFlagsOfRecord(db: SqlExecutor, recordId: number): Promise<FlagRow[]> {
  return (await db.all<RawFlag>(`SELECT ${F_COLUMNS} FROM "Flag" f WHERE f."recordId" = ? AND f."state" = 'open' ORDER BY ${SEVERITY_ORDER}, f."id"`, [recordId])).map(toRow);
}
