/**
 * Read model of the review queue: records with open flags, worst first, each with its source and
 * page reference, its values as entered and as stored, its flags with the rule's explanation, and
 * for duplicate flags the other record of the pair, for a side-by-side view.
 */
import { z } from "zod";
import { RULE_CATALOGUE, ruleInfo } from "../domain/checks/index";
import { CHECKED_FIELDS } from "../domain/checks/fields";
import { CANONICAL_UNIT } from "../domain/units";
import { openFlagCounts, openFlagsOfRecord, reviewQueuePage, type FlagCounts } from "../db/flags";
import { queueRecord, type QueueRecordRow } from "../db/reviews";
import { sql, type SqlExecutor } from "../db/sql";
import { guard, invalid, nulRefusal, ok, type Result } from "./result";
import { rowIdSchema } from "../schemas/ids";

export interface QueueValue {
  field: string;
  label: string;
  unit: string;
  entered: { text: string; unit: string; provenance: string } | null;
  canonical: number | null;
}

/** The record columns the queue shows as stored. */
type ShownColumns =
  | "id" | "version" | "status" | "alloyKey" | "designation" | "outcome" | "outcomeText" | "machine" | "atmosphere" | "qualityScore"
  | "volumetricEnergyJMm3" | "locationPage" | "locationLabel" | "importFile" | "importRow";

/** A record as the queue shows it: those columns, its source, and each value with what was entered. */
export interface QueueRecordView extends Pick<QueueRecordRow, ShownColumns> {
  source: { id: number; title: string; year: number | null; doi: string | null };
  values: QueueValue[];
}

export interface QueueFlagView {
  id: number;
  version: number;
  ruleCode: string;
  severity: "error" | "warning" | "info";
  message: string;
  details: Record<string, unknown>;
  title: string;
  explanation: string;
  ruleSource: string;
  relatedRecordId: number | null;
  suggestedFix: { field: string; value: string; unit: string } | null;
  isPair: boolean;
  settingsVersion: number | null;
}

export interface QueueItem {
  record: QueueRecordView;
  flags: QueueFlagView[];
  /** The other records of this record's duplicate flags, by id. */
  related: Record<number, QueueRecordView>;
}

export interface ReviewQueue {
  items: QueueItem[];
  total: number;
  page: number;
  pageSize: number;
  filter: { code: string | null; sourceId: number | null };
  counts: FlagCounts;
  ruleTitles: Record<string, string>;
}

async function recordView(db: SqlExecutor, id: number): Promise<QueueRecordView | null> {
  const r = await queueRecord(db, id);
  if (!r) return null;
  let entered: Record<string, { text: string; unit: string; provenance?: string }> = {};
  try {
    entered = JSON.parse(r.enteredValues) as typeof entered;
  } catch {
    entered = {};
  }
  const values: QueueValue[] = CHECKED_FIELDS.map((f) => {
    const e = entered[f.field];
    const canonical = r[f.key];
    return {
      field: f.field,
      label: f.label.charAt(0).toUpperCase() + f.label.slice(1),
      unit: CANONICAL_UNIT[f.quantity],
      entered: e ? { text: e.text, unit: e.unit, provenance: e.provenance ?? "reported" } : null,
      canonical: typeof canonical === "number" ? canonical : null,
    };
  }).filter((v) => v.entered !== null || v.canonical !== null);
  return {
    id: r.id, version: r.version, status: r.status, alloyKey: r.alloyKey, designation: r.designation, outcome: r.outcome, outcomeText: r.outcomeText,
    machine: r.machine, atmosphere: r.atmosphere, qualityScore: r.qualityScore, volumetricEnergyJMm3: r.volumetricEnergyJMm3,
    source: { id: r.sourceId, title: r.sourceTitle, year: r.sourceYear, doi: r.sourceDoi },
    locationPage: r.locationPage, locationLabel: r.locationLabel, importFile: r.importFile, importRow: r.importRow, values,
  };
}

const PAIR_CODES = new Set(["duplicate.exact", "duplicate.near", "duplicate.label_conflict"]);

const querySchema = z.object({
  code: z.string().trim().max(100).nullish().transform((v) => v || null),
  sourceId: z.preprocess((v) => (v === "" || v === undefined || v === null ? null : v), rowIdSchema.nullable()).default(null),
  page: z.preprocess((v) => (v === "" || v === undefined || v === null ? 0 : v), z.coerce.number().int().min(0).max(100_000)).default(0),
  pageSize: z.preprocess((v) => (v === "" || v === undefined || v === null ? 20 : v), z.coerce.number().int().min(1).max(100)).default(20),
});

/** One page of the queue (filters: a rule-code prefix and a source). */
export async function getReviewQueue(input: unknown): Promise<Result<ReviewQueue>> {
  return guard(async () => {
    const nul = nulRefusal(input);
    if (nul) return nul;
    const parsed = querySchema.safeParse(input);
    if (!parsed.success) return invalid(parsed.error, "The queue filter needs attention.");
    const { code, sourceId, page, pageSize } = parsed.data;
    // one snapshot: the page, its records and flags, and the counts agree with each other
    const read = async (db: SqlExecutor): Promise<Result<ReviewQueue>> => {
      const { recordIds, total } = await reviewQueuePage(db, { codePrefix: code, sourceId, offset: page * pageSize, limit: pageSize });
      const items: QueueItem[] = [];
      for (const id of recordIds) {
        const record = await recordView(db, id);
        if (!record) continue;
        const flags = (await openFlagsOfRecord(db, id))
          .filter((f) => !code || f.ruleCode.startsWith(code))
          .map((f): QueueFlagView => {
            const info = ruleInfo(f.ruleCode);
            const fix = f.details.suggestedFix as { field?: unknown; value?: unknown; unit?: unknown } | undefined;
            return {
              id: f.id, version: f.version, ruleCode: f.ruleCode, severity: (f.severity as QueueFlagView["severity"]) ?? "warning", message: f.message, details: f.details,
              title: info?.title ?? f.ruleCode, explanation: info?.description ?? "", ruleSource: info?.source ?? "",
              relatedRecordId: f.relatedRecordId,
              suggestedFix: fix && typeof fix.field === "string" && typeof fix.value === "string" ? { field: fix.field, value: fix.value, unit: typeof fix.unit === "string" ? fix.unit : "" } : null,
              isPair: PAIR_CODES.has(f.ruleCode) && f.relatedRecordId !== null,
              settingsVersion: f.settingsVersion,
            };
          });
        const related: Record<number, QueueRecordView> = {};
        for (const f of flags) {
          if (f.relatedRecordId !== null && !related[f.relatedRecordId]) {
            const other = await recordView(db, f.relatedRecordId);
            if (other) related[f.relatedRecordId] = other;
          }
        }
        items.push({ record, flags, related });
      }
      const ruleTitles = Object.fromEntries(RULE_CATALOGUE.map((r) => [r.code, r.title]));
      return ok({ items, total, page, pageSize, filter: { code, sourceId }, counts: await openFlagCounts(db), ruleTitles });
    };
    return sql().transaction(read, { readOnly: true });
  });
}
