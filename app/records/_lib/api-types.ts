import type { RecordTableRow } from "@/lib/server/records";

/** The JSON the records API sends: a table row as the browser receives it (already plain JSON). */
export type RecordsApiRow = RecordTableRow;

export interface RecordsApiPage {
  rows: RecordsApiRow[];
  total: number;
  page: number;
  pageSize: number;
}

export interface ApiErrorBody {
  error: { code: string; message: string; details?: Record<string, unknown> };
}

export interface RecordFacets {
  alloys: string[];
  sources: { id: number; label: string }[];
}
