import { prismaReady } from "../db/client";
import { appendAudit, listAuditFor, listBatchEventsCovering, type AuditEventRow } from "../db/audit";
import { findOrCreateMaterial } from "../db/materials";
import { getRecordDetail, getRecordTx, insertRecord, listRecordsPage, updateRecordIfVersion, type RecordDetail, type RecordRow, type RecordTableRow } from "../db/records";
import { getSourceTx } from "../db/sources";
import { sql } from "../db/sql";
import { recordInputSchema, recordUpdateSchema } from "../schemas/record";
import { recordsQuerySchema, type RecordsQuery } from "../schemas/records-query";
import { z } from "zod";
import { requireRole, type Actor } from "./actor";
import { checksAfterSave } from "./checks";
import { prepareRecord } from "./record-write";
import { AppFailure, fail, guard, invalid, nulRefusal, ok, type Result } from "./result";
import { isRowId, rowIdSchema } from "../schemas/ids";

/** The part of a record worth showing in an audit diff. */
function auditView(r: RecordRow) {
  const { createdAt: _c, updatedAt: _u, createdById: _cb, updatedById: _ub, ...rest } = r;
  return rest;
}

/** Creates a record from what a person keyed in; audited. */
export async function createRecord(input: unknown, actor: Actor): Promise<Result<{ id: number; version: number }>> {
  return guard(async () => {
    requireRole(actor, "contributor");
    const nul = nulRefusal(input);
    if (nul) return nul;
    const parsed = recordInputSchema.safeParse(input);
    if (!parsed.success) return invalid(parsed.error);
    const prepared = prepareRecord(parsed.data);
    if (!prepared.ok) return fail("invalid_input", "Some fields need attention.", { fieldErrors: prepared.fieldErrors });
    const db = await prismaReady();
    const created = await db.$transaction(async (tx) => {
      if (!(await getSourceTx(tx, prepared.write.sourceId))) {
        throw new AppFailure({ code: "invalid_input", message: "That source does not exist.", details: { fieldErrors: { sourceId: ["Choose an existing source."] } } });
      }
      const materialId = await findOrCreateMaterial(tx, prepared.material);
      const record = await insertRecord(tx, { ...prepared.write, materialId }, actor.id);
      await appendAudit(tx, { actorId: actor.id, actorName: actor.name, action: "create", entityType: "record", entityId: record.id, after: auditView(record) });
      return record;
    });
    // Checks: flags and quality score of the new record, after the write has committed.
    await checksAfterSave([created.id]);
    return ok({ id: created.id, version: created.version });
  });
}

/** Saves an edit when nobody else saved first; otherwise a conflict carrying the current record. */
export async function updateRecord(input: unknown, actor: Actor): Promise<Result<{ id: number; version: number }>> {
  return guard(async () => {
    requireRole(actor, "contributor");
    const nul = nulRefusal(input);
    if (nul) return nul;
    const parsed = recordUpdateSchema.safeParse(input);
    if (!parsed.success) return invalid(parsed.error);
    const { id, version, reason, ...values } = parsed.data;
    const prepared = prepareRecord(values);
    if (!prepared.ok) return fail("invalid_input", "Some fields need attention.", { fieldErrors: prepared.fieldErrors });
    const db = await prismaReady();
    const saved = await db.$transaction(async (tx) => {
      const before = await getRecordTx(tx, id);
      if (!before) throw new AppFailure({ code: "not_found", message: `Record ${id} does not exist.` });
      if (before.status === "rejected" || before.status === "merged") {
        throw new AppFailure({ code: "conflict", message: `Record ${id} is ${before.status}; it can no longer be edited.` });
      }
      if (!(await getSourceTx(tx, prepared.write.sourceId))) {
        throw new AppFailure({ code: "invalid_input", message: "That source does not exist.", details: { fieldErrors: { sourceId: ["Choose an existing source."] } } });
      }
      const materialId = await findOrCreateMaterial(tx, prepared.material);
      // An accepted record that is edited goes back for review.
      const status = before.status === "accepted" ? "needs_review" : prepared.write.status;
      const after = await updateRecordIfVersion(tx, id, version, { ...prepared.write, status, materialId }, actor.id);
      if (!after) {
        throw new AppFailure({
          code: "conflict",
          message: `Someone saved record ${id} after you opened it (you edited version ${version}, it is now version ${before.version}). Your changes were not saved; reload to see theirs, then apply yours again.`,
          details: { currentVersion: before.version },
        });
      }
      await appendAudit(tx, { actorId: actor.id, actorName: actor.name, action: "update", entityType: "record", entityId: id, before: auditView(before), after: auditView(after), reason });
      return after;
    });
    // Checks: re-judge the edited record (and its duplicate pairs), after the write has committed.
    await checksAfterSave([saved.id]);
    return ok({ id: saved.id, version: saved.version });
  });
}

const rejectSchema = z.object({
  id: rowIdSchema,
  version: rowIdSchema,
  reason: z.string().trim().min(3, { message: "Say why the record is rejected (at least 3 characters)." }).max(1000),
});

/** Rejecting replaces deleting: the record stays, marked rejected, with the reason audited. */
export async function rejectRecord(input: unknown, actor: Actor): Promise<Result<{ id: number; version: number }>> {
  return guard(async () => {
    requireRole(actor, "contributor");
    const nul = nulRefusal(input);
    if (nul) return nul;
    const parsed = rejectSchema.safeParse(input);
    if (!parsed.success) return invalid(parsed.error);
    const { id, version, reason } = parsed.data;
    const db = await prismaReady();
    const saved = await db.$transaction(async (tx) => {
      const before = await getRecordTx(tx, id);
      if (!before) throw new AppFailure({ code: "not_found", message: `Record ${id} does not exist.` });
      if (before.status === "rejected") throw new AppFailure({ code: "conflict", message: `Record ${id} is already rejected.` });
      const after = await updateRecordIfVersion(tx, id, version, { status: "rejected" }, actor.id);
      if (!after) throw new AppFailure({ code: "conflict", message: `Record ${id} changed since you opened it (now version ${before.version}); reload and try again.`, details: { currentVersion: before.version } });
      await appendAudit(tx, { actorId: actor.id, actorName: actor.name, action: "reject", entityType: "record", entityId: id, before: { status: before.status }, after: { status: "rejected" }, reason });
      return after;
    });
    return ok({ id: saved.id, version: saved.version });
  });
}

export interface RecordPage {
  record: RecordDetail;
  history: AuditEventRow[];
}

export async function getRecordPage(id: number): Promise<Result<RecordPage>> {
  return guard(async () => {
    if (!isRowId(id)) return fail("not_found", "No such record.");
    const record = await getRecordDetail(id);
    if (!record) return fail("not_found", `Record ${id} does not exist.`);
    // The record's own events and the batch (import, seed) that created it, oldest first.
    const history = [...(await listBatchEventsCovering(sql(), id)), ...(await listAuditFor("record", id))].sort((a, b) => a.at.getTime() - b.at.getTime() || a.id - b.id);
    return ok({ record, history });
  });
}

export type { RecordTableRow };

export interface RecordsPage {
  rows: RecordTableRow[];
  total: number;
  query: RecordsQuery;
}

/** One page of the records table; filters, sort and paging validated by the shared schema. Runs on either engine. */
export async function listRecords(input: unknown): Promise<Result<RecordsPage>> {
  return guard(async () => {
    const nul = nulRefusal(input);
    if (nul) return nul;
    const parsed = recordsQuerySchema.safeParse(input);
    if (!parsed.success) return invalid(parsed.error, "The table filters need attention.");
    // the total and the rows come from one statement (one snapshot), so a page never disagrees with its count
    const { rows, total } = await listRecordsPage(parsed.data, sql());
    return ok({ rows, total, query: parsed.data });
  });
}
