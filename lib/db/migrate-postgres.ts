import { randomUUID } from "node:crypto";
import { defaultPostgresMigrationsDir, isApplied, MigrationError, readMigrations, type MigrationFile, type MigrationResult } from "./migrate";
import type { PostgresClient } from "./postgres";

// The table Prisma Migrate keeps on PostgreSQL, column for column, so its tooling reads our history.
const HISTORY_TABLE = `CREATE TABLE IF NOT EXISTS "_prisma_migrations" (
    "id"                    VARCHAR(36) PRIMARY KEY NOT NULL,
    "checksum"              VARCHAR(64) NOT NULL,
    "finished_at"           TIMESTAMPTZ,
    "migration_name"        VARCHAR(255) NOT NULL,
    "logs"                  TEXT,
    "rolled_back_at"        TIMESTAMPTZ,
    "started_at"            TIMESTAMPTZ NOT NULL DEFAULT now(),
    "applied_steps_count"   INTEGER NOT NULL DEFAULT 0
)`;

// Any constant works; it only has to be the same for every Meltledger process migrating one database.
const MIGRATION_LOCK_KEY = 4_870_112_026;

/** The PostgreSQL migrations shipped with this version, oldest first. */
export function readPostgresMigrations(): MigrationFile[] {
  return readMigrations(defaultPostgresMigrationsDir());
}

/**
 * The PostgreSQL twin of `migrate` (migrate.ts): applies every migration under
 * prisma/postgres/migrations not yet recorded, each in its own transaction (DDL is transactional
 * in PostgreSQL, so a failed migration leaves nothing behind), and records it in
 * `_prisma_migrations`. An advisory lock makes two processes starting at once take turns; a
 * recorded migration whose file has changed stops the run.
 */
export async function migratePostgres(client: PostgresClient, migrations: MigrationFile[] = readPostgresMigrations(), now: () => Date = () => new Date()): Promise<MigrationResult> {
  await client.query("SELECT pg_advisory_lock($1)", [MIGRATION_LOCK_KEY]);
  try {
    await client.query(HISTORY_TABLE);
    const rows = (await client.query<{ migration_name: string; checksum: string }>(`SELECT migration_name, checksum FROM "_prisma_migrations" WHERE finished_at IS NOT NULL AND rolled_back_at IS NULL`)).rows;
    const done = new Map(rows.map((r) => [r.migration_name, r.checksum]));
    const result: MigrationResult = { applied: [], alreadyApplied: [] };
    for (const m of migrations) {
      if (isApplied(done, m)) {
        result.alreadyApplied.push(m.name);
        continue;
      }
      const startedAt = now();
      try {
        await client.query("BEGIN");
        await client.query(m.sql);
        await client.query(`INSERT INTO "_prisma_migrations" (id, checksum, finished_at, migration_name, started_at, applied_steps_count) VALUES ($1, $2, $3, $4, $5, 1)`, [randomUUID(), m.checksum, now(), m.name, startedAt]);
        await client.query("COMMIT");
      } catch (error) {
        await client.query("ROLLBACK").catch(() => undefined);
        throw new MigrationError(`Migration ${m.name} failed and was rolled back: ${(error as Error).message}`, m.name);
      }
      result.applied.push(m.name);
    }
    return result;
  } finally {
    await client.query("SELECT pg_advisory_unlock($1)", [MIGRATION_LOCK_KEY]).catch(() => undefined);
  }
}
