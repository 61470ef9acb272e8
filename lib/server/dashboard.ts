import { listRecentAudit, type AuditEventRow } from "../db/audit";
import { sqlite } from "../db/connection";
import { openFlagCounts, type FlagCounts } from "../db/flags";
import { collectionStats, type CollectionStats } from "../db/records";
import { guard, ok, type Result } from "./result";

export interface Dashboard {
  stats: CollectionStats;
  recent: AuditEventRow[];
  /** Open review flags by severity, rule and source. */
  flags: FlagCounts;
}

/** The state of the collection at a glance, for the home page. */
export async function getDashboard(): Promise<Result<Dashboard>> {
  return guard(async () => ok({ stats: collectionStats(), recent: await listRecentAudit(12), flags: openFlagCounts(sqlite()) }));
}
