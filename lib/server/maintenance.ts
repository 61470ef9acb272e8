import { existsSync, mkdirSync, renameSync } from "node:fs";
import path from "node:path";
import { closeSqlite, sqlite } from "../db/connection";
import { disconnectPrisma } from "../db/client";
import { migrate } from "../db/migrate";
import { migratePostgres } from "../db/migrate-postgres";
import { describeConnectionError, isPostgresConnectionError, withPostgres } from "../db/postgres";
import { resolveDatabaseLocation, resolveDatabaseTarget, type DatabaseEngine } from "../db/location";
import { fail, guard, ok, type Result } from "./result";

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

export function isDatabaseEmpty(): boolean {
  const db = sqlite();
  const n = (db.prepare(`SELECT (SELECT COUNT(*) FROM Source) + (SELECT COUNT(*) FROM BuildRecord) AS n`).get() as { n: number }).n;
  return n === 0;
}

/**
 * Moves the database file (and its WAL files) aside under data/previous/ — never deletes it —
 * so a reset starts from an empty file. Returns where the old file went, or null if none.
 */
export async function setDatabaseAside(): Promise<string | null> {
  const { filePath } = resolveDatabaseLocation();
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
