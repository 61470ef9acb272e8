import { appendAuditRaw } from "../db/audit-raw";
import { sqlite } from "../db/connection";
import { findOrCreateMaterialRaw } from "../db/materials";
import { insertRecordsRaw, type RecordWrite } from "../db/records";
import { recordInputSchema } from "../schemas/record";
import { requireRole, type Actor } from "./actor";
import { prepareRecord } from "./record-write";
import { fail, guard, ok, type Result } from "./result";

export interface RowError {
  /** 1-based row number among the inputs. */
  row: number;
  field: string;
  message: string;
}

export interface BulkOptions {
  /** Leave out rows with errors instead of refusing the whole batch (only when the user says so). */
  excludeErrors?: boolean;
  /** Recorded with every record: which file and row it came from. */
  importFile?: string | null;
  importRunId?: number | null;
  /** Per-row actor and time, for the demo scenario's history; defaults to the caller and now. */
  rowMeta?: (index: number) => { actorId: number; at: Date };
  /** Audit action name for the one batch event. */
  auditAction?: string;
  now?: () => Date;
}

export interface BulkResult {
  ids: number[];
  /** Input row (1-based) of each id, in the same order. */
  rows: number[];
  excluded: RowError[];
}

const iso = (d: Date) => d.toISOString().replace("Z", "+00:00");

/**
 * Validates and normalizes many records, then writes them in one transaction: all rows or none.
 * Rows with errors refuse the batch (listing every row, field and message) unless
 * `excludeErrors` is set, in which case they are left out and reported.
 */
export async function insertRecordsBulk(inputs: readonly unknown[], actor: Actor, options: BulkOptions = {}): Promise<Result<BulkResult>> {
  return guard(async () => {
    requireRole(actor, "contributor");
    const errors: RowError[] = [];
    const writes: { row: number; write: Omit<RecordWrite, "materialId">; material: Parameters<typeof findOrCreateMaterialRaw>[1] }[] = [];
    for (let i = 0; i < inputs.length; i++) {
      const parsed = recordInputSchema.safeParse(inputs[i]);
      if (!parsed.success) {
        for (const issue of parsed.error.issues) errors.push({ row: i + 1, field: issue.path.length ? String(issue.path[0]) : "_row", message: issue.message });
        continue;
      }
      const prepared = prepareRecord(parsed.data);
      if (!prepared.ok) {
        for (const [field, messages] of Object.entries(prepared.fieldErrors)) for (const message of messages) errors.push({ row: i + 1, field, message });
        continue;
      }
      writes.push({ row: i + 1, write: prepared.write, material: prepared.material });
    }
    if (errors.length && !options.excludeErrors) {
      const rowsWithErrors = new Set(errors.map((e) => e.row)).size;
      return fail("invalid_input", `${rowsWithErrors} of ${inputs.length} rows have problems; nothing was written. Fix them, or choose to leave those rows out.`, { rowErrors: errors });
    }
    const db = sqlite();
    const now = options.now ?? (() => new Date());
    const result = db.transaction((): BulkResult | { missingSource: number } => {
      const sourceIds = new Set(writes.map((w) => w.write.sourceId));
      for (const id of sourceIds) {
        if (!db.prepare(`SELECT 1 FROM Source WHERE id = ?`).get(id)) return { missingSource: id };
      }
      const materials = new Map<string, number>();
      const full: RecordWrite[] = writes.map((w) => ({ ...w.write, materialId: findOrCreateMaterialRaw(db, w.material, materials), importFile: options.importFile ?? null, importRunId: options.importRunId ?? null, importRow: options.importFile ? w.row : null }));
      let ids: number[];
      if (options.rowMeta) {
        ids = full.map((r, i) => {
          const meta = options.rowMeta!(writes[i]!.row - 1);
          return insertRecordsRaw(db, [r], meta.actorId, iso(meta.at))[0]!;
        });
      } else {
        ids = insertRecordsRaw(db, full, actor.id, iso(now()));
      }
      appendAuditRaw(db, {
        actorId: actor.id,
        actorName: actor.name,
        action: options.auditAction ?? "bulk_create",
        entityType: "record_batch",
        entityId: ids.length ? `${ids[0]}-${ids[ids.length - 1]}` : "none",
        after: { count: ids.length, firstId: ids[0] ?? null, lastId: ids[ids.length - 1] ?? null, importFile: options.importFile ?? null, excludedRows: errors.length ? [...new Set(errors.map((e) => e.row))] : [] },
        at: iso(now()),
      });
      return { ids, rows: writes.map((w) => w.row), excluded: errors };
    })();
    if ("missingSource" in result) {
      return fail("invalid_input", `Source ${result.missingSource} does not exist; nothing was written.`, { fieldErrors: { sourceId: [`Source ${result.missingSource} does not exist.`] } });
    }
    return ok(result);
  });
}
