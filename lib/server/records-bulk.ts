import { appendAuditEvent } from "../db/audit";
import { missingSourceIds } from "../db/imports";
import { materialIdFor, type MaterialSpec } from "../db/materials";
import { insertRecords, type RecordStamp, type RecordWrite } from "../db/records";
import { sql, type SqlExecutor } from "../db/sql";
import { recordInputSchema } from "../schemas/record";
import { NUL_MESSAGE, nulCharacterPath } from "../schemas/plain-input";
import { parseRecordInputFast } from "../schemas/record-fast";
import { requireRole, type Actor } from "./actor";
import { checksAfterSave, qualityScorerFor } from "./checks";
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
  // a NUL character would be refused by PostgreSQL (and kept by SQLite): a row error on both
  const nul = nulCharacterPath(input);
  if (nul !== null) return { ok: false, errors: [{ row, field: nul.split(/[.[]/)[0] || "_row", message: NUL_MESSAGE }] };
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
  /** Shared across calls of one transaction so each material is looked up once (fingerprint -> id). */
  materials: Map<string, number>;
  /** Quality score of each row as the checks would compute it (qualityScorerFor); null when absent. */
  quality?: QualityScorer;
}

export type QualityScorer = (w: Omit<RecordWrite, "materialId">) => number;

/**
 * Writes prepared rows inside the caller's transaction `db`; the caller has checked that the
 * sources exist. With an import file, each record remembers its row. Returns ids in row order.
 */
export async function writePreparedRows(db: SqlExecutor, rows: readonly PreparedBulkRow[], stamp: RecordStamp | ((index: number) => RecordStamp), options: WritePreparedOptions): Promise<number[]> {
  // The prepared objects are completed in place rather than copied: a spread copy of a record's
  // two dozen fields cost more than everything else in preparing it. Every field is set again on
  // each call, so a transaction run a second time (PostgreSQL, after a serialization failure)
  // writes the same.
  const full: RecordWrite[] = new Array(rows.length);
  for (let i = 0; i < rows.length; i++) {
    const w = rows[i]!;
    const r = w.write as RecordWrite;
    r.materialId = await materialIdFor(db, w.material, options.materials);
    r.importFile = options.importFile ?? null;
    r.importRunId = options.importRunId ?? null;
    r.importRow = options.importFile ? w.row : null;
    if (options.quality) r.qualityScore = options.quality(r);
    full[i] = r;
  }
  return insertRecords(db, full, stamp);
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
    const now = options.now ?? (() => new Date());
    const at = now();
    const sourceIds = new Set(writes.map((w) => w.write.sourceId));
    const stamp = options.rowMeta
      ? (i: number) => {
          const meta = options.rowMeta!(writes[i]!.row - 1);
          return { actorId: meta.actorId, at: meta.at };
        }
      : { actorId: actor.id, at };
    // Only database work inside: on PostgreSQL the body may run again after a serialization failure.
    const result = await sql().transaction(async (tx): Promise<BulkResult | { missingSource: number }> => {
      const missing = await missingSourceIds(tx, sourceIds);
      if (missing.length) return { missingSource: missing[0]! };
      const writeOptions = { importFile: options.importFile ?? null, importRunId: options.importRunId ?? null, materials: new Map<string, number>(), quality: await qualityScorerFor(tx, sourceIds) };
      const ids = await writePreparedRows(tx, writes, stamp, writeOptions);
      await appendAuditEvent(tx, {
        actorId: actor.id,
        actorName: actor.name,
        action: options.auditAction ?? "bulk_create",
        entityType: "record_batch",
        entityId: ids.length ? `${ids[0]}-${ids[ids.length - 1]}` : "none",
        after: { count: ids.length, firstId: ids[0] ?? null, lastId: ids[ids.length - 1] ?? null, importFile: options.importFile ?? null, excludedRows: errors.length ? [...new Set(errors.map((e) => e.row))] : [] },
        at: iso(at),
      });
      return { ids, rows: writes.map((w) => w.row), excluded: errors };
    });
    if ("missingSource" in result) {
      return fail("invalid_input", `Source ${result.missingSource} does not exist; nothing was written.`, { fieldErrors: { sourceId: [`Source ${result.missingSource} does not exist.`] } });
    }
    // Checks: flags and quality scores of the new records, after the write has committed.
    if (!options.deferChecks) await checksAfterSave(result.ids);
    return ok(result);
  });
}
