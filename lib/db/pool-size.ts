/**
 * How many connections one Meltledger process opens to a PostgreSQL server. The engine-neutral SQL
 * interface (sql.ts: table pages, checks, review, sessions) takes MELTLEDGER_PG_POOL_SIZE
 * connections (default 20); the Prisma client (entry forms, sources, accounts) half as many, at
 * least 2. So one server process holds at most 30 by default, well inside PostgreSQL's default
 * max_connections of 100 (PostgreSQL documentation, "Connections and Authentication") — several
 * app processes and the maintenance commands can share one server. Requests beyond the pool wait
 * for a free connection rather than fail.
 */
export const DEFAULT_PG_POOL_SIZE = 20;

export function pgPoolSizes(env: Record<string, string | undefined> = process.env): { sql: number; prisma: number } {
  const raw = env.MELTLEDGER_PG_POOL_SIZE?.trim();
  const n = raw && /^\d+$/.test(raw) ? Number(raw) : DEFAULT_PG_POOL_SIZE;
  const sql = Math.min(Math.max(n, 2), 500);
  return { sql, prisma: Math.max(2, Math.round(sql / 2)) };
}
