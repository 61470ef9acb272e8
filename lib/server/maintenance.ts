import { existsSync, mkdirSync, renameSync } from "node:fs";
import path from "node:path";
import { closeSqlite, sqlite } from "../db/connection";
import { disconnectPrisma } from "../db/client";
import { migrate } from "../db/migrate";
import { migratePostgres } from "../db/migrate-postgres";
import { describeConnectionError, isPostgresConnectionError, withPostgres } from "../db/postgres";
import { resolveDatabaseTarget, type DatabaseEngine } from "../db/location";
import { sql } from "../db/sql";
import { AppFailure, fail, guard, ok, type Result } from "./result";

/**
 * Applies pending migrations to the database DATABASE_URL names: prisma/migrations on a SQLite
 * file, prisma/postgres/migrations on a PostgreSQL server. `filePath` is the SQLite file, or the
 * server's URL with its password hidden.
 */
export interface MigrateSummary {
  filePath: string;
  engine: DatabaseEngine;
  applied: string[];
  alreadyApplied: string[];
}

export async function migrateDatabase(): Promise<Result<MigrateSummary>> {
  return guard<MigrateSummary>(async () => {
    const target = resolveDatabaseTarget();
    if (target.engine === "sqlite") return ok({ filePath: target.filePath, engine: "sqlite", ...migrate(sqlite()) });
    try {
      const r = await withPostgres(target.url, (client) => migratePostgres(client));
      return ok({ filePath: target.redactedUrl, engine: "postgresql", ...r });
    } catch (error) {
      if (isPostgresConnectionError(error)) return fail("unavailable", `${describeConnectionError(target.url, error)}.`);
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
  await disconnectPrisma();
  closeSqlite();
  const keep = path.join(path.dirname(filePath), "previous");
  mkdirSync(keep, { recursive: true });
  const stamp = new Date().toISOString().replace(/[:.]/g, "-");
  const target = path.join(keep, `${path.basename(filePath, ".db")}-${stamp}.db`);
  renameSync(filePath, target);
  for (const suffix of ["-wal", "-shm"]) if (existsSync(filePath + suffix)) renameSync(filePath + suffix, target + suffix);
  return target;
}
