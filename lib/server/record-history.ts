import type { AuditEventRow } from "../db/audit";
import { sqlite } from "../db/connection";
import { getRecordPage, type RecordPage } from "./records";
import { guard, ok, type Result } from "./result";

interface BatchRow {
  id: number;
  actorName: string;
  action: string;
  entityType: string;
  entityId: string;
  before: string | null;
  after: string | null;
  reason: string | null;
  at: string;
}

const parse = (text: string | null): unknown => {
  if (text === null) return null;
  try {
    return JSON.parse(text);
  } catch {
    return text;
  }
};

/**
 * Batch events (imports, the demo seed) whose id range covers the record. A batch writes its
 * records in one transaction, so its ids run from firstId to lastId without gaps from others.
 * The entity id is "first-last"; batches are few, so reading them all stays cheap.
 */
function batchEventsCovering(recordId: number): AuditEventRow[] {
  const rows = sqlite().prepare(`SELECT id, actorName, action, entityType, entityId, before, after, reason, at FROM AuditEvent WHERE entityType = 'record_batch' ORDER BY id`).all() as BatchRow[];
  const out: AuditEventRow[] = [];
  for (const r of rows) {
    const m = /^(\d+)-(\d+)$/.exec(r.entityId);
    if (!m || recordId < Number(m[1]) || recordId > Number(m[2])) continue;
    out.push({ ...r, before: parse(r.before), after: parse(r.after), at: new Date(r.at) });
  }
  return out;
}

/** The record page with the full history: its own events and the batch that created it, oldest first. */
export async function getRecordWithHistory(id: number): Promise<Result<RecordPage>> {
  const page = await getRecordPage(id);
  if (!page.ok) return page;
  return guard(async () => {
    const history = [...batchEventsCovering(id), ...page.data.history].sort((a, b) => a.at.getTime() - b.at.getTime() || a.id - b.id);
    return ok({ ...page.data, history });
  });
}
