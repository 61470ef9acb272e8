import { existsSync, mkdirSync } from "node:fs";
import path from "node:path";
import { moveSqliteFile } from "../db/backup-sqlite";
import { applyMigrations, closeDatabases, DatabaseUnreachableError, type MigrationsSummary } from "../db/databases";
import { resolveDatabaseTarget } from "../db/location";
import { sql } from "../db/sql";
import { AppFailure, fail, guard, ok, type Result } from "./result";

/**
 * Applies pending migrations to the database DATABASE_URL names: prisma/migrations on a SQLite
 * file, prisma/postgres/migrations on a PostgreSQL server. `filePath` is the SQLite file, or the
 * server's URL with its password hidden.
 */
export type MigrateSummary = MigrationsSummary;

export async function migrateDatabase(): Promise<Result<MigrateSummary>> {
  return guard<MigrateSummary>(async () => {
    try {
      return ok(await applyMigrations());
    } catch (error) {
      if (error instanceof DatabaseUnreachableError) return fail("unavailable", error.message);
      throw error;
    }
  });
}

/** True when the database holds no source and no record (the demo seed's "--if-empty"), on either engine. */
export async function isDatabaseEmpty(): Promise<boolean> {
  const row = await sql().get<{ n: number }>(`SELECT (SELECT COUNT(*) FROM "Source") + (SELECT COUNT(*) FROM "BuildRecord") AS "n"`);
  return (row?.n ?? 0) === 0;
}

/**
 * Moves the database file (and its WAL files) aside under data/previous/ — never deletes it —
 * so a reset starts from an empty file. Returns where the old file went, or null if none.
 * SQLite only: a PostgreSQL database is not a file to move, and nothing is ever deleted, so a
 * reset there is refused with what to do instead.
 */
export async function setDatabaseAside(): Promise<string | null> {
  const where = resolveDatabaseTarget();
  if (where.engine === "postgresql") {
    throw new AppFailure({
      code: "conflict",
      message: `DATABASE_URL names a PostgreSQL database (${where.redactedUrl}): a reset would have to delete its rows, which Meltledger never does. Back it up (meltledger db backup OUT), then point DATABASE_URL at a new, empty database (createdb) and seed that one.`,
    });
  }
  const { filePath } = where;
  if (!existsSync(filePath)) return null;
  await closeDatabases();
  const keep = path.join(path.dirname(filePath), "previous");
  mkdirSync(keep, { recursive: true });
  const stamp = new Date().toISOString().replace(/[:.]/g, "-");
  const target = path.join(keep, `${path.basename(filePath, ".db")}-${stamp}.db`);
  moveSqliteFile(filePath, target);
  return target;
}
