import type { AuditEventRow } from "../db/audit";
import type { SourceRow } from "../db/sources";
import { listRecords } from "./records";
import { ok, type Result } from "./result";
import { getSourcePage } from "./sources";

export interface SourceDetail {
  source: SourceRow;
  history: AuditEventRow[];
  /** Records of every status that cite this source. */
  recordCount: number;
}

/** A source with its audit history and how many records cite it, for the source page. */
export async function getSourceDetail(id: number): Promise<Result<SourceDetail>> {
  const page = await getSourcePage(id);
  if (!page.ok) return page;
  const records = await listRecords({ sourceId: [page.data.source.id], pageSize: 1 });
  if (!records.ok) return records;
  return ok({ ...page.data, recordCount: records.data.total });
}
