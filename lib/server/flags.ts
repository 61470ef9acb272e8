/**
 * Use case: list flags for scripted triage and for the queue's side panels.
 */
import { z } from "zod";
import { listFlags as listFlagRows, openFlagCounts, type FlagCounts, type FlagListRow } from "../db/flags";
import { sql } from "../db/sql";
import { guard, invalid, nulRefusal, ok, type Result } from "./result";
import { MAX_ROW_ID, rowIdSchema } from "../schemas/ids";

/** A flag as pipelines see it: snake_case keys, the record's import file and row when it was imported. */
export interface FlagJson {
  id: number;
  record_id: number | null;
  related_record_id: number | null;
  source_id: number | null;
  import_file: string | null;
  import_row: number | null;
  code: string;
  severity: string;
  message: string;
  details: Record<string, unknown>;
  state: string;
  resolution: string | null;
  reason: string | null;
  resolved_by: string | null;
  resolved_at: string | null;
  settings_version: number | null;
  version: number;
  created_at: string;
  record_status: string | null;
}

export function toFlagJson(f: FlagListRow): FlagJson {
  return {
    id: f.id,
    record_id: f.recordId,
    related_record_id: f.relatedRecordId,
    source_id: f.sourceId,
    import_file: f.importFile,
    import_row: f.importRow,
    code: f.ruleCode,
    severity: f.severity,
    message: f.message,
    details: f.details,
    state: f.state,
    resolution: f.resolution,
    reason: f.reason,
    resolved_by: f.resolvedByName,
    resolved_at: f.resolvedAt,
    settings_version: f.settingsVersion,
    version: f.version,
    created_at: f.createdAt,
    record_status: f.recordStatus,
  };
}

const filterSchema = z.object({
  recordId: z.coerce.number({ message: "--record takes a record id." }).int().positive({ message: "--record takes a record id." }).max(MAX_ROW_ID, { message: "--record takes a record id." }).nullish(),
  sourceId: rowIdSchema.nullish(),
  state: z.enum(["open", "resolved", "waived"], { message: "--state is open, resolved or waived." }).nullish(),
  codePrefix: z.string().trim().min(1).max(100).nullish(),
  severity: z.enum(["error", "warning", "info"], { message: "--severity is error, warning or info." }).nullish(),
});

/** Every flag matching the filter (no paging: scripts want the whole list). */
export async function listFlags(input: unknown): Promise<Result<FlagJson[]>> {
  return guard(async () => {
    const nul = nulRefusal(input);
    if (nul) return nul;
    const parsed = filterSchema.safeParse(input);
    if (!parsed.success) return invalid(parsed.error, "The filter needs attention.");
    return ok((await listFlagRows(sql(), parsed.data)).map(toFlagJson));
  });
}

/** Counts of open flags by rule, source and severity. */
export async function getFlagCounts(): Promise<Result<FlagCounts>> {
  return guard(async () => ok(await openFlagCounts(sql())));
}
