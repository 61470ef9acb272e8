import { distinctAlloys } from "../db/records";
import { sql } from "../db/sql";
import { listSources as listSourceRows } from "../db/sources";
import { listRecords, type RecordsPage } from "./records";
import { guard, ok, type AppError, type Result } from "./result";

export interface SourceOption {
  id: number;
  /** "2021 · Title…", as the table shows sources. */
  label: string;
}

export interface RecordFacets {
  /** Alloy keys present in the collection, sorted. */
  alloys: string[];
  sources: SourceOption[];
}

/** A short label for a source in lists and selects. */
export function sourceOptionLabel(s: { id: number; year: number | null; title: string }): string {
  const title = s.title.length > 80 ? `${s.title.slice(0, 79)}…` : s.title;
  return `${s.year ?? "n.d."} · ${title} (#${s.id})`;
}

/** The choices the records table offers as filters. */
export async function getRecordFacets(): Promise<Result<RecordFacets>> {
  return guard(async () => {
    const sources = await listSourceRows();
    return ok({ alloys: await distinctAlloys(sql()), sources: sources.map((s) => ({ id: s.id, label: sourceOptionLabel(s) })) });
  });
}

export interface RecordsBrowser {
  facets: RecordFacets;
  /** The first page for the query in the address bar, or why the query was refused. */
  page: RecordsPage | null;
  queryError: AppError | null;
}

/** What the records page needs on first render: filter choices and the requested page. */
export async function getRecordsBrowser(query: unknown): Promise<Result<RecordsBrowser>> {
  const facets = await getRecordFacets();
  if (!facets.ok) return facets;
  const page = await listRecords(query);
  if (page.ok) return ok({ facets: facets.data, page: page.data, queryError: null });
  if (page.error.code === "invalid_input") return ok({ facets: facets.data, page: null, queryError: page.error });
  return page;
}
