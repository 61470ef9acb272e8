import { listRecentAudit, type AuditEventRow } from "../db/audit";
import { collectionStats, type CollectionStats } from "../db/records";
import { guard, ok, type Result } from "./result";

export interface Dashboard {
  stats: CollectionStats;
  recent: AuditEventRow[];
}

/** The state of the collection at a glance, for the home page. */
export async function getDashboard(): Promise<Result<Dashboard>> {
  return guard(async () => ok({ stats: collectionStats(), recent: await listRecentAudit(12) }));
}
