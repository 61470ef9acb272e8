import type { Prisma } from "../generated/prisma/client";
import { prismaReady } from "./client";
import type { SqlExecutor, SqlValue } from "./sql";

export interface AuditInput {
  actorId: number | null;
  actorName: string;
  action: string;
  entityType: string;
  entityId: string | number;
  before?: unknown;
  after?: unknown;
  reason?: string | null;
}

type Tx = Prisma.TransactionClient;

const json = (v: unknown) => (v === undefined ? null : JSON.stringify(v));

/** Appends one audit event inside the caller's transaction (the table refuses updates and deletes). */
export async function appendAudit(tx: Tx, e: AuditInput): Promise<void> {
  await tx.auditEvent.create({
    data: {
      actorId: e.actorId,
      actorName: e.actorName,
      action: e.action,
      entityType: e.entityType,
      entityId: String(e.entityId),
      before: json(e.before),
      after: json(e.after),
      reason: e.reason ?? null,
    },
  });
}

/** The AuditEvent columns an event is written to, in the order of auditEventValues. */
export const AUDIT_EVENT_COLUMNS = `"actorId", "actorName", "action", "entityType", "entityId", "before", "after", "reason", "at"`;

/** An event's values for AUDIT_EVENT_COLUMNS: the entity id as text, before and after as JSON. */
export function auditEventValues(e: AuditInput & { at: string }): SqlValue[] {
  return [e.actorId, e.actorName, e.action, e.entityType, String(e.entityId), json(e.before), json(e.after), e.reason ?? null, e.at];
}

/** Appends one audit event on either engine, inside the caller's transaction (`tx` of sql().transaction). */
export async function appendAuditEvent(db: SqlExecutor, e: AuditInput & { at: string }): Promise<void> {
  await db.run(`INSERT INTO "AuditEvent" (${AUDIT_EVENT_COLUMNS}) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)`, auditEventValues(e));
}

export interface AuditEventRow {
  id: number;
  actorName: string;
  action: string;
  entityType: string;
  entityId: string;
  before: unknown;
  after: unknown;
  reason: string | null;
  at: Date;
}

function parse(text: string | null): unknown {
  if (text === null) return null;
  try {
    return JSON.parse(text);
  } catch {
    return text;
  }
}

/** Every event for one entity, oldest first. */
export async function listAuditFor(entityType: string, entityId: string | number): Promise<AuditEventRow[]> {
  const db = await prismaReady();
  const rows = await db.auditEvent.findMany({ where: { entityType, entityId: String(entityId) }, orderBy: { id: "asc" } });
  return rows.map((r) => ({ ...r, before: parse(r.before), after: parse(r.after) }));
}

/** The latest events across the collection, newest first. */
export async function listRecentAudit(limit: number): Promise<AuditEventRow[]> {
  const db = await prismaReady();
  const rows = await db.auditEvent.findMany({ orderBy: { id: "desc" }, take: limit });
  return rows.map((r) => ({ ...r, before: parse(r.before), after: parse(r.after) }));
}

/**
 * Batch events (imports, the demo seed) whose id range covers the record. A batch writes its
 * records in one transaction, so its ids run from firstId to lastId with no others between; the
 * event's entity id is "first-last". Batches are few, so reading them all stays cheap.
 */
export async function listBatchEventsCovering(db: SqlExecutor, recordId: number): Promise<AuditEventRow[]> {
  const rows = await db.all<Omit<AuditEventRow, "before" | "after" | "at"> & { before: string | null; after: string | null; at: string }>(
    `SELECT "id", "actorName" AS "actorName", "action", "entityType" AS "entityType", "entityId" AS "entityId", "before", "after", "reason", "at"
       FROM "AuditEvent" WHERE "entityType" = 'record_batch' ORDER BY "id"`,
  );
  const out: AuditEventRow[] = [];
  for (const r of rows) {
    const m = /^(\d+)-(\d+)$/.exec(r.entityId);
    if (!m || recordId < Number(m[1]) || recordId > Number(m[2])) continue;
    out.push({ ...r, before: parse(r.before), after: parse(r.after), at: new Date(r.at) });
  }
  return out;
}
