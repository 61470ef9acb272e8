import type { RecordDetail } from "../db/records";
import { listSources as listSourceRows } from "../db/sources";
import { getRecordPage } from "./records";
import { sourceOptionLabel, type SourceOption } from "./records-facets";
import { guard, ok, type Result } from "./result";

async function sourceOptions(): Promise<SourceOption[]> {
  const rows = await listSourceRows();
  return rows.map((s) => ({ id: s.id, label: sourceOptionLabel(s) }));
}

/** The choices the record form needs: every source to pick from. */
export async function getNewRecordForm(): Promise<Result<{ sources: SourceOption[] }>> {
  return guard(async () => ok({ sources: await sourceOptions() }));
}

/** A record to edit (with its version for the conflict check) and the sources to pick from. */
export async function getRecordEditor(id: number): Promise<Result<{ record: RecordDetail; sources: SourceOption[] }>> {
  const page = await getRecordPage(id);
  if (!page.ok) return page;
  return guard(async () => ok({ record: page.data.record, sources: await sourceOptions() }));
}
