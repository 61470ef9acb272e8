import { appendAuditRaw } from "../db/audit-raw";
import { sqlite, type SqliteDatabase } from "../db/connection";
import { findOrCreateMaterialRaw, type MaterialSpec } from "../db/materials";
import { insertRecordsRaw, type RecordWrite } from "../db/records";
import { recordInputSchema } from "../schemas/record";
import { parseRecordInputFast } from "../schemas/record-fast";
import { requireRole, type Actor } from "./actor";
import { checksAfterSave, qualityScorer } from "./checks";
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
  /** Leave the checks to a later batch run (`meltledger check`) instead of running them after the write. */
  deferChecks?: boolean;
}

export interface BulkResult {
  ids: number[];
  /** Input row (1-based) of each id, in the same order. */
  rows: number[];
  excluded: RowError[];
}

const iso = (d: Date) => d.toISOString().replace("Z", "+00:00");

/** One validated, normalized input, ready to write. */
export interface PreparedBulkRow {
  /** 1-based row number the caller gave (input position, or the row in an imported file). */
  row: number;
  write: Omit<RecordWrite, "materialId">;
  material: MaterialSpec;
}

/**
 * Validates and normalizes one input with the record schema; problems come back as row errors
 * (field = the top-level record field).
 */
export function prepareBulkRow(input: unknown, row: number): { ok: true; prepared: PreparedBulkRow } | { ok: false; errors: RowError[] } {
  // Plainly well-formed rows skip the schema's generic machinery (same result, proven by a
  // property test); anything else goes through the schema for its messages.
  const fast = parseRecordInputFast(input);
  if (fast) {
    const prepared = prepareRecord(fast.values, fast.parsed);
    if (prepared.ok) return { ok: true, prepared: { row, write: prepared.write, material: prepared.material } };
  }
  const parsed = recordInputSchema.safeParse(input);
  if (!parsed.success) {
    return { ok: false, errors: parsed.error.issues.map((issue) => ({ row, field: issue.path.length ? String(issue.path[0]) : "_row", message: issue.message })) };
  }
  const prepared = prepareRecord(parsed.data);
  if (!prepared.ok) {
    const errors: RowError[] = [];
    for (const [field, messages] of Object.entries(prepared.fieldErrors)) for (const message of messages) errors.push({ row, field, message });
    return { ok: false, errors };
  }
  return { ok: true, prepared: { row, write: prepared.write, material: prepared.material } };
}

export interface WritePreparedOptions {
  importFile?: string | null;
  importRunId?: number | null;
  /** Shared across calls of one batch so each material is looked up once. */
  materials: Map<string, number>;
  /** Quality score of each row as the checks would compute it (see qualityScorer); null when absent. */
  quality?: (w: Omit<RecordWrite, "materialId">) => number;
}

/**
 * Writes prepared rows on the raw connection; the caller holds the transaction and has checked
 * that the sources exist. With an import file, each record remembers its row. Returns ids in order.
 */
export function writePreparedRows(db: SqliteDatabase, rows: readonly PreparedBulkRow[], actorId: number | null, at: string, options: WritePreparedOptions): number[] {
  // The prepared objects are completed in place rather than copied: a spread copy of a record's
  // two dozen fields cost more than everything else in preparing it.
  const full: RecordWrite[] = rows.map((w) => {
    const r = w.write as RecordWrite;
    r.materialId = findOrCreateMaterialRaw(db, w.material, options.materials);
    r.importFile = options.importFile ?? null;
    r.importRunId = options.importRunId ?? null;
    r.importRow = options.importFile ? w.row : null;
    if (options.quality) r.qualityScore = options.quality(r);
    return r;
  });
  return insertRecordsRaw(db, full, actorId, at);
}

/**
 * Validates and normalizes many records, then writes them in one transaction: all rows or none.
 * Rows with errors refuse the batch (listing every row, field and message) unless
 * `excludeErrors` is set, in which case they are left out and reported.
 */
export async function insertRecordsBulk(inputs: readonly unknown[], actor: Actor, options: BulkOptions = {}): Promise<Result<BulkResult>> {
  return guard(async () => {
    requireRole(actor, "contributor");
    const errors: RowError[] = [];
    const writes: PreparedBulkRow[] = [];
    for (let i = 0; i < inputs.length; i++) {
      const r = prepareBulkRow(inputs[i], i + 1);
      if (r.ok) writes.push(r.prepared);
      else errors.push(...r.errors);
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
      const writeOptions = { importFile: options.importFile ?? null, importRunId: options.importRunId ?? null, materials, quality: qualityScorer(db) };
      let ids: number[];
      if (options.rowMeta) {
        ids = writes.map((w) => {
          const meta = options.rowMeta!(w.row - 1);
          return writePreparedRows(db, [w], meta.actorId, iso(meta.at), writeOptions)[0]!;
        });
      } else {
        ids = writePreparedRows(db, writes, actor.id, iso(now()), writeOptions);
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
    // Checks: flags and quality scores of the new records, after the write has committed.
    if (!options.deferChecks) await checksAfterSave(result.ids);
    return ok(result);
  });
}
