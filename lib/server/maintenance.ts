import { existsSync, mkdirSync, renameSync } from "node:fs";
import path from "node:path";
import { closeSqlite, sqlite } from "../db/connection";
import { disconnectPrisma } from "../db/client";
import { migrate } from "../db/migrate";
import { resolveDatabaseLocation } from "../db/location";
import { guard, ok, type Result } from "./result";

export async function migrateDatabase(): Promise<Result<{ filePath: string; applied: string[]; alreadyApplied: string[] }>> {
  return guard(async () => {
    const { filePath } = resolveDatabaseLocation();
    const r = migrate(sqlite());
    return ok({ filePath, ...r });
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
