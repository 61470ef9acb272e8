import { listRecentAudit, type AuditEventRow } from "../db/audit";
import { openFlagCounts, type FlagCounts } from "../db/flags";
import { collectionStats, type CollectionStats } from "../db/records";
import { sql } from "../db/sql";
import { guard, ok, type Result } from "./result";

export interface Dashboard {
  stats: CollectionStats;
  recent: AuditEventRow[];
  /** Open review flags by severity, rule and source. */
  flags: FlagCounts;
}

/**
 * The state of the collection at a glance, for the home page. Runs on either engine: the counts
 * through sql.ts, read from one snapshot so they agree with each other; the recent events through Prisma.
 */
export async function getDashboard(): Promise<Result<Dashboard>> {
  return guard(async () => {
    const { stats, flags } = await sql().transaction(async (tx) => ({ stats: await collectionStats(tx), flags: await openFlagCounts(tx) }), { readOnly: true });
    return ok({ stats, recent: await listRecentAudit(12), flags });
  });
}
