import type { AuditInput } from "./audit";
import type { SqlExecutor } from "./sql";

/** Appends one audit event on either engine, inside the caller's transaction (`tx` of sql().transaction). */
export async function appendAuditEvent(db: SqlExecutor, e: AuditInput & { at: string }): Promise<void> {
  await db.run(`INSERT INTO "AuditEvent" ("actorId", "actorName", "action", "entityType", "entityId", "before", "after", "reason", "at") VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)`, [
    e.actorId,
    e.actorName,
    e.action,
    e.entityType,
    String(e.entityId),
    e.before === undefined ? null : JSON.stringify(e.before),
    e.after === undefined ? null : JSON.stringify(e.after),
    e.reason ?? null,
    e.at,
  ]);
}
